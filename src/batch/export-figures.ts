import { researchFooter, orderKeys, orderZoneKeys } from './export-format';
import { drawBarChart, type BarChartSpec, type BarGroup } from './raster/bar-chart';
import { encodeRgbaPng } from './raster/encode-rgba-png';
import { hexColour, type Rgba } from './raster/raster';
import type { ImagePoint, ImageRect } from '../core/types';
import type { ModelSummary, RateSummary, ScoreSummary, SentenceRecord } from './types';

/**
 * Colour-blind-safe qualitative palette of Okabe & Ito (2008), "Color Universal Design (CUD):
 * How to make figures and presentations that are friendly to colorblind people". Black is kept
 * for whiskers and markers, so models take the other seven in this order.
 */
export const OKABE_ITO = {
  black: '#000000',
  orange: '#E69F00',
  skyBlue: '#56B4E9',
  bluishGreen: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  reddishPurple: '#CC79A7',
} as const;

const MODEL_COLOURS: readonly Rgba[] = [
  OKABE_ITO.blue, OKABE_ITO.orange, OKABE_ITO.bluishGreen, OKABE_ITO.reddishPurple, OKABE_ITO.skyBlue, OKABE_ITO.vermillion, OKABE_ITO.yellow,
].map(hexColour);

/** Colour of the i-th model (cycles after seven models). */
export function modelColour(index: number): Rgba {
  return MODEL_COLOURS[((index % MODEL_COLOURS.length) + MODEL_COLOURS.length) % MODEL_COLOURS.length];
}

export interface Figure {
  readonly name: string; // file name, e.g. 'grounding-by-model.png'
  readonly png: Uint8Array;
}

const RATE_TICKS = [0, 0.2, 0.4, 0.6, 0.8, 1];
const WILSON = { label: 'Wilson 95%', colour: hexColour(OKABE_ITO.black), sample: 'primary' as const };
const BOOT = { label: 'Study bootstrap 95%', colour: hexColour(OKABE_ITO.black), sample: 'secondary' as const };
const CHANCE = { label: 'Chance', colour: hexColour(OKABE_ITO.black), sample: 'marker' as const };

function ruleText(models: readonly ModelSummary[]): string {
  const rules = [...new Set(models.map((m) => m.hit_rule))];
  return rules.length === 1 ? `hit rule: ${rules[0]}` : "each model's hit rule";
}

function modelLegend(models: readonly ModelSummary[]) {
  return models.map((m, i) => ({ label: m.id, colour: modelColour(i), sample: 'box' as const }));
}

function rateBar(r: RateSummary | undefined, colour: Rgba) {
  return {
    value: r?.rate,
    colour,
    intervals: r?.wilson95 ? [{ lo: r.wilson95[0], hi: r.wilson95[1], style: 'primary' as const }] : [],
    marker: r?.chance,
  };
}

/** Chart spec (a): overall grounding rate per model with Wilson and study-bootstrap whiskers and chance. */
export function modelRateChart(summary: ScoreSummary): BarChartSpec {
  const groups: BarGroup[] = summary.models.map((m, i) => {
    const g = m.grounding;
    const intervals = [
      ...(g.wilson95 ? [{ lo: g.wilson95[0], hi: g.wilson95[1], style: 'primary' as const }] : []),
      ...(g.bootstrap95 ? [{ lo: g.bootstrap95[0], hi: g.bootstrap95[1], style: 'secondary' as const }] : []),
    ];
    return { label: m.id, bars: [{ value: g.rate, colour: modelColour(i), intervals, marker: g.chance }] };
  });
  return {
    title: `Grounding rate by model (${ruleText(summary.models)})`,
    xLabel: 'Model',
    yLabel: 'Grounding rate',
    yMax: 1,
    yTicks: RATE_TICKS,
    tickDecimals: 1,
    groups,
    legend: [WILSON, BOOT, CHANCE],
    note: researchFooter(summary),
    emptyMessage: 'No models were scored.',
  };
}

function groupedRateChart(
  summary: ScoreSummary,
  title: string,
  xLabel: string,
  pick: (m: ModelSummary) => Readonly<Record<string, RateSummary>>,
  order: (keys: Iterable<string>) => string[],
  empty: string,
): BarChartSpec {
  const keys = order(new Set(summary.models.flatMap((m) => Object.keys(pick(m)))));
  return {
    title,
    xLabel,
    yLabel: 'Hit rate',
    yMax: 1,
    yTicks: RATE_TICKS,
    tickDecimals: 1,
    groups: keys.map((k) => ({ label: k, bars: summary.models.map((m, i) => rateBar(pick(m)[k], modelColour(i))) })),
    legend: [...modelLegend(summary.models), WILSON, CHANCE],
    note: researchFooter(summary),
    emptyMessage: empty,
  };
}

/** Chart spec (b): hit rate by zone, one bar per model, Wilson whiskers and chance markers. */
export function zoneRateChart(summary: ScoreSummary): BarChartSpec {
  return groupedRateChart(summary, `Hit rate by zone (${ruleText(summary.models)})`, 'Zone of the reference boxes', (m) => m.by_zone, orderZoneKeys, 'No scored sentences with zones.');
}

