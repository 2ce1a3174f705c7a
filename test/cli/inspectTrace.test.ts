/**
 * The real command line (`node bin/kerrtrace.js`, which runs the compiled dist/: `npm test`
 * compiles first; run `npx tsc -p .` before running this file alone).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, writeFileSync, mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { ffprobeDecodedFrameCount, ffprobeStreams, makeClip, tempDir } from '../helpers/makeClip.js';
import { parseRate } from '../../src/media/probe.js';
import { cliEnv } from '../helpers/cliEnv.js';
import { OUTSIDE } from '../setup/outsideSources.js';

const BIN = resolve(__dirname, '../../bin/kerrtrace.js');

function cli(args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8', env: cliEnv() });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** One line on stderr, non-zero exit, no stack trace. */
function expectOneLineError(r: ReturnType<typeof cli>, pattern: RegExp): void {
  expect(r.status).not.toBe(0);
  const lines = r.stderr.trimEnd().split('\n');
  expect(lines.length).toBe(1);
  expect(lines[0]).toMatch(/^kerrtrace: /);
  expect(lines[0]).toMatch(pattern);
  expect(r.stderr).not.toMatch(/^\s+at /m);
  expect(r.stdout).toBe('');
}

describe('kerrtrace inspect', () => {
  let tmp: Awaited<ReturnType<typeof tempDir>>;
  beforeAll(async () => { tmp = await tempDir('cli-inspect'); });
  afterAll(async () => { await tmp.cleanup(); });

  const clips = [
    { name: 'a.mp4', spec: { width: 160, height: 120, fps: 30, durationS: 1 } },
    { name: 'b.mp4', spec: { width: 320, height: 180, fps: 24, durationS: 1.5 } },
    { name: 'c.mp4', spec: { width: 176, height: 144, fps: 50, durationS: 0.6, rotate: 90 } },
    { name: 'd.mp4', spec: { width: 160, height: 120, fps: 30, durationS: 1.5, vfr: true as const } },
  ];
  it.each(clips)('--json agrees with ffprobe for $name', { tags: [OUTSIDE.ffprobe] }, async ({ name, spec }) => {
    const clip = await makeClip(tmp.dir, name, spec);
    const r = cli(['inspect', clip, '--json']);
    expect(r.status).toBe(0);
    const info = JSON.parse(r.stdout) as Record<string, unknown>;
    const ref = (await ffprobeStreams(clip)).streams[0]!;
    const turned = 'rotate' in spec;
    expect([info.width, info.height]).toEqual(turned ? [ref.height, ref.width] : [ref.width, ref.height]);
    expect(info.rotationDeg).toBe(turned ? ((-(ref.side_data_list![0]!.rotation!) % 360) + 360) % 360 : 0);
    expect(info.frameCount).toBe(await ffprobeDecodedFrameCount(clip));
    expect(info.nominalFps).toBeCloseTo(parseRate(ref.r_frame_rate)!, 6);
    expect(info.variableFrameRate).toBe('vfr' in spec);
    expect(info.durationS).toBeCloseTo(Number(ref.duration), 5);
  });

  it('prints a readable summary by default', async () => {
    const clip = await makeClip(tmp.dir, 'e.mp4', { width: 160, height: 120, fps: 30, durationS: 1, rotate: 90 });
    const r = cli(['inspect', clip]);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/frame size\s+120x160 as displayed/);
    expect(r.stdout).toMatch(/frames\s+30/);
    expect(r.stdout).toMatch(/constant/);
  });

  it('refuses a missing file in one line', () => {
    expectOneLineError(cli(['inspect', join(tmp.dir, 'missing.mp4')]), /no file at .*missing\.mp4.*Check/);
  });
});

