import type { ZoneLabel } from '../core/types';
import type { StudyRecord } from '../dataset/types';
import type { ParsedSentence } from '../report/types';

// Words that name each finding of the study labels; a sentence names a finding when one appears.
const FINDING_WORDS: Readonly<Record<string, readonly string[]>> = {
  consolidation: ['consolidat', 'opacit', 'airspace', 'infiltrat'],
  nodule: ['nodul', 'mass', 'lesion'],
  effusion: ['effusion', 'fluid', 'meniscus', 'blunt'],
  pneumothorax: ['pneumothora', 'pleural line', 'air in the pleural'],
  atelectasis: ['atelecta', 'collapse', 'band'],
  cardiomegaly: ['cardiomegaly', 'cardiac silhouette', 'heart size', 'heart is enlarged', 'enlarged heart', 'cardiothoracic'],
  edema: ['edema', 'oedema', 'vascular congestion', 'interstitial', 'alveolar', 'kerley', 'perihilar haze'],
};

/**
 * The labelled finding a sentence speaks of: the set's own per-sentence label
 * (labels.sentences[].{index, finding}) when present; else, among the study's labelled findings, the one whose
 * words appear in the sentence, preferring one whose zones meet the sentence's box zones.
 * Returns '' when the study has no labels or none is named.
 */
export function findingOfSentence(sentence: ParsedSentence, study: StudyRecord, boxZones: readonly ZoneLabel[]): string {
  // A set may label each sentence's finding directly (the phantom generator does); that wins.
  const perSentence = study.labels?.sentences;
  if (Array.isArray(perSentence)) {
    const own = perSentence.find((x): x is { index: number; finding: string } => typeof x === 'object' && x !== null && (x as { index?: unknown }).index === sentence.index && typeof (x as { finding?: unknown }).finding === 'string');
    if (own) return own.finding;
  }
  const labels = study.labels?.findings ?? [];
  const text = sentence.text.toLowerCase();
  const named = labels.filter((l) => (FINDING_WORDS[l.finding] ?? [l.finding.toLowerCase()]).some((w) => text.includes(w)));
  if (named.length === 0) return '';
  const placed = named.find((l) => l.zones.some((z) => boxZones.includes(z)));
  return (placed ?? named[0]).finding;
}
