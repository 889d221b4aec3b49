import { useMemo } from 'react';
import type { GridShape } from '../../core/types';
import { componentsToRgb, principalComponents } from '../../core/principal-components';

export interface RegionFeaturesViewProps {
  /** L2-normalised cell embeddings, nCells x dim, row-major cells. */
  readonly cells: Float32Array | undefined;
  readonly dim: number;
  readonly grid: GridShape | undefined;
  readonly highlightedCell: number | undefined;
  readonly onHighlightCell: (cell: number | undefined) => void;
}

const SIZE = 176;

/**
 * The study's region embeddings reduced to their first three principal components
 * (src/core principalComponents), shown as red, green and blue over the grid (componentsToRgb):
 * cells of similar colour have similar embeddings.
 */
export function RegionFeaturesView({ cells, dim, grid, highlightedCell, onHighlightCell }: RegionFeaturesViewProps) {
  const result = useMemo(() => {
    if (!cells || !grid) return undefined;
    const n = grid.h * grid.w;
    try {
      const k = Math.min(3, n, dim);
      const pcs = principalComponents(cells, n, dim, k);
      return { rgb: componentsToRgb(pcs.scores, n, k), ratio: pcs.explainedVarianceRatio };
    } catch (err) {
      return { error: (err as Error).message };
    }
  }, [cells, dim, grid]);
  if (!grid || !result) return <p className="t-status">Encode the study to see its region features.</p>;
  if ('error' in result) return <p className="t-error">Region features cannot be shown: {result.error}</p>;
  const cw = SIZE / grid.w;
  const ch = SIZE / grid.h;
  return (
    <div className="t-features">
      <svg width={SIZE} height={SIZE} role="img" aria-label="Region features: first three principal components as colours over the grid">
        {Array.from({ length: grid.h * grid.w }, (_, i) => {
          const [r, g, b] = [result.rgb[3 * i], result.rgb[3 * i + 1], result.rgb[3 * i + 2]];
          return (
            <rect
              key={i}
              x={(i % grid.w) * cw}
              y={Math.floor(i / grid.w) * ch}
              width={cw}
              height={ch}
              fill={`rgb(${r},${g},${b})`}
              onMouseEnter={() => onHighlightCell(i)}
            />
          );
        })}
        {highlightedCell !== undefined && highlightedCell < grid.h * grid.w && (
          <rect
            x={(highlightedCell % grid.w) * cw}
            y={Math.floor(highlightedCell / grid.w) * ch}
            width={cw}
            height={ch}
            className="t-features__hl"
          />
        )}
      </svg>
      <div className="t-features__text">
        <p>Red, green and blue are the first three principal components of the normalised cell embeddings, each scaled over this study.</p>
        <p>
          Share of variance:{' '}
          {result.ratio.map((r, i) => (
            <span key={i} className="t-features__pc">
              PC{i + 1} {(r * 100).toFixed(1)}%
            </span>
          ))}
        </p>
        <p className="t-hint">Patient's right is on the left of the grid, as on the image.</p>
      </div>
    </div>
  );
}
