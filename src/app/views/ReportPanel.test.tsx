import { describe, expect, it, vi } from 'vitest';
import { useState } from 'react';
import { parseReport } from '../../report/parse-report';
import { ReportPanel, type ReportRow } from './ReportPanel';
import { click, pressKey, renderForTest } from './render-for-test';

const REPORT = parseReport(
  'FINDINGS:\nThere is consolidation in the right lower zone. No pneumothorax. Possible small left pleural effusion.',
);

function rowsOf(): ReportRow[] {
  return REPORT.sentences.map((sentence, i) => ({
    sentence,
    score: 0.5 - i * 0.1,
    outcome: sentence.negated ? 'negated' : i === 0 ? 'hit' : 'miss',
    boxCount: sentence.negated ? 0 : 1,
  }));
}

function Harness({ onSelect }: { onSelect?: (i: number) => void }) {
  const [selected, setSelected] = useState<number | undefined>(0);
  return (
    <ReportPanel
      rows={rowsOf()}
      selectedIndex={selected}
      onSelect={(i) => {
        onSelect?.(i);
        setSelected(i);
      }}
    />
  );
}

const selectedText = (c: HTMLElement) => c.querySelector('[aria-selected="true"]')?.textContent ?? '';

describe('ReportPanel', () => {
  it('ReportPanel moves the selection with ArrowDown, ArrowUp, End and Home', () => {
    const onSelect = vi.fn();
    const r = renderForTest(<Harness onSelect={onSelect} />);
    const list = r.container.querySelector('[role="listbox"]') as HTMLElement;
    expect(selectedText(r.container)).toContain('consolidation');
    pressKey(list, 'ArrowDown');
    expect(selectedText(r.container)).toContain('pneumothorax');
    pressKey(list, 'ArrowDown');
    pressKey(list, 'ArrowDown');
    expect(selectedText(r.container)).toContain('effusion');
    expect(onSelect).toHaveBeenLastCalledWith(2);
    pressKey(list, 'ArrowUp');
    expect(selectedText(r.container)).toContain('pneumothorax');
    pressKey(list, 'Home');
    expect(selectedText(r.container)).toContain('consolidation');
    pressKey(list, 'End');
    expect(selectedText(r.container)).toContain('effusion');
    expect(list.getAttribute('aria-activedescendant')).toBe('t-sentence-2');
    r.unmount();
  });

  it('ReportPanel selects a sentence on click', () => {
    const r = renderForTest(<Harness />);
    const options = r.container.querySelectorAll('[role="option"]');
    click(options[1]);
    expect(selectedText(r.container)).toContain('pneumothorax');
    r.unmount();
  });

  it('ReportPanel names negation and uncertainty in words, not colour alone', () => {
    const r = renderForTest(<Harness />);
    const options = r.container.querySelectorAll('[role="option"]');
    expect(REPORT.sentences[1].negated).toBe(true);
    expect(options[1].textContent).toContain('negated');
    expect(options[1].textContent).toContain('not scored');
    expect(REPORT.sentences[2].uncertain).toBe(true);
    expect(options[2].textContent).toContain('uncertain');
    expect(options[0].textContent).not.toContain('negated');
    expect(options[0].textContent).toContain('hit');
    expect(options[0].textContent).toContain('0.500');
    r.unmount();
  });

  it('ReportPanel highlights the location phrases found by src/report', () => {
    const r = renderForTest(<Harness />);
    const marks = [...r.container.querySelectorAll('mark.t-loc')].map((m) => m.textContent);
    const expected = REPORT.sentences.flatMap((s) => s.locations.map((l) => s.text.slice(l.span.start, l.span.end)));
    expect(expected.length).toBeGreaterThan(0);
    expect(marks).toEqual(expected);
    r.unmount();
  });

  it('ReportPanel says so when the report has no sentences', () => {
    const r = renderForTest(<ReportPanel rows={[]} selectedIndex={undefined} onSelect={() => {}} />);
    expect(r.container.textContent).toContain('No sentences');
    r.unmount();
  });
});
