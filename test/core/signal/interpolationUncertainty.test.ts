/**
 * Interpolation uncertainty measured in time, not sample index (issue 12: frames in a log gap kept
 * full weight). On an even log the bend is the plain second difference (the doc comment's rule);
 * with one interval four times longer the same curvature gives 16× the chord error there.
 */
import { describe, expect, it } from 'vitest';
import { interpolationUncertaintyV } from '../../../src/core/signal/interpolationUncertainty.js';

describe('interpolationUncertaintyV', () => {
  it('a straight ramp has only the noise; a bend on an even log gives half its second difference', () => {
    const t = Float64Array.from([0, 1, 2, 3, 4]);
    expect(interpolationUncertaintyV(t, Float64Array.from([0, 10, 20, 30, 40]), [1.5], 2)[0]).toBeCloseTo(2, 12);
    const v = Float64Array.from([0, 0, 0, 100, 200]); // corner at t = 2: Δ²v = 100
    expect(interpolationUncertaintyV(t, v, [2.5], 0)[0]).toBeCloseTo(50, 9);
  });
  it('grows with the square of the interval that holds the query (time-aware curvature)', () => {
    // v = t² sampled at 0, 1, 2, 6, 7: curvature 2 V/s² everywhere
    const t = Float64Array.from([0, 1, 2, 6, 7]);
    const v = Float64Array.from(t, (x) => x * x);
    const short = interpolationUncertaintyV(t, v, [1.5], 0)[0]!;
    const long = interpolationUncertaintyV(t, v, [4], 0)[0]!;
    expect(short).toBeCloseTo(1, 9); // ½·|c|·h̄² = ½·2·1
    expect(long).toBeCloseTo(16, 6); // ½·2·h̄²·(4/h̄)² with h̄ = 2.5 at t = 2 and 6: 16
  });
});
