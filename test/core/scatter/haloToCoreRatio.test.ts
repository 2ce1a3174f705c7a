import { describe, expect, it } from 'vitest';
import { modulationMaps } from '../../../src/core/scatter/modulationMaps.js';
import { regionsFromMaps } from '../../../src/core/scatter/regionsFromMaps.js';
import { haloToCoreRatio } from '../../../src/core/scatter/haloToCoreRatio.js';
import { cellBoxContains } from '../../../src/core/scatter/cellGeometry.js';
import { makeSyntheticRun, type SyntheticOptions } from './syntheticRun.js';

function measure(o: SyntheticOptions) {
  const run = makeSyntheticRun(o);
  const maps = modulationMaps({ grid: run.grid, frames: run.frames, gridWidth: run.gridWidth, gridHeight: run.gridHeight, modulation: run.modulation, usable: new Uint8Array(run.frames).fill(1) });
  const regions = regionsFromMaps(maps, { stepPx: run.stepPx });
  const halo = haloToCoreRatio(maps, regions);
  // Planted truth: mean planted halo S·H over the same annulus, minus the planted halo at the far
  // dark window, over the planted amplitude A (the spot's peak G = 1 lies on a block centre).
  let sum = 0, n = 0;
  for (let y = regions.halo.outer.y0; y <= regions.halo.outer.y1; y++) {
    for (let x = regions.halo.outer.x0; x <= regions.halo.outer.x1; x++) {
      if (cellBoxContains(regions.halo.inner, x, y)) continue;
      sum += run.halo(x, y); n++;
    }
  }
  let dsum = 0, dn = 0;
  const d = regions.dark!.cells;
  for (let y = d.y0; y <= d.y1; y++) for (let x = d.x0; x <= d.x1; x++) { dsum += run.halo(x, y); dn++; }
  const truth = (sum / n - dsum / dn) / run.options.amplitude;
  return { halo, truth, run };
}

describe('haloToCoreRatio', () => {
  it('recovers a planted halo within 20 % (with floor, ambient, noise, particles and sparks present)', () => {
    const { halo, truth } = measure({ seed: 21, particleFrames: [100, 300, 450], sparkFrames: [200, 380] });
    expect(halo).not.toBeNull();
    expect(truth).toBeGreaterThan(0.01);
    expect(Math.abs(halo!.ratio.value - truth) / truth).toBeLessThan(0.2);
    expect(halo!.ratio.stdErr).toBeGreaterThan(0);
  });

  it('gives a ratio near zero for a clean liquid without halo', () => {
    const { halo } = measure({ seed: 22, haloPeak: 0, durationS: 10 });
    expect(Math.abs(halo!.ratio.value)).toBeLessThan(0.003);
  });

  it('grows with the planted halo', () => {
    const weak = measure({ seed: 23, haloPeak: 0.01, durationS: 10 }).halo!.ratio.value;
    const strong = measure({ seed: 23, haloPeak: 0.04, durationS: 10 }).halo!.ratio.value;
    expect(strong / weak).toBeGreaterThan(3);
    expect(strong / weak).toBeLessThan(5);
  });
});
