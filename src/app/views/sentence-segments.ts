import type { ParsedSentence } from '../../report/types';

export interface TextSegment {
  readonly text: string;
  readonly kind: 'plain' | 'location' | 'trigger';
  /** Zones named by a location phrase, or the trigger's kind. */
  readonly note?: string;
}

/**
 * Splits a sentence into plain text, detected location phrases and negation/uncertainty trigger
 * phrases (spans from src/report), for highlighting. Overlaps keep the earlier-starting span.
 */
export function sentenceSegments(sentence: ParsedSentence): TextSegment[] {
  const marks = [
    ...sentence.locations.map((l) => ({ ...l.span, kind: 'location' as const, note: [...l.zones, ...l.tags].join(', ') })),
    ...sentence.negation.triggers
      .filter((t) => t.kind !== 'termination')
      .map((t) => ({ ...t.span, kind: 'trigger' as const, note: t.kind })),
  ].sort((a, b) => a.start - b.start || b.end - a.end);
  const out: TextSegment[] = [];
  let at = 0;
  for (const m of marks) {
    if (m.start < at || m.end <= m.start) continue;
    if (m.start > at) out.push({ text: sentence.text.slice(at, m.start), kind: 'plain' });
    out.push({ text: sentence.text.slice(m.start, m.end), kind: m.kind, note: m.note });
    at = m.end;
  }
  if (at < sentence.text.length) out.push({ text: sentence.text.slice(at), kind: 'plain' });
  return out;
}
