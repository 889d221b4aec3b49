import { createRaster, drawLine, drawText, fillRect, hexColour, lineAdvance, textHeight, textWidth, type Raster, type Rgba } from './raster';

/**
 * A grouped bar chart drawn on the raster: bars with optional interval whiskers and a chance
 * marker each, a labelled y axis with grid lines, category labels, a legend, a title and a note.
 * Layout is a pure function of the spec, so tests can check pixels against it.
 */

export type IntervalStyle = 'primary' | 'secondary';

export interface BarSpec {
  readonly value: number | undefined; // undefined draws 'n/a' at the baseline
  readonly colour: Rgba;
  readonly intervals?: readonly { readonly lo: number; readonly hi: number; readonly style: IntervalStyle }[];
  readonly marker?: number; // e.g. the chance level, drawn as a dashed line across the bar
}

export interface BarGroup {
  readonly label: string;
  readonly bars: readonly BarSpec[];
}

export type LegendSample = 'box' | 'primary' | 'secondary' | 'marker';

export interface BarChartSpec {
  readonly title: string;
  readonly xLabel: string;
  readonly yLabel: string;
  readonly yMax: number;
  readonly yTicks: readonly number[];
  readonly tickDecimals: number;
  readonly groups: readonly BarGroup[];
  readonly legend: readonly { readonly label: string; readonly colour: Rgba; readonly sample: LegendSample }[];
  readonly note: string;
  readonly emptyMessage?: string; // drawn in the plot when there are no groups
}

export const CHART_STYLE = {
  textScale: 2,
  margin: 16,
  plotHeight: 300,
  barWidth: 28,
  barGap: 6,
  groupPadding: 24,
  maxLabelChars: 24,
  background: hexColour('#ffffff'),
  ink: hexColour('#000000'),
  grid: hexColour('#e0e0e0'),
  secondary: hexColour('#6e6e6e'),
} as const;

export interface BarRect {
  readonly group: number;
  readonly bar: number;
  readonly x: number; // left edge, pixels
  readonly width: number;
}

export interface BarChartLayout {
  readonly width: number;
  readonly height: number;
  readonly plot: { readonly left: number; readonly top: number; readonly width: number; readonly height: number };
  readonly bars: readonly BarRect[];
  readonly groupCentres: readonly number[];
  readonly legendRows: readonly (readonly { readonly x: number; readonly index: number }[])[];
  readonly legendTop: number;
}

function clipLabel(label: string): string {
  const max = CHART_STYLE.maxLabelChars;
  return [...label].length <= max ? label : [...label].slice(0, max - 2).join('') + '..';
}

function tickLabel(v: number, decimals: number): string {
  return v.toFixed(decimals);
}

const SAMPLE_WIDTH = 24;

