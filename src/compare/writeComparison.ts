/**
 * Writes a comparison into `dir`: comparison.html (self-contained, like the run report),
 * comparison.json (the Comparison plus when and by which version it was written),
 * comparison.csv, summary.md, and plots/compare-<figure>.svg/.png.
 * The folder is staged and moved into place whole under the output policy of src/io/outputDir.ts:
 * refused (KerrError FILE_EXISTS, one line) when it exists and `force` is not set, when it is not a
 * folder kerrtrace wrote, or when it is, holds or lies inside one of `inputs` (the compared runs).
 * A system error while writing is an ENVIRONMENT KerrError naming `dir`.
 * Returns {files: {key: path relative to dir}}.
 * @example await writeComparison('cmp', compareRuns([a, b], ['before', 'after']), { force: false })
 */
import { environmentError } from '../io/environmentError.js';
import { stageOutputDir } from '../io/outputDir.js';
import { figure } from '../report/figureCatalogue.js';
import { guideLink } from '../report/guideLink.js';
import { packageInfo } from '../report/packageInfo.js';
import { renderPlot, svgToPng } from '../report/renderPlot.js';
import { comparisonFigureSpec } from '../report/plots/comparisonFigureSpec.js';
import { comparisonCsv } from './comparisonCsv.js';
import { comparisonHtml, type ComparisonPlot } from './comparisonHtml.js';
import { comparisonMarkdown } from './comparisonMarkdown.js';
import type { Comparison, FigureSeries } from './comparison.js';

export interface WriteComparisonOptions {
  force?: boolean;
  /** ISO-8601 time written into the files; defaults to now. */
  createdAt?: string;
  /** Tool version written into the files; defaults to the installed package's. */
  toolVersion?: string;
  /** The compared runs' files or folders: `dir` may never be, hold or lie inside one of them. */
  inputs?: string[];
}

export async function writeComparison(dir: string, comparison: Comparison, opts: WriteComparisonOptions = {}): Promise<{ files: Record<string, string> }> {
  const createdAt = opts.createdAt ?? new Date().toISOString();
  const toolVersion = opts.toolVersion ?? packageInfo().version;
  const plotted = comparison.figures.filter((f) => f.values.filter((q, i) => q !== null && !f.withheld[i]).length >= 1);
  const planned: Record<string, string> = {
    html: 'comparison.html',
    json: 'comparison.json',
    csv: 'comparison.csv',
    summary: 'summary.md',
  };
  for (const f of plotted) {
    planned[`${f.key}Svg`] = `plots/compare-${f.key}.svg`;
    planned[`${f.key}Png`] = `plots/compare-${f.key}.png`;
  }
  // The folder is written whole or not at all (staged beside the target, then renamed).
  const staged = stageOutputDir(dir, opts.force === true, opts.inputs ?? []);
  try {
    const plots: ComparisonPlot[] = [];
    for (const f of plotted) {
      const { spec } = comparisonFigureSpec(plotInput(f, comparison));
      const { svg } = await renderPlot(spec, `cmp-${f.key}`);
      staged.write(planned[`${f.key}Svg`]!, svg);
      staged.write(planned[`${f.key}Png`]!, await svgToPng(svg));
      plots.push({ key: f.key, title: f.name, svg, files: { png: planned[`${f.key}Png`]!, svg: planned[`${f.key}Svg`]! } });
    }
    staged.write(planned.json!, `${JSON.stringify({ ...comparison, createdAt, tool: { name: 'kerrtrace', version: toolVersion, node: process.version } }, finiteOrNull, 2)}\n`);
    staged.write(planned.csv!, comparisonCsv(comparison));
    staged.write(planned.summary!, comparisonMarkdown(comparison, createdAt));
    staged.write(planned.html!, comparisonHtml({ comparison, plots, hrefFor: (a) => guideLink(dir, a), createdAt, toolVersion }));
    staged.commit();
  } catch (err) {
    staged.abandon();
    throw environmentError(err, dir, 'writing') ?? err;
  }
  return { files: planned };
}

/** JSON has no NaN or Infinity: write them as null. */
function finiteOrNull(_key: string, value: unknown): unknown {
  return typeof value === 'number' && !Number.isFinite(value) ? null : value;
}

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** The figure's values in display units; scientific figures share one power of ten named in the axis unit. */
function plotInput(f: FigureSeries, c: Comparison): Parameters<typeof comparisonFigureSpec>[0] {
  const def = figure(f.key);
  let scale = def.display.scale;
  let unitLabel = def.display.unit;
  if (def.display.scientific) {
    const largest = Math.max(...f.values.map((q) => (q === null ? 0 : Math.abs(q.value * scale))));
    if (largest > 0 && Number.isFinite(largest)) {
      const exponent = Math.floor(Math.log10(largest));
      scale /= Math.pow(10, exponent);
      unitLabel = `10${String(exponent).split('').map((ch) => SUPERSCRIPT[ch] ?? ch).join('')} ${unitLabel}`;
    }
  }
  return {
    title: def.name,
    unitLabel,
    points: c.runs.map((r, i) => {
      const q = f.withheld[i] ? null : f.values[i] ?? null;
      return {
        run: r.label,
        order: i,
        value: q === null || !Number.isFinite(q.value) ? null : q.value * scale,
        stdErr: q === null || q.stdErr === undefined || q.stdErr === null || !Number.isFinite(q.stdErr) ? null : q.stdErr * scale,
      };
    }),
  };
}
