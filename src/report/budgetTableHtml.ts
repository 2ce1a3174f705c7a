/**
 * The uncertainty budget of a run as an HTML table for the report: one row per term (its input's
 * relative standard uncertainty, the sensitivity exponent, its share on B and on V_π, whether it
 * cancels between runs of one cell), then the combined standard uncertainty and the expanded
 * uncertainty (k = 2), and, when the run failed a gate, a callout naming each failure.
 * Pure; returns null for a result without a budget (schema version 1, photo series).
 */
import { html, type SafeHtml } from './html.js';
import type { RunResult } from '../result/schema.js';

const pct = (x: number): string => (Number.isFinite(x) ? `${(100 * x).toPrecision(2)} %` : '—');

export function budgetTableHtml(r: RunResult): SafeHtml | null {
  const u = r.uncertainty;
  const failures = r.validity && !r.validity.valid
    ? html`<div class="callout"><strong>This run failed ${r.validity.failures.length === 1 ? 'a check' : 'checks'}; its figures are not to be used.</strong><ul>${r.validity.failures.map((f) => html`<li>${f.gate}: ${f.message}</li>`)}</ul></div>`
    : null;
  if (!u) return failures;
  const vpiOf = (name: string) => u.halfWaveVoltage.terms.find((t) => t.name === name);
  const rows = u.kerrConstant.terms.map((t) => {
    const v = vpiOf(t.name);
    return html`<tr><th>${t.name}</th><td class="num">${pct(t.inputRelative)}</td><td class="num">${String(t.sensitivity)}</td><td class="num">${pct(t.relative)}</td><td class="num">${v ? pct(v.relative) : '—'}</td><td>${t.sharedWithinCell ? 'yes' : 'no'}</td><td>${t.note}</td></tr>`;
  });
  return html`${failures}<h3>Uncertainty budget</h3>
<p>GUM (JCGM 100:2008): relative standard uncertainties, combined in quadrature; the expanded uncertainty uses k = ${String(u.kerrConstant.coverageFactor)} (about 95 %). "Cancels" marks terms shared by every run of one cell with one logger, which drop out of a before/after comparison of that cell.</p>
<table class="budget"><tr><th>term</th><th>input</th><th>exponent in B</th><th>on B</th><th>on Vπ</th><th>cancels</th><th>source</th></tr>
${rows}
<tr><th>combined standard</th><td></td><td></td><td class="num">${pct(u.kerrConstant.relativeCombined)}</td><td class="num">${pct(u.halfWaveVoltage.relativeCombined)}</td><td></td><td>statistical alone on B: ${pct(u.kerrConstant.statisticalStdErr / Math.abs(u.kerrConstant.value))}</td></tr>
<tr><th>expanded (k = ${String(u.kerrConstant.coverageFactor)})</th><td></td><td></td><td class="num">${pct(u.kerrConstant.coverageFactor * u.kerrConstant.relativeCombined)}</td><td class="num">${pct(u.halfWaveVoltage.coverageFactor * u.halfWaveVoltage.relativeCombined)}</td><td></td><td></td></tr></table>`;
}
