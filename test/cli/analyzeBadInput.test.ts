/**
 * Bad inputs on the video path of `kerrtrace analyze`, through the real command line: a text file
 * named .mp4, an audio-only file, a still image, a recording cut short, a missing log and a binary
 * log. Each must give one line on stderr that names the problem, a non-zero exit, no stack trace,
 * and write nothing (no output folder, no staging folder left beside it). Needs dist/
 * (`npx tsc -p tsconfig.json`; `npm test` builds it).
 */
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, statSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TEST_MEDIA, expectOneLineError, inBatches, kerrtraceCli, requireBuiltCli, type CliRun } from '../helpers/cliRun.js';
import { ffmpeg } from '../helpers/makeClip.js';
import { seededRandom } from '../helpers/random.js';

const CASE = join(TEST_MEDIA, 'cfr-ramp', 'run');
const CLIP = join(CASE, 'clip.mp4');
const VOLTS = join(CASE, 'volts.csv');
const GEOMETRY = ['--length-mm', '50', '--gap-mm', '5'];

interface BadCase {
  name: string;
  /** Makes the inputs in `dir`; returns [video, log]. */
  make: (dir: string) => Promise<[string, string]>;
  pattern: RegExp;
  exitCode: number;
}

const CASES: BadCase[] = [
  {
    name: 'a text file named .mp4',
    make: async (dir) => {
      const p = join(dir, 'notes.mp4');
      writeFileSync(p, 'time_s,voltage_V\n0,0\n1,100\n');
      return [p, VOLTS];
    },
    pattern: /notes\.mp4 could not be read as a video.*Give a video file/,
    exitCode: 2,
  },
  {
    name: 'an audio-only file',
    make: async (dir) => {
      const p = join(dir, 'sound.mp4');
      // a 2 s tone from ffmpeg's lavfi sine source, AAC in MP4: a valid file with no picture
      await ffmpeg(['-f', 'lavfi', '-i', 'sine=frequency=440:duration=2', '-c:a', 'aac', p]);
      return [p, VOLTS];
    },
    pattern: /sound\.mp4 has no video stream/,
    exitCode: 2,
  },
  {
    name: 'a still image',
    make: async (dir) => {
      const p = join(dir, 'photo.png');
      await ffmpeg(['-f', 'lavfi', '-i', 'testsrc=size=240x180', '-frames:v', '1', p]);
      return [p, VOLTS];
    },
    pattern: /photo\.png is a still image.*kerrtrace stills/,
    exitCode: 2,
  },
  {
    name: 'a recording cut short',
    make: async (dir) => {
      const p = join(dir, 'cut.mp4');
      copyFileSync(CLIP, p);
      truncateSync(p, Math.floor(statSync(p).size * 0.4)); // the index is at the front (faststart)
      return [p, VOLTS];
    },
    pattern: /cut\.mp4 ends early: read \d+ of 300 frames.*cut short or damaged/,
    exitCode: 2,
  },
  {
    name: 'a missing log',
    make: async (dir) => [CLIP, join(dir, 'no-such-log.csv')],
    pattern: /no-such-log\.csv does not exist/,
    exitCode: 2,
  },
  {
    name: 'a binary log',
    make: async (dir) => {
      const p = join(dir, 'logger.csv');
      // a zip signature, then bytes of every value (NUL and control codes included), seeded
      const rnd = seededRandom(7);
      const bytes = Buffer.from(Array.from({ length: 4096 }, () => Math.floor(rnd() * 256)));
      writeFileSync(p, Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04]), bytes]));
      return [CLIP, p];
    },
    pattern: /logger\.csv is not a text CSV file/,
    exitCode: 2,
  },
];

let work: string;
const results = new Map<string, { dir: string; out: string; cli: CliRun; before: string[] }>();

beforeAll(async () => {
  requireBuiltCli();
  work = mkdtempSync(join(tmpdir(), 'kt-analyze-bad-'));
  await inBatches(CASES.map((c, k) => async () => {
    const dir = join(work, `case${k}`);
    mkdirSync(dir);
    const [video, log] = await c.make(dir);
    const out = join(dir, 'out');
    const before = readdirSync(dir).sort();
    const cli = await kerrtraceCli(['analyze', video, '--volts', log, ...GEOMETRY, '--out', out, '--quiet']);
    results.set(c.name, { dir, out, cli, before });
  }));
}, 300_000);

afterAll(() => rmSync(work, { recursive: true, force: true }));

describe('analyze refuses bad inputs on the video path', () => {
  for (const c of CASES) {
    it(`${c.name}: one line, exit ${c.exitCode}, no stack trace, nothing written`, () => {
      const r = results.get(c.name)!;
      expectOneLineError(r.cli, c.pattern);
      expect(r.cli.code).toBe(c.exitCode);
      expect(r.cli.stderr.startsWith('kerrtrace: ')).toBe(true);
      // nothing that would garble a terminal: no raw control characters besides the final newline
      expect(r.cli.stderr.trimEnd()).not.toMatch(/[\u0000-\u0008\u000b-\u001f\u007f]/);
      expect(r.cli.stdout).toBe('');
      expect(existsSync(r.out)).toBe(false);
      expect(readdirSync(r.dir).sort()).toEqual(r.before); // no staging folder left behind either
    });
  }
});
