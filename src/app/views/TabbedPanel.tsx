import { useId, useRef, type ReactNode } from 'react';

export interface TabDef {
  readonly id: string;
  readonly label: string;
  readonly render: () => ReactNode;
}

export interface TabbedPanelProps {
  readonly label: string;
  readonly tabs: readonly TabDef[];
  readonly active: string;
  readonly onActivate: (id: string) => void;
}

/** Tabs with the ARIA tab pattern: arrows, Home and End move between tabs. */
export function TabbedPanel({ label, tabs, active, onActivate }: TabbedPanelProps) {
  const base = useId();
  const list = useRef<HTMLDivElement>(null);
  const at = Math.max(0, tabs.findIndex((t) => t.id === active));
  const focusTab = (i: number) => {
    onActivate(tabs[i].id);
    list.current?.querySelectorAll<HTMLElement>('[role="tab"]')[i]?.focus();
  };
  return (
    <div className="t-tabs">
      <div
        ref={list}
        role="tablist"
        aria-label={label}
        className="t-tabs__list"
        onKeyDown={(e) => {
          const moves: Record<string, number> = { ArrowRight: at + 1, ArrowLeft: at - 1, Home: 0, End: tabs.length - 1 };
          const to = moves[e.key];
          if (to === undefined) return;
          e.preventDefault();
          e.stopPropagation();
          focusTab((to + tabs.length) % tabs.length);
        }}
      >
        {tabs.map((t, i) => (
          <button
            key={t.id}
            type="button"
            role="tab"
            id={`${base}-tab-${t.id}`}
            aria-selected={i === at}
            aria-controls={`${base}-panel-${t.id}`}
            tabIndex={i === at ? 0 : -1}
            className="t-tabs__tab"
            onClick={() => onActivate(t.id)}
          >
            {t.label}
          </button>
        ))}
      </div>
      <div role="tabpanel" id={`${base}-panel-${tabs[at].id}`} aria-labelledby={`${base}-tab-${tabs[at].id}`} className="t-tabs__panel" tabIndex={-1}>
        {tabs[at].render()}
      </div>
    </div>
  );
}
