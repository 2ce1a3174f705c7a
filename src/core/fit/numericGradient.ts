/**
 * Central-difference gradient of a scalar model with respect to its parameters:
 *
 *   ∂f/∂p_j ≈ (f(p + h_j·e_j) − f(p − h_j·e_j)) / (2·h_j),   h_j = ε^(1/3)·|p_j|  (ε^(1/3) if p_j = 0).
 *
 * The relative step ε^(1/3) ≈ 6.1e-6 balances the O(h²) truncation error against the O(ε/h)
 * rounding error, giving about ε^(2/3) ≈ 4e-11 relative accuracy for smooth models
 * (Nocedal & Wright, "Numerical Optimization", 2nd ed., §8.1). Keeping the step relative to
 * |p_j| keeps it in proportion for parameters of any size (1e-7 as well as 1e3). h_j is rounded
 * so that p_j ± h_j are exact doubles.
 *
 * `params` is used as scratch and restored exactly before returning; `out[j]` receives the
 * derivatives. Throws nothing (non-finite model values give non-finite derivatives).
 *
 * @example
 * // f(p, x) = p0·x² at p0 = 3, x = 2: out[0] ≈ 4
 */
export function numericGradient(
  value: (params: Float64Array, x: number) => number,
  params: Float64Array,
  x: number,
  out: Float64Array,
): void {
  for (let j = 0; j < params.length; j++) {
    const original = params[j]!;
    const magnitude = original !== 0 ? Math.abs(original) : 1;
    const trial = original + CBRT_EPS * magnitude;
    const h = trial - original; // exactly representable step
    params[j] = original + h;
    const up = value(params, x);
    params[j] = original - h;
    const down = value(params, x);
    params[j] = original;
    out[j] = (up - down) / (2 * h);
  }
}

const CBRT_EPS = Math.cbrt(Number.EPSILON);
