import type { NegationResult, Span } from './types';
import { FINDING_TERMS } from './finding-lexicon';
import { TRIGGER_RULES, triggerPriority, type TriggerKind, type TriggerRule } from './negation-triggers';
import { compilePhrase, indexRules, matchPhrases, resolveOverlaps, type PhraseMatch } from './phrase-match';
import { tokeniseSentence, type SentenceToken } from './tokenise-sentence';

interface CompiledTrigger extends TriggerRule {
  readonly words: readonly RegExp[];
}
interface CompiledFinding {
  readonly phrase: string;
  readonly words: readonly RegExp[];
}

const TRIGGER_INDEX = indexRules<CompiledTrigger>(TRIGGER_RULES.map((r) => ({ ...r, words: compilePhrase(r.phrase) })));
const FINDING_INDEX = indexRules<CompiledFinding>(FINDING_TERMS.map((phrase) => ({ phrase, words: compilePhrase(phrase) })));

// Punctuation that closes a clause, and with it any negation scope.
const SCOPE_BREAKS = new Set(['.', ';', ':', '!', '?']);

/** A finding term of the sentence and whether it lies in a negation scope. */
export interface FindingMention {
  readonly phrase: string;
  readonly span: Span; // relative to the sentence
  readonly negated: boolean;
}

export interface NegationAnalysis extends NegationResult {
  readonly findings: readonly FindingMention[];
}

export interface NegationOptions {
  /** Words a trigger's scope reaches (NegEx: five words between trigger and term, so the term is at most the sixth). */
  readonly window?: number;
}

function spanOf(tokens: readonly SentenceToken[], first: number, last: number): Span {
  return { start: tokens[first].span.start, end: tokens[last].span.end };
}

function isNumber(token: SentenceToken | undefined): boolean {
  return token !== undefined && /^\d/.test(token.text);
}

/** Drops matches that are not triggers in context: "No. 3" (a number), "May 2020" (a month). */
function inContext(tokens: readonly SentenceToken[], m: PhraseMatch<CompiledTrigger>): boolean {
  const word = m.rule.phrase;
  if (word === 'no') return !(tokens[m.last + 1]?.text === '.' && isNumber(tokens[m.last + 2]));
  if (word === 'may') return !isNumber(tokens[m.first - 1]) && !isNumber(tokens[m.last + 1]);
  return true;
}

/** Token indices reached from `from` stepping by `step`, up to `window` words, stopping at a barrier. */
function scopeFrom(
  tokens: readonly SentenceToken[],
  from: number,
  step: 1 | -1,
  window: number,
  barrier: readonly boolean[],
  triggerToken: readonly boolean[],
): number[] {
  const scope: number[] = [];
  let words = 0;
  for (let i = from; i >= 0 && i < tokens.length; i += step) {
    const t = tokens[i];
    if (t.kind === 'punct') {
      if (SCOPE_BREAKS.has(t.text)) break;
      continue;
    }
    if (barrier[i]) break;
    if (triggerToken[i]) continue;
    words++;
    if (words > window) break;
    scope.push(i);
  }
  return scope;
}

/**
 * NegEx-style negation and uncertainty for one sentence (Chapman et al., "A simple algorithm for
 * identifying negated findings and diseases in discharge summaries", J Biomed Inform 2001).
 * Triggers are matched longest first, so pseudo-triggers ("no change") and uncertainty phrases
 * ("cannot be excluded") mask the shorter negations inside them. A pre-negation scope runs forward,
 * a post-negation scope backward, each over at most `window` words (default 6: NegEx allows five
 * words between trigger and term), and ends early at a termination term ("but", "however", ...),
 * a pseudo or uncertainty trigger, or ; : . ! ?.
 * Sentence-level rule (ours): negated when at least one finding term of the lexicon lies in a
 * negation scope and no finding term lies outside every scope ("No effusion but a small
 * pneumothorax." is not negated). A sentence with no lexicon term is negated when a negation
 * trigger's scope holds at least one word ("No acute osseous injury."). Uncertain when any
 * uncertainty trigger, hedged negation ("no definite") or "?finding" query occurs anywhere.
 * Empty text gives { negated: false, uncertain: false, triggers: [], findings: [] }.
 */
