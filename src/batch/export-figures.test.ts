import { PNG } from 'pngjs';
import { describe, expect, it } from 'vitest';
import { modelSummary, scoreSummary, sentenceRecord, sentenceRecords } from './export-fixtures.test-util';
import {
  distanceChart, distanceHistogram, distanceToNearestBox, modelColour, modelRateChart, niceStep, OKABE_ITO, renderFigures, zoneRateChart,
} from './export-figures';
import { barChartLayout, CHART_STYLE, valueToRow } from './raster/bar-chart';
import type { Rgba } from './raster/raster';

function decode(png: Uint8Array): PNG {
  return PNG.sync.read(Buffer.from(png));
}

function isColour(img: PNG, x: number, y: number, c: Rgba): boolean {
  const i = (y * img.width + x) * 4;
  return img.data[i] === c[0] && img.data[i + 1] === c[1] && img.data[i + 2] === c[2] && img.data[i + 3] === c[3];
}

/** Top row and height of the run of colour c in column x. */
function columnRun(img: PNG, x: number, c: Rgba): { top: number; height: number } | undefined {
  let top = -1;
  let last = -1;
  for (let y = 0; y < img.height; y++) {
    if (isColour(img, x, y, c)) {
      if (top < 0) top = y;
      last = y;
    }
  }
  return top < 0 ? undefined : { top, height: last - top + 1 };
}

describe('renderFigures', () => {
  it('renderFigures(summary, records) gives the four named PNGs that decode in pngjs', () => {
    const figs = renderFigures(scoreSummary(), sentenceRecords());
    expect(figs.map((f) => f.name)).toEqual(['grounding-by-model.png', 'grounding-by-zone.png', 'grounding-by-finding.png', 'best-cell-distance.png']);
    for (const f of figs) {
      const img = decode(f.png);
      expect(img.width).toBeGreaterThan(200);
      expect(img.height).toBeGreaterThan(300);
    }
  });

  it('renderFigures is deterministic: the same inputs give byte-identical PNGs', () => {
    const a = renderFigures(scoreSummary(), sentenceRecords());
    const b = renderFigures(scoreSummary(), sentenceRecords());
    a.forEach((f, i) => expect(Buffer.from(f.png).equals(Buffer.from(b[i].png))).toBe(true));
  });

  it("the model figure's bar heights in pixels match the grounding rates", () => {
    const summary = scoreSummary({ models: [modelSummary('a', 7), modelSummary('b', 4), modelSummary('c', 0)] });
    const spec = modelRateChart(summary);
    const layout = barChartLayout(spec);
    const img = decode(renderFigures(summary, [])[0].png);
    expect([img.width, img.height]).toEqual([layout.width, layout.height]);
    const bottom = layout.plot.top + layout.plot.height;
    summary.models.forEach((m, i) => {
      const rect = layout.bars[i];
      const run = columnRun(img, rect.x + 2, modelColour(i));
      const expected = Math.round(m.grounding.rate! * CHART_STYLE.plotHeight);
      if (expected === 0) {
        expect(run).toBeUndefined();
        return;
      }
      expect(run).toBeDefined();
      expect(run!.height).toBe(expected);
      expect(run!.top + run!.height).toBe(bottom);
      expect(run!.top).toBe(valueToRow(layout, 1, m.grounding.rate!));
    });
  });

  it('the zone figure draws a bar of each model colour in every zone group, and nothing in that colour outside bars and legend', () => {
    const summary = scoreSummary();
    const spec = zoneRateChart(summary);
    const layout = barChartLayout(spec);
    const img = decode(renderFigures(summary, [])[1].png);
    for (const rect of layout.bars) {
      const bar = spec.groups[rect.group].bars[rect.bar];
      const run = columnRun(img, rect.x + 1, bar.colour);
      expect(run?.height).toBe(Math.round(bar.value! * CHART_STYLE.plotHeight));
    }
    // Between the last bar and the right edge of the plot there is no bar colour.
    const last = layout.bars[layout.bars.length - 1];
    for (let x = last.x + last.width + 1; x < layout.plot.left + layout.plot.width; x++) {
      expect(columnRun(img, x, modelColour(0))).toBeUndefined();
    }
  });

  it('renderFigures of a summary without models or records still draws decodable figures', () => {
    const figs = renderFigures(scoreSummary({ models: [], comparisons: [] }), []);
    expect(figs.length).toBe(4);
    for (const f of figs) expect(decode(f.png).width).toBeGreaterThan(0);
  });

  it('renderFigures survives NaN and out-of-range rates, missing intervals, long non-ASCII ids and many models', () => {
    const odd = modelSummary('m\u00e9dele-with-a-very-long-identifier-from-a-folder-path', 5);
    const models = [
      { ...odd, grounding: { ...odd.grounding, rate: NaN, wilson95: undefined, bootstrap95: [NaN, 2] as [number, number], chance: 1e300 } },
      ...Array.from({ length: 8 }, (_, i) => modelSummary(`model-${i}`, i)),
    ];
    const figs = renderFigures(scoreSummary({ models }), sentenceRecords());
    const img = decode(figs[0].png);
    const layout = barChartLayout(modelRateChart(scoreSummary({ models })));
    expect([img.width, img.height]).toEqual([layout.width, layout.height]);
    expect(layout.bars.length).toBe(9);
  });

  it('renderFigures stores plain-text metadata in the PNG', () => {
    const text = Buffer.from(renderFigures(scoreSummary(), [])[0].png).toString('latin1');
    expect(text).toContain('tEXtSoftware\u0000Tessera');
    expect(text).toContain('not a medical device');
  });

  it('modelColour follows the Okabe-Ito palette, blue first, and cycles', () => {
    expect(modelColour(0)).toEqual([0x00, 0x72, 0xb2, 255]);
    expect(modelColour(1)).toEqual([0xe6, 0x9f, 0x00, 255]);
    expect(modelColour(7)).toEqual(modelColour(0));
    expect(Object.keys(OKABE_ITO).length).toBe(8);
  });
});

