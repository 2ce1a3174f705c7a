/**
 * The analyze options that bring in outside brightness information, through the real command line:
 * the three ways to give the open level (--open-video, --open-level, --open-window) on the project's
 * low sweep (test-media/low-sweep: the drive reaches 0.45·V_π, B = 2.0e-12 m/V², L = 40 mm,
 * d = 4 mm; open/ renders the same bench with the analyser parallel and no field), and the exposure
 * reference (--reference-roi) on the auto-exposing phone clip (test-media/vfr-phone, truth
 * referenceRoi 14,132,36,32). The truth is the project's own simulator's (docs/scenario.md): the truth
 * checks are end-to-end self-consistency of simulate → analyze; the median is recomputed here with
 * simple-statistics. Needs dist/ (`npx tsc -p tsconfig.json`; `npm test` builds it).
 */
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { quantileSorted, sampleStandardDeviation } from 'simple-statistics';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TEST_MEDIA, inBatches, kerrtraceCli, readResultJson, readTraceCsv, requireBuiltCli, type CliRun } from '../helpers/cliRun.js';
import { ffmpeg } from '../helpers/makeClip.js';

const LOW = join(TEST_MEDIA, 'low-sweep');
const LOW_TRUTH = JSON.parse(readFileSync(join(LOW, 'run', 'truth.json'), 'utf8')) as { kerrConstantMPerV2: number; offsetS: number; frameCount: number; durationS: number };
const OPEN_TRUTH = JSON.parse(readFileSync(join(LOW, 'open', 'truth.json'), 'utf8')) as { frameCount: number; durationS: number };
const PHONE = join(TEST_MEDIA, 'vfr-phone', 'run');
const PHONE_TRUTH = JSON.parse(readFileSync(join(PHONE, 'truth.json'), 'utf8')) as { kerrConstantMPerV2: number; referenceRoi: number[] };

let work: string;
const runs: Record<string, { dir: string; cli: CliRun }> = {};

async function analyze(name: string, args: string[]): Promise<void> {
  const dir = join(work, name);
  runs[name] = { dir, cli: await kerrtraceCli(['analyze', ...args, '--out', dir, '--quiet', '--no-report', '--no-maps']) };
}

function ok(name: string) {
  const r = runs[name]!;
  expect(r.cli.stderr, `${name}: ${r.cli.stderr}`).toBe('');
  expect(r.cli.code).toBe(0);
  return { result: readResultJson(r.dir), dir: r.dir };
}

// The beam region of truth.json for all three, so that the open clip is measured on the same
// pixels whichever way it comes in.
const LOW_ROI = (JSON.parse(readFileSync(join(LOW, 'run', 'truth.json'), 'utf8')) as { roi: number[] }).roi.join(',');
const low = ['--volts', join(LOW, 'run', 'volts.csv'), '--length-mm', '40', '--gap-mm', '4', '--roi', LOW_ROI];
const phone = [join(PHONE, 'clip.mp4'), '--volts', join(PHONE, 'volts.csv'), '--length-mm', '30', '--gap-mm', '3'];
// the open clip follows the run clip: its frames are the seconds [run duration, run + open duration]
const OPEN_WINDOW: [number, number] = [LOW_TRUTH.durationS, LOW_TRUTH.durationS + OPEN_TRUTH.durationS];

beforeAll(async () => {
  requireBuiltCli();
  work = mkdtempSync(join(tmpdir(), 'kt-analyze-open-'));
  // One recording with the open level at its end: the run clip, then the open clip, joined by
  // ffmpeg's concat demuxer without re-encoding (same camera settings, so the streams match).
  const list = join(work, 'list.txt');
  writeFileSync(list, `file '${join(LOW, 'run', 'clip.mp4')}'\nfile '${join(LOW, 'open', 'clip.mp4')}'\n`);
  await ffmpeg(['-f', 'concat', '-safe', '0', '-i', list, '-c', 'copy', join(work, 'joined.mp4')]);
  await inBatches([
    () => analyze('openVideo', [join(LOW, 'run', 'clip.mp4'), ...low, '--open-video', join(LOW, 'open', 'clip.mp4')]),
    // the sync search runs too: every bright open frame must be in the window, or it wrecks the
    // regression the search scores offsets with
    () => analyze('openWindow', [join(work, 'joined.mp4'), ...low, '--open-window', OPEN_WINDOW.join(':')]),
    () => analyze('phone', phone),
    () => analyze('phoneReference', [...phone, '--reference-roi', PHONE_TRUTH.referenceRoi.join(',')]),
  ]);
  // the open level that --open-video measured, given as a number
  const measured = readResultJson(join(work, 'openVideo')).model.amplitude.value as number;
  await analyze('openLevel', [join(LOW, 'run', 'clip.mp4'), ...low, '--open-level', String(measured)]);
}, 600_000);

afterAll(() => rmSync(work, { recursive: true, force: true }));

