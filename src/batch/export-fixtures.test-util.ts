import type { ModelSummary, RateSummary, ScoreSummary, SentenceRecord, SimilarityDump } from './types';

/** Hand-built inputs for the exporter tests (synthetic; not produced by the pipeline). */

export function rate(n: number, hits: number, chance: number | undefined, wilson95?: [number, number]): RateSummary {
  const r = n === 0 ? undefined : hits / n;
  const lift = r === undefined || chance === undefined || !(chance > 0) ? undefined : r / chance;
  return { n, hits, rate: r, wilson95: n === 0 ? undefined : wilson95 ?? [Math.max(0, hits / n - 0.2), Math.min(1, hits / n + 0.2)], chance, lift };
}

const retrieval = {
  image_to_report_r1: 0.25,
  image_to_report_r5: 0.75,
  image_to_report_r10: 1,
  report_to_image_r1: 0.5,
  report_to_image_r5: 1,
  report_to_image_r10: 1,
  image_to_report_median_rank: 2,
  report_to_image_median_rank: 1.5,
};

export function modelSummary(id: string, hits: number, overrides: Partial<ModelSummary> = {}): ModelSummary {
  const n = 10;
  return {
    id,
    aggregator: 'max',
    hit_rule: 'centre',
    grounding: { ...rate(n, hits, 0.125, [0.3, 0.85]), bootstrap95: [0.35, 0.8], lift: hits / n / 0.125 },
    by_zone: {
      'left-lower': rate(4, 3, 0.1),
      'right-upper': rate(6, hits - 3, 0.15),
      cardiac: rate(2, 1, 0.3),
    },
    by_finding: { nodule: rate(5, 2, 0.05), 'effusion_50%': rate(5, hits - 2, 0.2), '(unlabelled)': rate(0, 0, undefined) },
    by_rule: { centre: rate(n, hits, 0.125), overlap: rate(n, Math.min(n, hits + 1), 0.2), upsampled: rate(n, hits, 0.11) },
    top_k_rate: 0.9,
    mean_mass_in_boxes: 0.123456789,
    mean_cnr: undefined,
    negated: { n: 3 },
    laterality_swap_rate: 0.5,
    retrieval: { ...retrieval, global: { ...retrieval, image_to_report_r1: 0.125 } },
    ...overrides,
  };
}

export function scoreSummary(overrides: Partial<ScoreSummary> = {}): ScoreSummary {
  return {
    schema: 'tessera.summary/1',
    set: 'phantom & co',
    n_studies: 4,
    seed: 7,
    models: [modelSummary('demo-a', 7), modelSummary('demo_b', 4, { aggregator: 'softmax:0.1' })],
    comparisons: [
      { a: 'demo-a', b: 'demo_b', n_pairs: 10, diff: 0.3, bootstrap95: [0.0, 0.6], mcnemar_p: 0.0001234567, b_only_a: 4, c_only_b: 1 },
    ],
    skipped: [{ study: 's9', reason: 'image "s9.png" unreadable, see log' }],
    synthetic_set: true,
    ...overrides,
  };
}

export function sentenceRecord(overrides: Partial<SentenceRecord> = {}): SentenceRecord {
  return {
    model: 'demo-a',
    study: 'study-001',
    sentenceIndex: 0,
    text: 'Small nodule in the right upper zone.',
    negated: false,
    uncertain: false,
    finding: 'nodule',
    zones: ['right-upper'],
    boxes: [{ x: 10, y: 20, w: 30, h: 40 }],
    scored: true,
    score: 0.4123456789,
    bestCell: { row: 1, col: 2 },
    bestPoint: { x: 25, y: 30 },
    hits: { centre: true, overlap: true, upsampled: false },
    chance: { centre: 0.125, overlap: 0.2, upsampled: 0.11 },
    topKHit: true,
    massInBoxes: 0.3,
    cnr: 1.5,
    lateralitySwap: false,
    ...overrides,
  };
}

export function sentenceRecords(): SentenceRecord[] {
  return [
    sentenceRecord(),
    sentenceRecord({
      sentenceIndex: 1,
      text: 'He said "no change", really,\nsince last film.',
      zones: ['left-lower', 'left-middle'],
      boxes: [{ x: 100, y: 100, w: 20, h: 20 }, { x: 130, y: 100, w: 10, h: 10 }],
      bestPoint: { x: 60, y: 100 },
      hits: { centre: false, overlap: false, upsampled: false },
      cnr: undefined,
      lateralitySwap: true,
      finding: '',
    }),
    sentenceRecord({ sentenceIndex: 2, text: 'No effusion.', negated: true, scored: false, zones: [], boxes: [], cnr: NaN }),
    sentenceRecord({ model: 'demo_b', bestPoint: { x: 0, y: 0 }, hits: { centre: false, overlap: true, upsampled: true } }),
  ];
}

export function similarityDump(overrides: Partial<SimilarityDump> = {}): SimilarityDump {
  return {
    model: 'demo-a',
    study: 'study-001',
    sentence: 0,
    negated: false,
    grid: { h: 2, w: 2 },
    values: [0.1234567891, -0.5, 1 / 3, -0.0000001],
    cells: [[0, 0, 12.5, 12.5], [12.5, 0, 12.5, 12.5], [0, 12.5, 12.5, 12.5], [12.5, 12.5, 12.5, 12.5]],
    boxes: [[1, 2, 3, 4]],
    ...overrides,
  };
}
