/**
 * Pins the exact output of findSyncOffset on fixed synthetic cases (offset, score, sharpness,
 * uncertainty, runner-up, V_π guess, the curve's length and sum, warning codes), so that a
 * reshaping of the search that changes any result shows. The expected numbers are what the
 * search produced before it was split into small functions: a self-consistency check, not an
 * outside reference (the accuracy against the truth is checked in findSyncOffset.test.ts).
 */
import { describe, expect, it } from 'vitest';
import { findSyncOffset, type SyncInput, type SyncResult } from '../../../src/core/sync/findSyncOffset.js';

/** mulberry32 (a small public-domain PRNG) and Box–Muller. */
function gaussian(seed: number): () => number {
  let a = seed >>> 0;
  const uniform = (): number => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(uniform() + 1e-300)) * Math.cos(2 * Math.PI * uniform());
}

const times = (count: number, stepS: number, startS = 0): Float64Array => Float64Array.from({ length: count }, (_, i) => startS + i * stepS);

function piecewise(corners: Array<[number, number]>): (t: number) => number {
  return (t) => {
    if (t <= corners[0]![0]) return corners[0]![1];
    for (let i = 1; i < corners.length; i++) {
      const [t1, v1] = corners[i]!;
      const [t0, v0] = corners[i - 1]!;
      if (t <= t1) return v0 + ((v1 - v0) * (t - t0)) / (t1 - t0);
    }
    return corners[corners.length - 1]![1];
  };
}

function scene(drive: (t: number) => number, vpiV: number, offsetS: number, frameTimesS: Float64Array, logTimeS: Float64Array, noise: number, seed: number): SyncInput {
  const g = gaussian(seed);
  const intensity = Float64Array.from(frameTimesS, (t) => 0.02 + 0.7 * Math.sin((Math.PI / 2) * (drive(t - offsetS) / vpiV) ** 2) ** 2 + noise * 0.7 * g());
  const logVoltageV = Float64Array.from(logTimeS, (t) => drive(t) + 10 * g());
  return { frameTimesS, intensity, logTimeS, logVoltageV };
}

const twoRamps = piecewise([[0, 0], [2, 0], [8, 9900], [14, 0], [15, 0], [17.5, 5400], [20, 0]]);
const slow = piecewise([[0, 0], [5, 0], [25, 9000], [40, 0], [45, 0], [55, 6000], [70, 0]]);

/** What a reshaping must keep: every number bit for bit, the curve by length and sums. */
function fingerprint(r: SyncResult): unknown {
  return {
    offsetS: r.offsetS,
    score: r.score,
    sharpnessS: r.sharpnessS,
    offsetStdErrS: r.offsetStdErrS,
    ambiguous: r.ambiguous,
    runnerUp: r.runnerUp,
    vpiGuessV: r.vpiGuessV,
    framesUsed: r.framesUsed,
    minOverlapFrames: r.minOverlapFrames,
    coarseStepS: r.coarseStepS,
    converged: r.converged,
    curvePoints: r.curve.offsetS.length,
    curveOffsetSum: r.curve.offsetS.reduce((a, b) => a + b, 0),
    curveScoreSum: r.curve.score.reduce((a, b) => a + b, 0),
    warnings: r.warnings,
  };
}

const CASES: Record<string, () => SyncInput> = {
  twoRamps: () => scene(twoRamps, 9000, 0.4567, times(600, 1 / 30), times(200, 0.1, -0.3), 0.01, 1),
  periodic: () => scene((t) => 8000 * Math.sin(2 * Math.PI * 0.4 * t), 9000, 0.3, times(600, 1 / 30), times(220, 0.1, -1), 0.01, 4),
  broad: () => scene(slow, 9000, 3.21, times(600, 1 / 30), times(680, 0.1), 0.005, 14),
  strided: () => scene(slow, 9000, 3.21, times(2000, 1 / 30), times(6800, 0.01), 0.01, 9),
};

describe('findSyncOffset pinned results (self-consistency: values from before the reshaping)', () => {
  for (const name of Object.keys(CASES)) {
    it(name, () => {
      const result = findSyncOffset(CASES[name]!());
      if (process.env.PRINT_PINS) console.log(name, JSON.stringify(fingerprint(result)));
      expect(fingerprint(result)).toEqual(PINNED[name]);
    });
  }
});

const PINNED: Record<string, unknown> = {
  twoRamps: {"offsetS":0.45309696650148357,"score":0.9991515049120744,"sharpnessS":0.17133789062499938,"offsetStdErrS":0.002015988043764418,"ambiguous":false,"runnerUp":{"offsetS":-9.600000000000037,"score":0.12308933182282203},"vpiGuessV":9001.039141907844,"framesUsed":595,"minOverlapFrames":299,"coarseStepS":0.09999999999999964,"converged":true,"curvePoints":200,"curveOffsetSum":69.99999999998559,"curveScoreSum":33.01405593693412,"warnings":[]},
  periodic: {"offsetS":2.800694437746528,"score":0.999053549119622,"sharpnessS":0.019160970052083264,"offsetStdErrS":0.00025372737736610904,"ambiguous":true,"runnerUp":{"offsetS":-2.1993055622534543,"score":0.9990417529539379},"vpiGuessV":8953.187565021812,"framesUsed":545,"minOverlapFrames":300,"coarseStepS":0.09999999999999964,"converged":true,"curvePoints":220,"curveOffsetSum":10.999999999983135,"curveScoreSum":54.10962403363649,"warnings":["sync: offsets 2.801 s (R² 0.9991) and -2.199 s (R² 0.999) fit almost equally well because the drive repeats itself; record one distinct ramp or step, or give the offset"]},
  broad: {"offsetS":3.3668737080020166,"score":0.9948262865847664,"sharpnessS":1.8539062499999934,"offsetStdErrS":0.014541144539289005,"ambiguous":true,"runnerUp":{"offsetS":-35.241019662496385,"score":0.9884665115335859},"vpiGuessV":8304.839178714996,"framesUsed":498,"minOverlapFrames":300,"coarseStepS":0.10000000000000142,"converged":true,"curvePoints":364,"curveOffsetSum":-8544.599999999771,"curveScoreSum":145.64781189834562,"warnings":["sync: offsets 3.367 s (R² 0.9948) and -35.24 s (R² 0.9885) fit almost equally well because the drive repeats itself; record one distinct ramp or step, or give the offset","sync: the best offset is poorly defined (R² changes by less than 0.01 within ±1.85 s); the video shows no sharp change of the drive, so check the offset or give it"]},
  strided: {"offsetS":3.211638342708173,"score":0.9988602164537236,"sharpnessS":0.463151041666665,"offsetStdErrS":0.002756549424336897,"ambiguous":false,"runnerUp":{"offsetS":33.32666666666631,"score":0.504641449634177},"vpiGuessV":8998.053515400246,"framesUsed":1903,"minOverlapFrames":1000,"coarseStepS":0.016666666666666607,"converged":true,"curvePoints":400,"curveOffsetSum":-342.3000000000912,"curveScoreSum":85.69217536567749,"warnings":[]},
};
