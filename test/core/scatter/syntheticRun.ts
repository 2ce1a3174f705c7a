/**
 * A synthetic run on the block grid, with every ingredient planted and known:
 *   block(x, y, t) = g(t)·[ambient + G(x,y)·(A·m(t) + F) + S·H(x,y) + particles + sparks] + noise
 * G a Gaussian beam spot (peak 1), H a wide dim Gaussian halo (peak 1) that does not modulate,
 * m(t) = sin²(π/2·(V/V_π)²) (crossed polarisers at 45°), V(t) a hold / ramp up / ramp down / hold
 * drive, particles short bumps at the beam centre, sparks single whole-frame flashes, g(t) an
 * optional exposure gain, and Gaussian camera noise. Optionally a bright steady "card".
 *
 * The beam intensity series is what the analyze pass measures: mean of a box of blocks on the
 * beam minus the mean of a ring around it. The numbers are a scenario of our own.
 * Random numbers: mulberry32 + Box–Muller (common practice for reproducible test data).
 */
import { crossedTransmission } from '../../../src/core/physics/kerr.js';

export interface SyntheticOptions {
  seed?: number;
  gridWidth?: number;
  gridHeight?: number;
  stepPx?: number;
  fps?: number;
  durationS?: number;
  beamX?: number; // blocks
  beamY?: number;
  beamSigma?: number; // blocks
  amplitude?: number; // A
  floor?: number; // F
  haloPeak?: number; // S
  haloSigma?: number; // blocks
  ambient?: number;
  noise?: number; // per block per frame
  halfWaveV?: number;
  maxOverHalfWave?: number;
  /** Start frames of particle bumps; each lasts `particleFrames` frames. */
  particleFrames?: number[];
  particleLength?: number;
  particleBrightness?: number;
  sparkFrames?: number[];
  sparkBrightness?: number;
  gain?: (t: number, frame: number) => number;
  /** Half-wave voltage on the falling ramp when it differs (hysteresis). */
  halfWaveDownV?: number;
  card?: { x0: number; y0: number; x1: number; y1: number; level: number };
}

export interface SyntheticRun {
  gridWidth: number;
  gridHeight: number;
  stepPx: number;
  frames: number;
  grid: Float32Array;
  timesS: Float64Array;
  voltageV: Float64Array;
  modulation: Float64Array;
  gain: Float64Array;
  /** Beam box mean − surround ring mean, divided by the gain, per frame. */
  intensity: Float64Array;
  beamBox: { x0: number; y0: number; x1: number; y1: number };
  options: Required<Omit<SyntheticOptions, 'gain' | 'halfWaveDownV' | 'card'>> & { halfWaveDownV?: number | undefined; card?: SyntheticOptions['card'] | undefined };
  /** Planted halo value S·H at a block. */
  halo(x: number, y: number): number;
  beam(x: number, y: number): number;
}

/** The shared seeded generators (test/helpers/random.ts), under the names these tests use. */
export { seededRandom as mulberry32, seededNormal as normalSource } from '../../helpers/random.js';
import { seededNormal as normalSource } from '../../helpers/random.js';

