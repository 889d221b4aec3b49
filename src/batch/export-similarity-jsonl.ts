import { roundDecimals } from './export-format';
import type { SimilarityDump } from './types';

const num = (x: number): number | null => roundDecimals(x) ?? null;
const quad = (q: readonly number[]): (number | null)[] => Array.from(q, num);

/**
 * One line of similarity.jsonl (no trailing newline): keys model, study, sentence, negated,
 * grid {h, w}, values (row-major, h*w), cells and boxes ([x, y, w, h] in image pixels), in that
 * order; numbers to 6 decimal places, NaN and infinities as null. Throws RangeError when the
 * value or cell count is not grid.h * grid.w.
 */
export function similarityJsonlLine(dump: SimilarityDump): string {
  const n = dump.grid.h * dump.grid.w;
  if (dump.values.length !== n) throw new RangeError(`'dump.values' must hold grid.h * grid.w = ${n} numbers; got ${dump.values.length}`);
  if (dump.cells.length !== n) throw new RangeError(`'dump.cells' must hold grid.h * grid.w = ${n} rectangles; got ${dump.cells.length}`);
  return JSON.stringify({
    model: dump.model,
    study: dump.study,
    sentence: dump.sentence,
    negated: dump.negated,
    grid: { h: dump.grid.h, w: dump.grid.w },
    values: Array.from(dump.values, num),
    cells: dump.cells.map(quad),
    boxes: dump.boxes.map(quad),
  });
}

/** similarity.jsonl text: one line per dump in the order given, each ending with '\n'; '' for none. */
export function similarityJsonl(dumps: Iterable<SimilarityDump>): string {
  let out = '';
  for (const d of dumps) out += similarityJsonlLine(d) + '\n';
  return out;
}
