/**
 * `kerrtrace simulate SCENARIO.json --out DIR [--force] [--seed N] [--quiet]`: renders synthetic
 * bench footage with known truth (clip.mp4, volts.csv, truth.json, scenario.json) from the physical
 * parameters in a scenario file (docs/scenario.md).
 */
import type { Command } from 'commander';
import { parseWholeNumberOption } from '../optionParsers.js';
import { formatNumber } from '../../src/quantity.js';
import { action } from '../action.js';
import { makeProgress } from '../progress.js';

interface SimulateCliOptions {
  out: string;
  force?: boolean;
  seed?: string;
  quiet?: boolean;
}

function parseSeed(text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  return parseWholeNumberOption(text, '--seed', 'a whole number', -Number.MAX_SAFE_INTEGER, Number.MAX_SAFE_INTEGER, 'Give an integer seed, e.g. --seed 7');
}

export function register(program: Command): void {
  program
    .command('simulate')
    .description('render synthetic bench footage with known truth from a scenario file (docs/scenario.md)')
    .argument('<scenario>', 'scenario JSON file, e.g. scenarios/example-ramp.json')
    .requiredOption('--out <dir>', 'output folder for clip.mp4, volts.csv, truth.json and scenario.json')
    .option('--force', 'replace an existing folder written by kerrtrace (never one holding other files or the scenario)')
    .option('--seed <n>', 'use this random seed instead of the scenario\'s')
    .option('--quiet', 'print nothing except errors')
    .action(action(async (scenarioPath: string, opts: SimulateCliOptions) => {
      const seed = parseSeed(opts.seed);
      // The renderer loads only when the command runs, so that `kerrtrace --help` starts quickly.
      const [{ readScenarioFile }, { simulateRun }] = await Promise.all([import('../../src/sim/readScenarioFile.js'), import('../../src/sim/simulate.js')]);
      const scenario = await readScenarioFile(scenarioPath, seed === undefined ? {} : { seed });
      const progress = makeProgress('rendering', opts.quiet === true);
      let summary;
      try {
        summary = await simulateRun(scenario, opts.out, { force: opts.force === true, inputs: [scenarioPath], onProgress: (done, total) => progress.update(done, total) });
      } finally {
        progress.stop();
      }
      if (opts.quiet) return;
      const truth = summary.truth;
      const rate = summary.variableFrameRate ? 'variable frame rate' : `${formatNumber(Number((truth.camera as { frameRateHz: number }).frameRateHz))} fps`;
      process.stdout.write(
        `wrote ${summary.outDir}: clip.mp4 (${summary.frameCount} frames, ${formatNumber(summary.durationS)} s, ${rate}), ` +
          `volts.csv (${summary.logRows} rows), truth.json, scenario.json\n` +
          `  B ${formatNumber(scenario.cell.kerrConstantMPerV2)} m/V^2, half-wave voltage ${formatNumber(summary.halfWaveVoltageV / 1e3)} kV, ` +
          `drive peak ${formatNumber(Number(truth.maxVoltageOverHalfWave))} x V_pi, log offset ${formatNumber(scenario.logger.clockOffsetS)} s, ` +
          `floor fraction ${formatNumber(Number(truth.floorFraction))}\n`,
      );
    }));
}
