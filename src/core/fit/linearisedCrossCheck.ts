import { isKerrError, invalid } from '../../errors.js';
import type { Quantity } from '../../quantity.js';
import { polariserAngleFactor } from '../physics/modulationTerm.js';
import { linearisedKerr } from './linearisedKerr.js';

export interface LinearisedCrossCheckInput {
  /** Applied voltage of each point handed to the fit (V), in the fit's order. */
  voltageV: ArrayLike<number>;
  /** Measured intensity of each point (the fit's linear units, dark-subtracted), same order. */
  intensity: ArrayLike<number>;
  /** The fit's floor I_floor (same units as intensity). */
  floorLevel: number;
  /** The fit's amplitude I_amp (same units as intensity); must be positive for a reduction. */
  amplitude: number;
  /** Polariser angle θ to the field (degrees), analyser crossed. */
  polariserAngleDeg: number;
  /** The fit's half-wave voltage V_π (V): points with |V| ≥ V_π are past the first branch. Infinity keeps every point. */
  halfWaveVoltageV: number;
  /** Electrode gap d (m). */
  gapM: number;
  /** Effective electrode length L_eff (m). */
  effectiveLengthM: number;
  /** The fit's Kerr constant (m/V²) with its standard error, compared with the regression's. */
  fitKerrConstant: Quantity;
  /** Non-zero where the fit flagged the point as an outlier (left out here too); same order. */
  outliers?: ArrayLike<number>;
}

/** The cross-check as result.json stores it (RunResult['linearised'] when not null). */
export interface LinearisedCrossCheck {
  /** B from the straight line V² against δ, with intercept (m/V²). */
  kerrConstant: Quantity;
  /** Points used by the regression (first branch, 0.02 < T < 0.98). */
  points: number;
  /** |z| < 3. */
  agreesWithFit: boolean;
  /** z = (B_lin − B_fit) / √(σ_fit² + σ_lin²). */
  zScore: number;
}

/** First-branch points below which the reduction is not attempted. */
export const MIN_LINEARISED_POINTS = 5;

/** sin²(2θ) at or below which the polariser is taken as parallel to the field (no modulation to normalise by). */
const MIN_ANGLE_FACTOR = 1e-9;

/** |z| at or above which the two values of B disagree. */
export const LINEARISED_Z_LIMIT = 3;

/**
 * The classic linearised reduction, as a cross-check of a full Kerr fit. Keep the points on the
 * first branch (|V| < V_π from the fit) that the fit did not flag as outliers, normalise them with
 * the fit's floor and amplitude,
 *   T = (I − I_floor) / (I_amp·sin²(2θ)),
 * and hand them to `linearisedKerr`, which regresses V² on δ = 2·arcsin√T (Kerr law
 * δ = 2π·B·L_eff·V²/d², so V² = d²/(2π·B·L_eff)·δ; points with T ≤ 0.02 or T ≥ 0.98 are dropped
 * there). The two values of B are compared by
 *   z = (B_lin − B_fit) / √(σ_fit² + σ_lin²),   agreesWithFit = |z| < 3.
 * With no standard error on either value z is ±Infinity (or NaN when the values are equal), and
 * agreesWithFit is false. Sources: Kerr law and Jones calculus (crossed polarisers,
 * T = sin²(2θ)·sin²(δ/2)) as in any optics text; the straight-line reduction is common laboratory
 * practice. Units: V, m, m/V²; intensities in any consistent linear unit.
 *
 * Returns null, as result.json records it, when the reduction cannot be made: fewer than
 * MIN_LINEARISED_POINTS (5) first-branch points, a non-positive or non-finite amplitude, a
 * polariser angle with sin²(2θ) ≈ 0, a V_π that is NaN or not positive, or fewer than 3 points
 * inside 0.02 < T < 0.98 (or one voltage only). Pure; never mutates its inputs.
 *
 * Throws KerrError BAD_ARGUMENT when intensity or outliers differ in length from voltageV, or for
 * a non-positive gap or length (from linearisedKerr).
 *
 * @example
 * // B = 2.4e-12 m/V², L_eff = 50 mm, d = 5 mm (V_π ≈ 10.2 kV), noise-free points at 0 ... 12 kV:
 * linearisedCrossCheck({ voltageV, intensity, floorLevel: 0.03, amplitude: 0.4, polariserAngleDeg: 45,
 *   halfWaveVoltageV: 10206, gapM: 0.005, effectiveLengthM: 0.05,
 *   fitKerrConstant: { value: 2.4e-12, stdErr: 2.4e-14, unit: 'm/V^2' } })
 * // → { kerrConstant: { value: 2.4e-12, ... }, points: 6, agreesWithFit: true, zScore: ≈ 0 }
 */
export function linearisedCrossCheck(input: LinearisedCrossCheckInput): LinearisedCrossCheck | null {
  const { voltageV, intensity, outliers } = input;
  if (intensity.length !== voltageV.length) {
    throw invalid(`one intensity per voltage (${voltageV.length})`, 'intensity', `${intensity.length} values`);
  }
  if (outliers !== undefined && outliers.length !== voltageV.length) {
    throw invalid(`one outlier flag per voltage (${voltageV.length})`, 'outliers', `${outliers.length} values`);
  }
  const angleFactor = polariserAngleFactor(input.polariserAngleDeg);
  if (!(input.amplitude > 0) || !Number.isFinite(input.amplitude) || !(angleFactor > MIN_ANGLE_FACTOR)) return null;
  if (!(input.halfWaveVoltageV > 0)) return null;
  const fullScale = input.amplitude * angleFactor;

  const transmission: number[] = [];
  const voltages: number[] = [];
  for (let k = 0; k < voltageV.length; k++) {
    if (outliers !== undefined && outliers[k]) continue;
    const v = voltageV[k]!;
    if (Math.abs(v) >= input.halfWaveVoltageV) continue;
    transmission.push((intensity[k]! - input.floorLevel) / fullScale);
    voltages.push(v);
  }
  if (transmission.length < MIN_LINEARISED_POINTS) return null;

  let line;
  try {
    line = linearisedKerr({ voltageV: voltages, transmission, gapM: input.gapM, lengthM: input.effectiveLengthM });
  } catch (err) {
    if (isKerrError(err) && err.code === 'NOT_IDENTIFIABLE') return null; // too few points inside 0.02 < T < 0.98, or one voltage
    throw err;
  }
  const bFit = input.fitKerrConstant;
  const bLin = line.kerrConstant;
  const zScore = (bLin.value - bFit.value) / Math.hypot(bFit.stdErr ?? 0, bLin.stdErr ?? 0);
  return { kerrConstant: bLin, points: line.points, agreesWithFit: Math.abs(zScore) < LINEARISED_Z_LIMIT, zScore };
}
