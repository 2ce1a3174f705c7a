/**
 * The compression term of B's uncertainty budget: a Type B estimate (JCGM 100:2008 §4.3) of what
 * lossy video coding does to B that neither the fit's residuals nor the response check see. At a
 * low bitrate the encoder flattens the dim spot toward its prediction and lets it lag the drive,
 * so B moves with the bitrate while the residuals stay small and smooth.
 *
 *   u_r,comp(B) = K / √bpp,   bpp = bits per pixel per frame = 8·(file bytes) / (frames·width·height)
 *
 * The square-root law and K = 5·10⁻⁴ (0.05 % of B at one bit per pixel per frame, 0.29 % at 0.03)
 * come from the coverage study (`npm run accuracy`, docs/uncertainty.md "The compression term"):
 * each case was encoded a second time near-losslessly (CRF 10) with everything else equal, and the
 * difference in B was modelled as N(0, u_stat² + (K·bpp^−p)²). On cases 0–63, maximum likelihood
 * gives K = 1.8·10⁻³ for p = ½ on the runs that passed their gates. That is an upper bound,
 * because part of the difference already widens the statistical term through correlated
 * residuals: with it, 79–83 % of valid runs fell within 1σ. K = 5·10⁻⁴ is the smallest of
 * 3, 5, 7 and 10·10⁻⁴ that brings each of the study's three case sets to 92 % within 2σ for B
 * (with the sync leaving log gaps out, modulationScorer). Photo series (no bitrate)
 * carry no term. On V_π the term is halved (B ∝ V_π⁻²).
 * @example compressionRelB(0.25) === 0.001; compressionRelB(NaN) === 0
 */
export const COMPRESSION_B_REL_AT_ONE_BPP = 5e-4;

/** Relative standard uncertainty of B from compression at `bitsPerPixel` (0 when not a video). */
export function compressionRelB(bitsPerPixel: number): number {
  if (!(Number.isFinite(bitsPerPixel) && bitsPerPixel > 0)) return 0;
  return COMPRESSION_B_REL_AT_ONE_BPP / Math.sqrt(bitsPerPixel);
}

/**
 * Below this many bits per pixel per frame a rising/falling difference of B is more likely the
 * codec than the liquid: a starved encoder updates a dim spot late, so rising ramps read darker and
 * falling ones brighter at the same voltage, which looks like hysteresis. Our choice, from the
 * coverage study's CRF 10 comparison (median |ΔB| from compression 0.7 % at 0.06–0.2 bpp and above
 * 1 % below 0.06 bpp; docs/uncertainty.md "The compression term").
 */
export const LAG_PRONE_BITS_PER_PIXEL = 0.1;
