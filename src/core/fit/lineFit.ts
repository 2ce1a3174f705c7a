import { invalid } from '../../errors.js';

export interface LineFit {
  slope: number;
  slopeStdErr: number;
  /** 0 (exactly, with stdErr 0) for a fit through the origin. */
  intercept: number;
  interceptStdErr: number;
  /** Centred R² = 1 − RSS/Σ(y − ȳ)² with intercept; uncentred 1 − RSS/Σy² through the origin. */
  r2: number;
  residualStdDev: number;
  rss: number;
  points: number;
  dof: number;
}

/**
 * Ordinary least-squares straight line y = a + b·x, or y = b·x through the origin, with standard
 * errors (Draper & Smith, "Applied Regression Analysis", 3rd ed., 1998, §1.4 and §3.1; from memory):
 *
 *   with intercept:   b = Sxy/Sxx,  a = ȳ − b·x̄,  s² = RSS/(n − 2),
 *                     se(b) = s/√Sxx,  se(a) = s·√(1/n + x̄²/Sxx),
 *   through origin:   b = Σxy/Σx²,  s² = RSS/(n − 1),  se(b) = s/√Σx²,
 *
 * with Sxx = Σ(x − x̄)², Sxy = Σ(x − x̄)(y − ȳ) formed from centred values (two passes, so large
 * offsets such as V² in kV² do not cancel). Units: slope in y-units per x-unit, intercept in y-units.
 *
 * Throws KerrError: BAD_ARGUMENT for different lengths or non-finite values (clean the data first);
 * NOT_IDENTIFIABLE with too few points (3 with intercept, 2 through the origin) or all x equal.
 *
 * @example fitLine([1, 2, 3], [2, 4, 6.5]) // slope 2.25, intercept −0.333…, r2 ≈ 0.9959
 */
export function fitLine(x: ArrayLike<number>, y: ArrayLike<number>, options: { throughOrigin?: boolean } = {}): LineFit {
  const n = x.length;
  if (y.length !== n) throw invalid(`as many y values as x values (${n})`, 'y', `${y.length} values`);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(x[i]!) || !Number.isFinite(y[i]!)) {
      throw invalid('finite x and y values', `point ${i}`, `(${x[i]}, ${y[i]})`, 'Drop or repair non-finite points before the line fit');
    }
  }
  const throughOrigin = options.throughOrigin ?? false;
  const needed = throughOrigin ? 2 : 3;
  if (n < needed) {
    throw invalid(`at least ${needed} points for a line with an error estimate`, 'line fit', `${n} points`,
      'Record more points along the sweep', 'NOT_IDENTIFIABLE');
  }

  let meanX = 0;
  let meanY = 0;
  if (!throughOrigin) {
    for (let i = 0; i < n; i++) {
      meanX += x[i]!;
      meanY += y[i]!;
    }
    meanX /= n;
    meanY /= n;
  }
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dx = x[i]! - meanX;
    const dy = y[i]! - meanY;
    sxx += dx * dx;
    sxy += dx * dy;
    syy += dy * dy;
  }
  if (!(sxx > 0)) {
    throw invalid('x values that are not all the same', 'line fit', `all x = ${x[0]}`,
      'Sweep over a range of values', 'NOT_IDENTIFIABLE');
  }
  const slope = sxy / sxx;
  const intercept = throughOrigin ? 0 : meanY - slope * meanX;
  let rss = 0;
  for (let i = 0; i < n; i++) {
    const r = y[i]! - intercept - slope * x[i]!;
    rss += r * r;
  }
  const dof = n - (throughOrigin ? 1 : 2);
  const variance = rss / dof;
  const s = Math.sqrt(variance);
  return {
    slope,
    slopeStdErr: s / Math.sqrt(sxx),
    intercept,
    interceptStdErr: throughOrigin ? 0 : s * Math.sqrt(1 / n + (meanX * meanX) / sxx),
    r2: syy > 0 ? 1 - rss / syy : Number.NaN,
    residualStdDev: s,
    rss,
    points: n,
    dof,
  };
}
