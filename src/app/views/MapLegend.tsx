import { cividisHex } from '../draw';

export interface MapLegendProps {
  /** Lowest and highest cosine of the map shown. */
  readonly domain: readonly [number, number] | undefined;
}

const STOPS = Array.from({ length: 11 }, (_, i) => i / 10);

/** The map's colour scale with its cosine range; the scale is named in the tooltip and the caption. */
export function MapLegend({ domain }: MapLegendProps) {
  if (!domain) return null;
  const gradient = `linear-gradient(to right, ${STOPS.map((t) => `${cividisHex(t)} ${t * 100}%`).join(', ')})`;
  return (
    <figure
      className="t-legend"
      title="Cosine similarity of the selected sentence with each cell. Colour scale: cividis (Nuñez, Anderton & Renslow 2018), readable with common colour-vision deficiencies. Scaled from this map's lowest to highest value."
    >
      <figcaption>Similarity (cosine), cividis scale</figcaption>
      <div className="t-legend__bar" style={{ background: gradient }} aria-hidden="true" />
      <div className="t-legend__ticks">
        <span>{domain[0].toFixed(3)}</span>
        <span>{((domain[0] + domain[1]) / 2).toFixed(3)}</span>
        <span>{domain[1].toFixed(3)}</span>
      </div>
    </figure>
  );
}
