import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { findSyncOffset, type SyncInput } from '../../../src/core/sync/findSyncOffset.js';
import { KerrError } from '../../../src/errors.js';
import { readVoltageLog } from '../../../src/io/readVoltageLog.js';
import { interpolateAt } from '../../../src/core/signal/interpolate.js';
import { BENCH_CLIP_NAMES, benchClip } from '../../helpers/referenceData.js';
import { benchClipTag } from '../../setup/outsideSources.js';

/** Small deterministic PRNG (mulberry32) and a Gaussian from it (Box–Muller). */
function rng(seed: number): { uniform: () => number; gauss: () => number } {
  let a = seed >>> 0;
  const uniform = (): number => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const gauss = (): number => Math.sqrt(-2 * Math.log(uniform() + 1e-300)) * Math.cos(2 * Math.PI * uniform());
  return { uniform, gauss };
}

/** Crossed-polariser transmission sin²(π/2 · V²/V_π²) (DESIGN.md, Jones calculus at 45°). */
const transmission = (voltageV: number, vpiV: number): number => Math.sin((Math.PI / 2) * (voltageV / vpiV) ** 2) ** 2;

/** Piecewise-linear drive through (t, V) corners; constant outside. */
function piecewise(corners: Array<[number, number]>): (t: number) => number {
  return (t) => {
    if (t <= corners[0][0]) return corners[0][1];
    for (let i = 1; i < corners.length; i++) {
      const [t1, v1] = corners[i];
      const [t0, v0] = corners[i - 1];
      if (t <= t1) return v0 + ((v1 - v0) * (t - t0)) / (t1 - t0);
    }
    return corners[corners.length - 1][1];
  };
}

interface Scene {
  drive: (logTimeS: number) => number;
  vpiV: number;
  offsetS: number;
  frameTimesS: Float64Array;
  logTimeS: Float64Array;
  noise: number; // relative to the modulation amplitude
  logNoiseV: number;
  seed: number;
}

/** Synthetic trace from the model: I = dark + floor + amp·T(V(t − offset)) + noise; the log samples the same drive. */
function synthesise(scene: Scene): SyncInput {
  const random = rng(scene.seed);
  const amp = 0.7;
  const base = 0.02;
  const intensity = Float64Array.from(scene.frameTimesS, (t) => base + amp * transmission(scene.drive(t - scene.offsetS), scene.vpiV) + scene.noise * amp * random.gauss());
  const logVoltageV = Float64Array.from(scene.logTimeS, (t) => scene.drive(t) + scene.logNoiseV * random.gauss());
  return { frameTimesS: scene.frameTimesS, intensity, logTimeS: scene.logTimeS, logVoltageV };
}

const regularTimes = (count: number, stepS: number, startS = 0): Float64Array => Float64Array.from({ length: count }, (_, i) => startS + i * stepS);

/** Variable frame rate: each interval 1–3 ticks of 1/60 s, the phone-camera pattern also used by the vfr bench clip. */
function vfrTimes(durationS: number, seed: number): Float64Array {
  const random = rng(seed);
  const times: number[] = [0];
  while (times[times.length - 1] < durationS) times.push(times[times.length - 1] + (1 + Math.floor(random.uniform() * 3)) / 60);
  return Float64Array.from(times);
}

const twoRamps = (vpiV: number): ((t: number) => number) =>
  piecewise([
    [0, 0],
    [2, 0],
    [8, 1.1 * vpiV],
    [14, 0],
    [15, 0],
    [17.5, 0.6 * vpiV],
    [20, 0],
  ]);