describe('best-cell distance', () => {
  it('distanceToNearestBox is 0 inside, axis distance beside, Euclidean off a corner, undefined with no boxes', () => {
    const box = { x: 10, y: 20, w: 30, h: 40 };
    expect(distanceToNearestBox({ x: 15, y: 25 }, [box])).toBe(0);
    expect(distanceToNearestBox({ x: 45, y: 30 }, [box])).toBe(5);
    expect(distanceToNearestBox({ x: 7, y: 16 }, [box])).toBe(5);
    expect(distanceToNearestBox({ x: 0, y: 0 }, [box, { x: 0, y: 3, w: 1, h: 1 }])).toBe(3);
    expect(distanceToNearestBox({ x: 0, y: 0 }, [])).toBeUndefined();
  });

  it('distanceHistogram counts every scored sentence once, with distance 0 in the first bin', () => {
    const records = [
      sentenceRecord({ bestPoint: { x: 15, y: 25 } }),
      sentenceRecord({ bestPoint: { x: 0, y: 0 } }), // 22.36 px
      sentenceRecord({ bestPoint: { x: 45, y: 30 } }), // 5 px
      sentenceRecord({ bestPoint: { x: 45, y: 30 }, scored: false }),
      sentenceRecord({ model: 'other', bestPoint: { x: 45, y: 30 } }),
    ];
    const h = distanceHistogram(['demo-a'], records);
    expect(h.binWidth).toBe(5);
    expect(h.labels[0]).toBe('inside');
    expect(h.labels[1]).toBe('0-5');
    expect(h.counts[0].reduce((a, b) => a + b, 0)).toBe(3);
    expect(h.counts[0][0]).toBe(1);
    expect(h.counts[0][1]).toBe(1); // 5 lies in (0, 5]
    expect(h.counts[0][5]).toBe(1); // 22.36 lies in (20, 25]
  });

  it('distanceHistogram with no scored sentences has the inside bin only, and the chart shows none', () => {
    const h = distanceHistogram(['a'], []);
    expect(h.labels).toEqual(['inside']);
    expect(h.counts).toEqual([[0]]);
    expect(distanceChart(scoreSummary(), []).groups).toEqual([]);
  });

  it('niceStep rounds up to 1, 2 or 5 times a power of ten', () => {
    expect(niceStep(0.3)).toBe(0.5);
    expect(niceStep(1)).toBe(1);
    expect(niceStep(2.7)).toBe(5);
    expect(niceStep(7)).toBe(10);
    expect(niceStep(120)).toBe(200);
    expect(() => niceStep(0)).toThrow(/'x'/);
  });
});
