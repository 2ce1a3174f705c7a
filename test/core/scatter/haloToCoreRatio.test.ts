import { describe, expect, it } from 'vitest';
import { modulationMaps } from '../../../src/core/scatter/modulationMaps.js';
import { regionsFromMaps } from '../../../src/core/scatter/regionsFromMaps.js';
import { haloToCoreRatio, type HaloOptions } from '../../../src/core/scatter/haloToCoreRatio.js';
import { makeSyntheticRun, type SyntheticOptions } from './syntheticRun.js';

/**
 * The planted ratio by the definition the simulator's truth uses (src/sim/truth.ts), here on the
 * block grid of the synthetic run: mean planted halo S·H over the blocks where the planted beam G
 * is below 5 % but within w = max(r₅₀, 2 blocks) of a block where it is not (r₅₀ = √(N₅₀/π)),
 * minus the least planted halo in the frame, over the planted amplitude A.
 */
function plantedRatio(run: ReturnType<typeof makeSyntheticRun>): number {
  const { gridWidth: w, gridHeight: h } = run;
  const foot: [number, number][] = [];
  let core = 0;
  let far = Infinity;
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      if (run.beam(x, y) >= 0.05) foot.push([x, y]);
      if (run.beam(x, y) >= 0.5) core++;
      far = Math.min(far, run.halo(x, y));
    }
  }
  const width = Math.max(Math.sqrt(core / Math.PI), 2);
  let sum = 0, n = 0;
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      if (run.beam(x, y) >= 0.05) continue;
      if (!foot.some(([fx, fy]) => (x - fx) ** 2 + (y - fy) ** 2 <= width * width + 1e-9)) continue;
      sum += run.halo(x, y); n++;
    }
  }
  return (sum / n - far) / run.options.amplitude;
}

function measure(o: SyntheticOptions, options: HaloOptions = {}) {
  const run = makeSyntheticRun(o);
  const maps = modulationMaps({ grid: run.grid, frames: run.frames, gridWidth: run.gridWidth, gridHeight: run.gridHeight, modulation: run.modulation, usable: new Uint8Array(run.frames).fill(1) });
  const regions = regionsFromMaps(maps, { stepPx: run.stepPx });
  const halo = haloToCoreRatio(maps, regions, options);
  return { halo, truth: plantedRatio(run), run, maps, regions };
}

describe('haloToCoreRatio', () => {
  it('recovers a planted halo within 10 % by the truth\'s definition (with floor, ambient, noise, particles and sparks present)', () => {
    const { halo, truth, run } = measure({ seed: 21, particleFrames: [100, 300, 450], sparkFrames: [200, 380] }, { floorFraction: 0.005 / 0.5 });
    expect(halo).not.toBeNull();
    expect(truth).toBeGreaterThan(0.01);
    expect(Math.abs(halo!.ratio.value - truth) / truth).toBeLessThan(0.1);
    expect(halo!.ratio.stdErr).toBeGreaterThan(0);
    // the core amplitude is the slope peak, within 3 % of the planted A on a block centre
    expect(Math.abs(halo!.coreAmplitude / run.options.amplitude - 1)).toBeLessThan(0.03);
  });

  it('removes the beam\'s own floor from the band: a bright floor and no halo gives near 0 only with φ', () => {
    // planted F = 0.05 (10 % of A): its tail in the band is what φ·b_c takes away
    const o: SyntheticOptions = { seed: 24, haloPeak: 0, floor: 0.05, durationS: 10 };
    const without = measure(o).halo!.ratio.value;
    const withPhi = measure(o, { floorFraction: 0.05 / 0.5 }).halo!.ratio.value;
    expect(without).toBeGreaterThan(0.0015); // F·(mean G over the band ≈ 0.02)/A
    expect(Math.abs(withPhi)).toBeLessThan(0.2 * without);
  });

  it('gives a ratio near zero for a clean liquid without halo', () => {
    const { halo } = measure({ seed: 22, haloPeak: 0, durationS: 10 }, { floorFraction: 0.01 });
    expect(Math.abs(halo!.ratio.value)).toBeLessThan(0.003);
  });

  it('grows with the planted halo', () => {
    const weak = measure({ seed: 23, haloPeak: 0.01, durationS: 10 }).halo!.ratio.value;
    const strong = measure({ seed: 23, haloPeak: 0.04, durationS: 10 }).halo!.ratio.value;
    expect(strong / weak).toBeGreaterThan(3);
    expect(strong / weak).toBeLessThan(5);
  });

  it('divides by κ·peak: a luminance scale κ divides the ratio by κ and adds its relative error', () => {
    const plain = measure({ seed: 25, durationS: 8 }).halo!;
    const { maps, regions } = measure({ seed: 25, durationS: 8 });
    const scaled = haloToCoreRatio(maps, regions, { coreScale: { scale: 1.6, stdErr: 0.016 } })!;
    expect(scaled.ratio.value).toBeCloseTo(plain.ratio.value / 1.6, 12);
    expect(scaled.coreAmplitude).toBeCloseTo(plain.coreAmplitude * 1.6, 12);
    // σ_R = √((σ_N/κP)² + (R·σ_P/P)² + (R·σ_κ/κ)²): the last term is R·1 %
    const base = plain.ratio.stdErr! / 1.6;
    expect(scaled.ratio.stdErr!).toBeCloseTo(Math.hypot(base, 0.01 * scaled.ratio.value), 12);
  });

  it('averages only band blocks, outside the footprint and within the band width of it', () => {
    const { regions } = measure({ seed: 26, durationS: 6 });
    const { mask, widthPx } = regions.halo;
    const { beamX, beamY, beamSigma } = makeSyntheticRun({ seed: 26, durationS: 6 }).options;
    // round Gaussian beam: the band is the ring r₅ < r ≤ r₅ + w, r₅ = σ√(2 ln 20) ≈ 2.45 σ (± a block)
    const r5 = beamSigma * Math.sqrt(2 * Math.log(20));
    const w = widthPx / 8;
    let n = 0;
    for (let c = 0; c < mask.length; c++) {
      if (!mask[c]) continue;
      n++;
      const r = Math.hypot((c % 48) - beamX, Math.floor(c / 48) - beamY);
      expect(r).toBeGreaterThan(r5 - 1);
      expect(r).toBeLessThanOrEqual(r5 + w + 1);
    }
    expect(n).toBe(regions.halo.cellCount);
    // w = max(r₅₀, 2 blocks), r₅₀ = σ√(2 ln 2) ≈ 1.18 σ for a Gaussian (textbook half-maximum)
    expect(w).toBeGreaterThanOrEqual(Math.max(2, 1.18 * beamSigma - 1));
    expect(w).toBeLessThanOrEqual(Math.max(2, 1.18 * beamSigma + 1));
  });
});
