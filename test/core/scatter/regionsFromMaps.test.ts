import { describe, expect, it } from 'vitest';
import { modulationMaps } from '../../../src/core/scatter/modulationMaps.js';
import { regionsFromMaps } from '../../../src/core/scatter/regionsFromMaps.js';
import { cellBoxContains, cellBoxesOverlap } from '../../../src/core/regions/cellGeometry.js';
import { isKerrError } from '../../../src/errors.js';
import { makeSyntheticRun, type SyntheticOptions } from './syntheticRun.js';

function mapsOf(o: SyntheticOptions) {
  const run = makeSyntheticRun(o);
  const maps = modulationMaps({ grid: run.grid, frames: run.frames, gridWidth: run.gridWidth, gridHeight: run.gridHeight, modulation: run.modulation, usable: new Uint8Array(run.frames).fill(1) });
  return { run, maps };
}

describe('regionsFromMaps', () => {
  it('finds the beam core around the planted centre, sized like the half-maximum of the spot', () => {
    const { run, maps } = mapsOf({ seed: 11, durationS: 10 });
    const r = regionsFromMaps(maps, { stepPx: run.stepPx });
    const { beamX, beamY, beamSigma } = run.options;
    expect(cellBoxContains(r.core.cells, beamX, beamY)).toBe(true);
    // slope ≥ half the peak reaches out to σ·√(2 ln 2) ≈ 1.18 σ (Gaussian half-maximum, textbook)
    const halfWidth = (r.core.cells.x1 - r.core.cells.x0) / 2;
    expect(halfWidth).toBeGreaterThanOrEqual(Math.floor(1.18 * beamSigma) - 1);
    expect(halfWidth).toBeLessThanOrEqual(Math.ceil(1.18 * beamSigma) + 1);
    expect(r.core.rect).toEqual({ x: r.core.cells.x0 * 8, y: r.core.cells.y0 * 8, w: (r.core.cells.x1 - r.core.cells.x0 + 1) * 8, h: (r.core.cells.y1 - r.core.cells.y0 + 1) * 8 });
    // the halo annulus encloses the footprint, which encloses the core
    expect(r.halo.inner).toEqual(r.footprint);
    expect(r.footprint.x0).toBeLessThanOrEqual(r.core.cells.x0);
    expect(r.halo.outer.x0).toBeLessThan(r.halo.inner.x0);
    expect(r.peakModulated.value).toBeGreaterThan(0.9 * run.options.amplitude);
  });

  it('places the far dark region away from the beam, at the lowest static light', () => {
    const { run, maps } = mapsOf({ seed: 12, durationS: 10 });
    const r = regionsFromMaps(maps, { stepPx: run.stepPx });
    expect(r.dark).not.toBeNull();
    expect(cellBoxesOverlap(r.dark!.cells, r.keepOut)).toBe(false);
    // planted static light there: ambient + a halo tail; the far corner is where the halo is least
    const cx = (r.dark!.cells.x0 + r.dark!.cells.x1) / 2;
    const cy = (r.dark!.cells.y0 + r.dark!.cells.y1) / 2;
    expect(Math.hypot(cx - run.options.beamX, cy - run.options.beamY)).toBeGreaterThan(15);
    expect(r.dark!.level).toBeCloseTo(run.options.ambient + run.halo(cx, cy), 3);
  });

  it('proposes a bright steady card as reference and nothing when there is none', () => {
    const card = { x0: 40, y0: 2, x1: 46, y1: 8, level: 0.35 };
    const { run, maps } = mapsOf({ seed: 13, durationS: 10, card });
    const r = regionsFromMaps(maps, { stepPx: run.stepPx });
    expect(r.reference).not.toBeNull();
    const ref = r.reference!.cells;
    expect(ref.x0 >= card.x0 && ref.x1 <= card.x1 && ref.y0 >= card.y0 && ref.y1 <= card.y1).toBe(true);
    expect(r.reference!.level).toBeCloseTo(0.35, 2);

    const plain = mapsOf({ seed: 13, durationS: 10 });
    expect(regionsFromMaps(plain.maps, { stepPx: 8 }).reference).toBeNull();
  });

  it('does not take a clipped card as reference', () => {
    const card = { x0: 40, y0: 2, x1: 46, y1: 8, level: 0.97 };
    const { maps } = mapsOf({ seed: 14, durationS: 6, card });
    expect(regionsFromMaps(maps, { stepPx: 8 }).reference).toBeNull();
  });

  it('says so when nothing on the modulated map stands above noise', () => {
    const { maps } = mapsOf({ seed: 15, durationS: 6, amplitude: 0, floor: 0 });
    let caught: unknown;
    try { regionsFromMaps(maps, { stepPx: 8 }); } catch (e) { caught = e; }
    expect(isKerrError(caught) && caught.code).toBe('BAD_REGION');
    expect(isKerrError(caught) && caught.hint).toMatch(/give the beam region/);
    expect(isKerrError(caught) && caught.inputs).toEqual(['beamRegion']); // the command line names it (--roi)
  });
});