describe('kerrtrace trace', () => {
  let tmp: Awaited<ReturnType<typeof tempDir>>;
  let clip: string;
  beforeAll(async () => {
    tmp = await tempDir('cli-trace');
    clip = await makeClip(tmp.dir, 'clip.mp4', { width: 160, height: 120, fps: 20, durationS: 1, tags: { range: 'tv', matrix: 'bt709', transfer: 'iec61966-2-1' } });
  });
  afterAll(async () => { await tmp.cleanup(); });

  it('writes the per-frame CSV to stdout', () => {
    const r = cli(['trace', clip, '--roi', '10,10,20,20', '--roi', '60,40,10,10', '--dark-roi', '0,0,6,6', '--quiet']);
    expect(r.status).toBe(0);
    const lines = r.stdout.trimEnd().split('\n');
    expect(lines[0]).toBe('time_s,frame,roi1_luma,roi1_r,roi1_g,roi1_b,roi1_clipped_fraction,roi2_luma,roi2_r,roi2_g,roi2_b,roi2_clipped_fraction,dark_luma,dark_r,dark_g,dark_b,dark_clipped_fraction');
    expect(lines.length).toBe(21);
    expect(Number(lines[2]!.split(',')[0])).toBeCloseTo(0.05, 6);
    expect(r.stderr).toBe('');
  });

  it('writes --out, refuses to overwrite it without --force, replaces it with --force', () => {
    const out = join(tmp.dir, 'trace.csv');
    const first = cli(['trace', clip, '--roi', '10,10,20,20', '--out', out, '--transfer', 'bt709']);
    expect(first.status).toBe(0);
    expect(first.stdout).toBe('');
    const written = readFileSync(out, 'utf8');
    expect(written.split('\n')[0]).toMatch(/^time_s,frame,roi1_luma/);
    writeFileSync(out, 'keep me');
    expectOneLineError(cli(['trace', clip, '--roi', '10,10,20,20', '--out', out]), /already exists.*--force/);
    expect(readFileSync(out, 'utf8')).toBe('keep me');
    writeFileSync(join(tmp.dir, 'neighbour.csv'), 'time_s\n0\n');
    expect(cli(['trace', clip, '--roi', '10,10,20,20', '--out', out, '--transfer', 'bt709', '--force', '--quiet']).status).toBe(0);
    expect(readFileSync(out, 'utf8')).toBe(written); // 'keep me' really was replaced by the trace
    expect(readFileSync(join(tmp.dir, 'neighbour.csv'), 'utf8')).toBe('time_s\n0\n'); // nothing else touched
    expect(readdirSync(tmp.dir).filter((f) => f.includes('.partial-'))).toEqual([]);
  });

  describe('bad input: one line naming the problem and the fix, non-zero exit, nothing written', () => {
    let dir: string;
    let n = 0;
    beforeAll(() => {
      dir = join(tmp.dir, 'bad');
      mkdirSync(dir);
    });

    async function badCase(args: (out: string) => string[], pattern: RegExp): Promise<void> {
      const out = join(dir, `out-${n++}.csv`);
      const r = cli(args(out));
      expectOneLineError(r, pattern);
      expect(existsSync(out)).toBe(false);
      expect(readdirSync(dir).filter((f) => f.includes('.csv'))).toEqual([]);
    }

    it('a missing file', async () => {
      await badCase((out) => ['trace', join(tmp.dir, 'nope.mp4'), '--roi', '1,1,4,4', '--out', out], /no file at .*nope\.mp4\. Check/);
    });

    it('a text file', async () => {
      const text = join(tmp.dir, 'volts.csv');
      writeFileSync(text, 'time_s,voltage_V\n0,0\n');
      await badCase((out) => ['trace', text, '--roi', '1,1,4,4', '--out', out], /could not be read as a video.*Give a video file/);
    });

    it('an empty file', async () => {
      const empty = join(tmp.dir, 'empty.mp4');
      writeFileSync(empty, '');
      await badCase((out) => ['trace', empty, '--roi', '1,1,4,4', '--out', out], /is empty \(0 bytes\).*copy it again/);
    });

    it('an MP4 cut in half (index in front): says how many frames were read of how many', async () => {
      const cut = await makeClip(tmp.dir, 'cut.mp4', { width: 160, height: 120, fps: 30, durationS: 3, truncateFraction: 0.5 });
      await badCase((out) => ['trace', cut, '--roi', '1,1,4,4', '--out', out], /ends early: read \d+ of 90 frames.*copy it again/);
    });

    it('an MP4 cut in half (index at the end)', async () => {
      const cut = await makeClip(tmp.dir, 'cut2.mp4', { width: 160, height: 120, fps: 30, durationS: 3, truncateFraction: 0.5, faststart: false });
      await badCase((out) => ['trace', cut, '--roi', '1,1,4,4', '--out', out], /without its index .*cut short/);
    });

    it('a region outside the frame', async () => {
      await badCase((out) => ['trace', clip, '--roi', '150,100,20,30', '--out', out], /--roi .*outside the 160x120 frame.*Keep x\+w/);
    });

    it('a region of zero size', async () => {
      await badCase((out) => ['trace', clip, '--roi', '10,10,0,5', '--out', out], /positive width and height for --roi.*received "10,10,0,5"/);
    });

    it('a malformed region', async () => {
      await badCase((out) => ['trace', clip, '--dark-roi', '10,10,5', '--roi', '1,1,2,2', '--out', out], /x,y,w,h.*--dark-roi.*received "10,10,5"/);
    });

    it('no region at all', async () => {
      await badCase((out) => ['trace', clip, '--out', out], /no region to trace.*--roi/);
    });

    it('an unknown transfer curve', async () => {
      await badCase((out) => ['trace', clip, '--roi', '1,1,2,2', '--transfer', 'log', '--out', out], /--transfer.*"log"/);
    });
  });
});