export function makeSyntheticRun(o: SyntheticOptions = {}): SyntheticRun {
  const opt = {
    seed: o.seed ?? 1,
    gridWidth: o.gridWidth ?? 48,
    gridHeight: o.gridHeight ?? 36,
    stepPx: o.stepPx ?? 8,
    fps: o.fps ?? 30,
    durationS: o.durationS ?? 20,
    beamX: o.beamX ?? 20,
    beamY: o.beamY ?? 17,
    beamSigma: o.beamSigma ?? 2.5,
    amplitude: o.amplitude ?? 0.5,
    floor: o.floor ?? 0.005,
    haloPeak: o.haloPeak ?? 0.02,
    haloSigma: o.haloSigma ?? 10,
    ambient: o.ambient ?? 0.01,
    noise: o.noise ?? 0.002,
    halfWaveV: o.halfWaveV ?? 10000,
    maxOverHalfWave: o.maxOverHalfWave ?? 1.1,
    particleFrames: o.particleFrames ?? [],
    particleLength: o.particleLength ?? 5,
    particleBrightness: o.particleBrightness ?? 0.05,
    sparkFrames: o.sparkFrames ?? [],
    sparkBrightness: o.sparkBrightness ?? 0.15,
    halfWaveDownV: o.halfWaveDownV,
    card: o.card,
  };
  const { gridWidth: gw, gridHeight: gh } = opt;
  const cells = gw * gh;
  const frames = Math.round(opt.durationS * opt.fps);
  const normal = normalSource(opt.seed);
  const beam = (x: number, y: number) => Math.exp(-((x - opt.beamX) ** 2 + (y - opt.beamY) ** 2) / (2 * opt.beamSigma ** 2));
  const halo = (x: number, y: number) => opt.haloPeak * Math.exp(-((x - opt.beamX) ** 2 + (y - opt.beamY) ** 2) / (2 * opt.haloSigma ** 2));
  const particleShape = (x: number, y: number) => Math.exp(-((x - opt.beamX) ** 2 + (y - opt.beamY) ** 2) / (2 * 1.2 ** 2));
  const vMax = opt.maxOverHalfWave * opt.halfWaveV;
  const holdS = 1.5;
  const rampS = (opt.durationS - 2 * holdS) / 2;
  const grid = new Float32Array(frames * cells);
  const timesS = new Float64Array(frames);
  const voltageV = new Float64Array(frames);
  const modulation = new Float64Array(frames);
  const gain = new Float64Array(frames);
  const particleAt = new Float64Array(frames);
  for (const start of opt.particleFrames) {
    for (let k = 0; k < opt.particleLength; k++) {
      const f = start + k;
      // a smooth bump: rises and falls over the particle's passage
      if (f < frames) particleAt[f] = Math.max(particleAt[f]!, Math.sin((Math.PI * (k + 0.5)) / opt.particleLength));
    }
  }
  const sparks = new Set(opt.sparkFrames);
  const staticPart = new Float64Array(cells);
  const beamPart = new Float64Array(cells);
  const particlePart = new Float64Array(cells);
  for (let y = 0; y < gh; y++) {
    for (let x = 0; x < gw; x++) {
      const c = y * gw + x;
      beamPart[c] = beam(x, y);
      staticPart[c] = opt.ambient + halo(x, y) + opt.floor * beamPart[c]!;
      if (opt.card && x >= opt.card.x0 && x <= opt.card.x1 && y >= opt.card.y0 && y <= opt.card.y1) staticPart[c] = opt.card.level;
      particlePart[c] = particleShape(x, y);
    }
  }
  for (let f = 0; f < frames; f++) {
    const t = f / opt.fps;
    timesS[f] = t;
    let v = 0;
    let falling = false;
    if (t >= holdS && t < holdS + rampS) v = (vMax * (t - holdS)) / rampS;
    else if (t >= holdS + rampS && t < holdS + 2 * rampS) { v = vMax * (1 - (t - holdS - rampS) / rampS); falling = true; }
    voltageV[f] = v;
    const vpi = falling && opt.halfWaveDownV !== undefined ? opt.halfWaveDownV : opt.halfWaveV;
    const m = crossedTransmission(Math.PI / 4, Math.PI * (v / vpi) ** 2);
    modulation[f] = crossedTransmission(Math.PI / 4, Math.PI * (v / opt.halfWaveV) ** 2);
    const g = o.gain ? o.gain(t, f) : 1;
    gain[f] = g;
    const spark = sparks.has(f) ? opt.sparkBrightness : 0;
    const off = f * cells;
    for (let c = 0; c < cells; c++) {
      const light = staticPart[c]! + beamPart[c]! * opt.amplitude * m + particlePart[c]! * opt.particleBrightness * particleAt[f]! + spark;
      grid[off + c] = g * light + opt.noise * normal();
    }
  }
  const beamBox = { x0: opt.beamX - 2, y0: opt.beamY - 2, x1: opt.beamX + 2, y1: opt.beamY + 2 };
  const intensity = new Float64Array(frames);
  for (let f = 0; f < frames; f++) {
    const off = f * cells;
    let sb = 0, nb = 0, sr = 0, nr = 0;
    for (let y = opt.beamY - 7; y <= opt.beamY + 7; y++) {
      for (let x = opt.beamX - 7; x <= opt.beamX + 7; x++) {
        const d = Math.max(Math.abs(x - opt.beamX), Math.abs(y - opt.beamY));
        const v = grid[off + y * gw + x]!;
        if (d <= 2) { sb += v; nb++; } else if (d >= 4) { sr += v; nr++; }
      }
    }
    intensity[f] = (sb / nb - sr / nr) / gain[f]!;
  }
  return { gridWidth: gw, gridHeight: gh, stepPx: opt.stepPx, frames, grid, timesS, voltageV, modulation, gain, intensity, beamBox, options: opt, halo, beam };
}