export function analyseNegation(sentence: string, { window = 6 }: NegationOptions = {}): NegationAnalysis {
  if (typeof sentence !== 'string') throw new TypeError(`'sentence' must be a string; got ${typeof sentence}`);
  if (!Number.isInteger(window) || window < 1) {
    throw new RangeError(`'window' must be an integer >= 1; got ${window}`);
  }
  const tokens = tokeniseSentence(sentence);
  const matched = resolveOverlaps(matchPhrases(tokens, TRIGGER_INDEX), triggerPriority).filter((m) =>
    inContext(tokens, m),
  );

  const triggerToken = tokens.map(() => false);
  const barrier = tokens.map(() => false);
  for (const m of matched) {
    for (let i = m.first; i <= m.last; i++) {
      triggerToken[i] = true;
      if (m.rule.kind === 'termination' || m.rule.kind === 'pseudo' || m.rule.kind === 'uncertainty') barrier[i] = true;
    }
  }

  const findingMatches = resolveOverlaps(
    matchPhrases(tokens, FINDING_INDEX).filter((m) => {
      for (let i = m.first; i <= m.last; i++) if (triggerToken[i]) return false;
      return true;
    }),
    () => 0,
  );
  const isFindingToken = tokens.map(() => false);
  for (const f of findingMatches) for (let i = f.first; i <= f.last; i++) isFindingToken[i] = true;

  const inScope = tokens.map(() => false);
  const triggers: { phrase: string; kind: TriggerKind; span: Span }[] = [];
  let negatingScopeHasWords = false;
  let uncertain = false;
  for (const m of matched) {
    const span = spanOf(tokens, m.first, m.last);
    const phrase = sentence.slice(span.start, span.end);
    let kind: TriggerKind = m.rule.kind;
    if (kind === 'pre-negation' || kind === 'post-negation') {
      const forward = kind === 'pre-negation' ? scopeFrom(tokens, m.last + 1, 1, window, barrier, triggerToken) : [];
      const backward =
        kind === 'post-negation' || m.rule.bothWays ? scopeFrom(tokens, m.first - 1, -1, window, barrier, triggerToken) : [];
      if (m.rule.bothWays && !forward.some((i) => isFindingToken[i]) && backward.some((i) => isFindingToken[i])) {
        kind = 'post-negation';
      }
      for (const i of [...forward, ...backward]) inScope[i] = true;
      if (forward.length + backward.length > 0) negatingScopeHasWords = true;
    }
    triggers.push({ phrase, kind, span });
    if (kind === 'uncertainty') uncertain = true;
    if (m.rule.alsoUncertain) {
      triggers.push({ phrase, kind: 'uncertainty', span });
      uncertain = true;
    }
  }
  // "?pneumonia": a question mark written straight onto a word is a query.
  tokens.forEach((t, i) => {
    const next = tokens[i + 1];
    if (t.text === '?' && next !== undefined && next.kind === 'word' && next.span.start === t.span.end) {
      triggers.push({ phrase: '?', kind: 'uncertainty', span: t.span });
      uncertain = true;
    }
  });
  triggers.sort((a, b) => a.span.start - b.span.start);

  const findings: FindingMention[] = findingMatches.map((f) => {
    const span = spanOf(tokens, f.first, f.last);
    let negated = false;
    for (let i = f.first; i <= f.last; i++) if (inScope[i]) negated = true;
    return { phrase: sentence.slice(span.start, span.end), span, negated };
  });
  const negated =
    findings.length > 0 ? findings.every((f) => f.negated) : negatingScopeHasWords;
  return { negated, uncertain, triggers, findings };
}

/**
 * The sentence-level negation and uncertainty flags of analyseNegation, with the triggers that
 * decided them (spans relative to the sentence). See analyseNegation for the rules and source.
 */
export function detectNegation(sentence: string, options: NegationOptions = {}): NegationResult {
  const { negated, uncertain, triggers } = analyseNegation(sentence, options);
  return { negated, uncertain, triggers };
}

const NORMAL_PATTERNS: readonly RegExp[] = [
  /\blungs?\b.*\b(?:clear|well expanded|normal|unremarkable)\b/i,
  /\blung fields\b.*\b(?:clear|normal)\b/i,
  /\b(?:heart|cardiac) size\b.*\b(?:normal|within normal limits|unremarkable|upper limits of normal)\b/i,
  /\b(?:cardiomediastinal|mediastinal|cardiac|heart)\s+(?:silhouette|contours?|outline|shadow)s?\b.*\b(?:normal|unremarkable|within normal limits)\b/i,
  /\b(?:normal|unremarkable) (?:study|chest|radiograph|examination|appearances?)\b/i,
  /\bwithin normal limits\b/i,
  /\bunremarkable\b/i,
  /\bno acute (?:cardiopulmonary |intrathoracic |osseous )?(?:abnormality|process|disease|findings?)\b/i,
];

/**
 * Heuristic (ours): true when the sentence states a normal appearance ("The lungs are clear.",
 * "Heart size is normal.") and names no finding outside a negation scope. Such sentences are
 * neither negated findings nor positive findings. Empty text gives false.
 */
export function isNormalStatement(sentence: string): boolean {
  if (typeof sentence !== 'string') throw new TypeError(`'sentence' must be a string; got ${typeof sentence}`);
  if (!NORMAL_PATTERNS.some((p) => p.test(sentence))) return false;
  return analyseNegation(sentence).findings.every((f) => f.negated);
}
