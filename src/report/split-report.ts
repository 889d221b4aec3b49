import type { ReportSection, Span } from './types';

/** One sentence found by splitReport; its span indexes the original report text. */
export interface SplitSentence {
  readonly text: string;
  readonly span: Span;
  readonly section: string;
}

export interface SplitReport {
  readonly sections: ReportSection[];
  readonly sentences: SplitSentence[];
}

// Headings recognised case-insensitively at a line start; plural forms map to one section name.
const KNOWN_HEADINGS = [
  'findings', 'finding', 'impression', 'impressions', 'comparison', 'comparisons', 'indication',
  'indications', 'technique', 'history', 'clinical history', 'clinical information', 'clinical indication',
  'clinical details', 'reason for exam', 'reason for examination', 'examination', 'exam', 'procedure',
  'conclusion', 'conclusions', 'recommendation', 'recommendations', 'summary', 'opinion',
];
const CANONICAL: Readonly<Record<string, string>> = {
  finding: 'findings', impressions: 'impression', comparisons: 'comparison', indications: 'indication',
  conclusions: 'conclusion', recommendations: 'recommendation',
};

// Never a sentence end, wherever they stand (titles, Latin abbreviations, "approx.").
const ALWAYS_ABBREVIATIONS = new Set([
  'e.g', 'i.e', 'eg', 'ie', 'vs', 'dr', 'drs', 'mr', 'mrs', 'ms', 'prof', 'approx', 'cf', 'fig', 'figs',
  'incl', 'esp', 'viz', 'st', 'ref',
]);
// Units and short forms that end a sentence only when a capital letter (or nothing) follows.
const SOFT_ABBREVIATIONS = new Set([
  'cm', 'mm', 'ml', 'cc', 'kg', 'mg', 'kv', 'kvp', 'mas', 'hr', 'hrs', 'min', 'mins', 'sec', 'yr', 'yrs',
  'wk', 'wks', 'mo', 'mos', 'etc', 'pt', 'pts', 'sq', 'deg', 'ant', 'post', 'lat', 'sup', 'inf', 'med', 'cont',
]);

const CLOSERS = new Set([')', ']', '"', "'", '\u201d', '\u2019']);

function isSpace(c: string): boolean {
  return /\s/.test(c);
}
function isInlineSpace(c: string): boolean {
  return c !== '\n' && /\s/.test(c);
}
function hasAlnum(text: string, from: number, to: number): boolean {
  return /[\p{L}\p{N}]/u.test(text.slice(from, to));
}

function headingPattern(names: readonly string[]): string {
  return [...names]
    .sort((a, b) => b.length - a.length)
    .map((n) => n.split(' ').join('[ \\t]+'))
    .join('|');
}
const KNOWN_ALTERNATIVES = headingPattern(KNOWN_HEADINGS);
const KNOWN_WITH_COLON = new RegExp(`^[ \\t]*(${KNOWN_ALTERNATIVES})[ \\t]*:`, 'gim');
const KNOWN_ALONE = new RegExp(`^[ \\t]*(${KNOWN_ALTERNATIVES})[ \\t]*$`, 'gim');
// Flattened reports often run a capitalised heading on after the previous sentence end.
const KNOWN_UPPER_MIDLINE = new RegExp(
  `(?<=[.!?][ \\t]+)(${headingPattern(KNOWN_HEADINGS.map((n) => n.toUpperCase()))})[ \\t]*:`,
  'gm',
);
// Any other all-capitals label of up to four words, e.g. "CLINICAL NOTES:".
const GENERIC_UPPER = /^[ \t]*([A-Z]{3,}(?:[ \t/&-]+[A-Z]{2,}){0,3})[ \t]*:(?=\s|$)/gm;

interface Heading {
  readonly start: number;
  readonly bodyStart: number;
  readonly name: string;
}

function sectionName(raw: string): string {
  const name = raw.toLowerCase().replace(/\s+/g, ' ').trim();
  return CANONICAL[name] ?? name;
}

