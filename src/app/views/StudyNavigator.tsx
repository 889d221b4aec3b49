import { useEffect, useRef } from 'react';
import type { RateWithChance } from '../../core/rate-summary';

/** Hits, misses, rate and mean chance of one study's scored sentences (src/core summariseRate). */
export type StudyTally = Pick<RateWithChance, 'hits' | 'n' | 'rate' | 'chance'>;

export interface NavigatorStudy {
  readonly id: string;
  readonly sentenceCount: number;
  readonly boxCount: number;
  readonly tally?: StudyTally;
}

export interface StudyNavigatorProps {
  readonly studies: readonly NavigatorStudy[];
  readonly selectedId: string | undefined;
  readonly onSelect: (id: string) => void;
}

function tallyText(t: StudyTally | undefined): string {
  if (!t) return 'not encoded';
  if (t.n === 0) return 'nothing to score';
  const chance = t.chance === undefined ? '' : ` · chance ${(t.chance * 100).toFixed(0)}%`;
  return `${t.hits} hit${t.hits === 1 ? '' : 's'} · ${t.n - t.hits} miss${t.n - t.hits === 1 ? '' : 'es'}${chance}`;
}

/** The set's studies with a per-study tally; arrows or a click select. */
export function StudyNavigator({ studies, selectedId, onSelect }: StudyNavigatorProps) {
  const listRef = useRef<HTMLUListElement>(null);
  const at = studies.findIndex((s) => s.id === selectedId);
  useEffect(() => {
    listRef.current?.querySelector<HTMLElement>('[aria-selected="true"]')?.scrollIntoView?.({ block: 'nearest' });
  }, [selectedId]);
  if (studies.length === 0) return <p className="t-status">No sample set is open.</p>;
  return (
    <ul
      ref={listRef}
      className="t-nav"
      role="listbox"
      tabIndex={0}
      aria-label="Studies"
      aria-activedescendant={at >= 0 ? `t-study-${at}` : undefined}
      onKeyDown={(e) => {
        const step: Record<string, number> = { ArrowDown: 1, ArrowUp: -1 };
        if (e.key === 'Home' || e.key === 'End') {
          e.preventDefault();
          e.stopPropagation();
          onSelect(studies[e.key === 'Home' ? 0 : studies.length - 1].id);
          return;
        }
        const d = step[e.key];
        if (d === undefined) return;
        e.preventDefault();
        e.stopPropagation();
        const to = Math.max(0, Math.min(studies.length - 1, (at < 0 ? 0 : at) + d));
        onSelect(studies[to].id);
      }}
    >
      {studies.map((s, i) => (
        <li
          key={s.id}
          id={`t-study-${i}`}
          role="option"
          aria-selected={s.id === selectedId}
          className="t-nav__item"
          onClick={() => onSelect(s.id)}
        >
          <span className="t-nav__id">{s.id}</span>
          <span className="t-nav__meta">
            {s.sentenceCount} sentences · {s.boxCount} box{s.boxCount === 1 ? '' : 'es'}
          </span>
          <span className={`t-nav__tally${s.tally ? '' : ' t-nav__tally--none'}`}>{tallyText(s.tally)}</span>
          {s.tally && s.tally.rate !== undefined && (
            <span className="t-nav__bar" aria-hidden="true">
              <span style={{ width: `${100 * s.tally.rate}%` }} />
              {s.tally.chance !== undefined && <i style={{ left: `${100 * s.tally.chance}%` }} />}
            </span>
          )}
        </li>
      ))}
    </ul>
  );
}
