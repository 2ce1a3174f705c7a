/**
 * Camera transfer functions, inverted: a gamma-encoded signal V (0..1) back to linear light L
 * (0..1, 1 = full-scale white).
 *
 * - `srgb`: IEC 61966-2-1:1999, L = V/12.92 for V ≤ 0.04045, else ((V + 0.055)/1.055)^2.4.
 *   Check values: V = 0.5 → 0.214041; 8-bit code 128 → 0.215861.
 * - `bt709`: inverse of the ITU-R BT.709-6 OETF, L = V/4.5 for V < 0.081, else
 *   ((V + 0.099)/1.099)^(1/0.45). (SMPTE 170M / BT.601 uses the same curve.)
 * - `gamma:G`: pure power law L = V^G (G > 0, e.g. gamma:2.2).
 * - `linear`: L = V (raw or already linear footage).
 *
 * Inputs outside 0..1 are clamped. `transferLut` tabulates a curve at the 256 8-bit code values
 * (plus one guard entry for interpolation) so per-pixel work is a table look-up.
 *
 * Throws KerrError BAD_ARGUMENT from `parseTransfer` for an unknown name or a non-positive gamma.
 *
 * @example toLinear('srgb', 0.5) // 0.21404114
 * @example parseTransfer('gamma:2.2', '--transfer') // 'gamma:2.2'
 */
import { invalid } from '../../errors.js';
import type { TransferName } from '../../media/types.js';

const clamp01 = (v: number): number => (v <= 0 ? 0 : v >= 1 ? 1 : v);

/** sRGB decoding, IEC 61966-2-1. */
export function srgbToLinear(signal: number): number {
  const v = clamp01(signal);
  return v <= 0.04045 ? v / 12.92 : Math.pow((v + 0.055) / 1.055, 2.4);
}

/** Inverse BT.709 OETF, ITU-R BT.709-6 (L = V/4.5 below V = 0.081). */
export function bt709ToLinear(signal: number): number {
  const v = clamp01(signal);
  return v < 0.081 ? v / 4.5 : Math.pow((v + 0.099) / 1.099, 1 / 0.45);
}

/** Gamma exponent of a `gamma:G` name, or undefined for the named curves. */
export function gammaExponent(transfer: TransferName): number | undefined {
  if (!transfer.startsWith('gamma:')) return undefined;
  return Number(transfer.slice('gamma:'.length));
}

/** Linear light for a signal V in 0..1 under the named transfer. */
export function toLinear(transfer: TransferName, signal: number): number {
  if (transfer === 'srgb') return srgbToLinear(signal);
  if (transfer === 'bt709') return bt709ToLinear(signal);
  if (transfer === 'linear') return clamp01(signal);
  const exponent = gammaExponent(transfer);
  if (exponent === undefined || !(exponent > 0)) throw invalid('a transfer name', 'transfer', transfer);
  return Math.pow(clamp01(signal), exponent);
}

/**
 * 257-entry table: entry k (0..255) is the linear light of 8-bit code k (V = k/255); entry 256
 * repeats entry 255 so `lut[i] + f·(lut[i+1] − lut[i])` is safe for any code in 0..255.
 */
export function transferLut(transfer: TransferName): Float64Array {
  const lut = new Float64Array(257);
  for (let code = 0; code < 256; code++) lut[code] = toLinear(transfer, code / 255);
  lut[256] = lut[255]!;
  return lut;
}

/**
 * Parses a user's transfer choice: `srgb`, `bt709`, `linear` or `gamma:G` with 0 < G ≤ 10.
 * @throws KerrError BAD_ARGUMENT naming the option and the accepted forms.
 */
export function parseTransfer(text: string, optionName: string): TransferName {
  const t = text.trim().toLowerCase();
  if (t === 'srgb' || t === 'bt709' || t === 'linear') return t;
  const m = /^gamma:([0-9]*\.?[0-9]+)$/.exec(t);
  if (m) {
    const exponent = Number(m[1]);
    if (exponent > 0 && exponent <= 10) return `gamma:${exponent}`;
  }
  throw invalid('srgb, bt709, linear or gamma:G with G between 0 and 10 (e.g. gamma:2.2)', optionName, text,
    'Use srgb for most phones and webcams, bt709 for camcorders, linear for raw footage');
}
