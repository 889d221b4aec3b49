import { researchFooter } from './export-format';
import { buildTables, runLine, type TableContent } from './export-tables-content';
import type { ScoreSummary } from './types';

const LATEX_ESCAPES: Readonly<Record<string, string>> = {
  '\\': '\\textbackslash{}',
  '{': '\\{',
  '}': '\\}',
  _: '\\_',
  '%': '\\%',
  '&': '\\&',
  '#': '\\#',
  $: '\\$',
  '~': '\\textasciitilde{}',
  '^': '\\textasciicircum{}',
  '<': '\\textless{}',
  '>': '\\textgreater{}',
  '|': '\\textbar{}',
  // A cell starting with '[' right after \\ or \midrule would be read as their optional argument.
  '[': '{[}',
  ']': '{]}',
};

/** Escapes text for LaTeX text mode in one pass (so inserted backslashes are not escaped again); line breaks become spaces. */
export function escapeLatex(text: string): string {
  return text.replace(/\r\n|\r|\n/g, ' ').replace(/[\\{}_%&#$~^<>|[\]]/g, (c) => LATEX_ESCAPES[c]);
}

/** A LaTeX comment line; line breaks in the text would end the comment, so they become spaces. */
function comment(text: string): string {
  return `% ${text.replace(/\r\n|\r|\n/g, ' ')}\n`;
}

function table(t: TableContent): string {
  let out = comment(`${t.id}: ${t.title}.`);
  if (t.rows.length === 0) return out + comment(t.empty);
  out += comment(t.note);
  out += `\\begin{tabular}{${t.columns.map((c) => c.align).join('')}}\n\\toprule\n`;
  out += `${t.columns.map((c) => c.tex).join(' & ')} \\\\\n\\midrule\n`;
  for (const row of t.rows) out += `${row.map(escapeLatex).join(' & ')} \\\\\n`;
  return out + '\\bottomrule\n\\end{tabular}\n';
}

/**
 * tables.tex text: Tables 1-4 as standalone booktabs tabular blocks (needs \usepackage{booktabs}),
 * each preceded by a caption comment and its note, cell text escaped for LaTeX, ending with the
 * research-use footer (which says when the set is synthetic) as a comment. Deterministic.
 */
export function tablesLatex(summary: ScoreSummary): string {
  const head = comment('Tessera score tables. Requires \\usepackage{booktabs}.') + comment(runLine(summary));
  return [head, ...buildTables(summary).map(table), comment(researchFooter(summary))].join('\n');
}
