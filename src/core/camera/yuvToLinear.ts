/**
 * Tables that turn 8-bit Y'CbCr code values into gamma-encoded R'G'B' code values (0..255 scale,
 * full range) and then into linear light, so per-pixel work is five look-ups, a few additions and
 * one interpolated look-up per channel.
 *
 * Steps (ITU-R BT.709-6, BT.601-7 and BT.2020-2, "derivation of luminance and colour-difference"):
 * 1. Range expansion. Limited ("tv") range: Y' = (Y − 16)/219, Cb = (U − 128)/224,
 *    Cr = (V − 128)/224. Full ("pc", JPEG) range: Y' = Y/255, Cb = (U − 128)/255, Cr = (V − 128)/255.
 *    For n-bit sources (n > 8, s = 2^(n−8)): limited Y' = (Y − 16s)/(219s), C = (C − 128s)/(224s)
 *    (10-bit: 64..940 and 64..960, BT.2020-2 Table 5); full Y' = Y/(2^n − 1),
 *    C = (C − 2^(n−1))/(2^n − 1). The tables then have 2^n entries and keep every bit.
 * 2. Matrix, with Kr, Kb = 0.2126, 0.0722 (BT.709), 0.299, 0.114 (BT.601) or 0.2627, 0.0593
 *    (BT.2020 non-constant luminance), Kg = 1 − Kr − Kb:
 *    R' = Y' + 2(1 − Kr)·Cr; B' = Y' + 2(1 − Kb)·Cb; G' = (Y' − Kr·R' − Kb·B')/Kg.
 * 3. Code value c = 255·R' (clamped to 0..255); a channel with c ≥ clipCode − 0.5 (that is,
 *    rounding to clipCode or above) counts as clipped.
 * 4. Linear light from the transfer table (see transfer.ts), linearly interpolated between codes;
 *    for sources above 8 bits the table has `perCode` = 4 entries per code so the steep parts of
 *    HLG and PQ are interpolated finely. A measured camera response (decoding.response) replaces
 *    the transfer table when present.
 *
 * Units: code values 0..255; linear light 0..1 (1 = full-scale white).
 * Throws nothing itself; the transfer name is checked by `parseTransfer`.
 *
 * @example
 * const t = yuvTables({ range: 'limited', matrix: 'bt709', transfer: 'srgb', clipCode: 250 });
 * const out = new Float64Array(6);
 * decodePixel(t, 126, 128, 128, out); // out[0..2] ≈ 128 (codes), out[3..5] ≈ 0.2159 (linear)
 */
import type { CameraDecoding, YuvMatrix } from './decodingTypes.js';
import { responseLut } from './responseTable.js';
import { transferLut } from './transfer.js';

export interface YuvTables {
  /** 255·Y' for each Y code. */
  yCode: Float64Array;
  /** 255·2(1−Kr)·Cr for each V code (adds to R'). */
  rFromV: Float64Array;
  /** −255·2Kr(1−Kr)/Kg·Cr for each V code (adds to G'). */
  gFromV: Float64Array;
  /** −255·2Kb(1−Kb)/Kg·Cb for each U code (adds to G'). */
  gFromU: Float64Array;
  /** 255·2(1−Kb)·Cb for each U code (adds to B'). */
  bFromU: Float64Array;
  /** Linear light of R'G'B' code k/perCode (255·perCode + 2 entries, see transferLut). */
  linear: Float64Array;
  /** Entries of `linear` per code value: index = code·perCode. */
  perCode: number;
  /** Linear light of a grey pixel with luma sample Y (for luma-only maps): linear[clamp(yCode[Y])]. */
  lumaLinear: Float64Array;
  /** A channel code at or above this (= clipCode − 0.5) counts as clipped. */
  clipThreshold: number;
}

/** Kr and Kb of the two matrices (BT.709-6 Table 3 item 3.2; BT.601-7 item 2.5.1). */
export const MATRIX_COEFFICIENTS: Record<YuvMatrix, { kr: number; kb: number }> = {
  bt709: { kr: 0.2126, kb: 0.0722 },
  bt601: { kr: 0.299, kb: 0.114 },
  bt2020: { kr: 0.2627, kb: 0.0593 }, // ITU-R BT.2020-2 Table 4
};

/** Builds the look-up tables for one camera decoding of `bitDepth`-bit samples (8 to 16). */
export function yuvTables(decoding: CameraDecoding, bitDepth = 8): YuvTables {
  const { kr, kb } = MATRIX_COEFFICIENTS[decoding.matrix];
  const kg = 1 - kr - kb;
  const limited = decoding.range === 'limited';
  const size = 1 << bitDepth;
  const s = size / 256;
  const full = size - 1;
  const yCode = new Float64Array(size);
  const rFromV = new Float64Array(size);
  const gFromV = new Float64Array(size);
  const gFromU = new Float64Array(size);
  const bFromU = new Float64Array(size);
  for (let code = 0; code < size; code++) {
    const lumaSignal = limited ? (code - 16 * s) / (219 * s) : code / full;
    const chromaSignal = limited ? (code - 128 * s) / (224 * s) : (code - size / 2) / full;
    yCode[code] = 255 * lumaSignal;
    rFromV[code] = 255 * 2 * (1 - kr) * chromaSignal;
    bFromU[code] = 255 * 2 * (1 - kb) * chromaSignal;
    gFromV[code] = (-255 * 2 * kr * (1 - kr) * chromaSignal) / kg;
    gFromU[code] = (-255 * 2 * kb * (1 - kb) * chromaSignal) / kg;
  }
  const perCode = bitDepth > 8 ? 4 : 1;
  const linear = decoding.response ? responseLut(decoding.response, perCode) : transferLut(decoding.transfer, perCode);
  const lumaLinear = new Float64Array(size);
  for (let code = 0; code < size; code++) lumaLinear[code] = interpolateLinear(linear, yCode[code]!, perCode);
  return { yCode, rFromV, gFromV, gFromU, bFromU, linear, perCode, lumaLinear, clipThreshold: decoding.clipCode - 0.5 };
}

/** Linear light of a (fractional) code value, clamped to 0..255, by interpolation in the table. */
export function interpolateLinear(linear: Float64Array, code: number, perCode = 1): number {
  const c = (code <= 0 ? 0 : code >= 255 ? 255 : code) * perCode;
  const i = c | 0;
  const lo = linear[i]!;
  return lo + (c - i) * (linear[i + 1]! - lo);
}

/**
 * Decodes one pixel. Writes R', G', B' code values (clamped 0..255) to out[0..2] and linear R, G, B
 * to out[3..5]; returns true when any channel is clipped. Reference path for tests and single
 * pixels: the region meter inlines the same arithmetic.
 */
export function decodePixel(tables: YuvTables, y: number, u: number, v: number, out: Float64Array): boolean {
  const base = tables.yCode[y]!;
  const r = base + tables.rFromV[v]!;
  const g = base + tables.gFromU[u]! + tables.gFromV[v]!;
  const b = base + tables.bFromU[u]!;
  out[0] = r <= 0 ? 0 : r >= 255 ? 255 : r;
  out[1] = g <= 0 ? 0 : g >= 255 ? 255 : g;
  out[2] = b <= 0 ? 0 : b >= 255 ? 255 : b;
  out[3] = interpolateLinear(tables.linear, r, tables.perCode);
  out[4] = interpolateLinear(tables.linear, g, tables.perCode);
  out[5] = interpolateLinear(tables.linear, b, tables.perCode);
  const t = tables.clipThreshold;
  return r >= t || g >= t || b >= t;
}
