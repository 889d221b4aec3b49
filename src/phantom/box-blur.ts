/**
 * Separable box blur of a square row-major float image, repeated `passes` times (three passes
 * approximate a Gaussian; Wells, "Efficient synthesis of Gaussian filters by cascaded uniform
 * filters", IEEE TPAMI 1986). Edges clamp. Radius 0 returns a copy. Shapes: size * size.
 */
export function boxBlur(src: Float32Array, size: number, radius: number, passes = 1): Float32Array {
  const a = Float32Array.from(src);
  if (radius < 1 || size < 1) return a;
  const b = new Float32Array(a.length);
  const r = Math.floor(radius);
  const norm = 1 / (2 * r + 1);
  for (let p = 0; p < passes; p++) {
    blurRows(a, b, size, r, norm);
    blurCols(b, a, size, r, norm);
  }
  return a;
}

function blurRows(src: Float32Array, dst: Float32Array, size: number, r: number, norm: number): void {
  const last = size - 1;
  for (let y = 0; y < size; y++) {
    const row = y * size;
    let acc = 0;
    for (let k = -r; k <= r; k++) acc += src[row + Math.min(last, Math.max(0, k))];
    for (let x = 0; x < size; x++) {
      dst[row + x] = acc * norm;
      // Clamped indices only near the two ends; the interior reads the window directly.
      const add = x + r + 1 <= last ? src[row + x + r + 1] : src[row + last];
      const sub = x - r >= 0 ? src[row + x - r] : src[row];
      acc += add - sub;
    }
  }
}

function blurCols(src: Float32Array, dst: Float32Array, size: number, r: number, norm: number): void {
  const last = size - 1;
  // Row-by-row running sums over all columns at once keep memory access sequential.
  const acc = new Float64Array(size);
  for (let k = -r; k <= r; k++) {
    const row = Math.min(last, Math.max(0, k)) * size;
    for (let x = 0; x < size; x++) acc[x] += src[row + x];
  }
  for (let y = 0; y < size; y++) {
    const out = y * size;
    const addRow = Math.min(last, y + r + 1) * size;
    const subRow = Math.max(0, y - r) * size;
    for (let x = 0; x < size; x++) {
      dst[out + x] = acc[x] * norm;
      acc[x] += src[addRow + x] - src[subRow + x];
    }
  }
}
