/**
 * `kerrtrace compare A B [C ...] --out DIR`: compares runs (result.json files or the folders that
 * hold them) in the order given, and writes comparison.html, comparison.json, comparison.csv,
 * summary.md and plots into DIR. Reads and validates every input and checks the output before
 * any work; prints the verdicts and where the files went.
 */
import type { Command } from 'commander';
import { basename, dirname, resolve } from 'node:path';
import { action } from '../action.js';
import { KerrError } from '../../src/errors.js';
import { checkOutputDir } from '../../src/io/outputDir.js';

interface CompareOptions {
  out?: string;
  force?: boolean;
  allowDifferentCells?: boolean;
  label: string[];
}

function collect(value: string, previous: string[]): string[] {
  return [...previous, value];
}

/** Default label of a run: the folder name for "runs/before/result.json" or "runs/before", else the result's own label. */
function defaultLabel(arg: string, resultLabel: string): string {
  const abs = resolve(arg);
  const name = basename(abs) === 'result.json' ? basename(dirname(abs)) : basename(abs).replace(/\.json$/i, '');
  return name !== '' && name !== '.' ? name : resultLabel;
}

function uniqueLabels(labels: string[]): string[] {
  const seen = new Map<string, number>();
  return labels.map((l) => {
    const n = (seen.get(l) ?? 0) + 1;
    seen.set(l, n);
    return n === 1 ? l : `${l} (${n})`;
  });
}

/** Registers the `compare` command. */
export function register(program: Command): void {
  program
    .command('compare')
    .description('compare two or more analysed runs (e.g. before and after purifying the liquid): figures, changes with uncertainties, plain verdicts')
    .argument('<results...>', 'result.json files, or the run folders that hold them, in time order')
    .requiredOption('--out <dir>', 'folder for comparison.html, comparison.json, comparison.csv, summary.md and plots')
    .option('--force', 'replace an earlier comparison in --out')
    .option('--allow-different-cells', 'compare runs whose cell length, effective length or gap differ (warns)')
    .option('--label <name>', 'name of a run in the report; give once per run, in the same order (default: folder name)', collect, [] as string[])
    .action(
      action(async (paths: string[], o: CompareOptions) => {
        // The output may never be, hold or lie inside a compared run (links resolved); checked first.
        checkOutputDir(o.out as string, o.force === true, paths);
        // Plot and image libraries load only when the command runs.
        const [{ compareRuns }, { readRunResult }, { writeComparison }] = await Promise.all([
          import('../../src/compare/compareRuns.js'),
          import('../../src/compare/readRunResult.js'),
          import('../../src/compare/writeComparison.js'),
        ]);
        const out = o.out as string;
        if (paths.length < 2) {
          throw new KerrError('BAD_ARGUMENT', `compare needs at least two results but received only ${paths.length === 1 ? 'one' : paths.length}`, { hint: 'Give two or more result.json files or run folders' });
        }
        if (o.label.length > 0 && o.label.length !== paths.length) {
          throw new KerrError('BAD_ARGUMENT', `expected one --label per run (${paths.length}) but received ${o.label.length}`, { path: '--label', hint: 'Give --label once for every run, in the same order, or leave it out' });
        }
        const read = [];
        for (const p of paths) read.push(await readRunResult(p));
        const labels = o.label.length > 0 ? o.label : uniqueLabels(read.map((r, i) => defaultLabel(paths[i]!, r.result.label)));
        const comparison = compareRuns(read.map((r) => r.result), labels, {
          allowDifferentCells: o.allowDifferentCells ?? false,
          sources: read.map((r) => r.source),
        });
        const { files } = await writeComparison(out, comparison, { force: o.force ?? false, inputs: paths });
        for (const v of comparison.verdicts) process.stdout.write(`${v}\n`);
        for (const w of comparison.warnings) process.stdout.write(`warning: ${w.message}\n`);
        process.stdout.write(`wrote ${resolve(out, files.html ?? 'comparison.html')}\n`);
      }),
    );
}
