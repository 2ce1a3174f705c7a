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

/**
 * The floor fraction's camera-response term: a response I_true ∝ I_lin^γ read as linear (γ = 1)
 * turns the zero-field light f·A into about (f·A)^(1/γ) against an amplitude near A^(1/γ), so
 * the fraction measured is about f^(1/γ) and ln f moves by (γ − 1)·ln f to first order:
 *   u_resp(f) = |f · ln f| · u_γ
 * with u_γ the root-mean-square error of γ = 1 under what is known of γ (the run's response check
 * combined with the prior, core/fit/checkCameraResponse `gammaUncertainty`). A dark floor is far
 * down the response curve, so it is the figure a response error moves most: f = 0.01 and
 * u_γ = 0.02 give 9 % of f. GUM (JCGM 100:2008) §5.1.2 for the propagation; the power-law model
 * of the response is docs/camera-response.md's.
 * Zero for f outside (0, 1) (no logarithm to take; a non-positive floor has its own warning).
 * @example floorResponseTerm(0.01, 0.02) → 0.000921
 */
export function floorResponseTerm(fraction: number, gammaUncertainty: number): number {
  if (!(fraction > 0 && fraction < 1) || !(gammaUncertainty > 0)) return 0;
  return Math.abs(fraction * Math.log(fraction)) * gammaUncertainty;
}

/**
 * Relative standard uncertainty of the floor fraction from reading the background under the beam
 * off its surround rings (our choice, a Type B estimate, GUM §4.3): 5 %. The floor is the beam's
 * zero-field light above the light around it, and the halo of scattered light is brighter under
 * the beam than in the rings that estimate it (core/regions/localSurround extrapolates, but not
 * exactly). Set from the coverage study's cases 0–63 and checked on cases 64–163
 * (docs/uncertainty.md, "The floor fraction's uncertainty").
 */
export const FLOOR_SURROUND_REL = 0.05;

/**
 * Compression's effect on the floor fraction, relative, at 1 bit per pixel per frame (our choice,
 * Type B, from the same study): u_r = FLOOR_COMPRESSION_REL_BPP / (bits per pixel per frame).
 * A starved codec smears light from the bright frames and the bright surround into the dark ones
 * and quantises dim detail away, so the dark level depends on the bit budget: 0.8 % of f at
 * 1 bit per pixel, 27 % at 0.03.
 */
export const FLOOR_COMPRESSION_REL_BPP = 0.008;

/** The floor fraction's terms, each a standard uncertainty of f (absolute). */
export interface FloorFractionTerms {
  fit: number;
  cameraResponse: number;
  surround: number;
  /** Absent for photo series (no video bit budget). */
  compression?: number;
}

/**
 * The floor fraction with its standard uncertainty combined from the fit's, the camera
 * response's (floorResponseTerm), the surround's (FLOOR_SURROUND_REL) and, for video, the
 * compression's (FLOOR_COMPRESSION_REL_BPP / bits per pixel): u = √(Σ terms²), uncorrelated
 * terms (GUM §5.1.2). A fraction with no finite value is returned as it is.
 * @example floorFractionUncertainty({ value: 0.01, stdErr: 0.0002 }, { gammaUncertainty: 0.02, bitsPerPixel: 0.1 })
 *   → stdErr ≈ √(0.0002² + 0.00092² + 0.0005² + 0.0008²) ≈ 0.00133
 */
export function floorFractionUncertainty(fraction: Quantity, o: { gammaUncertainty: number; bitsPerPixel?: number }): { fraction: Quantity; terms: FloorFractionTerms | null } {
  const f = fraction.value;
  if (!Number.isFinite(f)) return { fraction, terms: null };
  const terms: FloorFractionTerms = {
    fit: fraction.stdErr ?? 0,
    cameraResponse: floorResponseTerm(f, o.gammaUncertainty),
    surround: Math.abs(f) * FLOOR_SURROUND_REL,
    ...(o.bitsPerPixel !== undefined && o.bitsPerPixel > 0 ? { compression: Math.abs(f) * FLOOR_COMPRESSION_REL_BPP / o.bitsPerPixel } : {}),
  };
  const u = Math.hypot(terms.fit, terms.cameraResponse, terms.surround, terms.compression ?? 0);
  return { fraction: quantity(f, u, fraction.unit), terms };
}
