/**
 * The warnings list of a report: each warning in plain words, its code, and — when it names a
 * section of docs/recording-a-run.md — a link to that section plus the section's one-line advice
 * quoted inline (the report may be opened where the docs are not). All warning text is escaped;
 * unknown sections get no link. Pure: the caller supplies `hrefFor(anchor)`.
 * @example warningsHtml([], hrefFor) renders "No warnings."
 */
import type { RunWarning } from '../result/schema.js';
import { guideAdvice } from './guide.js';
import { html, type SafeHtml } from './html.js';

export function warningsHtml(warnings: readonly RunWarning[], hrefFor: (anchor: string) => string, prefix?: (w: RunWarning) => string | null): SafeHtml {
  if (warnings.length === 0) return html`<p class="none">No warnings.</p>`;
  const items = warnings.map((w) => {
    const section = w.guideSection === undefined ? undefined : guideAdvice(w.guideSection);
    const who = prefix?.(w) ?? null;
    const advice = section
      ? html`<div class="advice">Guide: <a href="${hrefFor(section.anchor)}"><em>${section.title}</em></a> — ${section.advice}</div>`
      : null;
    return html`<li>${who === null ? null : html`<b>${who}:</b> `}${w.message} <span class="code mono">[${w.code}]</span>${advice}</li>`;
  });
  return html`<ol class="warnings">${items}</ol>`;
}
