/**
 * The Kerr modulation term: the share of the open-analyser light a crossed-polariser Kerr cell
 * passes at drive voltage V,
 *
 *   T(V) = sin²(2θ) · sin²(u),   u = (π/2)·(V/V_π)² + φ/2,
 *
 * with θ the polariser's angle to the field, V_π the half-wave voltage and φ the cell's static
 * retardance (rad, 0 for an ideal cell). It is `crossedTransmission(θ, δ)` of `kerr.ts` with the
 * Kerr-law retardance δ = 2π·B·L·V²/d² + φ = π·(V/V_π)² + φ written through V_π (V_π = d/√(2·B·L)),
 * which is the form the fits need: the one place fit, cross-check, camera-response check and sync
 * scorer take the curve from. Sources: Kerr law and Jones calculus as in any optics text
 * (docs/references.md); the test checks it against the explicit Jones product.
 *
 * `angleFactor` is sin²(2θ), computed once per run with `polariserAngleFactor`; a fit passes
 * amplitude·sin²(2θ) there to get the signal's modulated part amp·T(V) in one product (the
 * evaluation order the fits have always used, so their results are unchanged to the last bit).
 * Dimensionless (or the amplitude's unit); pure; throws nothing (V_π = 0 gives NaN, as the formula does).
 * @example modulationTerm(5000, 10000, polariserAngleFactor(45)) // sin²(π/8) ≈ 0.1464
 */
export function modulationTerm(voltageV: number, halfWaveV: number, angleFactor: number, staticRetardanceRad = 0): number {
  const s = Math.sin(modulationPhase(voltageV, halfWaveV, staticRetardanceRad));
  return angleFactor * s * s;
}

/** u = (π/2)·(V/V_π)² + φ/2 in rad: half the retardance, the argument of sin² in the term. */
export function modulationPhase(voltageV: number, halfWaveV: number, staticRetardanceRad = 0): number {
  return (Math.PI / 2) * (voltageV / halfWaveV) * (voltageV / halfWaveV) + staticRetardanceRad / 2;
}

/**
 * ∂T/∂V_π = sin²(2θ) · 2·sin u·cos u · (−π·V²/V_π³), the term's slope in the half-wave voltage
 * (for the fit's Jacobian), in 1/V.
 */
export function modulationTermSlopeHalfWave(voltageV: number, halfWaveV: number, angleFactor: number, staticRetardanceRad = 0): number {
  const u = modulationPhase(voltageV, halfWaveV, staticRetardanceRad);
  const s = Math.sin(u);
  const c = Math.cos(u);
  return angleFactor * 2 * s * c * (-Math.PI * voltageV * voltageV / (halfWaveV * halfWaveV * halfWaveV));
}

/** sin²(2θ) for a polariser at `polariserAngleDeg` degrees to the field (1 at 45°, 0 at 0° and 90°). */
export function polariserAngleFactor(polariserAngleDeg: number): number {
  return Math.sin(2 * polariserAngleDeg * (Math.PI / 180)) ** 2;
}
