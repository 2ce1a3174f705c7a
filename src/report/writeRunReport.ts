/**
 * Writes the report files of one run into `dir`:
 *   report.html   one self-contained page (inline SVG plots, data: images, no network),
 *   plots/*.svg   the same plots as standalone SVG, and plots/*.png at 144 dpi,
 *   summary.md    headline figures, warnings and input hashes for a lab notebook.
 * Every file is written to a temporary name and renamed into place, so an interrupted run never
 * leaves a half-written file. Existing report files in `dir` are replaced (the caller decides
 * beforehand whether that is allowed). Plots are rendered with vega-lite + vega in Node; no
 * browser is involved.
 * Returns the written files as {key: path relative to dir}; keys: report, summary, and
 * "<plot>Svg"/"<plot>Png" for plot ∈ timeTrace, transmission, linearised, sync.
 * Throws whatever the file system throws (e.g. EACCES), after removing its temporary file.
 * @example const { files } = await writeRunReport('out', { result, trace }); files.report === 'report.html'
 */
import { join } from 'node:path';
import type { RunResult, TraceRow } from '../result/schema.js';
import { guideLink } from './guideLink.js';
import { renderPlot, svgToPng } from './renderPlot.js';
import { runReportHtml, type PlotBlock, type RunReportImages } from './runReportHtml.js';
import { runSummaryMarkdown } from './runSummaryMarkdown.js';
import { writeFileAtomic } from './writeFileAtomic.js';
import { linearisedSpec } from './plots/linearisedSpec.js';
import type { PlotSpecResult } from './plots/plotStyle.js';
import { syncCurveSpec } from './plots/syncCurveSpec.js';
import { timeTraceSpec } from './plots/timeTraceSpec.js';
import { transmissionSpec } from './plots/transmissionSpec.js';

export interface RunReportInput {
  result: RunResult;
  trace: TraceRow[];
  images?: RunReportImages;
}

export async function writeRunReport(dir: string, input: RunReportInput): Promise<{ files: Record<string, string> }> {
  const { result, trace } = input;
  const files: Record<string, string> = {};
  const hasTrace = trace.length > 0;
  const specs: Record<'timeTrace' | 'transmission' | 'linearised' | 'sync', { name: string; made: PlotSpecResult | null }> = {
    timeTrace: { name: 'time-trace', made: hasTrace ? timeTraceSpec(result, trace) : null },
    transmission: { name: 'transmission', made: hasTrace && trace.some((r) => r.voltageV !== null) ? transmissionSpec(result, trace) : null },
    linearised: { name: 'linearised', made: hasTrace ? linearisedSpec(result, trace) : null },
    sync: { name: 'sync', made: syncCurveSpec(result) },
  };
  const plots: Record<string, PlotBlock | null> = {};
  for (const [key, { name, made }] of Object.entries(specs)) {
    if (made === null) {
      plots[key] = null;
      continue;
    }
    const { svg } = await renderPlot(made.spec, name);
    const svgFile = `plots/${name}.svg`;
    const pngFile = `plots/${name}.png`;
    await writeFileAtomic(join(dir, svgFile), svg);
    await writeFileAtomic(join(dir, pngFile), await svgToPng(svg));
    files[`${key}Svg`] = svgFile;
    files[`${key}Png`] = pngFile;
    plots[key] = { svg, thinned: made.thinned, counts: made.counts, files: { png: pngFile, svg: svgFile } };
  }
  const page = runReportHtml({
    result,
    plots: { timeTrace: plots.timeTrace ?? null, transmission: plots.transmission ?? null, linearised: plots.linearised ?? null, sync: plots.sync ?? null },
    images: input.images ?? {},
    hrefFor: (anchor) => guideLink(dir, anchor),
  });
  await writeFileAtomic(join(dir, 'summary.md'), runSummaryMarkdown(result));
  files.summary = 'summary.md';
  await writeFileAtomic(join(dir, 'report.html'), page);
  files.report = 'report.html';
  return { files };
}
