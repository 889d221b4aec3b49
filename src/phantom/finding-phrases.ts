import type { Rng } from '../core/seeded-random';
import type { Side } from './chest-geometry';
import type { ReportFinding } from './compose-report';

/** A sentence from a template, and whether its wording hedges. */
export interface Built {
  text: string;
  uncertain: boolean;
}

const pick = <T>(rng: Rng, items: readonly T[]): T => items[rng.int(items.length)];
/** Size words by severity 1..3. */
export const SIZE_WORDS: readonly (readonly string[])[] = [[], ['small', 'minor'], ['moderate', 'moderate-sized'], ['large', 'sizeable']];

/** Phrasings of one finding (our own templates). */
export function consolidationText(rng: Rng, loc: string, hedge: boolean, plural: boolean): Built {
  if (hedge) {
    return pick(rng, [
      { text: `Possible early consolidation in ${loc}.`, uncertain: true },
      { text: `Ill-defined opacity in ${loc}, possibly infective.`, uncertain: true },
      { text: `Hazy shadowing in ${loc} may represent consolidation.`, uncertain: true },
    ]);
  }
  if (plural) {
    return pick(rng, [
      { text: `There are patchy airspace opacities in ${loc}.`, uncertain: false },
      { text: `Areas of consolidation are seen in ${loc}.`, uncertain: false },
    ]);
  }
  return pick(rng, [
    { text: `There is a focal opacity in ${loc}.`, uncertain: false },
    { text: `Patchy consolidation is seen in ${loc}.`, uncertain: false },
    { text: `Airspace opacity in ${loc}, in keeping with consolidation.`, uncertain: false },
    { text: `An area of consolidation with air bronchograms occupies ${loc}.`, uncertain: false },
    { text: `Focal airspace shadowing is present in ${loc}.`, uncertain: false },
  ]);
}

/** Phrasings of one finding (our own templates). */
export function noduleText(rng: Rng, loc: string, hedge: boolean, plural: boolean, mm: number): Built {
  if (hedge) {
    return pick(rng, [
      { text: `Possible small nodule in ${loc}.`, uncertain: true },
      { text: `A faint rounded density in ${loc} may be a nodule.`, uncertain: true },
    ]);
  }
  if (plural) return { text: `Rounded nodules are seen in ${loc}.`, uncertain: false };
  return pick(rng, [
    { text: `A ${mm} mm nodule is noted in ${loc}.`, uncertain: false },
    { text: `There is a small rounded nodular opacity in ${loc}.`, uncertain: false },
    { text: `A well-defined nodule projects over ${loc}.`, uncertain: false },
    { text: `Solitary pulmonary nodule in ${loc}, measuring about ${mm} mm.`, uncertain: false },
  ]);
}

/** Phrasings of one finding (our own templates). */
export function effusionText(rng: Rng, f: ReportFinding, loc: { zones: readonly unknown[]; phrase: string }, hedge: boolean): Built {
  const size = pick(rng, SIZE_WORDS[Math.min(3, Math.max(1, f.severity))]);
  const side = f.side as Side;
  if (hedge) {
    return pick(rng, [
      { text: `Possible small effusion at the ${side} base.`, uncertain: true },
      { text: `Slight blunting of the ${side} costophrenic angle, possibly a trace of fluid.`, uncertain: true },
    ]);
  }
  if (loc.zones.length === 2) {
    return pick(rng, [
      { text: `A ${size} pleural effusion occupies ${loc.phrase}.`, uncertain: false },
      { text: `There is a ${size} pleural effusion in ${loc.phrase}, with a meniscus laterally.`, uncertain: false },
    ]);
  }
  return pick(rng, [
    { text: `There is a ${size} pleural effusion at the ${side} base.`, uncertain: false },
    { text: `The ${side} costophrenic angle is blunted by a ${size} effusion.`, uncertain: false },
    { text: `A ${size} pleural effusion is seen in the ${side} lower zone, with a meniscus.`, uncertain: false },
    { text: `Fluid fills the ${side} costophrenic angle, in keeping with a ${size} effusion.`, uncertain: false },
  ]);
}

