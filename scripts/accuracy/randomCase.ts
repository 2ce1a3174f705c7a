/**
 * One randomised case of the coverage study (`npm run accuracy`): a simulator scenario (JSON, as
 * docs/scenario.md describes) plus what the analysis is told. Pure: the same index gives the same
 * case on every machine (the simulator's own seeded generator draws every choice).
 *
 * Ranges drawn (uniform unless said): drive shape (triangle, sine, steps, two triangles), sweep
 * reach 0.6–1.3·V_π, clip 8–11 s at 15/24/25/30 fps (one case in five with a variable frame rate),
 * shot noise 2 000–30 000 photons per full scale and read noise 0.001–0.004, H.264 CRF 16–34,
 * logger 2–50 Hz (log-uniform) with 0–0.3 % noise and a clock offset of ±1.5 s, one case in five
 * with a logger dropout of 0.5–2.5 s (rows removed from volts.csv), one case in four with
 * auto-exposure and a grey reference card (given to the analysis). Geometry is exact in the
 * simulation, and the logger has no calibration error, so the analysis is run with zero
 * geometry tolerance and zero voltage accuracy: the study checks the statistical, sync and
 * interpolation terms of the budget against the planted truth.
 */
import { makeRng } from '../../src/sim/rng.js';

export interface AccuracyCase {
  index: number;
  scenario: Record<string, unknown>;
  /** Log-time window whose rows are removed from volts.csv (a logger dropout), s; null for none. */
  dropoutS: [number, number] | null;
  useReference: boolean;
  /** Short words for the table of worst cases. */
  description: string;
}

export function randomCase(index: number): AccuracyCase {
  const rng = makeRng(9000 + index);
  const u = (a: number, b: number) => a + (b - a) * rng.uniform();
  const pick = <T>(xs: readonly T[]): T => xs[Math.min(xs.length - 1, Math.floor(rng.uniform() * xs.length))]!;
  const lengthMm = Math.round(u(20, 60));
  const gapMm = Math.round(u(2, 5) * 10) / 10;
  const B = u(1.0e-12, 4.0e-12);
  const vpi = (gapMm * 1e-3) / Math.sqrt(2 * B * lengthMm * 1e-3);
  const reach = u(0.6, 1.3);
  const peakV = reach * vpi;
  const durationS = Math.round(u(8, 11) * 10) / 10;
  const shape = pick(['triangle', 'sine', 'steps', 'double'] as const);
  const drive = makeDrive(shape, peakV, durationS, rng.uniform());
  const fps = pick([15, 24, 25, 30]);
  const variable = rng.uniform() < 0.2;
  const crf = Math.round(u(16, 34));
  const logRateHz = Math.round(Math.exp(u(Math.log(2), Math.log(50))) * 10) / 10;
  const clockOffsetS = Math.round(u(-1.5, 1.5) * 1000) / 1000;
  const useReference = rng.uniform() < 0.25;
  const dropout = rng.uniform() < 0.2;
  const dropStart = u(1, durationS - 3);
  const dropoutS: [number, number] | null = dropout ? [dropStart, dropStart + u(0.5, 2.5)] : null;
  const camera: Record<string, unknown> = {
    widthPx: 160, heightPx: 120,
    ...(variable ? { variableFrameRate: { tickHz: 60, minTicks: 1, maxTicks: 4, tickWeights: [1, 3, 3, 1] } } : { frameRateHz: fps }),
    ambient: u(0.005, 0.02), transfer: pick(['srgb', 'bt709'] as const), crf,
    photonsPerFullScale: Math.round(u(2000, 30000)), readNoise: u(0.001, 0.004),
    ...(useReference ? {
      autoExposure: { targetMean: u(0.02, 0.05), lagS: u(0.2, 0.8) },
      referencePatch: { xPx: 6, yPx: 84, widthPx: 28, heightPx: 28, radiance: 0.18 },
    } : {}),
  };
  const scenario = {
    label: `accuracy case ${index}`,
    notes: 'coverage study case; numbers invented',
    seed: 5000 + index,
    durationS,
    cell: { kerrConstantMPerV2: B, lengthMm, gapMm, extinctionRatio: Math.round(u(1000, 10000)), liquidBreakdownKvPerMm: 20 },
    light: { profile: 'gaussian', sigmaPx: u(5, 7), centreXPx: Math.round(u(70, 90)), centreYPx: Math.round(u(50, 70)), wavelengthNm: 532, amplitude: u(0.3, 0.7) },
    dirt: { scatterFloor: u(0.002, 0.01), haloPeak: 0.002, haloSigmaPx: 40 },
    camera,
    drive,
    logger: { sampleRateHz: logRateHz, noiseV: u(0, 0.003) * peakV, clockOffsetS },
  };
  const description = `${shape} reach ${reach.toFixed(2)} ${variable ? 'vfr' : `${fps}fps`} crf${crf} log ${logRateHz}Hz${dropout ? ' dropout' : ''}${useReference ? ' auto-exposure' : ''}`;
  return { index, scenario, dropoutS, useReference, description };
}

function makeDrive(shape: 'triangle' | 'sine' | 'steps' | 'double', peakV: number, durationS: number, phase: number): Record<string, unknown> {
  const hold = 1;
  const active = durationS - 2 * hold;
  if (shape === 'triangle') {
    return { segments: [{ kind: 'hold', durationS: hold }, { kind: 'ramp', toV: peakV, durationS: active / 2 }, { kind: 'ramp', toV: 0, durationS: active / 2 }, { kind: 'hold', durationS: hold }] };
  }
  if (shape === 'double') {
    const q = active / 4;
    return { segments: [{ kind: 'hold', durationS: hold }, { kind: 'ramp', toV: peakV, durationS: q }, { kind: 'ramp', toV: 0, durationS: q }, { kind: 'ramp', toV: 0.8 * peakV, durationS: q }, { kind: 'ramp', toV: 0, durationS: q }, { kind: 'hold', durationS: hold }] };
  }
  if (shape === 'steps') {
    const levels = [0.25, 0.5, 0.75, 1, 0.6, 0.3, 0];
    const d = active / levels.length;
    return { segments: [{ kind: 'hold', durationS: hold }, ...levels.map((f) => ({ kind: 'step', toV: f * peakV, durationS: d, riseTimeS: 0.1 })), { kind: 'hold', durationS: hold }] };
  }
  // sine: one or one and a half slow periods of |sin|, sampled every 20 ms (points joined by lines)
  const periods = phase < 0.5 ? 1 : 1.5;
  const points: { timeS: number; voltageV: number }[] = [];
  for (let t = 0; t <= durationS + 1e-9; t += 0.02) {
    const x = Math.min(Math.max(0, (t - hold) / active), 1);
    points.push({ timeS: Math.round(t * 1000) / 1000, voltageV: peakV * Math.sin(Math.PI * periods * x) ** 2 });
  }
  return { points };
}