/** Pixel geometry of a chart: overall size, plot rectangle, each bar's x span, legend placement. */
export function barChartLayout(spec: BarChartSpec): BarChartLayout {
  if (!(spec.yMax > 0) || !Number.isFinite(spec.yMax)) throw new RangeError(`'spec.yMax' must be a positive finite number; got ${spec.yMax}`);
  const s = CHART_STYLE.textScale;
  const m = CHART_STYLE.margin;
  const th = textHeight(s);
  const tickWidth = Math.max(0, ...spec.yTicks.map((t) => textWidth(tickLabel(t, spec.tickDecimals), s)));
  const left = m + th + m + tickWidth + 10;
  const groupWidths = spec.groups.map((g) => {
    const bars = g.bars.length * CHART_STYLE.barWidth + Math.max(0, g.bars.length - 1) * CHART_STYLE.barGap;
    return Math.max(bars + CHART_STYLE.groupPadding, textWidth(clipLabel(g.label), s) + 12);
  });
  const plotWidth = Math.max(240, groupWidths.reduce((a, b) => a + b, 0));
  const width = Math.max(
    left + plotWidth + m,
    left + textWidth(spec.xLabel, s) + m,
    left + textWidth(spec.emptyMessage ?? '', s) + m,
    textWidth(spec.title, s) + 2 * m,
    textWidth(spec.note, s) + 2 * m,
  );

  // Legend rows wrap at the figure width.
  const legendRows: { x: number; index: number }[][] = [];
  let row: { x: number; index: number }[] = [];
  let x = m;
  spec.legend.forEach((item, index) => {
    const w = SAMPLE_WIDTH + 6 + textWidth(item.label, s);
    if (row.length > 0 && x + w > width - m) {
      legendRows.push(row);
      row = [];
      x = m;
    }
    row.push({ x, index });
    x += w + 20;
  });
  if (row.length > 0) legendRows.push(row);

  const legendTop = m + th + 12;
  const top = legendTop + legendRows.length * (lineAdvance(s) + 6) + 16;
  const plotHeight = CHART_STYLE.plotHeight;
  const height = top + plotHeight + 8 + th + 12 + th + 16 + th + m;

  const bars: BarRect[] = [];
  const groupCentres: number[] = [];
  let gx = left + Math.floor((plotWidth - groupWidths.reduce((a, b) => a + b, 0)) / 2);
  spec.groups.forEach((g, group) => {
    const gw = groupWidths[group];
    const barsWidth = g.bars.length * CHART_STYLE.barWidth + Math.max(0, g.bars.length - 1) * CHART_STYLE.barGap;
    const start = gx + Math.floor((gw - barsWidth) / 2);
    g.bars.forEach((_b, bar) => bars.push({ group, bar, x: start + bar * (CHART_STYLE.barWidth + CHART_STYLE.barGap), width: CHART_STYLE.barWidth }));
    groupCentres.push(gx + Math.floor(gw / 2));
    gx += gw;
  });
  return { width, height, plot: { left, top, width: plotWidth, height: plotHeight }, bars, groupCentres, legendRows, legendTop };
}

/** Pixel row of value v on the layout's y axis (the baseline for 0), clamped to the plot. */
export function valueToRow(layout: BarChartLayout, yMax: number, v: number): number {
  const clamped = Math.min(Math.max(v, 0), yMax);
  return layout.plot.top + layout.plot.height - Math.round((clamped / yMax) * layout.plot.height);
}

function drawWhisker(r: Raster, x: number, top: number, bottom: number, style: IntervalStyle): void {
  const colour = style === 'primary' ? CHART_STYLE.ink : CHART_STYLE.secondary;
  drawLine(r, x, top, x, bottom, colour, { thickness: 2 });
  drawLine(r, x - 4, top, x + 4, top, colour, { thickness: 2 });
  drawLine(r, x - 4, bottom, x + 4, bottom, colour, { thickness: 2 });
}

function drawSample(r: Raster, x: number, y: number, colour: Rgba, sample: LegendSample, size: number): void {
  const mid = y + Math.floor(size / 2);
  if (sample === 'box') fillRect(r, x, y, SAMPLE_WIDTH, size, colour);
  else if (sample === 'marker') drawLine(r, x, mid, x + SAMPLE_WIDTH, mid, colour, { thickness: 2, dash: [4, 3] });
  else {
    const c = sample === 'primary' ? CHART_STYLE.ink : CHART_STYLE.secondary;
    drawLine(r, x + 12, y, x + 12, y + size, c, { thickness: 2 });
    drawLine(r, x + 8, y, x + 16, y, c, { thickness: 2 });
    drawLine(r, x + 8, y + size, x + 16, y + size, c, { thickness: 2 });
  }
}

