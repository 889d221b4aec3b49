import type { GridShape, Matrix } from '../../core/types';
import type { ParsedSentence } from '../../report/types';

export interface CellSentenceListProps {
  readonly cell: number | undefined;
  readonly grid: GridShape | undefined;
  readonly sim: Matrix | undefined;
  readonly sentences: readonly ParsedSentence[];
  readonly onSelect: (sentenceIndex: number) => void;
  /** Rows listed; default 5. */
  readonly limit?: number;
}

/** The sentences ranked by their similarity to the cell under the pointer. */
export function CellSentenceList({ cell, grid, sim, sentences, onSelect, limit = 5 }: CellSentenceListProps) {
  if (cell === undefined || !grid || !sim || cell >= sim.cols) {
    return <p className="t-status">Point at a grid cell to rank the sentences by their similarity to it.</p>;
  }
  const ranked = sentences
    .map((s, row) => ({ s, v: sim.data[row * sim.cols + cell] }))
    .sort((a, b) => b.v - a.v || a.s.index - b.s.index)
    .slice(0, limit);
  const row = Math.floor(cell / grid.w);
  const col = cell % grid.w;
  return (
    <div className="t-cellrank">
      <p className="t-cellrank__head">
        Cell row {row + 1}, column {col + 1}: closest sentences
      </p>
      <ol>
        {ranked.map(({ s, v }) => (
          <li key={s.index}>
            <button type="button" className="t-linkish" onClick={() => onSelect(s.index)} title="Select this sentence">
              <span className="t-cellrank__v">{v.toFixed(3)}</span> <span className="t-cellrank__n">S{s.index + 1}</span> {s.text}
              {s.negated && <span className="t-tag t-tag--neg">negated</span>}
            </button>
          </li>
        ))}
      </ol>
    </div>
  );
}
