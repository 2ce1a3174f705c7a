/**
 * Contrast ratio of a Kerr fit over the voltages a run used: the highest over the lowest fitted
 * (dark- or surround-subtracted) intensity, found by scanning the fitted curve at
 * CONTRAST_SCAN_STEPS + 1 evenly spaced voltages from the least to the greatest |V| used
 * (dimensionless; DESIGN.md "contrast").
 * Standard error by first-order propagation (GUM, JCGM 100:2008 §5.1.2) from the floor and
 * amplitude errors, their correlation ignored: the model is I = I_floor + I_amp·t, so at a level I
 *   σ_I² = σ_floor² + t²·σ_amp²,  t = (I − I_floor)/I_amp,
 * and for c = I_hi/I_lo: σ_c = c·√((σ_hi/I_hi)² + (σ_lo/I_lo)²).
 * When the lowest fitted level is at or below 0 the ratio is unbounded: Infinity, no error,
 * `floorNotPositive` true (the caller warns).
 * Shared by video and photo runs: pass the fit (KerrCurveFit satisfies ContrastFit) and the range
 * of |V| over the frames or photos used. Pure; throws nothing.
 * @example contrastRatio(fit, 0, 12000).ratio.value ≈ (floor + amp)/floor for a sweep through V_π
 */
import { quantity, type Quantity } from '../../quantity.js';

/** Points of the scan of the fitted curve, minus one. */
export const CONTRAST_SCAN_STEPS = 400;

export interface ContrastFit {
  predict: (voltageV: number) => number;
  floorLevel: Quantity;
  amplitude: Quantity;
}

export function contrastRatio(fit: ContrastFit, minAbsVoltageV: number, maxAbsVoltageV: number): { ratio: Quantity; floorNotPositive: boolean } {
  let hi = -Infinity, lo = Infinity;
  for (let k = 0; k <= CONTRAST_SCAN_STEPS; k++) {
    const m = fit.predict(minAbsVoltageV + ((maxAbsVoltageV - minAbsVoltageV) * k) / CONTRAST_SCAN_STEPS);
    hi = Math.max(hi, m);
    lo = Math.min(lo, m);
  }
  if (!(lo > 0)) return { ratio: quantity(Infinity), floorNotPositive: true };
  const floor = fit.floorLevel, amp = fit.amplitude;
  const sigmaAt = (level: number): number => {
    const t = amp.value > 0 ? (level - floor.value) / amp.value : 0;
    return Math.sqrt((floor.stdErr ?? 0) ** 2 + (t * (amp.stdErr ?? 0)) ** 2);
  };
  const c = hi / lo;
  return { ratio: quantity(c, c * Math.hypot(sigmaAt(hi) / hi, sigmaAt(lo) / lo)), floorNotPositive: false };
}

/** Least and greatest |V| of the voltages at the given indices (the frames or photos used). */
export function usedVoltageRange(voltageV: ArrayLike<number>, usedIndex: readonly number[]): [number, number] {
  let lo = Infinity, hi = 0;
  for (const i of usedIndex) {
    const a = Math.abs(voltageV[i]!);
    lo = Math.min(lo, a);
    hi = Math.max(hi, a);
  }
  return [lo, hi];
}
