import { researchFooter } from './export-format';
import { buildTables, runLine, type TableContent } from './export-tables-content';
import type { ScoreSummary } from './types';

/** Escapes text for a Markdown table cell or paragraph: inline markup, pipes and line breaks. */
export function escapeMarkdown(text: string): string {
  return text.replace(/\r\n|\r|\n/g, ' ').replace(/[\\`*_[\]<>|#]/g, (c) => `\\${c}`);
}

function table(t: TableContent): string {
  let out = `## ${t.id}. ${t.title}\n\n`;
  if (t.rows.length === 0) return out + `${escapeMarkdown(t.empty)}\n`;
  out += `| ${t.columns.map((c) => c.md).join(' | ')} |\n`;
  out += `| ${t.columns.map((c) => (c.align === 'r' ? '---:' : ':---')).join(' | ')} |\n`;
  // Names are free text and are escaped; number cells are ours, and their brackets and '<' are not markup here.
  for (const row of t.rows) out += `| ${row.map((cell, i) => (t.columns[i].align === 'l' ? escapeMarkdown(cell) : cell)).join(' | ')} |\n`;
  return out + `\n${escapeMarkdown(t.note)}\n`;
}

/**
 * tables.md text: a heading, the run line, Tables 1-4 (per model; by zone; by finding; paired
 * comparisons) as pipe tables with a note under each, and the research-use footer (which says
 * when the set is synthetic). Cell text is escaped; the same summary gives the same text.
 */
export function tablesMarkdown(summary: ScoreSummary): string {
  const parts = [`# Tessera score tables\n\n${escapeMarkdown(runLine(summary))}\n`, ...buildTables(summary).map(table), `*${escapeMarkdown(researchFooter(summary))}*\n`];
  return parts.join('\n');
}
