import { Matrix as DenseMatrix, SVD } from 'ml-matrix';

/** Principal components of n points in dim dimensions. */
export interface PrincipalComponents {
  /** Projections of the centred points on the components, row-major n x k. */
  readonly scores: Float32Array;
  /** Variance along each component, s_i^2 / (n - 1); all 0 for n = 1. */
  readonly explainedVariance: number[];
  /** Share of the total variance along each component; all 0 when the points do not vary. */
  readonly explainedVarianceRatio: number[];
  /** Unit component directions, row-major k x dim, in decreasing order of variance. */
  readonly components: Float32Array;
}

/**
 * Principal component analysis of data (row-major n x dim, one point per row) through the singular value
 * decomposition of the column-centred data, X - mean = U S V^T: components are the first k rows of V^T,
 * scores are (X - mean) V. Signs are fixed so that each component's largest-magnitude loading is positive
 * (the first such loading on ties), which makes the result deterministic.
 * Components of zero variance (constant data, n = 1, k > rank) are not unique: any orthonormal completion
 * the decomposition returns is kept, with zero scores.
 * Throws RangeError unless n >= 1, dim >= 1, data.length = n * dim, k is an integer in [1, min(n, dim)]
 * and no value is NaN or infinite.
 * Method: K. Pearson (1901), Phil. Mag. 2:559-572; computed by the Golub-Kahan-Reinsch SVD of ml-matrix
 * (G. H. Golub and C. Reinsch (1970), Numer. Math. 14:403-420).
 */
export function principalComponents(data: Float32Array, n: number, dim: number, k = 3): PrincipalComponents {
  if (!Number.isSafeInteger(n) || n < 1) throw new RangeError(`'n' must be an integer >= 1; got ${n}`);
  if (!Number.isSafeInteger(dim) || dim < 1) throw new RangeError(`'dim' must be an integer >= 1; got ${dim}`);
  if (data.length !== n * dim) throw new RangeError(`'data' must hold n * dim = ${n * dim} values; got ${data.length}`);
  const maxK = Math.min(n, dim);
  if (!Number.isSafeInteger(k) || k < 1 || k > maxK) {
    throw new RangeError(`'k' must be an integer in [1, min(n, dim) = ${maxK}]; got ${k}`);
  }
  const centred = centreColumns(data, n, dim);
  let total = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < dim; j++) total += centred.get(i, j) ** 2;

  const svd = new SVD(centred, { autoTranspose: true, computeLeftSingularVectors: false });
  const v = svd.rightSingularVectors;
  const s = svd.diagonal;
  const components = new Float32Array(k * dim);
  const scores = new Float32Array(n * k);
  const explainedVariance: number[] = [];
  const explainedVarianceRatio: number[] = [];
  const direction = new Float64Array(dim);
  for (let c = 0; c < k; c++) {
    let best = 0;
    for (let j = 0; j < dim; j++) {
      direction[j] = v.get(j, c);
      if (Math.abs(direction[j]) > Math.abs(direction[best])) best = j;
    }
    const sign = direction[best] < 0 ? -1 : 1;
    for (let j = 0; j < dim; j++) components[c * dim + j] = sign * direction[j];
    for (let i = 0; i < n; i++) {
      let dot = 0;
      for (let j = 0; j < dim; j++) dot += centred.get(i, j) * direction[j];
      scores[i * k + c] = sign * dot;
    }
    const s2 = (s[c] ?? 0) ** 2;
    explainedVariance.push(n > 1 ? s2 / (n - 1) : 0);
    explainedVarianceRatio.push(total > 0 ? s2 / total : 0);
  }
  return { scores, explainedVariance, explainedVarianceRatio, components };
}

function centreColumns(data: Float32Array, n: number, dim: number): DenseMatrix {
  const mean = new Float64Array(dim);
  for (let i = 0; i < data.length; i++) {
    if (!Number.isFinite(data[i])) {
      throw new RangeError(`'data' must be finite; got ${data[i]} at row ${Math.floor(i / dim)}, col ${i % dim}`);
    }
    mean[i % dim] += data[i];
  }
  for (let j = 0; j < dim; j++) mean[j] /= n;
  const m = new DenseMatrix(n, dim);
  for (let i = 0; i < n; i++) for (let j = 0; j < dim; j++) m.set(i, j, data[i * dim + j] - mean[j]);
  return m;
}

/**
 * Maps the first three principal-component scores of n points (row-major n x k) to RGB bytes (n x 3):
 * each component is min-max scaled over the points to 0..255 and rounded. A component that does not vary
 * maps to 128; channels beyond k (k < 3) are 0. Empty input (n = 0) gives an empty array.
 * Throws RangeError when scores.length is not n * k, k < 1, or a score is NaN or infinite.
 * Method: false-colour display of the leading principal components (common practice).
 */
export function componentsToRgb(scores: ArrayLike<number>, n: number, k: number): Uint8ClampedArray {
  if (!Number.isSafeInteger(n) || n < 0) throw new RangeError(`'n' must be a non-negative integer; got ${n}`);
  if (!Number.isSafeInteger(k) || k < 1) throw new RangeError(`'k' must be an integer >= 1; got ${k}`);
  if (scores.length !== n * k) throw new RangeError(`'scores' must hold n * k = ${n * k} values; got ${scores.length}`);
  const rgb = new Uint8ClampedArray(n * 3);
  for (let c = 0; c < Math.min(k, 3); c++) {
    let lo = Infinity, hi = -Infinity;
    for (let i = 0; i < n; i++) {
      const v = scores[i * k + c];
      if (!Number.isFinite(v)) throw new RangeError(`'scores' must be finite; got ${v} at point ${i}, component ${c}`);
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    const span = hi - lo;
    for (let i = 0; i < n; i++) {
      rgb[i * 3 + c] = span > 0 ? Math.round(((scores[i * k + c] - lo) / span) * 255) : 128;
    }
  }
  return rgb;
}
