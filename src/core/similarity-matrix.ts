import type { Matrix } from './types';

function checkShape(name: string, countName: string, data: Float32Array, n: number, dim: number): void {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`'${countName}' must be an integer >= 0; got ${n}`);
  if (!Number.isInteger(dim) || dim < 1) throw new RangeError(`'dim' must be an integer >= 1; got ${dim}`);
  if (data.length !== n * dim) {
    throw new RangeError(`'${name}' must hold ${n} x ${dim} = ${n * dim} values; got ${data.length}`);
  }
}

function normaliseInto(src: Float32Array, out: Float32Array, n: number, dim: number): void {
  for (let r = 0; r < n; r++) {
    const o = r * dim;
    let ss = 0;
    for (let k = 0; k < dim; k++) ss += src[o + k] * src[o + k];
    // A zero row has no direction; it stays zero so its cosine with anything is 0, not NaN.
    const inv = ss > 0 ? 1 / Math.sqrt(ss) : 0;
    for (let k = 0; k < dim; k++) out[o + k] = src[o + k] * inv;
  }
}

/**
 * L2-normalises each of the n rows of a row-major n x dim matrix (a copy; the input is untouched).
 * Zero rows stay zero. Sums of squares are taken in float64, so float32 values up to ~1e38 do not
 * overflow; NaN in a row makes that row NaN. Empty input (n = 0) gives an empty array.
 */
export function l2Normalise(data: Float32Array, n: number, dim: number): Float32Array {
  checkShape('data', 'n', data, n, dim);
  const out = new Float32Array(n * dim);
  normaliseInto(data, out, n, dim);
  return out;
}

function dotBlock1(
  a: Float32Array,
  ao: number,
  b: Float32Array,
  j0: number,
  nB: number,
  dim: number,
  scale: number,
  out: Float32Array,
  oo: number,
): void {
  for (let j = j0; j < nB; j++) {
    const bo = j * dim;
    let acc = 0;
    for (let k = 0; k < dim; k++) acc += a[ao + k] * b[bo + k];
    out[oo + j] = acc * scale;
  }
}

function dotRows2(
  a: Float32Array,
  i: number,
  b: Float32Array,
  nB: number,
  nB4: number,
  dim: number,
  rowScale: Float64Array,
  out: Float32Array,
): void {
  const a0 = i * dim;
  const a1 = a0 + dim;
  const o0 = i * nB;
  const o1 = o0 + nB;
  const r0 = rowScale[i];
  const r1 = rowScale[i + 1];
  for (let j = 0; j < nB4; j += 4) {
    const b0 = j * dim;
    const b1 = b0 + dim;
    const b2 = b1 + dim;
    const b3 = b2 + dim;
    let s00 = 0, s01 = 0, s02 = 0, s03 = 0;
    let s10 = 0, s11 = 0, s12 = 0, s13 = 0;
    for (let k = 0; k < dim; k++) {
      const x = a[a0 + k];
      const y = a[a1 + k];
      const c0 = b[b0 + k];
      const c1 = b[b1 + k];
      const c2 = b[b2 + k];
      const c3 = b[b3 + k];
      s00 += x * c0; s01 += x * c1; s02 += x * c2; s03 += x * c3;
      s10 += y * c0; s11 += y * c1; s12 += y * c2; s13 += y * c3;
    }
    out[o0 + j] = s00 * r0; out[o0 + j + 1] = s01 * r0; out[o0 + j + 2] = s02 * r0; out[o0 + j + 3] = s03 * r0;
    out[o1 + j] = s10 * r1; out[o1 + j + 1] = s11 * r1; out[o1 + j + 2] = s12 * r1; out[o1 + j + 3] = s13 * r1;
  }
  dotBlock1(a, a0, b, nB4, nB, dim, r0, out, o0);
  dotBlock1(a, a1, b, nB4, nB, dim, r1, out, o1);
}

