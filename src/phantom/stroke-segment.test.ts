import { describe, expect, it } from 'vitest';
import { strokeSegment } from './stroke-segment';

describe('strokeSegment', () => {
  it('strokeSegment fills pixels within the radius with amp and leaves far ones at 0', () => {
    const buf = new Float32Array(100);
    strokeSegment(buf, 10, { x0: 1, y0: 5, x1: 9, y1: 5 }, 1, 0, 0.8);
    expect(buf[5 * 10 + 4]).toBeCloseTo(0.8);
    expect(buf[4 * 10 + 4]).toBeCloseTo(0.8);
    expect(buf[1 * 10 + 4]).toBe(0);
  });
  it('strokeSegment keeps the larger value where strokes cross, and handles a zero-length segment', () => {
    const buf = new Float32Array(100);
    strokeSegment(buf, 10, { x0: 0, y0: 5, x1: 10, y1: 5 }, 0.6, 0.5, 0.5);
    strokeSegment(buf, 10, { x0: 5, y0: 0, x1: 5, y1: 10 }, 0.6, 0.5, 0.3);
    expect(buf[5 * 10 + 5]).toBeCloseTo(0.5);
    const dot = new Float32Array(100);
    strokeSegment(dot, 10, { x0: 5.5, y0: 5.5, x1: 5.5, y1: 5.5 }, 0.7, 0, 1);
    expect(Array.from(dot).filter((v) => v > 0)).toHaveLength(1);
  });
});
