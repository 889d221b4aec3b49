import { cividisHex } from '../draw';

export interface MapLegendProps {
  /** Lowest and highest cosine of the map shown. */
  readonly domain: readonly [number, number] | undefined;
}

const STOPS = Array.from({ length: 11 }, (_, i) => i / 10);

/** Where the colour scale comes from, in plain words; shown under the legend and in the help overlay. */
export const CIVIDIS_SOURCE = 'Nuñez, Anderton and Renslow 2018, PLoS ONE 13(7): e0199239';

/** The map's colour scale with its cosine range; the caption names the scale and its source. */
export function MapLegend({ domain }: MapLegendProps) {
  if (!domain) return null;
  const gradient = `linear-gradient(to right, ${STOPS.map((t) => `${cividisHex(t)} ${t * 100}%`).join(', ')})`;
  return (
    <figure
      className="t-legend"
      title={`Cosine similarity of the selected sentence with each cell, scaled from this map's lowest to highest value. Colour scale: cividis (${CIVIDIS_SOURCE}), readable with common colour-vision deficiencies.`}
    >
      <figcaption>Similarity (cosine), cividis colour scale</figcaption>
      <div className="t-legend__bar" style={{ background: gradient }} aria-hidden="true" />
      <div className="t-legend__ticks">
        <span>{domain[0].toFixed(3)}</span>
        <span>{((domain[0] + domain[1]) / 2).toFixed(3)}</span>
        <span>{domain[1].toFixed(3)}</span>
      </div>
      <p className="t-legend__source">{CIVIDIS_SOURCE}</p>
    </figure>
  );
}