function dotKernel(
  a: Float32Array,
  nA: number,
  b: Float32Array,
  nB: number,
  dim: number,
  rowScale: Float64Array,
  out: Float32Array,
): void {
  // Register blocking, four rows of a by four rows of b: each load feeds four of the sixteen
  // accumulators. Every dot product still sums over k in order, so blocking never changes a value.
  const nA4 = nA - (nA % 4);
  const nB4 = nB - (nB % 4);
  for (let i = 0; i < nA4; i += 4) {
    const a0 = i * dim;
    const a1 = a0 + dim;
    const a2 = a1 + dim;
    const a3 = a2 + dim;
    const o0 = i * nB;
    const o1 = o0 + nB;
    const o2 = o1 + nB;
    const o3 = o2 + nB;
    const r0 = rowScale[i];
    const r1 = rowScale[i + 1];
    const r2 = rowScale[i + 2];
    const r3 = rowScale[i + 3];
    for (let j = 0; j < nB4; j += 4) {
      const b0 = j * dim;
      const b1 = b0 + dim;
      const b2 = b1 + dim;
      const b3 = b2 + dim;
      let s00 = 0, s01 = 0, s02 = 0, s03 = 0;
      let s10 = 0, s11 = 0, s12 = 0, s13 = 0;
      let s20 = 0, s21 = 0, s22 = 0, s23 = 0;
      let s30 = 0, s31 = 0, s32 = 0, s33 = 0;
      for (let k = 0; k < dim; k++) {
        const c0 = b[b0 + k];
        const c1 = b[b1 + k];
        const c2 = b[b2 + k];
        const c3 = b[b3 + k];
        let x = a[a0 + k];
        s00 += x * c0; s01 += x * c1; s02 += x * c2; s03 += x * c3;
        x = a[a1 + k];
        s10 += x * c0; s11 += x * c1; s12 += x * c2; s13 += x * c3;
        x = a[a2 + k];
        s20 += x * c0; s21 += x * c1; s22 += x * c2; s23 += x * c3;
        x = a[a3 + k];
        s30 += x * c0; s31 += x * c1; s32 += x * c2; s33 += x * c3;
      }
      out[o0 + j] = s00 * r0; out[o0 + j + 1] = s01 * r0; out[o0 + j + 2] = s02 * r0; out[o0 + j + 3] = s03 * r0;
      out[o1 + j] = s10 * r1; out[o1 + j + 1] = s11 * r1; out[o1 + j + 2] = s12 * r1; out[o1 + j + 3] = s13 * r1;
      out[o2 + j] = s20 * r2; out[o2 + j + 1] = s21 * r2; out[o2 + j + 2] = s22 * r2; out[o2 + j + 3] = s23 * r2;
      out[o3 + j] = s30 * r3; out[o3 + j + 1] = s31 * r3; out[o3 + j + 2] = s32 * r3; out[o3 + j + 3] = s33 * r3;
    }
    for (let q = 0; q < 4; q++) dotBlock1(a, a0 + q * dim, b, nB4, nB, dim, rowScale[i + q], out, o0 + q * nB);
  }
  let i = nA4;
  if (i + 2 <= nA) {
    dotRows2(a, i, b, nB, nB4, dim, rowScale, out);
    i += 2;
  }
  if (i < nA) dotBlock1(a, i * dim, b, 0, nB, dim, rowScale[i], out, i * nB);
}

function inverseNorms(data: Float32Array, n: number, dim: number): Float64Array {
  const inv = new Float64Array(n);
  for (let r = 0; r < n; r++) {
    const o = r * dim;
    let ss = 0;
    for (let k = 0; k < dim; k++) ss += data[o + k] * data[o + k];
    inv[r] = ss > 0 ? 1 / Math.sqrt(ss) : 0;
  }
  return inv;
}

/**
 * Cosine similarity matrix S (nSentences x nCells, row-major float32): S[i][j] is the cosine of
 * sentence embedding i and cell embedding j, both row-major with `dim` columns. Zero vectors give
 * cosine 0; NaN propagates. Either count may be 0 (an empty matrix). Dot products accumulate in
 * float64.
 */
export function computeSimilarity(
  sentences: Float32Array,
  nSentences: number,
  cells: Float32Array,
  nCells: number,
  dim: number,
): Matrix {
  checkShape('sentences', 'nSentences', sentences, nSentences, dim);
  checkShape('cells', 'nCells', cells, nCells, dim);
  const normalisedCells = new Float32Array(nCells * dim);
  normaliseInto(cells, normalisedCells, nCells, dim);
  return computeSimilarityWithNormalisedCells(sentences, nSentences, normalisedCells, nCells, dim);
}

/**
 * As computeSimilarity, for cell embeddings that are already L2-normalised (l2Normalise), so a
 * study's cells are normalised once and reused for every sentence batch. Sentence rows need not
 * be normalised: each output row is scaled by the inverse norm of its sentence.
 */
export function computeSimilarityWithNormalisedCells(
  sentences: Float32Array,
  nSentences: number,
  normalisedCells: Float32Array,
  nCells: number,
  dim: number,
): Matrix {
  checkShape('sentences', 'nSentences', sentences, nSentences, dim);
  checkShape('normalisedCells', 'nCells', normalisedCells, nCells, dim);
  const out = new Float32Array(nSentences * nCells);
  dotKernel(sentences, nSentences, normalisedCells, nCells, dim, inverseNorms(sentences, nSentences, dim), out);
  return { data: out, rows: nSentences, cols: nCells };
}
