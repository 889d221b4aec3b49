/** Default softmax temperature for massInBoxes (our choice; see massInBoxes). */
export const DEFAULT_MASS_TEMPERATURE = 0.1;

/**
 * Share of the map's softmax mass inside the reference boxes, in [0, 1]: sum_i p_i f_i with
 * p = softmax(values / T) over the cells and f_i the fraction of cell i's area inside the box
 * union (coveredAreas / cell area; 0 for zero-area padding cells). An energy-based pointing game
 * (Wang et al., CVPR Workshops 2020, Score-CAM), with the softmax turning cosine similarities
 * into a non-negative energy. T defaults to 0.1 (our choice): cosines differ between cells by a
 * few tenths, and T = 0.1, like the usual contrastive-training temperatures (0.07 to 0.1, from
 * memory), turns a 0.1 gap into a factor e; T = 1 would leave the mass almost uniform. NaN cells
 * are left out; undefined when no value is a number. Lengths must match (RangeError).
 */
export function massInBoxes(
  values: ArrayLike<number>,
  insideFraction: ArrayLike<number>,
  { temperature = DEFAULT_MASS_TEMPERATURE }: { temperature?: number } = {},
): number | undefined {
  if (!(Number.isFinite(temperature) && temperature > 0)) {
    throw new RangeError(`'temperature' must be a finite number > 0; got ${temperature}`);
  }
  if (insideFraction.length !== values.length) {
    throw new RangeError(`'insideFraction' must hold one fraction per value (${values.length}); got ${insideFraction.length}`);
  }
  let m = -Infinity;
  for (let i = 0; i < values.length; i++) if (values[i] > m) m = values[i];
  if (m === -Infinity) return undefined;
  let total = 0;
  let inside = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v !== v) continue;
    const w = Math.exp((v - m) / temperature);
    total += w;
    inside += w * insideFraction[i];
  }
  return inside / total;
}
