/**
 * `kerrtrace calibrate-camera INPUT --out PROFILE.json [--angles CSV] [--force] [--json] [--quiet]`:
 * a camera response profile from a calibration recording (a clip or a folder of photos of the beam
 * with the analyser turned through known angles); docs/camera-response.md.
 */
import type { Command } from 'commander';
import { formatNumber } from '../../src/quantity.js';
import { action } from '../action.js';
import { makeProgress } from '../progress.js';
import { toolVersion } from '../toolVersion.js';

interface CalibrateCliOptions {
  out: string;
  angles?: string;
  force?: boolean;
  json?: boolean;
  quiet?: boolean;
}

export function register(program: Command): void {
  program
    .command('calibrate-camera')
    .description('measure the camera\'s response from a clip or photos of the beam with the analyser turned through known angles (docs/camera-response.md)')
    .argument('<input>', 'calibration clip (analyser turned steadily, or in steps with --angles), or a folder of photos named by angle (ang030.jpg)')
    .requiredOption('--out <file>', 'camera profile to write (JSON), for analyze/stills --camera-profile')
    .option('--angles <csv>', 'for a stepped clip: CSV of time_s,angle_deg (0 = analyser parallel), one row per step')
    .option('--force', 'replace an existing camera profile')
    .option('--json', 'print the profile instead of a summary')
    .option('--quiet', 'no progress bar')
    .action(action(async (input: string, opts: CalibrateCliOptions) => {
      const [{ calibrateCamera }, { writeCameraProfile }] = await Promise.all([
        import('../../src/calibrate/calibrateCamera.js'), import('../../src/calibrate/writeCameraProfile.js'),
      ]);
      const { existsSync } = await import('node:fs');
      if (existsSync(opts.out) && !opts.force) {
        // checked again, with the file's kind, when writing; this saves the decoding
        const { KerrError } = await import('../../src/errors.js');
        throw new KerrError('FILE_EXISTS', `${opts.out} already exists`, { path: '--out', hint: 'Choose another --out file, or add --force to replace a camera profile' });
      }
      const progress = makeProgress('calibrating', opts.quiet === true || opts.json === true);
      let outcome;
      try {
        outcome = await calibrateCamera({
          inputPath: input,
          ...(opts.angles !== undefined ? { anglesPath: opts.angles } : {}),
          onProgress: (_stage, done, total) => progress.update(done, total),
        }, { toolVersion: toolVersion(), now: new Date().toISOString() });
      } finally {
        progress.stop();
      }
      await writeCameraProfile(outcome.profile, opts.out, { force: opts.force === true });
      if (opts.json) {
        process.stdout.write(`${JSON.stringify(outcome.profile, null, 2)}\n`);
        return;
      }
      const p = outcome.profile;
      const cam = Object.values(p.camera).join(' ') || 'camera not named in the file';
      process.stdout.write(
        `wrote ${opts.out}: response of ${cam} from ${p.source.points} ${p.source.kind === 'photo-angles' ? 'photos' : 'frames'} (${p.source.kind}` +
          `${p.source.lightPeriodS !== undefined ? `, light period ${formatNumber(p.source.lightPeriodS)} s` : ''}, channel ${p.source.channel})\n` +
          `  codes ${formatNumber(p.codeRange[0])}–${formatNumber(p.codeRange[1])}, fit residual ${formatNumber(p.fit.residualRms * 100)} % of the light range` +
          `${Number.isFinite(p.fit.departureFromTags) ? `, departs from its ${p.decoding.transferTag} tag by up to ${formatNumber(p.fit.departureFromTags * 100)} %` : ''}\n` +
          outcome.notes.map((n) => `  note: ${n}\n`).join(''),
      );
    }));
}
