/**
 * Camera transfer functions, inverted: a gamma-encoded signal V (0..1) back to linear light L
 * (0..1, 1 = full-scale white).
 *
 * - `srgb`: IEC 61966-2-1:1999, L = V/12.92 for V ≤ 0.04045, else ((V + 0.055)/1.055)^2.4.
 *   Check values: V = 0.5 → 0.214041; 8-bit code 128 → 0.215861.
 * - `bt709`: inverse of the ITU-R BT.709-6 OETF, L = V/4.5 for V < 0.081, else
 *   ((V + 0.099)/1.099)^(1/0.45). (SMPTE 170M / BT.601 uses the same curve.)
 * - `hlg`: inverse of the hybrid log-gamma OETF (ITU-R BT.2100-2 Table 5; ARIB STD-B67):
 *   E = E′²/3 for E′ ≤ 1/2, else (exp((E′ − c)/a) + b)/12, a = 0.17883277, b = 1 − 4a,
 *   c = 0.5 − a·ln(4a). Scene-linear light 0..1 (E′ = 1 → 1). The display OOTF is not applied: we
 *   want the light in front of the camera, not what a display would show.
 * - `pq`: the perceptual-quantiser EOTF (SMPTE ST 2084:2014; ITU-R BT.2100-2 Table 4):
 *   Y = 10000·(max(E′^(1/m2) − c1, 0)/(c2 − c3·E′^(1/m2)))^(1/m1) cd/m², m1 = 2610/16384,
 *   m2 = 2523/4096·128, c1 = 3424/4096, c2 = 2413/4096·32, c3 = 2392/4096·32. As linear light we
 *   return Y/10000 (E′ = 1 → 1). PQ is display light: how the phone mapped scene to display is
 *   not in the file, which the run's response check (docs/camera-response.md) tests.
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
import type { TransferName } from './decodingTypes.js';

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

/** HLG constants (ITU-R BT.2100-2 Table 5); b and c follow from a. */
export const HLG_A = 0.17883277;
export const HLG_B = 1 - 4 * HLG_A;
export const HLG_C = 0.5 - HLG_A * Math.log(4 * HLG_A);

/** Inverse HLG OETF, ITU-R BT.2100-2: signal E′ (0..1) → scene-linear E (0..1). */
export function hlgToLinear(signal: number): number {
  const v = clamp01(signal);
  return v <= 0.5 ? (v * v) / 3 : (Math.exp((v - HLG_C) / HLG_A) + HLG_B) / 12;
}

/** PQ constants (SMPTE ST 2084:2014). */
export const PQ = { m1: 2610 / 16384, m2: (2523 / 4096) * 128, c1: 3424 / 4096, c2: (2413 / 4096) * 32, c3: (2392 / 4096) * 32 } as const;

/** PQ EOTF, SMPTE ST 2084: signal E′ (0..1) → display luminance in cd/m² (0..10000). */
export function pqToCdM2(signal: number): number {
  const p = Math.pow(clamp01(signal), 1 / PQ.m2);
  return 10000 * Math.pow(Math.max(p - PQ.c1, 0) / (PQ.c2 - PQ.c3 * p), 1 / PQ.m1);
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
  if (transfer === 'hlg') return hlgToLinear(signal);
  if (transfer === 'pq') return pqToCdM2(signal) / 10000;
  const exponent = gammaExponent(transfer);
  if (exponent === undefined || !(exponent > 0)) throw invalid('a transfer name', 'transfer', transfer);
  return Math.pow(clamp01(signal), exponent);
}

/**
 * 255·perCode + 2 entries: entry k is the linear light of code value k/perCode on the 0..255 scale
 * (V = k/(255·perCode)); the last entry repeats the one before so `lut[i] + f·(lut[i+1] − lut[i])`
 * is safe for any code in 0..255. perCode = 1 (default) gives the 257-entry 8-bit table; 10-bit
 * sources use 4 so the steep parts of HLG and PQ are interpolated finely.
 */
export function transferLut(transfer: TransferName, perCode = 1): Float64Array {
  const top = 255 * perCode;
  const lut = new Float64Array(top + 2);
  for (let k = 0; k <= top; k++) lut[k] = toLinear(transfer, k / top);
  lut[top + 1] = lut[top]!;
  return lut;
}

/**
 * Parses a user's transfer choice: `srgb`, `bt709`, `hlg`, `pq`, `linear` or `gamma:G` with 0 < G ≤ 10.
 * @throws KerrError BAD_ARGUMENT naming the option and the accepted forms.
 */
export function parseTransfer(text: string, optionName: string): TransferName {
  const t = text.trim().toLowerCase();
  if (t === 'srgb' || t === 'bt709' || t === 'linear' || t === 'hlg' || t === 'pq') return t;
  const m = /^gamma:([0-9]*\.?[0-9]+)$/.exec(t);
  if (m) {
    const exponent = Number(m[1]);
    if (exponent > 0 && exponent <= 10) return `gamma:${exponent}`;
  }
  throw invalid('srgb, bt709, hlg, pq, linear or gamma:G with G between 0 and 10 (e.g. gamma:2.2)', optionName, text,
    'Use srgb for most phones and webcams, bt709 for camcorders, hlg or pq for HDR video, linear for raw footage');
}
