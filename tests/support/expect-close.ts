import { expect } from 'vitest';

/** Asserts |actual - expected| <= tol, elementwise for arrays; NaN matches only NaN. */
export function expectClose(
  actual: number | ArrayLike<number>,
  expected: number | ArrayLike<number>,
  tol = 1e-9,
): void {
  const a = typeof actual === 'number' ? [actual] : Array.from(actual);
  const e = typeof expected === 'number' ? [expected] : Array.from(expected);
  expect(a.length, 'length').toBe(e.length);
  for (let i = 0; i < a.length; i++) {
    if (Number.isNaN(e[i])) {
      expect(Number.isNaN(a[i]), `element ${i} should be NaN, got ${a[i]}`).toBe(true);
      continue;
    }
    const diff = Math.abs(a[i] - e[i]);
    expect(diff <= tol, `element ${i}: ${a[i]} vs ${e[i]} (|diff| ${diff} > tol ${tol})`).toBe(true);
  }
}