describe('analyze: the open level', () => {
  it('--open-video fixes the amplitude from the open clip and makes the low sweep identifiable; the clip is recorded with its hash', () => {
    const { result } = ok('openVideo');
    expect(result.identifiable).toBe(true);
    expect(result.identifiability.openLevelUsed).toBe(true);
    expect(result.model.amplitude.value).toBeGreaterThan(0);
    expect(result.model.amplitude.stdErr).toBeUndefined(); // fixed, not fitted
    expect(result.identifiability.ampVpiCorrelation).toBe(0);
    expect(result.regions.beam).toEqual({ x: 100, y: 70, w: 41, h: 41 });
    expect(result.inputs.openVideo.sha256).toBe(createHash('sha256').update(readFileSync(join(LOW, 'open', 'clip.mp4'))).digest('hex'));
  });

  it('--open-level X holds the amplitude at exactly X, and the same X as --open-video measured gives the same fit', () => {
    const byVideo = ok('openVideo').result;
    const { result } = ok('openLevel');
    expect(result.model.amplitude.value).toBe(byVideo.model.amplitude.value);
    expect(result.model.amplitude.stdErr).toBeUndefined();
    expect(result.identifiable).toBe(true);
    expect(result.options.openLevel).toBe(byVideo.model.amplitude.value);
    expect(result.kerrConstant.value / byVideo.kerrConstant.value).toBeCloseTo(1, 9);
    expect(result.halfWaveVoltage.value / byVideo.halfWaveVoltage.value).toBeCloseTo(1, 9);
  });

  it('--open-window leaves the window\'s frames out of the fit, takes their median as the amplitude, and recovers the truth', () => {
    const { result, dir } = ok('openWindow');
    const rows = readTraceCsv(dir);
    expect(rows).toHaveLength(LOW_TRUTH.frameCount + OPEN_TRUTH.frameCount);
    const inWindow = rows.filter((r) => r.timeS >= OPEN_WINDOW[0] && r.timeS <= OPEN_WINDOW[1]);
    expect(inWindow.length).toBe(OPEN_TRUTH.frameCount);
    expect(rows.filter((r) => r.excludedReason === 'open-window')).toEqual(inWindow);
    expect(result.frames.excluded['open-window']).toBe(inWindow.length);
    // the amplitude is the median of the window's intensities (trace.csv keeps ~7 digits)
    const sorted = inWindow.map((r) => r.intensity).sort((a, b) => a - b);
    const median = quantileSorted(sorted, 0.5);
    const amp = result.model.amplitude.value;
    expect(Math.abs(amp - median) / median).toBeLessThan(1e-6);
    expect(result.identifiable).toBe(true);
    // B against the truth within 3σ, σ including the open level's own noise, which the fit holds
    // fixed: the standard error of a median is √(π/2)·s/√n (common practice, normal noise), and on
    // a low sweep I − I_floor ≈ I_amp·(π/2)²·(V/V_π)⁴, so V_π ∝ I_amp^¼ and B ∝ V_π⁻² ∝ I_amp^−½.
    const sigmaAmpRel = (Math.sqrt(Math.PI / 2) * sampleStandardDeviation(sorted)) / Math.sqrt(sorted.length) / amp;
    const B = result.kerrConstant;
    const sigma = Math.hypot(B.stdErr, (B.value * sigmaAmpRel) / 2);
    expect(Math.abs(B.value - LOW_TRUTH.kerrConstantMPerV2)).toBeLessThanOrEqual(3 * sigma);
  });
});

describe('analyze: the open level two ways', () => {
  it('--open-video and --open-window over the same frames appended to the run give the same amplitude and the same B', () => {
    const byVideo = ok('openVideo').result;
    const byWindow = ok('openWindow').result;
    expect(byWindow.model.amplitude.value / byVideo.model.amplitude.value).toBeCloseTo(1, 9);
    // The window run also leaves out the frames of the analyser's turning beside the window
    // (reason "open-turning", 1.5 s either side: docs/analyze.md), so its fit sees a few frames
    // fewer: B agrees well within one standard error, not to the last bit.
    expect(byWindow.frames.excluded['open-turning']).toBeGreaterThan(0);
    expect(byVideo.frames.excluded['open-turning'] ?? 0).toBe(0);
    expect(Math.abs(byWindow.kerrConstant.value - byVideo.kerrConstant.value)).toBeLessThan(0.5 * byVideo.kerrConstant.stdErr);
  });
});

describe('analyze: --reference-roi', () => {
  it('divides out the auto-exposure: B within 3σ of the truth with the grey card, and closer than without it', () => {
    const without = ok('phone').result;
    const { result } = ok('phoneReference');
    const [x, y, w, h] = PHONE_TRUTH.referenceRoi;
    expect(result.regions.reference).toEqual({ x, y, w, h });
    expect(without.regions.reference).toBeUndefined();
    const truth = PHONE_TRUTH.kerrConstantMPerV2;
    expect(Math.abs(result.kerrConstant.value - truth)).toBeLessThanOrEqual(3 * result.kerrConstant.stdErr);
    expect(Math.abs(result.kerrConstant.value - truth)).toBeLessThan(Math.abs(without.kerrConstant.value - truth));
  });
});
