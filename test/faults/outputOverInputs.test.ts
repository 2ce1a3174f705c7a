/**
 * `--out` equal to, inside, or above every kind of input of every command that writes, directly
 * and through a symbolic link, always with --force, and with the folder above the input made to
 * look like an earlier kerrtrace output (marker file) so that only the input check can save it.
 * Every case must be refused in one line with exit code 2 before any work, touching nothing.
 */
import { copyFileSync, mkdirSync, mkdtempSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { BUILT, FIXTURE_RESULTS, MEDIA, expectOneLine, hashTree, kerrtrace } from './faultHelpers.js';

const clipDir = join(MEDIA, 'sparks-halo', 'run');
const work = mkdtempSync(join(tmpdir(), 'kt-over-'));

/** A folder `name` holding `file` (copied from `from`) and kerrtrace's marker; returns the input path. */
function inputIn(name: string, file: string, from: string): string {
  const dir = join(work, name);
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, '.kerrtrace-output'), 'Written by kerrtrace\n');
  copyFileSync(from, join(dir, file));
  symlinkSync(dir, join(work, `${name}-link`));
  return join(dir, file);
}

const video = inputIn('video', 'clip.mp4', join(clipDir, 'clip.mp4'));
const volts = inputIn('volts', 'volts.csv', join(clipDir, 'volts.csv'));
const open = inputIn('open', 'open.mp4', join(clipDir, 'clip.mp4'));
const baselineFile = inputIn('baseline', 'result.json', join(FIXTURE_RESULTS, 'before', 'result.json'));
const runA = inputIn('runA', 'result.json', join(FIXTURE_RESULTS, 'before', 'result.json'));
const runB = join(FIXTURE_RESULTS, 'after');
const scenario = inputIn('scenario', 'scenario.json', join(clipDir, 'scenario.json'));
const photo = inputIn('photos', 'step01_0kV.jpg', join(clipDir, 'truth.json'));
const voltsMap = inputIn('map', 'voltages.csv', join(clipDir, 'volts.csv'));
const openPhoto = inputIn('openphoto', 'open.jpg', join(clipDir, 'truth.json'));
const trVideo = inputIn('trace', 'clip.mp4', join(clipDir, 'clip.mp4'));

const analyze = (out: string, extra: string[] = []) => ['analyze', video, '--volts', volts, '--length-mm', '45', '--gap-mm', '4.5', ...extra, '--out', out, '--force', '--quiet'];
const stills = (out: string, extra: string[] = []) => ['stills', dirname(photo), '--length-mm', '45', '--gap-mm', '4.5', ...extra, '--out', out, '--force', '--quiet'];

/** [input kind, the input path, the command line for an --out]. */
const kinds: [string, string, (out: string) => string[]][] = [
  ['analyze video', video, (o) => analyze(o)],
  ['analyze --volts', volts, (o) => analyze(o)],
  ['analyze --open-video', open, (o) => analyze(o, ['--open-video', open])],
  ['analyze --baseline (file)', baselineFile, (o) => analyze(o, ['--baseline', baselineFile])],
  ['analyze --baseline (folder)', dirname(baselineFile), (o) => analyze(o, ['--baseline', dirname(baselineFile)])],
  ['compare run (folder)', dirname(runA), (o) => ['compare', dirname(runA), runB, '--out', o, '--force']],
  ['compare run (result.json)', runA, (o) => ['compare', runA, runB, '--out', o, '--force']],
  ['simulate scenario', scenario, (o) => ['simulate', scenario, '--out', o, '--force', '--quiet']],
  ['stills photo folder', dirname(photo), (o) => stills(o)],
  ['stills --volts map', voltsMap, (o) => stills(o, ['--volts', voltsMap])],
  ['stills --open-photo', openPhoto, (o) => stills(o, ['--open-photo', openPhoto])],
  ['trace video', trVideo, (o) => ['trace', trVideo, '--roi', '1,1,8,8', '--out', o, '--force', '--quiet']],
];

describe.skipIf(!BUILT)('--out never equal to, inside or above an input', () => {
  for (const [kind, input, args] of kinds) {
    it(kind, () => {
      const before = hashTree(work);
      const isFolder = kind.endsWith('(folder)') || kind === 'stills photo folder';
      const folder = isFolder ? input : dirname(input);
      const link = join(work, `${folder.split('/').pop()!}-link`);
      const file = input.split('/').pop()!;
      const refused = /is or holds one of the inputs|is the input|lies inside the input folder|goes through the file .* as if it were a folder|is a folder/;
      // equal, inside, above; then the same through a symbolic link to the input's folder.
      const outs: [string, RegExp][] = (isFolder
        ? [input, join(input, 'sub'), work, link, join(link, 'sub')]
        : [input, join(input, 'sub'), folder, link, join(link, file), join(link, file, 'sub')]
      ).map((o) => [o, refused]);
      for (const [out, pattern] of outs) {
        const r = kerrtrace(args(out), { env: { KERRTRACE_FFPROBE: '/nonexistent/ffprobe', KERRTRACE_FFMPEG: '/nonexistent/ffmpeg' } });
        expectOneLine({ ...r, stderr: r.stderr || `(nothing on stderr for --out ${out}, exit ${r.code})` }, 2, pattern);
      }
      expect(hashTree(work)).toEqual(before);
    });
  }
});
