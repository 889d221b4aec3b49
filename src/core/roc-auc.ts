/**
 * Area under the ROC curve: the probability that a random positive outscores a random negative, ties
 * counting one half. Computed from the Mann-Whitney U statistic with mid-ranks, in O(n log n):
 * AUC = (R+ - n+ (n+ + 1) / 2) / (n+ n-), R+ the rank sum of the positives.
 * labels[i] is 1 / true for a positive, 0 / false for a negative.
 * Returns undefined when either class is empty (including empty input). Throws RangeError for unequal
 * lengths, a NaN score or a label other than 0, 1, true, false.
 * Method: D. Bamber (1975), J. Math. Psych. 12:387-415; J. A. Hanley and B. J. McNeil (1982),
 * Radiology 143:29-36 (AUC equals the Mann-Whitney statistic).
 */
export function rocAuc(scores: ArrayLike<number>, labels: ArrayLike<0 | 1 | boolean>): number | undefined {
  const n = scores.length;
  if (labels.length !== n) {
    throw new RangeError(`'scores' and 'labels' must have the same length; got ${n} and ${labels.length}`);
  }
  const positive = new Uint8Array(n);
  let nPos = 0;
  for (let i = 0; i < n; i++) {
    const l = labels[i];
    if (l === 1 || l === true) positive[i] = 1;
    else if (l !== 0 && l !== false) throw new RangeError(`'labels[${i}]' must be 0, 1, true or false; got ${String(l)}`);
    if (Number.isNaN(scores[i])) throw new RangeError(`'scores[${i}]' must be a number; got NaN`);
    nPos += positive[i];
  }
  const nNeg = n - nPos;
  if (nPos === 0 || nNeg === 0) return undefined;
  const order = new Uint32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  order.sort((a, b) => (scores[a] < scores[b] ? -1 : scores[a] > scores[b] ? 1 : 0));
  let rankSumPos = 0;
  for (let start = 0; start < n; ) {
    let end = start + 1;
    while (end < n && scores[order[end]] === scores[order[start]]) end++;
    // Ranks start + 1 .. end share their mean.
    const midRank = (start + 1 + end) / 2;
    for (let t = start; t < end; t++) if (positive[order[t]]) rankSumPos += midRank;
    start = end;
  }
  return (rankSumPos - (nPos * (nPos + 1)) / 2) / (nPos * nNeg);
}
