import { spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { KerrError } from '../../src/errors.js';
import { ffmpegPath, ffprobePath } from '../../src/media/ffmpegPaths.js';
import { parseScenario } from '../../src/sim/scenario.js';
import { simulateRun } from '../../src/sim/simulate.js';
import { makeCodeEncoder, srgbDecode } from '../../src/sim/transfer.js';
import { cliEnv } from '../helpers/cliEnv.js';

const work = mkdtempSync(join(tmpdir(), 'kerrtrace-sim-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** A tiny noiseless CFR bench with a grey card: 160×120, 30 fps, 2 s. */
const cfrJson = () => ({
  seed: 3,
  cell: { kerrConstantMPerV2: 2.4e-12, lengthMm: 40, gapMm: 4 },
  light: { sigmaPx: 6, centreXPx: 100, centreYPx: 50, amplitude: 0.6 },
  dirt: { scatterFloor: 0.003, haloPeak: 0.002, haloSigmaPx: 40 },
  camera: {
    widthPx: 160, heightPx: 120, frameRateHz: 30, photonsPerFullScale: 0, readNoise: 0, crf: 16,
    referencePatch: { xPx: 8, yPx: 72, widthPx: 40, heightPx: 40, radiance: 0.2 },
  },
  drive: { segments: [{ kind: 'hold', durationS: 0.3 }, { kind: 'ramp', toHalfWaveFraction: 1, durationS: 1.2 }, { kind: 'hold', durationS: 0.5 }] },
  logger: { sampleRateHz: 10, clockOffsetS: 0.25 },
});

/** A noisy VFR bench: 160×120, intervals of 1–3 ticks of 1/60 s, 3 s, with a spark and a particle. */
const vfrJson = () => ({
  seed: 21,
  cell: { kerrConstantMPerV2: 3e-12, lengthMm: 30, gapMm: 3 },
  light: { sigmaPx: 5, amplitude: 0.5 },
  dirt: { particles: { count: 1, durationS: 0.3 }, sparks: { timesS: [1.234] } },
  camera: { widthPx: 160, heightPx: 120, variableFrameRate: { tickHz: 60, minTicks: 1, maxTicks: 3 }, readNoise: 0.002 },
  drive: { points: [{ timeS: 0, voltageV: 0 }, { timeS: 2, voltageV: 7000 }, { timeS: 3, voltageV: 7000 }] },
  logger: { sampleRateHz: 8, clockOffsetS: -0.5, delimiter: ';', decimalComma: true },
});

function packetTimes(path: string): number[] {
  const r = spawnSync(ffprobePath(), ['-v', 'error', '-select_streams', 'v:0', '-show_entries', 'packet=pts_time', '-of', 'csv=p=0', path], { encoding: 'utf8' });
  expect(r.status).toBe(0);
  return r.stdout.split('\n').filter((l) => l.trim()).map(Number).sort((a, b) => a - b);
}

function streamTags(path: string): Record<string, string> {
  const r = spawnSync(ffprobePath(), ['-v', 'error', '-select_streams', 'v:0', '-show_entries', 'stream=codec_name,pix_fmt,color_range,color_space,color_transfer,color_primaries,width,height', '-of', 'default=nw=1', path], { encoding: 'utf8' });
  return Object.fromEntries(r.stdout.trim().split('\n').map((l) => l.split('=') as [string, string]));
}

/** Decoded frames as planar yuv420p (ffmpeg), one Buffer per frame. */
function decodeYuv(path: string, w: number, h: number): Buffer[] {
  const r = spawnSync(ffmpegPath(), ['-v', 'error', '-i', path, '-f', 'rawvideo', '-pix_fmt', 'yuv420p', '-vsync', 'passthrough', 'pipe:1'], { maxBuffer: 1 << 30 });
  const size = (w * h * 3) / 2;
  const frames: Buffer[] = [];
  for (let o = 0; o + size <= r.stdout.length; o += size) frames.push(r.stdout.subarray(o, o + size));
  return frames;
}

/** R'G'B' code values (0–255) of pixel (x, y) from limited-range BT.709 Y'CbCr (ITU-R BT.709-6 matrix). */
function rgbAt(frame: Buffer, w: number, h: number, x: number, y: number): [number, number, number] {
  const yy = (frame[y * w + x]! - 16) / 219;
  const cb = (frame[w * h + (y >> 1) * (w >> 1) + (x >> 1)]! - 128) / 224;
  const cr = (frame[w * h + (w * h) / 4 + (y >> 1) * (w >> 1) + (x >> 1)]! - 128) / 224;
  return [yy + 1.5748 * cr, yy - 0.1873 * cb - 0.4681 * cr, yy + 1.8556 * cb].map((v) => v * 255) as [number, number, number];
}

describe('simulateRun (writes clip.mp4, volts.csv, truth.json, scenario.json)', () => {
  const cfrDir = join(work, 'cfr');
  let cfrTruth: Record<string, unknown>;

  it('writes a CFR clip whose ffprobe packet times and count match truth.frameTimesS', async () => {
    const progress: number[] = [];
    const summary = await simulateRun(parseScenario(cfrJson(), 'cfr.json'), cfrDir, { onProgress: (done, total) => progress.push(done / total) });
    expect(readdirSync(cfrDir).sort()).toEqual(['.kerrtrace-output', 'clip.mp4', 'scenario.json', 'truth.json', 'volts.csv']);
    cfrTruth = JSON.parse(readFileSync(join(cfrDir, 'truth.json'), 'utf8')) as Record<string, unknown>;
    const planned = cfrTruth.frameTimesS as number[];
    expect(planned.length).toBe(60);
    expect(summary.frameCount).toBe(60);
    const probed = packetTimes(join(cfrDir, 'clip.mp4'));
    expect(probed.length).toBe(planned.length);
    for (let k = 0; k < planned.length; k++) expect(Math.abs(probed[k]! - planned[k]!)).toBeLessThan(5e-4);
    expect(progress[progress.length - 1]).toBe(1);
    expect(progress.length).toBe(60);
  });

  it('tags the stream H.264 yuv420p, limited range, BT.709 matrix and primaries, sRGB transfer', () => {
    expect(streamTags(join(cfrDir, 'clip.mp4'))).toMatchObject({
      codec_name: 'h264', pix_fmt: 'yuv420p', color_range: 'tv', color_space: 'bt709', color_primaries: 'bt709', color_transfer: 'iec61966-2-1', width: '160', height: '120',
    });
  });

  it('round-trips the flat grey card through the BT.709 limited-range encode within ±2 code values', () => {
    const frames = decodeYuv(join(cfrDir, 'clip.mp4'), 160, 120);
    expect(frames.length).toBe(60);
    const expected = makeCodeEncoder('srgb').encode(0.2); // noiseless, gain 1: the card's sRGB code
    for (const k of [0, 30, 59]) {
      for (const [x, y] of [[20, 84], [28, 92], [40, 100]] as const) {
        for (const c of rgbAt(frames[k]!, 160, 120, x, y)) expect(Math.abs(c - expected)).toBeLessThanOrEqual(2);
      }
    }
    const ref = cfrTruth.referenceRoi as number[];
    expect(ref).toEqual([10, 74, 36, 36]);
  });

  it('shows the beam at ambient + G·w·(A·T + F + leak) + H·w·S once decoded and linearised (sRGB, IEC 61966-2-1)', () => {
    const frames = decodeYuv(join(cfrDir, 'clip.mp4'), 160, 120);
    const volts = cfrTruth.frameVoltagesV as number[];
    const levels = cfrTruth.levels as Record<string, number>;
    const weightG = (cfrTruth.light as { channelWeights: number[] }).channelWeights[1]!;
    const halfWaveV = cfrTruth.halfWaveVoltageV as number;
    for (const k of [5, 20, 30, 40, 55]) {
      const t = Math.sin((Math.PI * (volts[k]! / halfWaveV) ** 2) / 2) ** 2; // crossed at 45°: sin²(δ/2)
      let model = 0;
      let measured = 0;
      for (let y = 46; y <= 54; y++) {
        for (let x = 96; x <= 104; x++) {
          const r2 = (x - 100) ** 2 + (y - 50) ** 2;
          const beam = Math.exp(-r2 / (2 * 6 * 6));
          const halo = Math.exp(-r2 / (2 * 40 * 40));
          model += levels.ambient! + weightG * (beam * (levels.amplitude! * t + levels.scatterFloor! + levels.polariserLeak!) + halo * levels.haloPeak!);
          measured += srgbDecode(Math.min(255, Math.max(0, rgbAt(frames[k]!, 160, 120, x, y)[1])) / 255);
        }
      }
      expect(Math.abs(measured - model) / model).toBeLessThan(0.02);
    }
  });

  it('states the truth figures from the planted parameters', () => {
    const halfWaveV = 0.004 / Math.sqrt(2 * 2.4e-12 * 0.04);
    expect(cfrTruth.B).toBe(2.4e-12);
    expect(cfrTruth.halfWaveVoltageV as number).toBeCloseTo(halfWaveV, 3);
    expect(cfrTruth.offsetS).toBe(0.25);
    expect(cfrTruth.floorFraction as number).toBeCloseTo((0.003 + 0.6 / 10000) / 0.6, 10);
    expect(cfrTruth.maxVoltageOverHalfWave as number).toBeCloseTo(1, 9);
    expect(cfrTruth.roi).toEqual([85, 35, 31, 31]);
    expect(cfrTruth.contrastRatio as number).toBeCloseTo((0.6 + 0.00306) / 0.00306, 6);
    const log = readFileSync(join(cfrDir, 'volts.csv'), 'utf8').split('\n');
    expect(log[0]).toBe('time_s,voltage_V');
    expect(JSON.parse(readFileSync(join(cfrDir, 'scenario.json'), 'utf8'))).toEqual(cfrJson());
  });

  it('refuses to overwrite a folder that holds files without force, and replaces a folder it wrote with it', async () => {
    const before = statSync(join(cfrDir, 'clip.mp4')).mtimeMs;
    const err = await simulateRun(parseScenario(cfrJson(), 'cfr.json'), cfrDir).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(KerrError);
    expect((err as KerrError).code).toBe('FILE_EXISTS');
    expect((err as KerrError).oneLine()).toContain('--force');
    expect(statSync(join(cfrDir, 'clip.mp4')).mtimeMs).toBe(before);
    // --force replaces the folder whole, so never one holding a file the simulator did not write.
    writeFileSync(join(cfrDir, 'notes.txt'), 'mine');
    const refused = await simulateRun(parseScenario({ ...cfrJson(), seed: 4 }, 'cfr.json'), cfrDir, { force: true }).catch((e: unknown) => e);
    expect((refused as KerrError).oneLine()).toMatch(/did not write \(notes\.txt\)/);
    expect(readFileSync(join(cfrDir, 'notes.txt'), 'utf8')).toBe('mine');
    rmSync(join(cfrDir, 'notes.txt'));
    await simulateRun(parseScenario({ ...cfrJson(), seed: 4 }, 'cfr.json'), cfrDir, { force: true });
    expect(JSON.parse(readFileSync(join(cfrDir, 'truth.json'), 'utf8')).seed).toBe(4);
    expect(readdirSync(work).filter((f) => f.includes('.partial-') || f.includes('.backup-'))).toEqual([]);
  });

  it('writes a VFR clip whose ffprobe packet times match the planned tick times', async () => {
    const dir = join(work, 'vfr');
    const summary = await simulateRun(parseScenario(vfrJson(), 'vfr.json'), dir);
    const truth = JSON.parse(readFileSync(join(dir, 'truth.json'), 'utf8')) as Record<string, unknown>;
    const planned = truth.frameTimesS as number[];
    const probed = packetTimes(join(dir, 'clip.mp4'));
    expect(summary.variableFrameRate).toBe(true);
    expect(probed.length).toBe(planned.length);
    for (let k = 0; k < planned.length; k++) expect(Math.abs(probed[k]! - planned[k]!)).toBeLessThan(5e-4);
    const steps = new Set<number>();
    for (let k = 1; k < planned.length; k++) steps.add(Math.round((planned[k]! - planned[k - 1]!) * 60));
    expect([...steps].sort()).toEqual([1, 2, 3]);
    expect(truth.sparks).toEqual([{ timeS: 1.234, frameIndex: planned.filter((t) => t <= 1.234).length - 1 }]);
    expect((truth.particles as unknown[]).length).toBe(1);
    expect(readFileSync(join(dir, 'volts.csv'), 'utf8').split('\n')[1]).toMatch(/^-?\d+,\d+;-?\d+,\d$/);
  });

  it('gives the same raw frames for the same seed and different ones for another seed', async () => {
    const noisy = () => ({ ...cfrJson(), durationS: 0.5, camera: { ...cfrJson().camera, readNoise: 0.002 } });
    const a = await simulateRun(parseScenario(noisy(), 'a.json'), join(work, 'seed-a'));
    const b = await simulateRun(parseScenario(noisy(), 'b.json'), join(work, 'seed-b'));
    const c = await simulateRun(parseScenario({ ...noisy(), seed: 99 }, 'c.json'), join(work, 'seed-c'));
    expect(a.rawFramesSha256).toMatch(/^[0-9a-f]{64}$/);
    expect(b.rawFramesSha256).toBe(a.rawFramesSha256);
    expect(c.rawFramesSha256).not.toBe(a.rawFramesSha256);
    expect(readFileSync(join(work, 'seed-b', 'volts.csv'), 'utf8')).toBe(readFileSync(join(work, 'seed-a', 'volts.csv'), 'utf8'));
  });

  it('refuses a scenario it cannot render before touching the disk', () => {
    const dir = join(work, 'refused');
    const json = { ...vfrJson(), camera: { ...vfrJson().camera, readNoise: 0, photonsPerFullScale: 0 } };
    expect(() => parseScenario(json, 'f.json')).toThrow(KerrError);
    expect(existsSync(dir)).toBe(false);
  });

  it('leaves nothing behind when a run fails part-way (the encoder dies after the first frames)', () => {
    // A stand-in ffmpeg that answers -version like ffmpeg, then reads some frames and dies, as a
    // crashing encoder or a full disk would. Run through the real command line, so the failure
    // happens inside simulate after its staging folder exists.
    const fake = join(work, 'dying-ffmpeg.cjs');
    writeFileSync(fake, [
      '#!/usr/bin/env node',
      "if (process.argv.includes('-version')) { process.stdout.write('ffmpeg version 0.0-dying\\n'); process.exit(0); }",
      'let got = 0;',
      "process.stdin.on('data', (b) => { got += b.length; if (got > 200000) { process.stderr.write('dying on purpose\\n'); process.exit(1); } });",
      "process.stdin.on('end', () => process.exit(1));",
    ].join('\n'));
    chmodSync(fake, 0o755);
    const parent = mkdtempSync(join(work, 'fails-'));
    const scenario = join(parent, 'scenario.json');
    writeFileSync(scenario, JSON.stringify(cfrJson()));
    const out = join(parent, 'run');
    const env = cliEnv({ KERRTRACE_FFMPEG: fake });
    const r = spawnSync(process.execPath, [join(__dirname, '..', '..', 'bin', 'kerrtrace.js'), 'simulate', scenario, '--out', out, '--quiet'], { encoding: 'utf8', env, timeout: 240_000 });
    expect(r.status).not.toBe(0);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/^kerrtrace: /);
    expect(existsSync(out)).toBe(false); // no output folder
    expect(readdirSync(parent)).toEqual(['scenario.json']); // no staging folder left over either
  });
});