function findHeadings(text: string): Heading[] {
  const found: Heading[] = [];
  for (const pattern of [KNOWN_WITH_COLON, KNOWN_ALONE, KNOWN_UPPER_MIDLINE, GENERIC_UPPER]) {
    for (const m of text.matchAll(pattern)) {
      const start = m.index + m[0].indexOf(m[1]);
      found.push({ start, bodyStart: m.index + m[0].length, name: sectionName(m[1]) });
    }
  }
  found.sort((a, b) => a.start - b.start || b.bodyStart - a.bodyStart);
  const headings: Heading[] = [];
  for (const h of found) {
    const last = headings[headings.length - 1];
    if (last === undefined || h.start >= last.bodyStart) headings.push(h);
  }
  return headings;
}

interface ListMarker {
  readonly end: number; // first character of the item text
  readonly number: number | undefined;
}

/** A list marker ("1.", "2)", "(3)", "-", "*", bullet) followed by inline space and item text. */
function listMarkerAt(text: string, i: number, to: number): ListMarker | undefined {
  const head = text.slice(i, Math.min(to, i + 16));
  const m = /^(?:(\d{1,2})[.)]|\((\d{1,2})\)|[-*\u2022\u00b7\u25aa\u2023\u25e6\u2013\u2014])[ \t\u00a0]+(?=\S)/.exec(head);
  if (m === null) return undefined;
  const digits = m[1] ?? m[2];
  return { end: i + m[0].length, number: digits === undefined ? undefined : Number(digits) };
}

function skipClosers(text: string, i: number, to: number): number {
  let e = i;
  while (e < to && CLOSERS.has(text[e])) e++;
  return e;
}

function trimEnd(text: string, start: number, end: number): number {
  let e = end;
  while (e > start && isSpace(text[e - 1])) e--;
  return e;
}

/** The letters-and-dots word ending just before position j, e.g. "e.g" or "cm". */
function wordBefore(text: string, j: number, start: number): string {
  let b = j;
  while (b > start && /[A-Za-z.]/.test(text[b - 1])) b--;
  return text.slice(b, j).replace(/^\.+/, '');
}

