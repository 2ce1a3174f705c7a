/**
 * Floor flicker: how steady the closed-shutter (zero-field) light is, as the relative standard
 * deviation of the beam intensity over the frames where the modulation term is small:
 *
 *   z_t = I_t − I_amp·m_t   for frames with m_t < `mLimit` (default 0.02), events excluded,
 *   flicker = s(z) / mean(z),   σ_flicker ≈ flicker / √(2(n−1))
 *
 * Subtracting I_amp·m_t removes the little modulated light still present below the limit (with a
 * floor of 1 % of I_amp, m = 0.02 alone would double the floor). The standard error is the
 * large-sample error of a standard deviation for normal data (e.g. Ahn & Fessler 2003, "Standard
 * errors of mean, variance, and standard deviation estimators"). The figure includes camera noise:
 * it is what a user of the shutter would see, frame to frame, at this camera's settings.
 *
 * Dimensionless. Returns null when fewer than 5 frames qualify or the mean zero-field level is
 * not positive. Pure; throws KerrError INTERNAL for arrays of different length.
 * @example floorFlicker({ intensity, modulation, amplitude: 0.6, include }) → { value: 0.08, stdErr: 0.006 }
 */
import { KerrError } from '../../errors.js';
import { quantity, type Quantity } from '../../quantity.js';

export interface FloorFlickerInput {
  intensity: Float64Array;
  modulation: Float64Array;
  /** Fitted modulation amplitude I_amp, same units as intensity. */
  amplitude: number;
  /** 1 = frame may be used (usable, not an event). */
  include: Uint8Array;
  mLimit?: number;
}

export interface FloorFlicker {
  flicker: Quantity;
  meanLevel: number;
  frames: number;
}

export function floorFlicker(input: FloorFlickerInput): FloorFlicker | null {
  const { intensity, modulation, amplitude, include } = input;
  const n = intensity.length;
  if (modulation.length !== n || include.length !== n) throw new KerrError('INTERNAL', 'intensity, modulation and include series must have one entry per frame');
  const mLimit = input.mLimit ?? 0.02;
  const amp = Number.isFinite(amplitude) ? amplitude : 0;
  // Welford's one-pass mean and variance (Knuth, TAOCP vol. 2, §4.2.2).
  let count = 0;
  let mean = 0;
  let m2 = 0;
  for (let f = 0; f < n; f++) {
    const m = modulation[f]!;
    if (!include[f] || !(m < mLimit) || !Number.isFinite(intensity[f]!)) continue;
    const z = intensity[f]! - amp * m;
    count++;
    const delta = z - mean;
    mean += delta / count;
    m2 += delta * (z - mean);
  }
  if (count < 5 || !(mean > 0)) return null;
  const sd = Math.sqrt(m2 / (count - 1));
  const rel = sd / mean;
  return { flicker: quantity(rel, rel / Math.sqrt(2 * (count - 1))), meanLevel: mean, frames: count };
}
