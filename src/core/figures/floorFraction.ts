/**
 * Floor fraction of a Kerr fit: the zero-field light left on the beam over the modulation
 * amplitude, f = I_floor / I_amp (dimensionless; DESIGN.md "floor"). Its standard error by
 * first-order propagation (GUM, JCGM 100:2008 §5.1.2) from the fit's floor and amplitude errors,
 * their covariance ignored:
 *   σ_f² = (σ_floor / I_amp)² + (I_floor · σ_amp / I_amp²)²
 * which equals |f|·√((σ_floor/I_floor)² + (σ_amp/I_amp)²) for a non-zero floor and stays correct
 * (σ_floor/I_amp) when the floor is exactly 0. No standard error when neither input has one.
 * NaN (no error) when the amplitude is not positive: the fraction has no meaning then.
 * Shared by video and photo runs. Pure; throws nothing.
 * @example floorFraction({ value: 0.03, stdErr: 0.001 }, { value: 0.4, stdErr: 0.004 }) → { value: 0.075, stdErr ≈ 0.00260 }
 */
import { quantity, type Quantity } from '../../quantity.js';

export function floorFraction(floorLevel: Quantity, amplitude: Quantity): Quantity {
  const floor = floorLevel.value;
  const amp = amplitude.value;
  if (!(amp > 0)) return quantity(NaN);
  if (floorLevel.stdErr === undefined && amplitude.stdErr === undefined) return quantity(floor / amp);
  const err = Math.hypot((floorLevel.stdErr ?? 0) / amp, (floor * (amplitude.stdErr ?? 0)) / (amp * amp));
  return quantity(floor / amp, err);
}
