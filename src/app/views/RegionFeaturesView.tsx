import { useMemo } from 'react';
import type { GridShape } from '../../core/types';
import { featureColourHex, regionFeatureColours } from '../draw';

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
 * (regionFeatureColours: src/core principalComponents and componentsToRgb), shown as red, green
 * and blue over the grid: cells of similar colour have similar embeddings. The study toolbar's
 * "Region features" overlay draws the same colours over the image.
 */
export function RegionFeaturesView({ cells, dim, grid, highlightedCell, onHighlightCell }: RegionFeaturesViewProps) {
  const result = useMemo(() => {
    if (!cells || !grid) return undefined;
    try {
      const { rgb, varianceShare } = regionFeatureColours(cells, grid.h * grid.w, dim);
      return { rgb, ratio: varianceShare };
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
        {Array.from({ length: grid.h * grid.w }, (_, i) => (
          <rect
            key={i}
            x={(i % grid.w) * cw}
            y={Math.floor(i / grid.w) * ch}
            width={cw}
            height={ch}
            fill={featureColourHex(result.rgb, i)}
            onMouseEnter={() => onHighlightCell(i)}
          />
        ))}
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
