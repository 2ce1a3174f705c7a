/**
 * The sync offset's standard uncertainty (src/core/uncertainty/syncOffsetUncertainty.ts): the
 * search's curvature estimate, a frame's timing Δt/√12 and, for a log with N steps, their edge
 * timing Δt_log/√(12·N), in quadrature (JCGM 100:2008 §4.3.7: a rectangular distribution of full
 * width a has u = a/√12). Worked by hand.
 */
import { describe, expect, it } from 'vitest';
import { syncOffsetUncertaintyS } from '../../../src/core/uncertainty/syncOffsetUncertainty.js';

const frames30 = Float64Array.from({ length: 300 }, (_x, k) => k / 30);

describe('syncOffsetUncertaintyS', () => {
  it('combines the widened search error with a frame interval over √12', () => {
    expect(syncOffsetUncertaintyS(0.001, 2, frames30)).toBeCloseTo(Math.hypot(0.002, 1 / 30 / Math.sqrt(12)), 12);
    expect(syncOffsetUncertaintyS(undefined, 2, frames30)).toBeUndefined();
  });

  it('adds the timing of the log steps: a 4 Hz log with 7 steps gives 0.25/√84 s', () => {
    const u = syncOffsetUncertaintyS(0.001, 1, frames30, { intervalS: 0.25, count: 7 })!;
    expect(u).toBeCloseTo(Math.hypot(0.001, 1 / 30 / Math.sqrt(12), 0.25 / Math.sqrt(84)), 12);
    // a smooth log (no steps) adds nothing
    expect(syncOffsetUncertaintyS(0.001, 1, frames30, { intervalS: 0.25, count: 0 })).toBeCloseTo(syncOffsetUncertaintyS(0.001, 1, frames30)!, 15);
  });
});
