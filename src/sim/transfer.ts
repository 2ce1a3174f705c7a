/**
 * Camera transfer functions used by the simulator to turn linear light (0–1 of full scale) into
 * 8-bit (or 10-bit) code values, as a camera's image pipeline does before compression.
 *
 * - sRGB encode (IEC 61966-2-1:1999): V = 12.92·L for L ≤ 0.0031308, else 1.055·L^(1/2.4) − 0.055.
 *   Check value: L = 0.214041 encodes to V = 0.5 (docs/references.md).
 * - BT.709 OETF (ITU-R BT.709-6): V = 4.5·L for L < 0.018, else 1.099·L^0.45 − 0.099.
 * - linear: V = L (used by tests to read transmission straight off the code values).
 * - hlg: the HLG OETF of ITU-R BT.2100-2, E′ = √(3E) for E ≤ 1/12, else a·ln(12E − b) + c.
 * - pq: full scale shown at PQ_PEAK_CD_M2 = 1000 cd/m² (a common phone HDR peak; common
 *   practice), E′ = ST 2084 inverse EOTF of 1000·L cd/m².
 * - a phone tone curve (`SimToneCurve`): V = S(L^(1/exponent)) with the mid-tone S-curve
 *   S(x) = x − k·sin(2πx)/(2π) (monotone for 0 ≤ k < 1; slope 1 + k at mid-grey, 1 − k at the
 *   ends): a power law with extra mid-tone contrast, as phones apply whatever their tags say.
 *
 * `makeCodeEncoder` builds an exact and fast linear → n-bit mapping: code k is chosen when
 * decode((k − 0.5)/max) ≤ L < decode((k + 0.5)/max), i.e. round(max·encode(L)), using a 65 536-bin
 * lookup plus threshold comparisons. Inputs outside [0, 1] clip to code 0 and the code of 1.
 * Throws nothing.
 * @example srgbEncode(0.214041) ≈ 0.5; makeCodeEncoder('srgb').encode(0.214041) === 128
 */
import { HLG_A, HLG_B, HLG_C, PQ, hlgToLinear, pqToCdM2 } from '../core/camera/transfer.js';

export type SimTransfer = 'srgb' | 'bt709' | 'linear' | 'hlg' | 'pq';

/** A phone-style tone curve: power law 1/exponent, then a mid-tone S-curve of strength midContrast. */
export interface SimToneCurve {
  exponent: number;
  midContrast: number;
}

/** Display luminance of full-scale light in the simulator's PQ clips, cd/m². */
export const PQ_PEAK_CD_M2 = 1000;

/** IEC 61966-2-1 sRGB encoding, linear → non-linear, both 0–1. */
export function srgbEncode(linear: number): number {
  if (linear <= 0.0031308) return 12.92 * linear;
  return 1.055 * Math.pow(linear, 1 / 2.4) - 0.055;
}

/** IEC 61966-2-1 sRGB decoding, non-linear → linear, both 0–1. */
export function srgbDecode(encoded: number): number {
  if (encoded <= 0.04045) return encoded / 12.92;
  return Math.pow((encoded + 0.055) / 1.055, 2.4);
}

/** ITU-R BT.709-6 opto-electronic transfer function, linear → non-linear, both 0–1. */
export function bt709Encode(linear: number): number {
  if (linear < 0.018) return 4.5 * linear;
  return 1.099 * Math.pow(linear, 0.45) - 0.099;
}

/** Inverse of the BT.709 OETF: L = V/4.5 for V < 0.081, else ((V + 0.099)/1.099)^(1/0.45). */
export function bt709Decode(encoded: number): number {
  if (encoded < 0.081) return encoded / 4.5;
  return Math.pow((encoded + 0.099) / 1.099, 1 / 0.45);
}

/** HLG OETF, ITU-R BT.2100-2: scene-linear E (0..1) → signal E′. */
export function hlgEncode(linear: number): number {
  const e = Math.max(0, linear);
  return e <= 1 / 12 ? Math.sqrt(3 * e) : HLG_A * Math.log(12 * e - HLG_B) + HLG_C;
}

