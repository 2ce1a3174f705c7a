/**
 * How many units of Rec. 709 luminance one unit of the block maps is worth on the beam.
 *
 * The block grid behind the static/modulated maps reads only the luma plane and linearises each
 * pixel as if it were grey, L_grid = EOTF(Σ K_c·OETF(L_c)) (src/measure/gridSampler.ts). That is
 * exact for neutral light and, to first order, for a small coloured signal on a neutral
 * background (the halo over room light), but not for bright coloured light: the transfer's
 * curvature compresses it. A red 633 nm spot at 0.6 of full scale under BT.709 reads about 0.6×
 * its luminance, a 532 nm green one under sRGB about 0.9×. The beam intensity of the Kerr fit
 * comes from the region meter, which linearises each channel before weighting (true luminance).
 * Both see the same frames, so regressing each on the modulation term m(t) and dividing gives
 * the scale of the modulated light in the beam region:
 *
 *   κ = b_I / b_G,   b_I = OLS slope of the fit's beam intensity I(t) on m(t),
 *                    b_G = Σ_k w_k · mean of the modulated map over rectangle k,
 *
 * where I(t) = Σ_k w_k · mean(rect_k) (the beam rectangle with weight 1, the surround's
 * rectangles with their negative surround weights, src/core/regions/localSurround.ts), so b_G is
 * the same combination read on the grid (the slope of a weighted sum of blocks is the weighted
 * sum of their slopes). A rectangle's mean over the block map weights each block by the share of
 * its pixels inside the rectangle; pixels beyond the grid's last block are not covered.
 * Error, first order with the two slopes taken as independent (they are positively correlated,
 * so this is conservative): σ_κ = κ·√((se(b_I)/b_I)² + (se_G/b_G)²), se_G from the block slope
 * errors as if independent.
 *
 * The scale is a modulated-light-weighted average over the beam region: it is exact for a flat
 * beam; for a spot of one colour it errs low by the weight of its dimmer, less compressed edge:
 * under 1 % for a Gaussian, about 2 % for the red top-hat of radius 12 px in test-media and
 * 3.5 % for one of radius 8 px (test/core/scatter/gridLuminanceScale.test.ts).
 * When the beam intensity was itself measured on the grid (beam found automatically), κ is 1 and
 * the colour bias stays (documented in docs/scatter.md).
 *
 * Units: κ is luminance per grid unit (dimensionless); rectangles in video pixels.
 * Returns null when it cannot be told: no frame with a finite m and intensity, m not varying, or
 * b_G not clearly positive (below 5 of its standard errors). Pure; throws nothing.
 * @example gridLuminanceScale({ modulatedMap, modulatedStdErr, gridWidth: 40, gridHeight: 30, stepPx: 8,
 *   terms: [{ rect: { x: 96, y: 64, w: 32, h: 32 }, weight: 1 }], intensity, modulation, usable })
 *   → { scale: 1.62, stdErr: 0.004, beamSlope: 0.061, gridSlope: 0.0377 }
 */
import type { Rect } from '../regions/rect.js';

export interface GridLuminanceScaleInput {
  modulatedMap: Float32Array;
  modulatedStdErr: Float32Array;
  gridWidth: number;
  gridHeight: number;
  stepPx: number;
  /** The beam intensity as a weighted sum of rectangle means (video pixels). */
  terms: { rect: Rect; weight: number }[];
  /** Beam intensity per frame, true luminance (exposure-corrected as the maps are). */
  intensity: Float64Array;
  /** Modulation term per frame (NaN where unknown). */
  modulation: Float64Array;
  /** 1 = frame used in the fit (the frames the maps regress). */
  usable: Uint8Array;
}

export interface GridLuminanceScale {
  scale: number;
  stdErr: number;
  /** b_I, luminance per unit of m. */
  beamSlope: number;
  /** b_G, grid units per unit of m. */
  gridSlope: number;
}

/** Block weights of a pixel rectangle: share of each block's pixels inside it, normalised to sum 1. */
function rectBlockWeights(rect: Rect, step: number, gw: number, gh: number): { cells: number[]; weights: number[] } {
  const overlap = (a0: number, a1: number, b0: number, b1: number) => Math.max(0, Math.min(a1, b1) - Math.max(a0, b0));
  const cells: number[] = [];
  const weights: number[] = [];
  let total = 0;
  const gx0 = Math.max(0, Math.floor(rect.x / step));
  const gy0 = Math.max(0, Math.floor(rect.y / step));
  const gx1 = Math.min(gw - 1, Math.floor((rect.x + rect.w - 1) / step));
  const gy1 = Math.min(gh - 1, Math.floor((rect.y + rect.h - 1) / step));
  for (let gy = gy0; gy <= gy1; gy++) {
    const fy = overlap(gy * step, (gy + 1) * step, rect.y, rect.y + rect.h);
    for (let gx = gx0; gx <= gx1; gx++) {
      const a = fy * overlap(gx * step, (gx + 1) * step, rect.x, rect.x + rect.w);
      if (a <= 0) continue;
      cells.push(gy * gw + gx);
      weights.push(a);
      total += a;
    }
  }
  for (let i = 0; i < weights.length; i++) weights[i] = weights[i]! / total;
  return { cells, weights };
}

export function gridLuminanceScale(input: GridLuminanceScaleInput): GridLuminanceScale | null {
  const { modulatedMap, modulatedStdErr, gridWidth: gw, gridHeight: gh, stepPx, terms, intensity, modulation, usable } = input;

  // b_G and its error: one weight per block, summed over the terms
  const blockWeight = new Map<number, number>();
  for (const t of terms) {
    if (t.weight === 0) continue;
    const { cells, weights } = rectBlockWeights(t.rect, stepPx, gw, gh);
    if (cells.length === 0) return null;
    cells.forEach((c, i) => blockWeight.set(c, (blockWeight.get(c) ?? 0) + t.weight * weights[i]!));
  }
  let gridSlope = 0;
  let gridVar = 0;
  for (const [c, wgt] of blockWeight) {
    gridSlope += wgt * modulatedMap[c]!;
    gridVar += (wgt * modulatedStdErr[c]!) ** 2;
  }
  const gridErr = Math.sqrt(gridVar);
  if (!(gridSlope > 0) || !(gridSlope > 5 * gridErr)) return null;

  // b_I: ordinary least squares of I on m over the used frames, x centred
  let n = 0, sx = 0, sy = 0;
  for (let f = 0; f < intensity.length; f++) {
    if (!usable[f] || !Number.isFinite(modulation[f]!) || !Number.isFinite(intensity[f]!)) continue;
    n++; sx += modulation[f]!; sy += intensity[f]!;
  }
  if (n < 3) return null;
  const xMean = sx / n, yMean = sy / n;
  let sxx = 0, sxy = 0, syy = 0;
  for (let f = 0; f < intensity.length; f++) {
    if (!usable[f] || !Number.isFinite(modulation[f]!) || !Number.isFinite(intensity[f]!)) continue;
    const dx = modulation[f]! - xMean, dy = intensity[f]! - yMean;
    sxx += dx * dx; sxy += dx * dy; syy += dy * dy;
  }
  if (!(sxx > 1e-12 * n)) return null;
  const beamSlope = sxy / sxx;
  const rss = Math.max(0, syy - beamSlope * beamSlope * sxx);
  const beamErr = Math.sqrt(rss / (n - 2) / sxx);
  if (!(beamSlope > 0)) return null;

  const scale = beamSlope / gridSlope;
  const stdErr = scale * Math.hypot(beamErr / beamSlope, gridErr / gridSlope);
  return { scale, stdErr, beamSlope, gridSlope };
}
