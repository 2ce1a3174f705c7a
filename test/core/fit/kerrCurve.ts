import type { CurveModel } from '../../../src/core/fit/levenbergMarquardt.js';

/**
 * Test model of a Kerr sweep seen through crossed polarisers at 45°:
 * I(V) = floor + amp·sin²(δ/2), δ = π·(V/V_π)² (so δ = π at V_π; Kerr law, any optics text).
 * Parameters [floor, amp, halfWaveV]. No analytic gradient: exercises the numeric path.
 */
export const kerrSweepModel: CurveModel = {
  nParams: 3,
  value: (p, v) => {
    const ratio = v / p[2]!;
    const s = Math.sin((Math.PI / 2) * ratio * ratio);
    return p[0]! + p[1]! * s * s;
  },
};

export function kerrSweep(truth: readonly number[], voltages: ArrayLike<number>, noise: () => number): { x: Float64Array; y: Float64Array } {
  const x = Float64Array.from(voltages);
  const at = Float64Array.from(truth);
  const y = x.map((v) => kerrSweepModel.value(at, v) + noise());
  return { x, y };
}