/** PQ inverse EOTF (SMPTE ST 2084) of PQ_PEAK_CD_M2·L. */
export function pqEncode(linear: number): number {
  const y = Math.pow(Math.max(0, (linear * PQ_PEAK_CD_M2) / 10000), PQ.m1);
  return Math.pow((PQ.c1 + PQ.c2 * y) / (1 + PQ.c3 * y), PQ.m2);
}

/** The mid-tone S-curve S(x) = x − k·sin(2πx)/(2π) on 0..1. */
function sCurve(x: number, k: number): number {
  return x - (k * Math.sin(2 * Math.PI * x)) / (2 * Math.PI);
}

/** Phone tone curve: linear (0..1) → signal, V = S(L^(1/exponent)). */
export function toneCurveEncode(curve: SimToneCurve, linear: number): number {
  const l = Math.min(1, Math.max(0, linear));
  return sCurve(Math.pow(l, 1 / curve.exponent), curve.midContrast);
}

/** Inverse of toneCurveEncode (S inverted by bisection to 1e-12). */
export function toneCurveDecode(curve: SimToneCurve, encoded: number): number {
  const v = Math.min(1, Math.max(0, encoded));
  let lo = 0, hi = 1;
  for (let k = 0; k < 50; k++) {
    const mid = (lo + hi) / 2;
    if (sCurve(mid, curve.midContrast) < v) lo = mid; else hi = mid;
  }
  return Math.pow((lo + hi) / 2, curve.exponent);
}

export function transferEncode(transfer: SimTransfer, linear: number): number {
  if (transfer === 'srgb') return srgbEncode(linear);
  if (transfer === 'bt709') return bt709Encode(linear);
  if (transfer === 'hlg') return hlgEncode(linear);
  if (transfer === 'pq') return pqEncode(linear);
  return linear;
}

export function transferDecode(transfer: SimTransfer, encoded: number): number {
  if (transfer === 'srgb') return srgbDecode(encoded);
  if (transfer === 'bt709') return bt709Decode(encoded);
  if (transfer === 'hlg') return hlgToLinear(encoded);
  if (transfer === 'pq') return pqToCdM2(encoded) / PQ_PEAK_CD_M2;
  return encoded;
}

export const CODE_BINS = 65536;

/** Lookup tables for linear → code: lut[floor(L·CODE_BINS)] then up while L ≥ thresholds[code]. */
export interface CodeTable {
  lut: Uint16Array;
  /** thresholds[k]: the smallest linear level that encodes to code k + 1 (Infinity for the top code). */
  thresholds: Float64Array;
  /** Largest code (255 for 8 bits, 1023 for 10). */
  maxCode: number;
  /** Code of full-scale light L = 1 (maxCode except for PQ, whose peak lies above the camera's full scale). */
  topCode: number;
  encode(linear: number): number;
}

/**
 * Linear light (any number) → code value of the chosen transfer (or phone tone curve), exact
 * rounding. `bits` 8 (default) or 10.
 */
export function makeCodeEncoder(transfer: SimTransfer | SimToneCurve, bits: 8 | 10 = 8): CodeTable {
  const decode = typeof transfer === 'string' ? (v: number) => transferDecode(transfer, v) : (v: number) => toneCurveDecode(transfer, v);
  const encodeSignal = typeof transfer === 'string' ? (l: number) => transferEncode(transfer, l) : (l: number) => toneCurveEncode(transfer, l);
  const maxCode = (1 << bits) - 1;
  const topCode = Math.min(maxCode, Math.round(maxCode * encodeSignal(1)));
  const thresholds = new Float64Array(maxCode + 1);
  for (let k = 0; k < maxCode; k++) thresholds[k] = k < topCode ? decode((k + 0.5) / maxCode) : Infinity;
  thresholds[maxCode] = Infinity;
  const lut = new Uint16Array(CODE_BINS + 1);
  let code = 0;
  for (let j = 0; j <= CODE_BINS; j++) {
    const level = j / CODE_BINS;
    while (code < maxCode && level >= thresholds[code]!) code++;
    lut[j] = code;
  }
  return {
    lut,
    thresholds,
    maxCode,
    topCode,
    encode(linear: number): number {
      if (!(linear > 0)) return 0; // also NaN
      if (linear >= 1) return topCode;
      let c = lut[Math.floor(linear * CODE_BINS)]!;
      while (linear >= thresholds[c]!) c++;
      return c;
    },
  };
}
