import { csvFlag, csvLine, csvNumber } from './export-format';
import type { SentenceRecord } from './types';

/** Column names of sentences.csv, in order (stable: scripts depend on them). */
export const SENTENCES_CSV_COLUMNS = [
  'model', 'study', 'sentence_index', 'sentence_text', 'negated', 'uncertain', 'finding', 'zones', 'n_boxes',
  'scored', 'score', 'best_row', 'best_col', 'best_x', 'best_y', 'hit_centre', 'hit_overlap', 'hit_upsampled',
  'chance_centre', 'chance_overlap', 'chance_upsampled', 'top_k_hit', 'mass_in_boxes', 'cnr', 'laterality_swap',
] as const;

function row(r: SentenceRecord): string[] {
  return [
    r.model,
    r.study,
    String(r.sentenceIndex),
    r.text,
    csvFlag(r.negated),
    csvFlag(r.uncertain),
    r.finding,
    r.zones.join(';'),
    String(r.boxes.length),
    csvFlag(r.scored),
    csvNumber(r.score),
    csvNumber(r.bestCell?.row),
    csvNumber(r.bestCell?.col),
    csvNumber(r.bestPoint?.x),
    csvNumber(r.bestPoint?.y),
    csvFlag(r.hits?.centre),
    csvFlag(r.hits?.overlap),
    csvFlag(r.hits?.upsampled),
    csvNumber(r.chance?.centre),
    csvNumber(r.chance?.overlap),
    csvNumber(r.chance?.upsampled),
    csvFlag(r.topKHit),
    csvNumber(r.massInBoxes),
    csvNumber(r.cnr),
    csvFlag(r.lateralitySwap),
  ];
}

/**
 * sentences.csv text: a header and one RFC 4180 record per model x study x sentence, in the order
 * given (the pipeline's order). Zones are ';'-joined, flags 1/0, numbers to 6 significant digits,
 * undefined or non-finite values empty; records end with CRLF. An empty list gives the header alone.
 */
export function sentencesCsv(records: readonly SentenceRecord[]): string {
  return csvLine(SENTENCES_CSV_COLUMNS) + records.map((r) => csvLine(row(r))).join('');
}
