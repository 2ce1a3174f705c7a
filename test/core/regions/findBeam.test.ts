/**
 * Automatic beam finding on a block grid drawn here: a modulated spot among a brighter static
 * patch, a slow ambient drift and flashes. The expected box is the one the test draws
 * (self-consistency of the geometry; no outside source).
 */
import { describe, expect, it } from 'vitest';
import { findBeam } from '../../../src/core/regions/findBeam.js';
import { seededNormal } from '../../helpers/random.js';

const GW = 40;
const GH = 30;
const FRAMES = 200;

interface Scene {
  grid: Float32Array;
  /** The modulated blocks the test planted (inclusive). */
  beam: { x0: number; y0: number; x1: number; y1: number };
}

/**
 * Frame f: ambient 0.02 (+ a slow 10 % drift), a static bright card at blocks x 2–7, y 2–6 (0.8,
 * never changing), and the beam: blocks x 25–28, y 12–14 at full modulation m(f) = sin²(πf/100)
 * of amplitude 0.5, with a one-block fringe around it at 40 % of that. Noise 0.002 per block.
 */
function scene(flashFrames: number[] = []): Scene {
  const noise = seededNormal(17);
  const grid = new Float32Array(FRAMES * GW * GH);
  for (let f = 0; f < FRAMES; f++) {
    const m = Math.sin((Math.PI * f) / 100) ** 2;
    const ambient = 0.02 * (1 + 0.1 * f / FRAMES);
    const flash = flashFrames.includes(f) ? 0.9 : 0;
    for (let y = 0; y < GH; y++) {
      for (let x = 0; x < GW; x++) {
        let v = ambient + flash + 0.002 * noise();
        if (x >= 2 && x <= 7 && y >= 2 && y <= 6) v += 0.8;
        const inCore = x >= 25 && x <= 28 && y >= 12 && y <= 14;
        const inFringe = x >= 24 && x <= 29 && y >= 11 && y <= 15;
        if (inCore) v += 0.5 * m;
        else if (inFringe) v += 0.2 * m;
        grid[f * GW * GH + y * GW + x] = v;
      }
    }
  }
  return { grid, beam: { x0: 24, y0: 11, x1: 29, y1: 15 } };
}

describe('findBeam', () => {
  it('finds the modulated spot, grown to its fringe (≥ 25 % of the peak range), and not the brighter static card', () => {
    const s = scene();
    const found = findBeam({ grid: s.grid, frames: FRAMES, gridWidth: GW, gridHeight: GH });
    expect(found.beam).toEqual(s.beam);
    // p95 − p5 of 0.5·sin² over whole periods is 0.5·(sin²(0.95·π/2) − sin²(0.05·π/2)) ≈ 0.494 (closed form)
    const expectedRange = 0.5 * (Math.sin(0.95 * Math.PI / 2) ** 2 - Math.sin(0.05 * Math.PI / 2) ** 2);
    expect(found.peakRange).toBeCloseTo(expectedRange, 1);
    expect(found.medianRange).toBeLessThan(0.02);
    expect(found.rangeMap).toHaveLength(GW * GH);
  });

  it('with a higher threshold keeps only the core', () => {
    const s = scene();
    const found = findBeam({ grid: s.grid, frames: FRAMES, gridWidth: GW, gridHeight: GH, threshold: 0.6 });
    expect(found.beam).toEqual({ x0: 25, y0: 12, x1: 28, y1: 14 });
  });

  it('is not led astray by whole-frame flashes: flagged frames are skipped, and a few unflagged ones fall outside p5–p95', () => {
    const flashes = [30, 31, 90, 150];
    const s = scene(flashes);
    const usable = new Uint8Array(FRAMES).fill(1);
    for (const f of flashes) usable[f] = 0;
    expect(findBeam({ grid: s.grid, frames: FRAMES, gridWidth: GW, gridHeight: GH, usable }).beam).toEqual(s.beam);
    expect(findBeam({ grid: s.grid, frames: FRAMES, gridWidth: GW, gridHeight: GH }).beam).toEqual(s.beam);
  });

  it('refuses a still scene and too few usable frames in one KerrError each', () => {
    const still = new Float32Array(FRAMES * GW * GH).fill(0.1);
    expect(() => findBeam({ grid: still, frames: FRAMES, gridWidth: GW, gridHeight: GH }))
      .toThrow(expect.objectContaining({ code: 'BAD_REGION', message: expect.stringMatching(/no part of the frame brightens and darkens/) }));
    const s = scene();
    const usable = new Uint8Array(FRAMES);
    usable.fill(1, 0, 4);
    expect(() => findBeam({ grid: s.grid, frames: FRAMES, gridWidth: GW, gridHeight: GH, usable }))
      .toThrow(expect.objectContaining({ code: 'BAD_REGION', message: expect.stringMatching(/only 4 usable frames/) }));
  });
});
