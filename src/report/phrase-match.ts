import type { SentenceToken } from './tokenise-sentence';

/** A phrase matched over consecutive word tokens [first, last] of a sentence. */
export interface PhraseMatch<T> {
  readonly first: number;
  readonly last: number;
  readonly rule: T;
}

/** Compiles a space-separated phrase into one anchored pattern per word; words are regex sources. */
export function compilePhrase(phrase: string): RegExp[] {
  return phrase.split(' ').map((w) => new RegExp(`^(?:${w})$`));
}

/** Rules bucketed by a literal first word, so most tokens test only a few rules. */
export interface RuleIndex<T> {
  readonly byLiteral: ReadonlyMap<string, readonly T[]>;
  readonly patterned: readonly T[];
}

const LITERAL = /^\^\(\?:([a-z']+)\)\$$/;

/** Builds the index of a rule list once; matchPhrases takes the index. */
export function indexRules<T extends { readonly words: readonly RegExp[] }>(rules: readonly T[]): RuleIndex<T> {
  const byLiteral = new Map<string, T[]>();
  const patterned: T[] = [];
  for (const rule of rules) {
    const literal = LITERAL.exec(rule.words[0].source)?.[1];
    if (literal === undefined) patterned.push(rule);
    else byLiteral.set(literal, [...(byLiteral.get(literal) ?? []), rule]);
  }
  return { byLiteral, patterned };
}

/**
 * Every match of every rule over runs of consecutive word tokens (punctuation between words
 * breaks a phrase). Overlaps are kept; resolveOverlaps chooses among them.
 */
export function matchPhrases<T extends { readonly words: readonly RegExp[] }>(
  tokens: readonly SentenceToken[],
  index: RuleIndex<T>,
): PhraseMatch<T>[] {
  const matches: PhraseMatch<T>[] = [];
  for (let i = 0; i < tokens.length; i++) {
    if (tokens[i].kind !== 'word') continue;
    for (const rule of [...(index.byLiteral.get(tokens[i].text) ?? []), ...index.patterned]) {
      const n = rule.words.length;
      if (i + n > tokens.length) continue;
      let ok = true;
      for (let k = 0; k < n && ok; k++) {
        const t = tokens[i + k];
        ok = t.kind === 'word' && rule.words[k].test(t.text);
      }
      if (ok) matches.push({ first: i, last: i + n - 1, rule });
    }
  }
  return matches;
}

/** Keeps the longest matches first (ties: lower `priority`, then earlier), dropping any that overlap a kept one. */
export function resolveOverlaps<T>(matches: readonly PhraseMatch<T>[], priority: (rule: T) => number): PhraseMatch<T>[] {
  const ordered = [...matches].sort(
    (a, b) => b.last - b.first - (a.last - a.first) || priority(a.rule) - priority(b.rule) || a.first - b.first,
  );
  const kept: PhraseMatch<T>[] = [];
  const taken = new Set<number>();
  for (const m of ordered) {
    let free = true;
    for (let i = m.first; i <= m.last && free; i++) free = !taken.has(i);
    if (!free) continue;
    for (let i = m.first; i <= m.last; i++) taken.add(i);
    kept.push(m);
  }
  return kept.sort((a, b) => a.first - b.first);
}
