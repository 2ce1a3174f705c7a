import { invalid } from '../../errors.js';
import { quantity, type Quantity } from '../../quantity.js';
import { fitLine } from './lineFit.js';

export interface LinearisedKerrInput {
  /** Applied voltages (V), any sign (only V² enters). */
  voltageV: ArrayLike<number>;
  /** Normalised transmissions T = (I − I_floor)/I_amp, first branch (retardance δ ≤ π), one per voltage. */
  transmission: ArrayLike<number>;
  /** Electrode gap d (m). */
  gapM: number;
  /** (Effective) electrode length L along the beam (m). */
  lengthM: number;
  /** Points with T ≤ minT are dropped (arcsin√T is steep there). Default 0.02. */
  minT?: number;
  /** Points with T ≥ maxT are dropped. Default 0.98. */
  maxT?: number;
}

export interface LinearisedKerrResult {
  /** B = d²/(2π·L·s) from the line with intercept (m/V²). */
  kerrConstant: Quantity;
  /** s = dV²/dδ of the line with intercept (V²/rad). */
  slopeV2PerRad: Quantity;
  /** V² at δ = 0 of the line with intercept (V²); ideally 0 within its stdErr. */
  intercept: Quantity;
  /** Points used. */
  points: number;
  /** Points left out (outsideRange + nonFinite). */
  dropped: number;
  droppedByReason: { outsideRange: number; nonFinite: number };
  /** Centred R² of the line with intercept. */
  r2: number;
  /** The classic reduction, V² = s·δ forced through the origin. */
  throughOrigin: { kerrConstant: Quantity; slopeV2PerRad: Quantity; r2: number };
}

const DEFAULT_MIN_T = 0.02;
const DEFAULT_MAX_T = 0.98;

/**
 * The classic linearised Kerr reduction. With crossed polarisers at 45° the normalised
 * transmission is T = sin²(δ/2), so on the first branch (δ ≤ π) the retardance is
 * δ_i = 2·arcsin√T_i, and since δ = 2π·B·L·V²/d² (Kerr law with E = V/d),
 *
 *   V² = s·δ,   s = d²/(2π·B·L),   so   B = d²/(2π·L·s),   σ_B = B·σ_s/s.
 *
 * V_i² is regressed on δ_i twice: with an intercept (the headline: an offset such as static
 * retardance or a mis-set floor shows up in the intercept instead of biasing the slope) and through
 * the origin (the textbook form, reported in `throughOrigin`). Slopes and their standard errors
 * come from `fitLine`. Sources: Kerr law and Jones calculus as in any optics text; the straight-line
 * reduction is common laboratory practice.
 *
 * Dropping: points with T ≤ minT or T ≥ maxT (defaults 0.02 and 0.98, also any T outside [0, 1])
 * are left out because dδ/dT = 1/√(T(1 − T)) diverges at both ends, so small errors in T become
 * large errors in δ; non-finite V or T are left out too. Both are counted in `droppedByReason`.
 * Points past the half-wave voltage (second branch) cannot be told apart from T alone: pass only
 * the rising branch.
 *
 * Throws KerrError: BAD_ARGUMENT for mismatched lengths, non-positive gap or length, or
 * 0 ≤ minT < maxT ≤ 1 violated; NOT_IDENTIFIABLE with fewer than 3 usable points or one voltage.
 *
 * @example
 * // nitrobenzene-like B = 2.4e-12 m/V², d = 5 mm, L = 5 cm → V_π ≈ 10.2 kV; points from
 * // T = sin²(π/2·(V/V_π)²) return kerrConstant.value ≈ 2.4e-12 and intercept ≈ 0.
 */
export function linearisedKerr(input: LinearisedKerrInput): LinearisedKerrResult {
  const { voltageV, transmission, gapM, lengthM } = input;
  const minT = input.minT ?? DEFAULT_MIN_T;
  const maxT = input.maxT ?? DEFAULT_MAX_T;
  if (transmission.length !== voltageV.length) {
    throw invalid(`one transmission per voltage (${voltageV.length})`, 'transmission', `${transmission.length} values`);
  }
  if (!(gapM > 0) || !Number.isFinite(gapM)) throw invalid('a positive electrode gap in m', 'gapM', gapM);
  if (!(lengthM > 0) || !Number.isFinite(lengthM)) throw invalid('a positive electrode length in m', 'lengthM', lengthM);
  if (!(minT >= 0 && minT < maxT && maxT <= 1)) {
    throw invalid('0 ≤ minT < maxT ≤ 1', 'minT/maxT', `${minT}/${maxT}`);
  }

  const retardanceRad: number[] = [];
  const voltageSquaredV2: number[] = [];
  let outsideRange = 0;
  let nonFinite = 0;
  for (let i = 0; i < voltageV.length; i++) {
    const v = voltageV[i]!;
    const t = transmission[i]!;
    if (!Number.isFinite(v) || !Number.isFinite(t)) {
      nonFinite++;
      continue;
    }
    if (t <= minT || t >= maxT || t < 0 || t > 1) {
      outsideRange++;
      continue;
    }
    retardanceRad.push(2 * Math.asin(Math.sqrt(t)));
    voltageSquaredV2.push(v * v);
  }

  if (retardanceRad.length < 3) {
    throw invalid(`at least 3 points with ${minT} < T < ${maxT}`, 'transmission',
      `${retardanceRad.length} usable of ${voltageV.length} (${outsideRange} outside the range, ${nonFinite} not finite)`,
      'Sweep over more of the rising branch, or widen minT/maxT', 'NOT_IDENTIFIABLE');
  }
  const withIntercept = fitLine(retardanceRad, voltageSquaredV2);
  const origin = fitLine(retardanceRad, voltageSquaredV2, { throughOrigin: true });
  const kerrFromSlope = (slope: number, slopeStdErr: number): Quantity => {
    const b = (gapM * gapM) / (2 * Math.PI * lengthM * slope);
    return quantity(b, Math.abs(b) * (slopeStdErr / Math.abs(slope)), 'm/V^2');
  };
  return {
    kerrConstant: kerrFromSlope(withIntercept.slope, withIntercept.slopeStdErr),
    slopeV2PerRad: quantity(withIntercept.slope, withIntercept.slopeStdErr, 'V^2/rad'),
    intercept: quantity(withIntercept.intercept, withIntercept.interceptStdErr, 'V^2'),
    points: withIntercept.points,
    dropped: outsideRange + nonFinite,
    droppedByReason: { outsideRange, nonFinite },
    r2: withIntercept.r2,
    throughOrigin: {
      kerrConstant: kerrFromSlope(origin.slope, origin.slopeStdErr),
      slopeV2PerRad: quantity(origin.slope, origin.slopeStdErr, 'V^2/rad'),
      r2: origin.r2,
    },
  };
}