describe('findSyncOffset on synthetic traces made from the model', () => {
  it('recovers a non-integer-frame offset within 1/5 frame at 30 fps with noise', () => {
    const frameS = 1 / 30;
    const offsetS = 0.4567; // 13.7 frames
    const input = synthesise({
      drive: twoRamps(9000),
      vpiV: 9000,
      offsetS,
      frameTimesS: regularTimes(600, frameS),
      logTimeS: regularTimes(200, 0.1, -0.3),
      noise: 0.01,
      logNoiseV: 15,
      seed: 1,
    });
    const result = findSyncOffset(input);
    expect(Math.abs(result.offsetS - offsetS)).toBeLessThan(frameS / 5);
    expect(result.score).toBeGreaterThan(0.99);
    expect(result.ambiguous).toBe(false);
    expect(result.converged).toBe(true);
    expect(result.vpiGuessV / 9000).toBeGreaterThan(0.97);
    expect(result.vpiGuessV / 9000).toBeLessThan(1.03);
    expect(result.sharpnessS).not.toBeNull();
    expect(result.sharpnessS!).toBeLessThan(0.5);
    expect(result.curve.offsetS.length).toBeGreaterThan(50);
    expect(result.curve.offsetS.length).toBeLessThanOrEqual(400);
    expect(result.curve.score.length).toBe(result.curve.offsetS.length);
    expect(result.warnings).toEqual([]);
  });

  it('recovers the offset within 1/5 frame with variable-frame-rate timestamps', () => {
    const frameTimesS = vfrTimes(20, 7);
    const meanFrameS = (frameTimesS[frameTimesS.length - 1] - frameTimesS[0]) / (frameTimesS.length - 1);
    const offsetS = -1.2345;
    const input = synthesise({
      drive: twoRamps(12000),
      vpiV: 12000,
      offsetS,
      frameTimesS,
      logTimeS: regularTimes(260, 1 / 12, -1),
      noise: 0.01,
      logNoiseV: 20,
      seed: 2,
    });
    const result = findSyncOffset(input);
    expect(Math.abs(result.offsetS - offsetS)).toBeLessThan(meanFrameS / 5);
    expect(result.ambiguous).toBe(false);
  });

  it('recovers a drive past the half-wave voltage (transmission peaks and falls)', () => {
    const frameS = 1 / 25;
    const offsetS = 2.0123;
    const input = synthesise({
      drive: piecewise([
        [0, 0],
        [1, 0],
        [7, 1.3 * 7000],
        [13, 0],
        [22, 0],
      ]),
      vpiV: 7000,
      offsetS,
      frameTimesS: regularTimes(500, frameS),
      logTimeS: regularTimes(400, 0.05),
      noise: 0.02,
      logNoiseV: 10,
      seed: 3,
    });
    const result = findSyncOffset(input);
    expect(Math.abs(result.offsetS - offsetS)).toBeLessThan(frameS / 5);
    expect(result.vpiGuessV / 7000).toBeGreaterThan(0.97);
    expect(result.vpiGuessV / 7000).toBeLessThan(1.03);
  });

  it('flags a purely periodic drive (sine of constant amplitude) as ambiguous', () => {
    const input = synthesise({
      drive: (t) => 8000 * Math.sin(2 * Math.PI * 0.4 * t),
      vpiV: 9000,
      offsetS: 0.3,
      frameTimesS: regularTimes(600, 1 / 30),
      logTimeS: regularTimes(220, 0.1, -1),
      noise: 0.01,
      logNoiseV: 10,
      seed: 4,
    });
    const result = findSyncOffset(input);
    expect(result.ambiguous).toBe(true);
    expect(result.runnerUp).not.toBeNull();
    // V² of a 0.4 Hz sine repeats every 1.25 s: the runner-up sits a multiple of that away.
    const periods = Math.abs(result.runnerUp!.offsetS - result.offsetS) / 1.25;
    expect(Math.abs(periods - Math.round(periods))).toBeLessThan(0.05);
    expect(result.warnings.some((w) => w.includes('repeats'))).toBe(true);
    // The finding as data: a code to sort by, the two offsets as facts, the message alongside.
    const finding = result.syncWarnings.find((w) => w.code === 'sync-ambiguous');
    expect(finding).toBeDefined();
    expect(finding!.facts.offsetS).toBe(result.offsetS);
    expect(finding!.facts.otherOffsetS).toBe(result.runnerUp!.offsetS);
    expect(result.warnings).toEqual(result.syncWarnings.map((w) => w.message));
  });

  it('does not flag a single ramp as ambiguous', () => {
    const input = synthesise({
      drive: piecewise([
        [0, 0],
        [3, 0],
        [12, 10000],
        [25, 10000],
      ]),
      vpiV: 11000,
      offsetS: 1.1,
      frameTimesS: regularTimes(600, 1 / 30),
      logTimeS: regularTimes(220, 0.1),
      noise: 0.01,
      logNoiseV: 10,
      seed: 5,
    });
    const result = findSyncOffset(input);
    expect(result.ambiguous).toBe(false);
    if (result.runnerUp !== null) expect(result.runnerUp.score).toBeLessThan(result.score - 0.02);
    expect(Math.abs(result.offsetS - 1.1)).toBeLessThan(1 / 30 / 5);
  });

  it('ignores frames marked unusable (sparks) and still finds the offset', () => {
    const frameS = 1 / 30;
    const input = synthesise({
      drive: twoRamps(9000),
      vpiV: 9000,
      offsetS: 0.77,
      frameTimesS: regularTimes(600, frameS),
      logTimeS: regularTimes(220, 0.1, -1),
      noise: 0.01,
      logNoiseV: 10,
      seed: 6,
    });
    const intensity = input.intensity.slice();
    const usable = new Uint8Array(intensity.length).fill(1);
    for (let k = 5; k < 600; k += 37) {
      intensity[k] = 50; // a spark: far brighter than full transmission
      usable[k] = 0;
    }
    const result = findSyncOffset({ ...input, intensity, usable });
    expect(Math.abs(result.offsetS - 0.77)).toBeLessThan(frameS / 5);
    expect(result.score).toBeGreaterThan(0.99);
  });

  it('syncs a log much shorter than the video (logger started late): half of the log must overlap', () => {
    const frameS = 1 / 30;
    const offsetS = 12.345; // the log's 0 s is 12.345 s into a 30 s video
    const drive = piecewise([
      [0, 0],
      [1, 0],
      [4, 9000],
      [6, 3000],
      [8, 7000],
      [10, 0],
    ]);
    const input = synthesise({ drive, vpiV: 9000, offsetS, frameTimesS: regularTimes(900, frameS), logTimeS: regularTimes(101, 0.1), noise: 0.01, logNoiseV: 10, seed: 13 });
    const result = findSyncOffset(input);
    expect(Math.abs(result.offsetS - offsetS)).toBeLessThan(frameS / 5);
    expect(result.minOverlapFrames).toBe(151); // half of the 301 frames (both ends included) a 10 s log can cover
    expect(result.ambiguous).toBe(false);
  });

  it('warns that the optimum is broad when the video only sees a slow partial ramp', () => {
    // The video shows a hold and part of one slow ramp (to ~0.6·V_π): shifting the offset trades
    // against V_π and the amplitude, so the score barely changes near the optimum.
    const drive = piecewise([
      [0, 0],
      [5, 0],
      [25, 9000],
      [40, 0],
      [45, 0],
      [55, 6000],
      [70, 0],
    ]);
    const input = synthesise({ drive, vpiV: 9000, offsetS: 3.21, frameTimesS: regularTimes(600, 1 / 30), logTimeS: regularTimes(680, 0.1), noise: 0.005, logNoiseV: 5, seed: 14 });
    const result = findSyncOffset(input);
    expect(result.sharpnessS === null || result.sharpnessS > 0.5).toBe(true);
    expect(result.warnings.some((w) => w.includes('poorly defined'))).toBe(true);
    const broad = result.syncWarnings.find((w) => w.code === 'sync-broad-peak');
    expect(broad?.facts.sharpnessS).toBe(result.sharpnessS);
    for (const w of result.syncWarnings) expect(w.message).not.toMatch(/--[a-z]/);
  });

  it('keeps the search inside a given range', () => {
    const input = synthesise({
      drive: twoRamps(9000),
      vpiV: 9000,
      offsetS: 0.5,
      frameTimesS: regularTimes(600, 1 / 30),
      logTimeS: regularTimes(220, 0.1, -1),
      noise: 0.01,
      logNoiseV: 10,
      seed: 8,
    });
    const result = findSyncOffset({ ...input, searchRangeS: [2, 4] });
    expect(result.offsetS).toBeGreaterThanOrEqual(2);
    expect(result.offsetS).toBeLessThanOrEqual(4);
    expect(Math.min(...result.curve.offsetS)).toBeGreaterThanOrEqual(2);
    expect(Math.max(...result.curve.offsetS)).toBeLessThanOrEqual(4);
    // The true offset 0.5 s lies outside [2, 4]: the best inside sits at the edge, and says so.
    expect(result.syncWarnings.map((w) => w.code)).toContain('sync-at-edge');
  });

  it('finds the offset of 2000 frames against a 100 Hz log (a long run) within a fifth of a frame', () => {
    const frameS = 1 / 30;
    const input = synthesise({
      drive: piecewise([
        [0, 0],
        [5, 0],
        [25, 9000],
        [40, 0],
        [45, 0],
        [55, 6000],
        [70, 0],
      ]),
      vpiV: 9000,
      offsetS: 3.21,
      frameTimesS: regularTimes(2000, frameS),
      logTimeS: regularTimes(6800, 0.01),
      noise: 0.01,
      logNoiseV: 10,
      seed: 9,
    });
    // Speed is the benchmark's business (npm run bench), not a unit test's; this checks the long case works.
    const result = findSyncOffset(input);
    expect(Math.abs(result.offsetS - 3.21)).toBeLessThan(frameS / 5);
  });
});

