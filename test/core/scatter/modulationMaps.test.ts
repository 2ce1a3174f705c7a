import { describe, expect, it } from 'vitest';
import { linearRegression } from 'simple-statistics';
import { modulationMaps } from '../../../src/core/scatter/modulationMaps.js';
import { isKerrError } from '../../../src/errors.js';
import { makeSyntheticRun } from './syntheticRun.js';

const all = (n: number) => new Uint8Array(n).fill(1);

describe('modulationMaps', () => {
  it('recovers planted intercept and slope per block exactly on noise-free data', () => {
    // block c = a_c + b_c·m, with a and b known
    const gw = 3, gh = 2, frames = 7, cells = gw * gh;
    const a = [0.1, 0.2, 0.05, 0.3, 0.0, 0.12];
    const b = [0.5, 0, 0.25, -0.1, 0.8, 0.01];
    const m = Float64Array.of(0, 0.1, 0.3, 0.5, 0.7, 0.9, 1);
    const grid = new Float32Array(frames * cells);
    for (let f = 0; f < frames; f++) for (let c = 0; c < cells; c++) grid[f * cells + c] = a[c]! + b[c]! * m[f]!;
    const maps = modulationMaps({ grid, frames, gridWidth: gw, gridHeight: gh, modulation: m, usable: all(frames) });
    for (let c = 0; c < cells; c++) {
      expect(maps.staticMap[c]).toBeCloseTo(a[c]!, 6);
      expect(maps.modulatedMap[c]).toBeCloseTo(b[c]!, 6);
      expect(maps.residualStd[c]).toBeLessThan(1e-6);
    }
    expect(maps.framesUsed).toBe(7);
    expect(maps.modulationSpan).toBeCloseTo(1, 12);
  });

  it('agrees with simple-statistics linearRegression and the textbook slope error on noisy blocks', () => {
    // Reference: simple-statistics' ordinary least squares; se(b) = s/√Sxx (Draper & Smith §1.4).
    const run = makeSyntheticRun({ durationS: 8, seed: 3 });
    const frames = run.frames, cells = run.gridWidth * run.gridHeight;
    const maps = modulationMaps({ grid: run.grid, frames, gridWidth: run.gridWidth, gridHeight: run.gridHeight, modulation: run.modulation, usable: all(frames) });
    for (const c of [0, run.options.beamY * run.gridWidth + run.options.beamX, 100]) {
      const pts: [number, number][] = [];
      for (let f = 0; f < frames; f++) pts.push([run.modulation[f]!, run.grid[f * cells + c]!]);
      const ref = linearRegression(pts);
      expect(maps.modulatedMap[c]).toBeCloseTo(ref.m, 5);
      expect(maps.staticMap[c]).toBeCloseTo(ref.b, 5);
      const xm = pts.reduce((s, p) => s + p[0], 0) / frames;
      let sxx = 0, rss = 0;
      for (const [x, y] of pts) { sxx += (x - xm) ** 2; rss += (y - ref.b - ref.m * x) ** 2; }
      expect(maps.modulatedStdErr[c]).toBeCloseTo(Math.sqrt(rss / (frames - 2) / sxx), 6);
    }
  });

  it('puts the modulated peak inside the planted beam and shows the halo above the far dark on the static map', () => {
    const run = makeSyntheticRun({ seed: 5 });
    const maps = modulationMaps({ grid: run.grid, frames: run.frames, gridWidth: run.gridWidth, gridHeight: run.gridHeight, modulation: run.modulation, usable: all(run.frames) });
    let peak = 0;
    for (let c = 1; c < maps.modulatedMap.length; c++) if (maps.modulatedMap[c]! > maps.modulatedMap[peak]!) peak = c;
    const px = peak % run.gridWidth, py = Math.floor(peak / run.gridWidth);
    // true beam region: within one σ of the planted centre
    expect(Math.hypot(px - run.options.beamX, py - run.options.beamY)).toBeLessThanOrEqual(run.options.beamSigma);
    expect(maps.modulatedMap[peak]).toBeGreaterThan(0.9 * run.options.amplitude);
    // annulus 6–8 blocks from the centre versus the far corner
    const at = (x: number, y: number) => maps.staticMap[y * run.gridWidth + x]!;
    const ring = [at(run.options.beamX + 7, run.options.beamY), at(run.options.beamX - 7, run.options.beamY), at(run.options.beamX, run.options.beamY + 7), at(run.options.beamX, run.options.beamY - 7)];
    const ringMean = ring.reduce((s, v) => s + v, 0) / 4;
    const far = at(run.gridWidth - 1, 0);
    expect(ringMean - far).toBeGreaterThan(0.5 * run.halo(run.options.beamX + 7, run.options.beamY));
    expect(ringMean - far).toBeCloseTo(run.halo(run.options.beamX + 7, run.options.beamY) - run.halo(run.gridWidth - 1, 0), 2);
  });

  it('divides by the exposure gain when one is given', () => {
    const run = makeSyntheticRun({ seed: 7, noise: 0.0005, gain: (t) => 1 + 0.2 * Math.sin(t) });
    const input = { grid: run.grid, frames: run.frames, gridWidth: run.gridWidth, gridHeight: run.gridHeight, modulation: run.modulation, usable: all(run.frames) };
    const corrected = modulationMaps({ ...input, gain: run.gain });
    const c = run.options.beamY * run.gridWidth + run.options.beamX;
    expect(corrected.modulatedMap[c]).toBeCloseTo(run.options.amplitude, 2);
    expect(corrected.staticMap[c]).toBeCloseTo(run.options.ambient + run.options.haloPeak + run.options.floor, 2);
  });

  it('skips unusable frames and frames without a modulation value, and counts them', () => {
    const run = makeSyntheticRun({ durationS: 6, seed: 9 });
    const usable = all(run.frames);
    usable[10] = 0; usable[11] = 0;
    const m = Float64Array.from(run.modulation);
    m[20] = NaN;
    const maps = modulationMaps({ grid: run.grid, frames: run.frames, gridWidth: run.gridWidth, gridHeight: run.gridHeight, modulation: m, usable });
    expect(maps.framesUsed).toBe(run.frames - 3);
    expect(maps.framesSkipped).toEqual({ unusable: 2, noModulation: 1, badGain: 0 });
    expect(maps.frameMean.length).toBe(run.frames);
  });

  it('refuses a modulation term that never varies', () => {
    const grid = new Float32Array(20 * 4).fill(0.1);
    let caught: unknown;
    try {
      modulationMaps({ grid, frames: 20, gridWidth: 2, gridHeight: 2, modulation: new Float64Array(20).fill(0.3), usable: all(20) });
    } catch (e) { caught = e; }
    expect(isKerrError(caught) && caught.code).toBe('NOT_IDENTIFIABLE');
  });

  it('refuses a grid whose size does not match', () => {
    expect(() => modulationMaps({ grid: new Float32Array(10), frames: 3, gridWidth: 2, gridHeight: 2, modulation: new Float64Array(3), usable: all(3) })).toThrow(/grid holds 10 values/);
  });
});
