/**
 * The fitted model's dark-subtracted intensity at a voltage, from the fit parameters saved in
 * result.json (`RunResult.model`):
 *   I(V) = I_floor + I_amp · sin²(2θ) · sin²((δ_static + δ(V))/2),  δ(V) = 2π·B·L_eff·V²/d²,
 * with θ the polariser angle to the field. Evaluated with the physics functions of
 * src/core/physics/kerr.ts (retardanceRad, crossedTransmission); the static retardance of
 * strained windows is taken along the field axis, so it adds to the Kerr retardance.
 * Units: V in volts, intensities in the result's linear units. Never throws; NaN in, NaN out.
 * @example modelIntensity({floorLevel:{value:0.01}, amplitude:{value:1}, kerrConstant:{value:2.4e-12},
 *   effectiveLengthM:0.05, gapM:0.005, polariserAngleDeg:45, staticRetardanceRad:0, darkLevel:0}, 10206) ≈ 1.01
 */
import type { FitModelParams } from '../../result/schema.js';
import { crossedTransmission, DEG, retardanceRad } from '../../core/physics/kerr.js';

export function modelIntensity(model: FitModelParams, voltageV: number): number {
  const kerrRetardanceRad = retardanceRad(model.kerrConstant.value, model.effectiveLengthM, voltageV, model.gapM);
  const totalRetardanceRad = model.staticRetardanceRad + kerrRetardanceRad;
  const transmission = crossedTransmission(model.polariserAngleDeg * DEG, totalRetardanceRad);
  return model.floorLevel.value + model.amplitude.value * transmission;
}
