import { describe, expect, it } from 'vitest';
import { groundSentence } from '../../core/ground-sentence';
import { gridCellRects } from '../../core/grid-geometry';
import { computeResizeTransform } from '../../core/resize-transform';
import { summariseRate } from '../../core/rate-summary';
import { addBox, selectSentence } from './commands';
import { scoredSentences, summariseStudy } from './study-summary';
import { makeTestStore } from './test-support';

const grid = { h: 2, w: 2 };
const transform = computeResizeTransform({ width: 400, height: 300 }, { width: 4, height: 4 }, 'stretch');
const cells = gridCellRects(transform, grid);
const ground = (values: number[], boxes: { x: number; y: number; w: number; h: number }[]) =>
  groundSentence({ values: Float32Array.from(values), grid, cells, transform, imageSize: { width: 400, height: 300 }, boxes });

describe('study summary', () => {
  it('scoredSentences(state, id) keeps non-negated sentences with boxes', () => {
    const store = makeTestStore();
    addBox(store, { rect: { x: 1, y: 1, w: 9, h: 9 } });
    selectSentence(store, 1);
    addBox(store, { rect: { x: 1, y: 1, w: 9, h: 9 } }); // "No pleural effusion." is negated
    expect(scoredSentences(store.get(), 'study-a')).toEqual([{ index: 0, boxes: [{ x: 1, y: 1, w: 9, h: 9 }] }]);
    expect(scoredSentences(store.get(), 'nope')).toEqual([]);
  });

  it('summariseStudy(results) counts hits and misses and takes rate and chance from summariseRate', () => {
    const topLeft = [{ x: 0, y: 0, w: 200, h: 150 }];
    const results = [
      { index: 0, grounding: ground([9, 0, 0, 0], topLeft) },
      { index: 2, grounding: ground([0, 9, 0, 0], topLeft) },
      { index: 3, grounding: ground([0, 0, 0, 9], [{ x: 200, y: 150, w: 200, h: 150 }]) },
    ];
    const s = summariseStudy(results);
    expect([s.hits, s.misses]).toEqual([2, 1]);
    expect(s.sentences.map((x) => x.hit)).toEqual([true, false, true]);
    expect(s.rate).toEqual(summariseRate(2, 3, results.reduce((a, r) => a + r.grounding.chance.centre, 0)));
    expect(s.rate.chance).toBeCloseTo(0.25, 12);
  });

  it('summariseStudy([]) has no hits and undefined rate; a repeated index throws', () => {
    const s = summariseStudy([], { rule: 'overlap' });
    expect([s.hits, s.misses, s.rate.rate, s.rate.chance]).toEqual([0, 0, undefined, undefined]);
    const g = ground([1, 0, 0, 0], []);
    expect(() => summariseStudy([{ index: 1, grounding: g }, { index: 1, grounding: g }])).toThrow(/index 1 twice/);
  });
});
