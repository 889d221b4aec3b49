import type { GridShape, Matrix } from '../../core/types';
import type { ParsedSentence } from '../../report/types';

export interface SimilarityMatrixViewProps {
  readonly sim: Matrix | undefined;
  readonly grid: GridShape | undefined;
  readonly sentences: readonly ParsedSentence[];
  readonly selectedSentence: number | undefined;
  readonly highlightedCell: number | undefined;
  /** Each row's best cell (src/core groundSentence), outlined in the row. */
  readonly bestCells?: readonly number[];
  readonly colourOf: (value: number) => string;
  readonly onSelectSentence: (sentenceIndex: number) => void;
  readonly onHighlightCell: (cell: number | undefined) => void;
}

const CELL_H = 16;
const LABEL_W = 34;

/**
 * Sentences (rows) by grid cells (columns) in row-major cell order. A click on a row selects the
 * sentence, a click on a column highlights its cell on the study; arrows move both when focused.
 */
export function SimilarityMatrixView(p: SimilarityMatrixViewProps) {
  const { sim, grid, sentences } = p;
  if (!sim || !grid || sim.rows === 0) return <p className="t-status">Encode the study to see its sentence × cell matrix.</p>;
  const nCells = sim.cols;
  // About 900 px whatever the grid: 196 cells get 4 px each, 784 cells a little over 1 px (arrows pick one).
  const cellW = Math.max(1, Math.min(14, 900 / nCells));
  const width = LABEL_W + nCells * cellW;
  const height = sim.rows * CELL_H + 14;
  const rowOf = (index: number | undefined) => sentences.findIndex((s) => s.index === index);
  const selRow = rowOf(p.selectedSentence);

  return (
    <div className="t-matrix">
      <svg
        role="grid"
        aria-label="Sentence × cell matrix"
        aria-describedby="t-matrix-help"
        tabIndex={0}
        width={width}
        height={height}
        onKeyDown={(e) => {
          const cell = p.highlightedCell ?? 0;
          if (e.key === 'ArrowLeft' || e.key === 'ArrowRight') {
            e.preventDefault();
            e.stopPropagation();
            p.onHighlightCell(Math.max(0, Math.min(nCells - 1, cell + (e.key === 'ArrowLeft' ? -1 : 1))));
          } else if (e.key === 'ArrowUp' || e.key === 'ArrowDown') {
            e.preventDefault();
            e.stopPropagation();
            const to = Math.max(0, Math.min(sentences.length - 1, (selRow < 0 ? 0 : selRow) + (e.key === 'ArrowUp' ? -1 : 1)));
            p.onSelectSentence(sentences[to].index);
          }
        }}
      >
        {sentences.map((s, r) => (
          <g key={s.index} role="row" onClick={() => p.onSelectSentence(s.index)} className="t-matrix__row">
            <text x={LABEL_W - 6} y={r * CELL_H + 12} textAnchor="end" className="t-matrix__label">
              {s.index + 1}
              {s.negated ? '¬' : ''}
            </text>
            {Array.from({ length: nCells }, (_, c) => (
              <rect
                key={c}
                role="gridcell"
                x={LABEL_W + c * cellW}
                y={r * CELL_H}
                width={cellW}
                height={CELL_H - 1}
                fill={p.colourOf(sim.data[r * nCells + c])}
                onClick={() => p.onHighlightCell(c)}
              >
                <title>{`Sentence ${s.index + 1}, cell ${Math.floor(c / grid.w) + 1},${(c % grid.w) + 1}: ${sim.data[r * nCells + c].toFixed(3)}`}</title>
              </rect>
            ))}
            {p.bestCells?.[r] !== undefined && (
              <rect
                x={LABEL_W + p.bestCells[r] * cellW + 0.5}
                y={r * CELL_H + 0.5}
                width={cellW - 1}
                height={CELL_H - 2}
                className="t-matrix__best"
              />
            )}
          </g>
        ))}
        {selRow >= 0 && <rect x={1} y={selRow * CELL_H} width={width - 2} height={CELL_H - 1} className="t-matrix__sel" />}
        {p.highlightedCell !== undefined && p.highlightedCell < nCells && (
          <rect x={LABEL_W + p.highlightedCell * cellW} y={0} width={cellW} height={sim.rows * CELL_H} className="t-matrix__col" />
        )}
        {Array.from({ length: grid.h }, (_, gr) => (
          <text key={gr} x={LABEL_W + gr * grid.w * cellW} y={height - 2} className="t-matrix__tick">
            r{gr + 1}
          </text>
        ))}
      </svg>
      <p id="t-matrix-help" className="t-hint">
        Rows: sentences (¬ negated). Columns: cells, row by row of the grid (r1, r2, …). Outlined: each sentence's best cell.
        Focus the matrix and use the arrows: left/right move the highlighted cell, up/down the sentence.
      </p>
    </div>
  );
}
