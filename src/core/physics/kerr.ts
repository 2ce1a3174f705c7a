/**
 * Kerr-effect relations for a liquid cell between parallel plate electrodes. SI units throughout.
 *
 * Kerr law: Δn = λ·B·E² with B the Kerr constant in m/V² (tables in cm/V²: multiply by 1e-2).
 * Field between plates E = V/d. Retardance δ = 2π·Δn·L/λ = 2π·B·L·E² = 2π·B·L·V²/d².
 * Half-wave voltage V_π = d/√(2·B·L); quarter-wave V_π/√2.
 * Sources: the Kerr law and Jones calculus as in any optics text; worked examples listed in
 * docs/references.md (nitrobenzene half-wave field; quarter-wave field problem).
 */

/** Retardance δ in rad for voltage V across gap d with (effective) length L: δ = 2π·B·L·V²/d². */
export function retardanceRad(kerrConstantMPerV2: number, lengthM: number, voltageV: number, gapM: number): number {
  const fieldVPerM = voltageV / gapM;
  return 2 * Math.PI * kerrConstantMPerV2 * lengthM * fieldVPerM * fieldVPerM;
}

/** Half-wave voltage V_π = d/√(2·B·L) in V. @example halfWaveVoltageV(2.4e-12, 0.05, 0.005) ≈ 10206 V */
export function halfWaveVoltageV(kerrConstantMPerV2: number, lengthM: number, gapM: number): number {
  return gapM / Math.sqrt(2 * kerrConstantMPerV2 * lengthM);
}

/** Inverse of halfWaveVoltageV: B = d²/(2·L·V_π²) in m/V². */
export function kerrConstantFromHalfWave(halfWaveV: number, lengthM: number, gapM: number): number {
  return (gapM * gapM) / (2 * lengthM * halfWaveV * halfWaveV);
}

/** Field E = 1/√(2·B·L) (V/m) at which the retardance is π (half wave). */
export function halfWaveFieldVPerM(kerrConstantMPerV2: number, lengthM: number): number {
  return 1 / Math.sqrt(2 * kerrConstantMPerV2 * lengthM);
}

/** Field E = 1/(2·√(B·L)) (V/m) at which the retardance is π/2 (quarter wave). */
export function quarterWaveFieldVPerM(kerrConstantMPerV2: number, lengthM: number): number {
  return 1 / (2 * Math.sqrt(kerrConstantMPerV2 * lengthM));
}

/**
 * Jones-calculus transmission of polariser (angle α) → retarder (fast/slow axes along and across
 * the field, retardance δ) → analyser (angle β), angles measured from the field direction:
 * T = cos²(α−β) − sin(2α)·sin(2β)·sin²(δ/2).
 * Crossed at 45° (α=45°, β=−45°): T = sin²(δ/2). With δ = 0 this is Malus's law T = cos²(α−β).
 */
export function jonesTransmission(polariserRad: number, analyserRad: number, retardance: number): number {
  const c = Math.cos(polariserRad - analyserRad);
  const s = Math.sin(retardance / 2);
  return c * c - Math.sin(2 * polariserRad) * Math.sin(2 * analyserRad) * s * s;
}

/**
 * Crossed polarisers, polariser at θ to the field: T = sin²(2θ)·sin²(δ/2) (θ = 45° gives the
 * full sin²(δ/2)). This is jonesTransmission(θ, θ − π/2, δ).
 */
export function crossedTransmission(polariserRad: number, retardance: number): number {
  const s2 = Math.sin(2 * polariserRad);
  const s = Math.sin(retardance / 2);
  return s2 * s2 * s * s;
}

/** cm/V² → m/V² (tables often quote B in cm/V²). */
export const cmPerV2ToMPerV2 = (b: number): number => b * 1e-2;
export const mPerV2ToCmPerV2 = (b: number): number => b * 1e2;

export const DEG = Math.PI / 180;
