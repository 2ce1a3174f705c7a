/**
 * Camera transfer functions used by the simulator to turn linear light (0–1 of full scale) into
 * 8-bit code values, as a camera's image pipeline does before compression.
 *
 * - sRGB encode (IEC 61966-2-1:1999): V = 12.92·L for L ≤ 0.0031308, else 1.055·L^(1/2.4) − 0.055.
 *   Check value: L = 0.214041 encodes to V = 0.5 (docs/references.md).
 * - BT.709 OETF (ITU-R BT.709-6): V = 4.5·L for L < 0.018, else 1.099·L^0.45 − 0.099.
 * - linear: V = L (used by tests to read transmission straight off the code values).
 *
 * `makeCodeEncoder` builds an exact and fast linear → 8-bit mapping: code k is chosen when
 * decode((k − 0.5)/255) ≤ L < decode((k + 0.5)/255), i.e. round(255·encode(L)), using a 65 536-bin
 * lookup plus one threshold comparison (bins are narrower than the closest thresholds).
 * Inputs outside [0, 1] clip to codes 0 and 255. Throws nothing.
 * @example srgbEncode(0.214041) ≈ 0.5; makeCodeEncoder('srgb').encode(0.214041) === 128
 */
export type SimTransfer = 'srgb' | 'bt709' | 'linear';

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

export function transferEncode(transfer: SimTransfer, linear: number): number {
  if (transfer === 'srgb') return srgbEncode(linear);
  if (transfer === 'bt709') return bt709Encode(linear);
  return linear;
}

export function transferDecode(transfer: SimTransfer, encoded: number): number {
  if (transfer === 'srgb') return srgbDecode(encoded);
  if (transfer === 'bt709') return bt709Decode(encoded);
  return encoded;
}

export const CODE_BINS = 65536;

/** Lookup tables for linear → 8-bit: lut[floor(L·CODE_BINS)] then one step up when L ≥ thresholds[code]. */
export interface CodeTable {
  lut: Uint8Array;
  /** thresholds[k]: the smallest linear level that encodes to code k + 1 (Infinity for k = 255). */
  thresholds: Float64Array;
  encode(linear: number): number;
}

/** Linear light (any number) → 8-bit code value of the chosen transfer, exact rounding. */
export function makeCodeEncoder(transfer: SimTransfer): CodeTable {
  const thresholds = new Float64Array(256);
  for (let k = 0; k < 255; k++) thresholds[k] = transferDecode(transfer, (k + 0.5) / 255);
  thresholds[255] = Infinity;
  const lut = new Uint8Array(CODE_BINS + 1);
  let code = 0;
  for (let j = 0; j <= CODE_BINS; j++) {
    const level = j / CODE_BINS;
    while (code < 255 && level >= thresholds[code]!) code++;
    lut[j] = code;
  }
  return {
    lut,
    thresholds,
    encode(linear: number): number {
      if (!(linear > 0)) return 0; // also NaN
      if (linear >= 1) return 255;
      let c = lut[Math.floor(linear * CODE_BINS)]!;
      if (linear >= thresholds[c]!) c++;
      return c;
    },
  };
}
