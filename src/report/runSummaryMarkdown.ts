/**
 * summary.md for one run, for pasting into a lab notebook: the headline figures with units and
 * uncertainties (or a plain statement when B cannot be separated from brightness), the warnings
 * with their one-line advice, and the inputs with SHA-256 hashes. User text is escaped with
 * escapeMarkdown. A photo series (result.source "stills") counts photos, says where their
 * voltages came from and shows no sync offset. Pure; never throws.
 * @example runSummaryMarkdown(result).startsWith('# ') === true
 */
import { cameraResponseText } from './cameraResponseText.js';
import { formatNumber } from '../quantity.js';
import type { InputFile, RunResult } from '../result/schema.js';
import { SAFETY_DEFERENCE } from '../safety/cautions.js';
import { FIGURES, formatFigure } from './figureCatalogue.js';
import { escapeMarkdown as md } from './escapeMarkdown.js';
import { guideAdvice } from './guide.js';
import { sampleWords } from './sampleWords.js';

export function runSummaryMarkdown(r: RunResult): string {
  const lines: string[] = [];
  lines.push(`# ${md(r.label)}: Kerr cell run`, '');
  lines.push(`Recorded result of ${md(r.createdAt)}; kerrtrace ${md(r.tool.version)}. Values are ± one standard error; SI units (Kerr constant in m/V², Δn = λ·B·E²).`, '');
  const n = (x: number): string => formatNumber(x, 4);
  lines.push(`Cell: length ${n(r.cell.lengthM * 1000)} mm, effective length ${n(r.cell.effectiveLengthM * 1000)} mm, gap ${n(r.cell.gapM * 1000)} mm, polariser at ${n(r.cell.polariserAngleDeg)}°${r.cell.wavelengthNm === null ? '' : `, ${n(r.cell.wavelengthNm)} nm`}.`, '');
  lines.push('| figure | value |', '| --- | --- |');
  for (const def of FIGURES) {
    const q = def.read(r);
    if (q === null || !Number.isFinite(q.value)) continue;
    const text = !r.identifiable && def.identifiable ? 'not separable from brightness (no number given)' : formatFigure(def, q);
    lines.push(`| ${def.name} | ${text} |`);
  }
  lines.push('');
  if (!r.identifiable) {
    lines.push('**The Kerr constant could not be separated from the brightness of the light.** Record an open level (analyser parallel, no voltage) or, only if the cell is rated for it, a sweep reaching at least 0.6 of the half-wave voltage.', '');
  }
  const words = sampleWords(r);
  if (r.source === 'stills') {
    const from = r.options.voltageSource === 'csv' ? 'the voltage map' : r.options.voltageSource === 'file-names' ? 'the file names' : 'the photo series';
    lines.push(`Voltages: each photo carries its own (from ${from}), so there is no clock to synchronise. Photos ordered ${r.options.timeBasis === 'exif-capture-time' ? 'by capture time (time axis: seconds after the first photo)' : 'by file name (time axis: photo order)'}.`, '');
  }
  lines.push(`${words.many === 'photos' ? 'Photos' : 'Frames'}: ${r.frames.used} of ${r.frames.total} used${Object.keys(r.frames.excluded).length > 0 ? `; left out: ${Object.entries(r.frames.excluded).map(([k, n]) => `${md(k)} ${n}`).join(', ')}` : ''}. Fit ${r.fit.converged ? 'converged' : 'did NOT converge'} (${md(r.fit.reason)}).`, '');
  const response = cameraResponseText(r.cameraResponse);
  if (response) lines.push(`Camera response: ${md(response.used)}; ${md(response.check)}.`, '');
  lines.push('## Warnings', '');
  if (r.warnings.length === 0) lines.push('None.');
  for (const w of r.warnings) {
    const s = w.guideSection === undefined ? undefined : guideAdvice(w.guideSection);
    lines.push(`- ${md(w.message)} (code ${md(w.code)})${s ? ` (guide: ${s.title}: ${s.advice})` : ''}`);
  }
  lines.push('', '## Inputs', '');
  const inputs: [string, InputFile][] = [];
  if (r.inputs.video) inputs.push(['video', r.inputs.video]);
  if (r.inputs.volts) inputs.push(['voltage log', r.inputs.volts]);
  if (r.inputs.openVideo) inputs.push(['open-level video', r.inputs.openVideo]);
  if (r.inputs.baseline) inputs.push(['baseline', r.inputs.baseline]);
  if (r.inputs.cameraProfile) inputs.push(['camera profile', r.inputs.cameraProfile]);
  (r.inputs.stills ?? []).forEach((f, i) => inputs.push([`still ${i + 1}`, f]));
  lines.push('| input | path | SHA-256 |', '| --- | --- | --- |');
  for (const [role, f] of inputs) lines.push(`| ${role} | ${md(f.path)} | ${md(f.sha256)} |`);
  lines.push('', `Safety: lethal voltages, stored charge, ozone, toxic liquids and lasers. ${SAFETY_DEFERENCE}`, '');
  return lines.join('\n');
}
