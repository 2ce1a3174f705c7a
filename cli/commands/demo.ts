/**
 * `kerrtrace demo [--out DIR]`: the whole job on built-in, invented bench data — two simulated
 * runs of one cell before and after purifying its liquid, analysed, reported and compared.
 */
import type { Command } from 'commander';
import { relative } from 'node:path';
import { action } from '../action.js';
import { formatQuantity } from '../../src/quantity.js';
import { makeProgress } from '../progress.js';
import { DEMO_PHOTO_DARK_ROI, DEMO_PHOTO_ROI } from '../../src/demo/demoScenarios.js';
import { toolVersionInfo } from '../versions.js';

export function register(program: Command): void {
  program
    .command('demo')
    .description('run the whole job on built-in demo data: a liquid before and after purification (all numbers invented)')
    .option('--out <dir>', 'output folder', 'kerrtrace-demo')
    .option('--force', 'replace an output folder written by kerrtrace even if it is not an earlier demo (never any other folder)')
    .option('--quiet', 'no progress')
    .action(action(async (c: { out: string; force?: boolean; quiet?: boolean }) => {
      const started = Date.now();
      const { runDemo } = await import('../../src/demo/runDemo.js');
      const quiet = c.quiet === true;
      let bar: ReturnType<typeof makeProgress> | null = null;
      let barLabel = '';
      const say = (s: string) => {
        bar?.stop();
        bar = null;
        if (!quiet) process.stderr.write(`kerrtrace demo: ${s}…\n`);
      };
      const out = await runDemo({
        outDir: c.out,
        force: c.force === true,
        ...toolVersionInfo(),
        onStage: say,
        onProgress: (label, done, total) => {
          if (quiet) return;
          if (!bar || barLabel !== label) {
            bar?.stop();
            bar = makeProgress(label, quiet);
            barLabel = label;
          }
          bar.update(done, total);
        },
      });
      (bar as ReturnType<typeof makeProgress> | null)?.stop();
      const lines: string[] = [];
      lines.push('');
      lines.push('kerrtrace demo — DEMO DATA: a simulated bench, every number invented');
      lines.push('A candidate Kerr liquid in a 40 mm × 4 mm cell at 532 nm, filmed before and after purification.');
      lines.push('');
      for (const r of out.runs) {
        const res = r.out.result;
        lines.push(`${r.name} purification`);
        lines.push(`  Kerr constant B     ${formatQuantity(res.kerrConstant)}`);
        lines.push(`  half-wave voltage   ${formatQuantity(res.halfWaveVoltage)}`);
        lines.push(`  floor fraction      ${formatQuantity(res.floorFraction)}`);
        lines.push(`  contrast ratio      ${formatQuantity(res.contrastRatio)}`);
        lines.push(`  sync offset         ${formatQuantity(res.syncOffset)}`);
        const ev = res.events.reduce<Record<string, number>>((acc, e) => ({ ...acc, [e.kind]: (acc[e.kind] ?? 0) + 1 }), {});
        if (Object.keys(ev).length) lines.push(`  events              ${Object.entries(ev).map(([k, v]) => `${v} ${k}`).join(', ')}`);
        lines.push(`  report              ${relative(process.cwd(), r.dir)}/report.html`);
      }
      lines.push('');
      lines.push('change between the runs');
      for (const v of out.comparison.verdicts) lines.push(`  ${v}`);
      lines.push(`  report              ${relative(process.cwd(), out.comparisonDir)}/comparison.html`);
      lines.push('');
      lines.push('photos of the after run at twelve voltages, for the photo-series command:');
      lines.push(`  npx kerrtrace stills ${relative(process.cwd(), out.photosDir)} --length-mm 40 --gap-mm 4 --roi ${DEMO_PHOTO_ROI} --dark-roi ${DEMO_PHOTO_DARK_ROI}`);
      lines.push('');
      lines.push(`All files are in ${relative(process.cwd(), out.outDir) || '.'}/ (finished in ${((Date.now() - started) / 1000).toFixed(1)} s).`);
      lines.push('Next: film your own run (docs/recording-a-run.md) and run `npx kerrtrace analyze VIDEO --volts LOG.csv --length-mm L --gap-mm D`.');
      lines.push('Safety: Kerr cells run at lethal voltages and keep their charge; follow local codes and licensed practice.');
      process.stdout.write(`${lines.join('\n')}\n`);
    }));
}