/** Draws the chart described by `spec` onto a new raster sized by barChartLayout(spec). */
export function drawBarChart(spec: BarChartSpec): Raster {
  const layout = barChartLayout(spec);
  const s = CHART_STYLE.textScale;
  const m = CHART_STYLE.margin;
  const th = textHeight(s);
  const { plot } = layout;
  const bottom = plot.top + plot.height;
  const r = createRaster(layout.width, layout.height, CHART_STYLE.background);

  drawText(r, spec.title, m, m, CHART_STYLE.ink, { scale: s });
  layout.legendRows.forEach((row, i) => {
    const y = layout.legendTop + i * (lineAdvance(s) + 6);
    for (const { x, index } of row) {
      const item = spec.legend[index];
      drawSample(r, x, y, item.colour, item.sample, th);
      drawText(r, item.label, x + SAMPLE_WIDTH + 6, y, CHART_STYLE.ink, { scale: s });
    }
  });

  for (const t of spec.yTicks) {
    const y = valueToRow(layout, spec.yMax, t);
    if (t > 0) drawLine(r, plot.left + 1, y, plot.left + plot.width - 1, y, CHART_STYLE.grid);
    drawLine(r, plot.left - 6, y, plot.left - 1, y, CHART_STYLE.ink);
    const label = tickLabel(t, spec.tickDecimals);
    drawText(r, label, plot.left - 10 - textWidth(label, s), y - Math.floor(th / 2), CHART_STYLE.ink, { scale: s });
  }
  const yLabelWidth = textWidth(spec.yLabel, s);
  drawText(r, spec.yLabel, m, plot.top + Math.max(0, Math.floor((plot.height - yLabelWidth) / 2)), CHART_STYLE.ink, { scale: s, rotate: 90 });

  for (const rect of layout.bars) {
    const bar = spec.groups[rect.group].bars[rect.bar];
    if (bar.value === undefined || !Number.isFinite(bar.value)) {
      drawText(r, 'n/a', rect.x + Math.floor((rect.width - textWidth('n/a', 1)) / 2), bottom - 10, CHART_STYLE.secondary, { scale: 1 });
      continue;
    }
    const y = valueToRow(layout, spec.yMax, bar.value);
    fillRect(r, rect.x, y, rect.width, bottom - y, bar.colour);
  }
  for (const rect of layout.bars) {
    const bar = spec.groups[rect.group].bars[rect.bar];
    const centre = rect.x + Math.floor(rect.width / 2);
    const intervals = bar.intervals ?? [];
    intervals.forEach((iv, k) => {
      if (!Number.isFinite(iv.lo) || !Number.isFinite(iv.hi)) return;
      // Two whiskers sit side by side so both stay readable.
      const offset = intervals.length === 1 ? 0 : k === 0 ? -6 : 6;
      drawWhisker(r, centre + offset, valueToRow(layout, spec.yMax, iv.hi), valueToRow(layout, spec.yMax, iv.lo), iv.style);
    });
    if (bar.marker !== undefined && Number.isFinite(bar.marker)) {
      const y = valueToRow(layout, spec.yMax, bar.marker);
      drawLine(r, rect.x - 4, y, rect.x + rect.width + 3, y, CHART_STYLE.ink, { thickness: 2, dash: [4, 3] });
    }
  }

  drawLine(r, plot.left, plot.top, plot.left, bottom, CHART_STYLE.ink);
  drawLine(r, plot.left, bottom, plot.left + plot.width, bottom, CHART_STYLE.ink);
  spec.groups.forEach((g, i) => {
    const label = clipLabel(g.label);
    drawText(r, label, layout.groupCentres[i] - Math.floor(textWidth(label, s) / 2), bottom + 8, CHART_STYLE.ink, { scale: s });
  });
  if (spec.groups.length === 0 && spec.emptyMessage) {
    const w = textWidth(spec.emptyMessage, s);
    drawText(r, spec.emptyMessage, plot.left + Math.floor((plot.width - w) / 2), plot.top + Math.floor(plot.height / 2), CHART_STYLE.secondary, { scale: s });
  }
  const xLabelY = bottom + 8 + th + 12;
  drawText(r, spec.xLabel, plot.left + Math.floor((plot.width - textWidth(spec.xLabel, s)) / 2), xLabelY, CHART_STYLE.ink, { scale: s });
  drawText(r, spec.note, m, xLabelY + th + 16, CHART_STYLE.secondary, { scale: s });
  return r;
}