describe('findSyncOffset failures', () => {
  const base = (): SyncInput =>
    synthesise({
      drive: twoRamps(9000),
      vpiV: 9000,
      offsetS: 0.5,
      frameTimesS: regularTimes(600, 1 / 30),
      logTimeS: regularTimes(196, 0.1),
      noise: 0.01,
      logNoiseV: 10,
      seed: 10,
    });

  const codeOf = (fn: () => unknown): string | null => {
    try {
      fn();
      return null;
    } catch (err) {
      return err instanceof KerrError ? err.code : 'not a KerrError';
    }
  };

  it('throws NO_OVERLAP naming both spans when no shift in the search range leaves the overlap', () => {
    const input = base();
    let caught: unknown = null;
    try {
      findSyncOffset({ ...input, searchRangeS: [30, 40] });
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(KerrError);
    const err = caught as KerrError;
    expect(err.code).toBe('NO_OVERLAP');
    expect(err.message).toContain('the log covers 0–19.5 s and the video 0–19.9667 s');
    // Core messages name no command-line flag (the command line adds its own wording).
    expect(err.hint).toContain('give the offset');
    expect(`${err.message} ${err.hint}`).not.toMatch(/--[a-z]/);
  });

  it('throws NO_OVERLAP when the log is too short to hold 20 frames', () => {
    const input = base();
    expect(codeOf(() => findSyncOffset({ ...input, logTimeS: Float64Array.of(0, 0.2, 0.4), logVoltageV: Float64Array.of(0, 5000, 0) }))).toBe('NO_OVERLAP');
  });

  it('throws NOT_IDENTIFIABLE when the voltage never leaves zero, with a unit hint', () => {
    const input = base();
    const logVoltageV = Float64Array.from(input.logVoltageV, (v) => v / 1000); // a kV log read as volts
    let caught: unknown = null;
    try {
      findSyncOffset({ ...input, logVoltageV });
    } catch (err) {
      caught = err;
    }
    expect((caught as KerrError).code).toBe('NOT_IDENTIFIABLE');
    expect((caught as KerrError).message).toContain('never exceeds');
    expect((caught as KerrError).hint).toContain('voltage_kV');
  });

  it('throws NOT_IDENTIFIABLE when the log holds a single level', () => {
    const input = base();
    const random = rng(11);
    const logVoltageV = Float64Array.from(input.logVoltageV, () => 5000 + 15 * random.gauss());
    let caught: unknown = null;
    try {
      findSyncOffset({ ...input, logVoltageV });
    } catch (err) {
      caught = err;
    }
    expect((caught as KerrError).code).toBe('NOT_IDENTIFIABLE');
    expect((caught as KerrError).message).toContain('single voltage level');
  });

  it('throws NOT_IDENTIFIABLE when the intensity is flat', () => {
    const input = base();
    expect(codeOf(() => findSyncOffset({ ...input, intensity: new Float64Array(input.intensity.length).fill(0.3) }))).toBe('NOT_IDENTIFIABLE');
  });

  it('rejects malformed input with BAD_ARGUMENT', () => {
    const input = base();
    expect(codeOf(() => findSyncOffset({ ...input, intensity: input.intensity.subarray(1) }))).toBe('BAD_ARGUMENT');
    expect(codeOf(() => findSyncOffset({ ...input, frameTimesS: input.frameTimesS.slice().reverse() }))).toBe('BAD_ARGUMENT');
    expect(codeOf(() => findSyncOffset({ ...input, logTimeS: Float64Array.from(input.logTimeS, () => 1) }))).toBe('BAD_ARGUMENT');
    expect(codeOf(() => findSyncOffset({ ...input, searchRangeS: [3, 1] }))).toBe('BAD_ARGUMENT');
    expect(codeOf(() => findSyncOffset({ ...input, usable: new Uint8Array(3) }))).toBe('BAD_ARGUMENT');
  });
});

// Outside check: the three bench clips' real logs and truth (B, L_mm, d_mm, offset_s, frame
// times) from test/reference/README.md (bench-clips) and each clip's truth.json. The
// intensities follow that README's renderer model: ambient + gain·(A·T(V(t − offset)) + F), with
// T = sin²(δ/2), δ = 2π·B·L·V²/d²; our synthesis only adds noise.
describe('findSyncOffset on the bench clips\' voltage logs (bench-clips README and truth.json)', () => {
  const vpiTolerance: Record<string, number> = { green_ramps: 0.02, white_steps_reference_card: 0.1, vfr_past_halfwave: 0.02 };

  for (const clip of BENCH_CLIP_NAMES) {
    it(`${clip}: offset within one frame of truth.json's offset_s`, { tags: [benchClipTag(clip)] }, async () => {
      const files = benchClip(clip);
      const truth = JSON.parse(readFileSync(files.truth, 'utf8')) as {
        B: number;
        L_mm: number;
        d_mm: number;
        offset_s: number;
        halfWaveVoltage_V: number;
        framePeriod_s: number;
        frames: number;
        frameTimes_s?: number[];
        modulationAmplitude_linear: number;
        floor_linear: number;
        ambient_linear: number;
        exposureGain: number | { terms: Array<[number, number, number]> };
      };
      const log = await readVoltageLog(files.volts);
      const frameTimesS = truth.frameTimes_s !== undefined ? Float64Array.from(truth.frameTimes_s) : regularTimes(truth.frames, truth.framePeriod_s);
      const lengthM = truth.L_mm / 1000;
      const gapM = truth.d_mm / 1000;
      const gain = (t: number): number =>
        typeof truth.exposureGain === 'number' ? truth.exposureGain : Math.exp(truth.exposureGain.terms.reduce((sum, [a, p, phi]) => sum + a * Math.sin((2 * Math.PI * t) / p + phi), 0));
      const voltage = interpolateAt(log.timeS, log.voltageV, Float64Array.from(frameTimesS, (t) => t - truth.offset_s));
      const random = rng(12);
      const intensity = Float64Array.from(frameTimesS, (t, k) => {
        const v = voltage[k];
        if (Number.isNaN(v)) return truth.ambient_linear + gain(t) * truth.floor_linear + 0.003 * random.gauss(); // outside the log: zero field
        const retardanceRad = (2 * Math.PI * truth.B * lengthM * v * v) / (gapM * gapM);
        const t45 = Math.sin(retardanceRad / 2) ** 2;
        return truth.ambient_linear + gain(t) * (truth.modulationAmplitude_linear * t45 + truth.floor_linear) + 0.003 * random.gauss();
      });
      const result = findSyncOffset({ frameTimesS, intensity, logTimeS: log.timeS, logVoltageV: log.voltageV });
      expect(Math.abs(result.offsetS - truth.offset_s)).toBeLessThan(truth.framePeriod_s);
      expect(result.ambiguous).toBe(false);
      // V_π from truth.json halfWaveVoltage_V; the guess only starts the fit. Sweeps below V_π with a
      // drifting exposure let amplitude and V_π trade off (DESIGN.md, Identifiability): looser there.
      expect(Math.abs(result.vpiGuessV / truth.halfWaveVoltage_V - 1)).toBeLessThan(vpiTolerance[clip]);
    });
  }
});
