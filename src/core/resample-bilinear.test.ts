import { describe, expect, it } from 'vitest';
import { resampleToInput } from './resample-bilinear';
import { computeResizeTransform } from './resize-transform';
import { createRng } from './seeded-random';
import { expectClose } from '../../tests/support/expect-close';

describe('resampleToInput', () => {
  it('resampleToInput with the identity transform returns the image unchanged', () => {
    const r = createRng(1);
    const src = Float32Array.from({ length: 35 }, () => r.next());
    const t = computeResizeTransform({ width: 7, height: 5 }, { width: 7, height: 5 }, 'stretch');
    expect(Array.from(resampleToInput(src, { width: 7, height: 5 }, t))).toEqual(Array.from(src));
  });
  it('resampleToInput keeps a constant image constant under every policy, up and down', () => {
    for (const policy of ['stretch', 'letterbox', 'centre-crop'] as const) {
      for (const [w, h] of [[13, 9], [300, 170], [1, 1]]) {
        const src = new Float32Array(w * h).fill(0.7);
        const t = computeResizeTransform({ width: w, height: h }, { width: 32, height: 32 }, policy);
        const out = resampleToInput(src, { width: w, height: h }, t, -1);
        for (const v of out) expect(v === -1 || Math.abs(v - 0.7) < 1e-6).toBe(true);
      }
    }
  });
  it('resampleToInput(letterbox) fills the padding with padValue', () => {
    const src = new Float32Array(40 * 20).fill(1);
    const t = computeResizeTransform({ width: 40, height: 20 }, { width: 20, height: 20 }, 'letterbox');
    const out = resampleToInput(src, { width: 40, height: 20 }, t, 0);
    // Content occupies input rows 5 .. 15.
    for (let y = 0; y < 20; y++) expect(out[y * 20 + 3]).toBe(y >= 5 && y < 15 ? 1 : 0);
  });
  it('resampleToInput upsampling reproduces a linear ramp with the pixel-centre convention', () => {
    const src = Float32Array.from({ length: 8 }, (_, i) => i);
    const t = computeResizeTransform({ width: 8, height: 1 }, { width: 32, height: 1 }, 'stretch');
    const out = resampleToInput(src, { width: 8, height: 1 }, t);
    // Input pixel u samples source x = (u + 0.5) / 4 - 0.5, clamped to [0, 7].
    expectClose(out, Array.from({ length: 32 }, (_, u) => Math.min(7, Math.max(0, (u + 0.5) / 4 - 0.5))), 1e-6);
  });
  it('resampleToInput downscaling 4x averages each 4 x 4 block (area averaging)', () => {
    const r = createRng(3);
    const src = Float32Array.from({ length: 64 }, () => r.next());
    const t = computeResizeTransform({ width: 8, height: 8 }, { width: 2, height: 2 }, 'stretch');
    const out = resampleToInput(src, { width: 8, height: 8 }, t);
    const block = (bx: number, by: number): number => {
      let s = 0;
      for (let y = 0; y < 4; y++) for (let x = 0; x < 4; x++) s += src[(by * 4 + y) * 8 + bx * 4 + x];
      return s / 16;
    };
    expectClose(out, [block(0, 0), block(1, 0), block(0, 1), block(1, 1)], 1e-6);
  });
  it('resampleToInput does not alias a fine checkerboard when downscaling 8x', () => {
    const n = 256;
    const src = Float32Array.from({ length: n * n }, (_, i) => ((i % n) + Math.floor(i / n)) % 2);
    const t = computeResizeTransform({ width: n, height: n }, { width: 32, height: 32 }, 'stretch');
    for (const v of resampleToInput(src, { width: n, height: n }, t)) expectClose(v, 0.5, 1e-6);
  });
  it('resampleToInput rejects a buffer of the wrong length', () => {
    const t = computeResizeTransform({ width: 4, height: 4 }, { width: 2, height: 2 }, 'stretch');
    expect(() => resampleToInput(new Float32Array(15), { width: 4, height: 4 }, t)).toThrow("'src' must hold 4 x 4 = 16 values; got 15");
  });
});