/** If the full stop at j ends a sentence, the end of the sentence (after closers); else undefined. */
function periodEnd(text: string, j: number, start: number, to: number, seenAlnum: boolean): number | undefined {
  let k = j;
  while (k < to && text[k] === '.') k++;
  const e = skipClosers(text, k, to);
  if (!seenAlnum) return undefined;
  if (e >= to) return e;
  // Decimals, dates, "e.g.," and "P.A./A.P." continue the sentence.
  if (!isSpace(text[e])) return undefined;
  let n = e;
  while (n < to && isSpace(text[n])) n++;
  if (n >= to) return e;
  const next = text[n];
  if (k - j >= 2) return /[a-z0-9]/.test(next) ? undefined : e;
  const word = wordBefore(text, j, start);
  const lower = word.toLowerCase();
  if (ALWAYS_ABBREVIATIONS.has(lower)) return undefined;
  if (lower === 'no' && /[0-9]/.test(next)) return undefined;
  if (listMarkerAt(text, n, to) !== undefined) return e;
  if (SOFT_ABBREVIATIONS.has(lower) && /[a-z0-9,;(]/.test(next)) return undefined;
  if (/^(?:[a-z]\.)+[a-z]$/i.test(word) && /[a-z0-9]/.test(next)) return undefined;
  return e;
}

/** Where the sentence that starts at `start` ends (trimmed) and where scanning resumes. */
function sentenceEnd(
  text: string,
  start: number,
  to: number,
  listNumber: number | undefined,
): { end: number; next: number } {
  // In a numbered list the next number starts a new item even without a full stop before it.
  const nextItem = listNumber === undefined ? undefined : new RegExp(`^${listNumber + 1}[.)][ \\t]+[A-Za-z]`);
  let j = start;
  // Tracked as the scan goes, so a long sentence is not rescanned at every full stop.
  let seenAlnum = false;
  while (j < to) {
    const c = text[j];
    if (!seenAlnum && /[\p{L}\p{N}]/u.test(c)) seenAlnum = true;
    if (c === '\n') {
      let k = j + 1;
      while (k < to && isInlineSpace(text[k])) k++;
      if (k >= to || text[k] === '\n' || listMarkerAt(text, k, to) !== undefined) {
        return { end: trimEnd(text, start, j), next: k };
      }
      j = k;
      continue;
    }
    if (c === '?' || c === '!') {
      let e = j + 1;
      while (e < to && (text[e] === '?' || text[e] === '!' || text[e] === '.')) e++;
      e = skipClosers(text, e, to);
      // "?consolidation" is a query prefix, not a question.
      if (seenAlnum && (e >= to || isSpace(text[e]))) return { end: e, next: e };
      j = e;
      continue;
    }
    if (c === '.') {
      const e = periodEnd(text, j, start, to, seenAlnum);
      if (e !== undefined) return { end: e, next: e };
      j++;
      continue;
    }
    if (nextItem !== undefined && isInlineSpace(c)) {
      if (seenAlnum && nextItem.test(text.slice(j + 1, Math.min(to, j + 8)))) {
        return { end: trimEnd(text, start, j), next: j + 1 };
      }
    }
    j++;
  }
  return { end: trimEnd(text, start, to), next: to };
}

function splitBody(text: string, from: number, to: number, section: string, out: SplitSentence[]): void {
  let i = from;
  let listNumber: number | undefined;
  while (i < to) {
    while (i < to && isSpace(text[i])) i++;
    if (i >= to) break;
    const marker = listMarkerAt(text, i, to);
    if (marker !== undefined) {
      if (marker.number !== undefined) listNumber = marker.number;
      i = marker.end;
    }
    const { end, next } = sentenceEnd(text, i, to, listNumber);
    if (end > i && hasAlnum(text, i, end)) {
      out.push({ text: text.slice(i, end), span: { start: i, end }, section });
    }
    i = Math.max(next, i + 1);
  }
}

/**
 * Splits report text into sections and sentences (rule-based; our own rules).
 * Sections start at a heading ("FINDINGS:", "Impression:", "Comparison:", ... case-insensitive, at a
 * line start, or a known heading in capitals straight after a sentence end); text before the first
 * heading is section ''. Section names are lower case ('findings', 'impression'); a section spans
 * from its heading to the next heading. Headings are not sentences.
 * Sentences end at . ? ! (not after abbreviations, decimals, "No. 3", units followed by lower case
 * or a digit), at a blank line, before a list item, and at the end of a section; a single line break
 * or a semicolon does not end a sentence. List markers ("1.", "2)", "-", bullets) are left out of the
 * sentence text. Every span indexes the original text: text.slice(span.start, span.end) is the
 * sentence text, trimmed. Empty or whitespace-only text gives no sections and no sentences.
 */
export function splitReport(text: string): SplitReport {
  if (typeof text !== 'string') throw new TypeError(`'text' must be a string; got ${typeof text}`);
  const sections: ReportSection[] = [];
  const sentences: SplitSentence[] = [];
  if (text.trim() === '') return { sections, sentences };
  const headings = findHeadings(text);
  const firstStart = headings.length > 0 ? headings[0].start : text.length;
  if (text.slice(0, firstStart).trim() !== '') {
    sections.push({ name: '', start: 0, end: firstStart });
    splitBody(text, 0, firstStart, '', sentences);
  }
  headings.forEach((h, k) => {
    const end = k + 1 < headings.length ? headings[k + 1].start : text.length;
    sections.push({ name: h.name, start: h.start, end });
    splitBody(text, h.bodyStart, end, h.name, sentences);
  });
  return { sections, sentences };
}