/** Chart spec (c): hit rate against chance by finding, one bar per model. */
export function findingRateChart(summary: ScoreSummary): BarChartSpec {
  return groupedRateChart(summary, `Hit rate vs chance by finding (${ruleText(summary.models)})`, 'Finding', (m) => m.by_finding, orderKeys, 'No scored sentences with findings.');
}

/**
 * Euclidean distance in image pixels from a point to the nearest of the boxes ([x, x + w) x [y, y + h)),
 * 0 when the point lies inside one; undefined when there are no boxes.
 */
export function distanceToNearestBox(point: ImagePoint, boxes: readonly ImageRect[]): number | undefined {
  let best: number | undefined;
  for (const b of boxes) {
    const dx = Math.max(b.x - point.x, 0, point.x - (b.x + b.w));
    const dy = Math.max(b.y - point.y, 0, point.y - (b.y + b.h));
    const d = Math.hypot(dx, dy);
    if (best === undefined || d < best) best = d;
  }
  return best;
}

/** Smallest of 1, 2, 5 times a power of ten that is at least x (x > 0). */
export function niceStep(x: number): number {
  if (!(x > 0) || !Number.isFinite(x)) throw new RangeError(`'x' must be a positive finite number; got ${x}`);
  const p = 10 ** Math.floor(Math.log10(x));
  for (const f of [1, 2, 5, 10]) if (f * p >= x * (1 - 1e-12)) return f * p;
  return 10 * p;
}

export interface DistanceHistogram {
  readonly binWidth: number; // image pixels; bins after the first are (k * w, (k + 1) * w]
  readonly labels: readonly string[]; // 'inside', then '0-w', 'w-2w', ...
  readonly counts: readonly (readonly number[])[]; // [model][bin]
}

/**
 * Histogram of the best cell's distance to the nearest reference box over scored sentences, per
 * model (in summary order): one bin for distance 0 (inside a box), then about eight bins of a
 * 1-2-5 width. Records of models not in the list are ignored.
 */
export function distanceHistogram(modelIds: readonly string[], records: readonly SentenceRecord[]): DistanceHistogram {
  const perModel = modelIds.map(() => [] as number[]);
  const index = new Map(modelIds.map((id, i) => [id, i]));
  for (const r of records) {
    const i = index.get(r.model);
    if (i === undefined || !r.scored || !r.bestPoint) continue;
    const d = distanceToNearestBox(r.bestPoint, r.boxes);
    if (d !== undefined && Number.isFinite(d)) perModel[i].push(d);
  }
  const max = Math.max(0, ...perModel.flat());
  const binWidth = max > 0 ? niceStep(max / 8) : 1;
  const nBins = max > 0 ? Math.ceil(max / binWidth - 1e-9) : 0;
  const fmt = (v: number): string => String(Number(v.toPrecision(6)));
  const labels = ['inside', ...Array.from({ length: nBins }, (_, k) => `${fmt(k * binWidth)}-${fmt((k + 1) * binWidth)}`)];
  const counts = perModel.map((ds) => {
    const c = new Array<number>(labels.length).fill(0);
    for (const d of ds) c[d === 0 ? 0 : Math.min(nBins, Math.max(1, Math.ceil(d / binWidth - 1e-9)))]++;
    return c;
  });
  return { binWidth, labels, counts };
}

/** Chart spec (d): histogram of best-cell distance to the nearest box, bars per model. */
export function distanceChart(summary: ScoreSummary, records: readonly SentenceRecord[]): BarChartSpec {
  const ids = summary.models.map((m) => m.id);
  const h = distanceHistogram(ids, records);
  const total = h.counts.flat().reduce((a, b) => a + b, 0);
  const maxCount = Math.max(1, ...h.counts.flat());
  const step = Math.max(1, niceStep(maxCount / 5));
  const yMax = Math.ceil(maxCount / step) * step;
  return {
    title: 'Distance from best cell to nearest reference box',
    xLabel: 'Distance (image pixels; bins exclude their lower edge)',
    yLabel: 'Scored sentences',
    yMax,
    yTicks: Array.from({ length: Math.round(yMax / step) + 1 }, (_, k) => k * step),
    tickDecimals: 0,
    groups: total === 0 ? [] : h.labels.map((label, b) => ({ label, bars: ids.map((_, i) => ({ value: h.counts[i][b], colour: modelColour(i) })) })),
    legend: modelLegend(summary.models),
    note: researchFooter(summary),
    emptyMessage: 'No scored sentences.',
  };
}

/**
 * The score figures as PNG files, in a fixed order: grounding-by-model.png (a),
 * grounding-by-zone.png (b), grounding-by-finding.png (c), best-cell-distance.png (d). Colours
 * from the Okabe-Ito palette; same inputs give byte-identical files.
 */
export function renderFigures(summary: ScoreSummary, records: readonly SentenceRecord[]): Figure[] {
  const specs: [string, BarChartSpec][] = [
    ['grounding-by-model.png', modelRateChart(summary)],
    ['grounding-by-zone.png', zoneRateChart(summary)],
    ['grounding-by-finding.png', findingRateChart(summary)],
    ['best-cell-distance.png', distanceChart(summary, records)],
  ];
  return specs.map(([name, spec]) => ({
    name,
    png: encodeRgbaPng(drawBarChart(spec), { Software: 'Tessera', Title: spec.title, Description: researchFooter(summary) }),
  }));
}
