import { describe, expect, it } from 'vitest';
import { modelSummary, scoreSummary } from './export-fixtures.test-util';
import { formatP } from './export-tables-content';
import { escapeMarkdown, tablesMarkdown } from './export-tables-md';
import { escapeLatex, tablesLatex } from './export-tables-tex';

/** Splits a Markdown table row on pipes that are not backslash-escaped. */
function mdCells(line: string): string[] {
  return line.slice(2, -2).split(/(?<!\\) \| /);
}

/** Splits a LaTeX row on '&' not escaped as '\&'. */
function texCells(line: string): string[] {
  return line.replace(/ \\\\$/, '').split(/(?<!\\) & /);
}

function unescapeLatex(s: string): string {
  const back: Record<string, string> = {
    '\\textbackslash{}': '\\', '\\textasciitilde{}': '~', '\\textasciicircum{}': '^', '\\textless{}': '<', '\\textgreater{}': '>', '\\textbar{}': '|',
  };
  return s.replace(/\{([[\]])\}/g, '$1').replace(/\\(textbackslash|textasciitilde|textasciicircum|textless|textgreater|textbar)\{\}|\\([{}_%&#$])/g, (m, _w, c) => (c ?? back[m]));
}

const awkward = scoreSummary({
  set: 'set\nwith newline & 100% $ {odd}',
  models: [modelSummary('m_1|a&b', 7), modelSummary('x~y^z\\#', 4)],
  comparisons: [{ a: 'm_1|a&b', b: 'x~y^z\\#', n_pairs: 10, diff: -0.3, bootstrap95: [-0.6, 0.0], mcnemar_p: 0.0496, b_only_a: 1, c_only_b: 4 }],
});

describe('tablesMarkdown', () => {
  it('tablesMarkdown(summary) writes Tables 1-4 with as many cells per row as header columns', () => {
    const md = tablesMarkdown(awkward);
    for (const id of ['Table 1.', 'Table 2.', 'Table 3.', 'Table 4.']) expect(md).toContain(`## ${id}`);
    const blocks = md.split('\n## ').slice(1);
    for (const block of blocks) {
      const lines = block.split('\n').filter((l) => l.startsWith('| '));
      const width = mdCells(lines[0]).length;
      expect(lines.length).toBeGreaterThan(2);
      for (const l of lines) expect(mdCells(l).length, l).toBe(width);
    }
  });

  it('tablesMarkdown shows rate, both intervals, chance and lift for each model', () => {
    const md = tablesMarkdown(scoreSummary());
    const row = md.split('\n').find((l) => l.startsWith('| demo-a |'))!;
    const cells = mdCells(row);
    expect(cells.slice(0, 9)).toEqual(['demo-a', 'max', 'centre', '10', '0.700', '[0.300, 0.850]', '[0.350, 0.800]', '0.125', '5.60']);
    expect(cells).toContain('n/a'); // mean CNR undefined
    const header = mdCells(md.split('\n').find((l) => l.startsWith('| Model |'))!);
    expect(header).toContain('Global I→R R@1');
  });

  it('tablesMarkdown escapes pipes and markup in names and ends with the synthetic-set footer', () => {
    const md = tablesMarkdown(awkward);
    expect(md).toContain('m\\_1\\|a&b');
    expect(md).not.toContain('set\nwith');
    expect(md.trimEnd().split('\n').at(-1)).toBe('*Research use only; not a medical device. The sample set is synthetic.*');
    expect(tablesMarkdown(scoreSummary({ synthetic_set: false }))).not.toContain('synthetic');
  });

  it('tablesMarkdown with one model says there are no paired comparisons instead of an empty table', () => {
    const md = tablesMarkdown(scoreSummary({ models: [modelSummary('only', 5)], comparisons: [] }));
    expect(md).toContain('No paired comparisons');
    expect(md.split('## Table 4.')[1]).not.toContain('| A |');
  });

  it('escapeMarkdown backslash-escapes markup characters and flattens line breaks', () => {
    expect(escapeMarkdown('a|b*c_d\ne`f')).toBe('a\\|b\\*c\\_d e\\`f');
  });

  it('tablesMarkdown is deterministic', () => {
    expect(tablesMarkdown(awkward)).toBe(tablesMarkdown(awkward));
  });
});

describe('tablesLatex', () => {
  it('escapeLatex escapes each LaTeX special character once and round-trips', () => {
    const raw = 'a_b%c&d#e$f{g}h~i^j\\k<l>m|n[o]';
    const esc = escapeLatex(raw);
    expect(esc).toBe('a\\_b\\%c\\&d\\#e\\$f\\{g\\}h\\textasciitilde{}i\\textasciicircum{}j\\textbackslash{}k\\textless{}l\\textgreater{}m\\textbar{}n{[}o{]}');
    expect(unescapeLatex(esc)).toBe(raw);
    expect(escapeLatex('x\ny')).toBe('x y');
  });

  it('tablesLatex(summary) writes four booktabs tabulars with a caption comment and consistent column counts', () => {
    const tex = tablesLatex(awkward);
    expect(tex.match(/\\begin\{tabular\}/g)?.length).toBe(4);
    expect(tex.match(/\\toprule/g)?.length).toBe(4);
    expect(tex.match(/\\midrule/g)?.length).toBe(4);
    expect(tex.match(/\\bottomrule/g)?.length).toBe(4);
    for (const id of ['1', '2', '3', '4']) expect(tex).toMatch(new RegExp(`^% Table ${id}: `, 'm'));
    for (const block of tex.split('\\begin{tabular}{').slice(1)) {
      const spec = block.slice(0, block.indexOf('}'));
      const rows = block.split('\n').filter((l) => l.endsWith(' \\\\'));
      for (const r of rows) expect(texCells(r).length, r).toBe(spec.length);
    }
  });

  it('tablesLatex escapes model names and keeps a newline in the set name inside its comment', () => {
    const tex = tablesLatex(awkward);
    expect(tex).toContain('m\\_1\\textbar{}a\\&b');
    expect(tex).toContain('x\\textasciitilde{}y\\textasciicircum{}z\\textbackslash{}\\#');
    for (const line of tex.split('\n')) {
      if (line === '' || line.startsWith('%') || line.startsWith('\\')) continue;
      expect(line.endsWith(' \\\\'), `stray line: ${line}`).toBe(true);
    }
    const body = tex.split('\n').filter((l) => !l.startsWith('%')).join('\n');
    let depth = 0;
    for (let i = 0; i < body.length; i++) {
      if (body[i] === '\\') { i++; continue; }
      if (body[i] === '{') depth++;
      if (body[i] === '}') depth--;
      expect(depth).toBeGreaterThanOrEqual(0);
    }
    expect(depth).toBe(0);
  });

  it('tablesLatex shows signed differences and p-values and ends with the footer comment', () => {
    const tex = tablesLatex(awkward);
    expect(tex).toContain('-0.300 & {[}-0.600, 0.000{]} & 0.050 & 1 & 4 \\\\');
    expect(tex.trimEnd().split('\n').at(-1)).toBe('% Research use only; not a medical device. The sample set is synthetic.');
  });

  it('formatP(p) gives three decimals, <0.001 below that, n/a when undefined', () => {
    expect(formatP(0.0496)).toBe('0.050');
    expect(formatP(0.0009)).toBe('<0.001');
    expect(formatP(1)).toBe('1.000');
    expect(formatP(undefined)).toBe('n/a');
    expect(formatP(NaN)).toBe('n/a');
  });
});
