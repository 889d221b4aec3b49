/**
 * Trigger vocabulary for NegEx-style negation and uncertainty detection. Trigger categories follow
 * NegEx (Chapman et al., "A simple algorithm for identifying negated findings and diseases in
 * discharge summaries", J Biomed Inform 2001;34:301-10): pre-negation, post-negation, pseudo-negation
 * and scope-terminating terms; the "possible" (uncertainty) category follows the same work. The
 * phrases are our own selection for chest radiograph reports. Words are regex sources.
 */

export type TriggerKind = 'pre-negation' | 'post-negation' | 'pseudo' | 'termination' | 'uncertainty';

export interface TriggerRule {
  readonly phrase: string;
  readonly kind: TriggerKind;
  /** Negates in both directions ("resolved right effusion", "the effusion resolved"). */
  readonly bothWays?: boolean;
  /** Also marks the sentence uncertain ("no definite", "not certain if"). */
  readonly alsoUncertain?: boolean;
}

const PRE_NEGATION = [
  'no', 'not', 'without', 'nor', 'neither', 'negative for', 'no evidence of', 'no evidence for',
  'no radiographic evidence of', 'no signs? of', 'no findings of', 'no new', 'free of', 'clear of',
  'absence of', 'rules out', 'ruled out', 'no longer', 'resolution of', 'interval resolution of',
  'fails? to (?:reveal|demonstrate|show)', 'cannot see', 'negative',
];
// Hedged negations: read as negated and uncertain ("No definite consolidation" leaves a doubt).
const HEDGED_NEGATION = ['no definite', 'no definitive', 'no convincing', 'no convincing evidence of', 'no clear evidence of'];
const POST_NEGATION = [
  'is not seen', 'are not seen', 'not seen', 'is not identified', 'are not identified', 'not identified',
  'not present', 'is absent', 'are absent', 'absent', 'has resolved', 'have resolved', 'has cleared',
  'have cleared', 'were excluded', 'was excluded', 'excluded', 'is ruled out', 'has been ruled out',
  'not visuali[sz]ed', 'not demonstrated', 'not appreciated', 'not evident', 'no longer seen',
  'no longer visible', 'no longer present',
];
const BOTH_WAYS = ['resolved', 'resolving', 'cleared'];
const PSEUDO = [
  'no change', 'no changes', 'no interval change', 'no significant change', 'no significant interval change',
  'no appreciable change', 'no substantial change', 'no definite change', 'no suspicious change',
  'no increase', 'no significant increase', 'no decrease', 'no interval increase', 'without change',
  'without interval change', 'without significant change', 'not only', 'not necessarily', 'not extend',
  'not cause', 'not drain', 'without difficulty',
];
const PSEUDO_UNCERTAIN = ['not certain if', 'not certain whether', 'not sure if', 'not sure whether'];
const TERMINATION = [
  'but', 'however', 'although', 'though', 'which', 'except', 'aside from', 'apart from', 'other than',
  'with the exception of', 'nevertheless', 'yet', 'still', 'whereas', 'secondary to', 'due to',
  'as the cause of', 'as a cause of', 'as the source of',
];
const UNCERTAINTY = [
  'may', 'may be', 'might', 'could', 'possible', 'possibly', 'probable', 'probably', 'likely', 'most likely',
  'unlikely', 'cannot be excluded', 'can not be excluded', 'cannot exclude', 'can not exclude',
  'not excluded', 'not be excluded', 'could not be excluded', 'cannot be ruled out', 'can not be ruled out',
  'cannot rule out', 'not ruled out', 'suggestive of', 'suggests', 'suggesting', 'suggestion of',
  'questionable', 'question of', 'could represent', 'may represent', 'suspicious for', 'suspicion of',
  'suspected', 'versus', 'vs', 'concerning for', 'concern for', 'worrisome for', 'equivocal', 'indeterminate',
  'uncertain', 'not certain', 'rule out', 'to rule out', 'evaluate for', 'evaluation for', 'assess for',
  'presumed', 'presumably', 'perhaps', 'differential includes', 'raising the possibility of', 'cannot be differentiated',
];

function rules(phrases: readonly string[], kind: TriggerKind, extra: Partial<TriggerRule> = {}): TriggerRule[] {
  return phrases.map((phrase) => ({ phrase, kind, ...extra }));
}

export const TRIGGER_RULES: readonly TriggerRule[] = [
  ...rules(PRE_NEGATION, 'pre-negation'),
  ...rules(HEDGED_NEGATION, 'pre-negation', { alsoUncertain: true }),
  ...rules(POST_NEGATION, 'post-negation'),
  ...rules(BOTH_WAYS, 'pre-negation', { bothWays: true }),
  ...rules(PSEUDO, 'pseudo'),
  ...rules(PSEUDO_UNCERTAIN, 'pseudo', { alsoUncertain: true }),
  ...rules(TERMINATION, 'termination'),
  ...rules(UNCERTAINTY, 'uncertainty'),
];

/** Tie-break among equally long overlapping matches: pseudo before uncertainty before the rest. */
export function triggerPriority(rule: TriggerRule): number {
  return { pseudo: 0, uncertainty: 1, termination: 2, 'post-negation': 3, 'pre-negation': 4 }[rule.kind];
}
