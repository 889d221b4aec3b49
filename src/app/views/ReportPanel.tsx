import { useEffect, useRef } from 'react';
import type { ParsedSentence } from '../../report/types';
import { sentenceSegments } from './sentence-segments';

/** How a sentence fares against its reference boxes under the current hit rule. */
export type SentenceOutcome = 'hit' | 'miss' | 'no-boxes' | 'negated' | 'not-encoded';

export interface ReportRow {
  readonly sentence: ParsedSentence;
  /** Pooled region score (src/core poolRegions); undefined until the study is encoded. */
  readonly score: number | undefined;
  readonly outcome: SentenceOutcome;
  readonly boxCount: number;
  readonly hasProposal?: boolean;
}

export interface ReportPanelProps {
  readonly rows: readonly ReportRow[];
  readonly selectedIndex: number | undefined;
  readonly onSelect: (sentenceIndex: number) => void;
}

const OUTCOME_TEXT: Readonly<Record<SentenceOutcome, { text: string; cls: string }>> = {
  hit: { text: 'hit', cls: 't-tag--hit' },
  miss: { text: 'miss', cls: 't-tag--miss' },
  'no-boxes': { text: 'no boxes', cls: 't-tag--muted' },
  negated: { text: 'not scored', cls: 't-tag--muted' },
  'not-encoded': { text: 'not encoded', cls: 't-tag--muted' },
};

function SentenceText({ sentence }: { readonly sentence: ParsedSentence }) {
  return (
    <span className="t-sentence__text">
      {sentenceSegments(sentence).map((seg, i) =>
        seg.kind === 'plain' ? (
          <span key={i}>{seg.text}</span>
        ) : seg.kind === 'location' ? (
          <mark key={i} className="t-loc" title={`Location: ${seg.note}`}>
            {seg.text}
          </mark>
        ) : (
          <em key={i} className="t-trigger" title={`Trigger: ${seg.note}`}>
            {seg.text}
          </em>
        ),
      )}
    </span>
  );
}

/**
 * The report's sentences as a keyboard listbox: arrows move the selection, Home/End jump,
 * a click selects. Each row names its flags in words (negated, uncertain), its pooled score
 * and its hit or miss against its reference boxes.
 */
export function ReportPanel({ rows, selectedIndex, onSelect }: ReportPanelProps) {
  const listRef = useRef<HTMLUListElement>(null);
  const position = rows.findIndex((r) => r.sentence.index === selectedIndex);
  useEffect(() => {
    const el = listRef.current?.querySelector<HTMLElement>('[aria-selected="true"]');
    el?.scrollIntoView?.({ block: 'nearest' });
  }, [selectedIndex]);

  const move = (delta: number | 'first' | 'last') => {
    if (rows.length === 0) return;
    const next =
      delta === 'first' ? 0 : delta === 'last' ? rows.length - 1 : Math.min(rows.length - 1, Math.max(0, (position < 0 ? -1 : position) + delta));
    onSelect(rows[next].sentence.index);
  };

  if (rows.length === 0) return <p className="t-status">No sentences in this report.</p>;
  return (
    <ul
      ref={listRef}
      className="t-report"
      role="listbox"
      tabIndex={0}
      aria-label="Report sentences"
      aria-activedescendant={position >= 0 ? `t-sentence-${rows[position].sentence.index}` : undefined}
      onKeyDown={(e) => {
        const keys: Record<string, number | 'first' | 'last'> = { ArrowDown: 1, ArrowUp: -1, Home: 'first', End: 'last' };
        const d = keys[e.key];
        if (d === undefined) return;
        e.preventDefault();
        e.stopPropagation();
        move(d);
      }}
    >
      {rows.map((row) => {
        const s = row.sentence;
        const outcome = OUTCOME_TEXT[row.outcome];
        return (
          <li
            key={s.index}
            id={`t-sentence-${s.index}`}
            role="option"
            aria-selected={s.index === selectedIndex}
            className="t-sentence"
            onClick={() => onSelect(s.index)}
          >
            <span className="t-sentence__num">{s.index + 1}</span>
            <SentenceText sentence={s} />
            <span className="t-sentence__meta">
              {s.section && <span className="t-sentence__section">{s.section}</span>}
              {s.negated && <span className="t-tag t-tag--neg">negated</span>}
              {s.uncertain && <span className="t-tag t-tag--unc">uncertain</span>}
              <span className="t-sentence__score" title="Pooled region score (cosine)">
                {row.score === undefined ? '—' : row.score.toFixed(3)}
              </span>
              <span className={`t-tag ${outcome.cls}`}>{outcome.text}</span>
              {row.boxCount > 0 && (
                <span className="t-tag t-tag--muted">
                  {row.boxCount} box{row.boxCount === 1 ? '' : 'es'}
                </span>
              )}
              {row.hasProposal && <span className="t-tag t-tag--muted">proposal: Enter</span>}
            </span>
          </li>
        );
      })}
    </ul>
  );
}
