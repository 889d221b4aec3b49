import { describe, expect, it } from 'vitest';
import { applyVoiLinear, toUnitIntensity } from './voi-window';
import { expectClose } from '../../tests/support/expect-close';

/** The formula of DICOM PS3.3 C.11.2.1.2.1 with y_min = 0, y_max = 1, written out independently. */
function standardLinear(x: number, c: number, w: number): number {
  if (x <= c - 0.5 - (w - 1) / 2) return 0;
  if (x > c - 0.5 + (w - 1) / 2) return 1;
  return ((x - (c - 0.5)) / (w - 1) + 0.5) * (1 - 0) + 0;
}

describe('voi-window', () => {
  it('applyVoiLinear(x, 2048, 4096) matches DICOM PS3.3 C.11.2.1.2.1 worked numbers', () => {
    // c = 2048, w = 4096: lower edge c - 0.5 - 2047.5 = 0, upper edge c - 0.5 + 2047.5 = 4095.
    expect(applyVoiLinear(0, 2048, 4096)).toBe(0);
    expect(applyVoiLinear(4095, 2048, 4096)).toBeCloseTo(1, 12);
    expect(applyVoiLinear(4095.5, 2048, 4096)).toBe(1);
    // x = c - 0.5 sits exactly at the middle: 0.5.
    expect(applyVoiLinear(2047.5, 2048, 4096)).toBe(0.5);
    // x = 1000: (1000 - 2047.5) / 4095 + 0.5 = 0.244200244...
    expectClose(applyVoiLinear(1000, 2048, 4096), (1000 - 2047.5) / 4095 + 0.5, 1e-15);
    expectClose(applyVoiLinear(1000, 2048, 4096), 0.24420024420024420, 1e-12);
  });

  it('applyVoiLinear(x, 40, 400) (a CT soft-tissue window) matches the standard at edges and inside', () => {
    // Edges: 40 - 0.5 - 199.5 = -160 (-> 0), 40 - 0.5 + 199.5 = 239 (above -> 1).
    expect(applyVoiLinear(-160, 40, 400)).toBe(0);
    expectClose(applyVoiLinear(-159, 40, 400), 1 / 399, 1e-15);
    expectClose(applyVoiLinear(239, 40, 400), 1, 1e-12);
    expect(applyVoiLinear(239.0001, 40, 400)).toBe(1);
    expectClose(applyVoiLinear(100, 40, 400), (100 - 39.5) / 399 + 0.5, 1e-15);
  });

  it('applyVoiLinear(x, c, 1) is a step at c - 0.5', () => {
    expect(applyVoiLinear(9.5, 10, 1)).toBe(0);
    expect(applyVoiLinear(9.5001, 10, 1)).toBe(1);
  });

  it('applyVoiLinear agrees with the standard formula on a grid and is monotone and in [0, 1]', () => {
    for (const [c, w] of [[0, 2], [100, 50], [-500, 1500], [32768, 65536], [0.25, 1.5]]) {
      let prev = -Infinity;
      for (let k = -100; k <= 100; k++) {
        const x = c + (k / 50) * w;
        const y = applyVoiLinear(x, c, w);
        expectClose(y, standardLinear(x, c, w), 1e-12);
        expect(y).toBeGreaterThanOrEqual(0);
        expect(y).toBeLessThanOrEqual(1);
        expect(y).toBeGreaterThanOrEqual(prev);
        prev = y;
      }
    }
  });

  it('applyVoiLinear handles NaN and huge values', () => {
    expect(applyVoiLinear(NaN, 0, 10)).toBeNaN();
    expect(applyVoiLinear(1e300, 0, 10)).toBe(1);
    expect(applyVoiLinear(-1e300, 0, 10)).toBe(0);
    expect(applyVoiLinear(Infinity, 0, 10)).toBe(1);
  });

  it('applyVoiLinear(x, c, w < 1) throws a RangeError naming width', () => {
    expect(() => applyVoiLinear(0, 0, 0.5)).toThrow(RangeError);
    expect(() => applyVoiLinear(0, 0, 0.5)).toThrow(/'width'.*got 0.5/);
    expect(() => applyVoiLinear(0, 0, NaN)).toThrow(/'width'/);
    expect(() => applyVoiLinear(0, NaN, 2)).toThrow(/'centre'/);
  });

  it('toUnitIntensity(image, window) applies the VOI function elementwise', () => {
    const data = Float32Array.of(-200, 0, 39.5, 100, 300);
    const out = toUnitIntensity({ data, valueRange: [0, 1] }, { centre: 40, width: 400 });
    expectClose(out, Array.from(data, (x) => standardLinear(x, 40, 400)), 1e-6);
    expect(() => toUnitIntensity({ data, valueRange: [0, 1] }, { centre: 40, width: 0 })).toThrow(RangeError);
    expect(() => toUnitIntensity({ data: new Float32Array(0), valueRange: [0, 1] }, { centre: 40, width: 0 })).toThrow(RangeError);
  });

  it('toUnitIntensity(image) maps valueRange linearly and clamps', () => {
    const out = toUnitIntensity({ data: Float32Array.of(-5, 0, 1024, 4095, 5000, NaN), valueRange: [0, 4095] });
    expectClose(out, [0, 0, 1024 / 4095, 1, 1, NaN], 1e-7);
    expect(toUnitIntensity({ data: new Float32Array(0), valueRange: [0, 1] }).length).toBe(0);
    expect(Array.from(toUnitIntensity({ data: Float32Array.of(2, 3, 4), valueRange: [3, 3] }))).toEqual([0, 0, 1]);
    expect(() => toUnitIntensity({ data: Float32Array.of(1), valueRange: [0, Infinity] })).toThrow(/valueRange/);
  });

  it('toUnitIntensity is invariant under a positive affine rescaling of data, range and window', () => {
    const data = Float32Array.from({ length: 50 }, (_, i) => i * 37 - 300);
    const a = 2.5;
    const b = -40;
    const scaled = Float32Array.from(data, (x) => a * x + b);
    expectClose(toUnitIntensity({ data: scaled, valueRange: [a * -300 + b, a * 1513 + b] }), toUnitIntensity({ data, valueRange: [-300, 1513] }), 1e-5);
  });
});