/** Phrasings of one finding (our own templates). */
export function pneumothoraxText(rng: Rng, f: ReportFinding, loc: { phrase: string }, hedge: boolean): Built {
  const size = pick(rng, SIZE_WORDS[Math.min(3, Math.max(1, f.severity))]);
  if (hedge) return { text: f.variant === 'apical' ? `Possible small ${f.side} apical pneumothorax.` : `Possible small pneumothorax in ${loc.phrase}.`, uncertain: true };
  if (f.variant === 'apical') {
    return pick(rng, [
      { text: `There is a ${size} ${f.side} apical pneumothorax.`, uncertain: false },
      { text: `A ${size} ${f.side} apical pneumothorax is present, with a visible pleural edge.`, uncertain: false },
      { text: `A pleural line is seen at the ${f.side} apex with no lung markings above it, in keeping with pneumothorax.`, uncertain: false },
    ]);
  }
  return pick(rng, [
    { text: `There is a ${size} pneumothorax in ${loc.phrase}.`, uncertain: false },
    { text: `A pleural line with absent lung markings beyond it is seen laterally in ${loc.phrase}, in keeping with pneumothorax.`, uncertain: false },
    { text: `A ${size} pneumothorax is present along the lateral chest wall in ${loc.phrase}.`, uncertain: false },
  ]);
}

/** Phrasings of one finding (our own templates). */
export function atelectasisText(rng: Rng, loc: string, hedge: boolean): Built {
  if (hedge) return { text: `A linear opacity in ${loc} probably represents atelectasis.`, uncertain: true };
  return pick(rng, [
    { text: `Linear band of atelectasis in ${loc}.`, uncertain: false },
    { text: `Plate-like atelectasis is seen in ${loc}.`, uncertain: false },
    { text: `There is subsegmental atelectasis in ${loc}.`, uncertain: false },
    { text: `A horizontal band of discoid atelectasis crosses ${loc}.`, uncertain: false },
  ]);
}

/** Phrasings of one finding (our own templates). */
export function edemaText(rng: Rng, grade: number, oedema: string): Built {
  if (grade === 1) {
    return pick(rng, [
      { text: `Mild vascular congestion in both perihilar regions.`, uncertain: false },
      { text: `Prominent vessels in both perihilar regions, in keeping with mild vascular congestion.`, uncertain: false },
    ]);
  }
  if (grade === 2) {
    return pick(rng, [
      { text: `Bilateral perihilar interstitial markings, consistent with interstitial ${oedema}.`, uncertain: false },
      { text: `Interstitial ${oedema} with reticular shadowing in both perihilar regions.`, uncertain: false },
    ]);
  }
  return pick(rng, [
    { text: `Bilateral perihilar airspace opacities in a bat-wing distribution, in keeping with alveolar ${oedema}.`, uncertain: false },
    { text: `Confluent shadowing in both perihilar regions, consistent with alveolar pulmonary ${oedema}.`, uncertain: false },
  ]);
}

/** Negated statements for absent findings; OEDEMA stands for the report's spelling. */
export const NEGATIONS: Readonly<Record<string, readonly string[]>> = {
  pneumothorax: ['No pneumothorax.', 'There is no pneumothorax.', 'No evidence of pneumothorax.', 'A pneumothorax is not seen.'],
  effusion: ['No pleural effusion.', 'There is no pleural effusion.', 'No effusion is seen.', 'No pleural fluid.'],
  consolidation: ['No focal consolidation.', 'There is no consolidation.', 'No airspace opacity is seen.'],
  nodule: ['No pulmonary nodule is identified.', 'No nodules or masses.'],
  edema: ['No pulmonary OEDEMA.', 'There is no OEDEMA.', 'No features of pulmonary OEDEMA.'],
};

