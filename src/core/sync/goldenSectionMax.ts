/**
 * Golden-section search for the maximum of a unimodal function on [lo, hi]: keep two interior
 * points at the golden ratio, drop the side of the lower one, until the bracket is narrower than
 * `toleranceX`. Source: Kiefer (1953); Press et al., Numerical Recipes, §10.2 "golden section
 * search". Units are the caller's. The best point seen (interior or end) is returned.
 *
 * Iterations are capped (`maxIterations`, default 80: a bracket shrinks by 0.618 per step) and
 * `converged` says whether the tolerance was reached. Throws nothing; a non-finite f value counts
 * as −∞.
 *
 * @example goldenSectionMax((x) => -(x - 1) ** 2, 0, 3, 1e-6).x ≈ 1
 */
export interface GoldenSectionResult {
  x: number;
  value: number;
  iterations: number;
  converged: boolean;
}

const INV_PHI = (Math.sqrt(5) - 1) / 2; // 0.618…

export function goldenSectionMax(
  f: (x: number) => number,
  lo: number,
  hi: number,
  toleranceX: number,
  maxIterations = 80,
): GoldenSectionResult {
  const safe = (x: number): number => {
    const y = f(x);
    return Number.isFinite(y) ? y : Number.NEGATIVE_INFINITY;
  };
  let a = Math.min(lo, hi);
  let b = Math.max(lo, hi);
  let c = b - INV_PHI * (b - a);
  let d = a + INV_PHI * (b - a);
  let fc = safe(c);
  let fd = safe(d);
  let bestX = fc >= fd ? c : d;
  let bestValue = Math.max(fc, fd);
  let iterations = 0;
  while (b - a > toleranceX && iterations < maxIterations) {
    iterations++;
    if (fc >= fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - INV_PHI * (b - a);
      fc = safe(c);
      if (fc > bestValue) {
        bestValue = fc;
        bestX = c;
      }
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + INV_PHI * (b - a);
      fd = safe(d);
      if (fd > bestValue) {
        bestValue = fd;
        bestX = d;
      }
    }
  }
  for (const x of [lo, hi]) {
    const y = safe(x);
    if (y > bestValue) {
      bestValue = y;
      bestX = x;
    }
  }
  return { x: bestX, value: bestValue, iterations, converged: b - a <= toleranceX };
}
