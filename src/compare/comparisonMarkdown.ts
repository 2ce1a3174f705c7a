/**
 * summary.md beside comparison.html, for a lab notebook: the verdicts, a table of figures per run
 * with units and uncertainties, the warnings, and the result files with their SHA-256.
 * User text (labels, paths, warning text) is escaped with escapeMarkdown. Pure; never throws.
 * @example comparisonMarkdown(c, '2025-03-14T10:00:00Z').startsWith('# Comparison: ') === true
 */
import { figure, formatFigure } from '../report/figureCatalogue.js';
import { escapeMarkdown as md } from '../report/escapeMarkdown.js';
import { guideAdvice } from '../report/guide.js';
import { SAFETY_DEFERENCE } from '../safety/cautions.js';
import type { Comparison } from './comparison.js';

export function comparisonMarkdown(c: Comparison, createdAt: string): string {
  const lines: string[] = [];
  lines.push(`# Comparison: ${c.runs.map((r) => md(r.label)).join(' → ')}`, '');
  lines.push(`Written ${md(createdAt)}. Values are ± one standard error; changes are judged against the combined uncertainty (|z| < 2: no change within uncertainty).`, '');
  lines.push('## Verdict', '');
  for (const v of c.verdicts) lines.push(`- ${md(v)}`);
  lines.push('', '## Figures', '');
  lines.push(`| figure | ${c.runs.map((r) => md(r.label)).join(' | ')} |`, `| --- |${c.runs.map(() => ' --- |').join('')}`);
  for (const f of c.figures) {
    const cells = f.values.map((q, i) => (f.withheld[i] ? 'not separable' : q === null ? '—' : formatFigure(figure(f.key), q)));
    lines.push(`| ${f.name} | ${cells.join(' | ')} |`);
  }
  lines.push('', '## Warnings', '');
  if (c.warnings.length === 0) lines.push('None.');
  for (const w of c.warnings) {
    const s = w.guideSection === undefined ? undefined : guideAdvice(w.guideSection);
    lines.push(`- ${md(w.message)}${s ? ` (guide: ${s.title}: ${s.advice})` : ''}`);
  }
  lines.push('', '## Result files', '', '| run | file | SHA-256 |', '| --- | --- | --- |');
  for (const r of c.runs) lines.push(`| ${md(r.label)} | ${r.source === null ? '—' : md(r.source.path)} | ${r.source === null ? '—' : md(r.source.sha256)} |`);
  lines.push('', `Safety: lethal voltages, stored charge, ozone, toxic liquids and lasers. ${SAFETY_DEFERENCE}`, '');
  return lines.join('\n');
}
