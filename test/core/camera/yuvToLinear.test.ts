import { describe, expect, it } from 'vitest';
import { decodePixel, yuvTables } from '../../../src/core/camera/yuvToLinear.js';
import { hlgToLinear, srgbToLinear } from '../../../src/core/camera/transfer.js';
import type { CameraDecoding } from '../../../src/media/types.js';
import { OUTSIDE } from '../../setup/outsideSources.js';

const bt709Limited: CameraDecoding = { range: 'limited', matrix: 'bt709', transfer: 'srgb', clipCode: 250 };
const bt601Limited: CameraDecoding = { range: 'limited', matrix: 'bt601', transfer: 'srgb', clipCode: 250 };

function decode(decoding: CameraDecoding, y: number, u: number, v: number): { codes: number[]; linear: number[]; clipped: boolean } {
  const out = new Float64Array(6);
  const clipped = decodePixel(yuvTables(decoding), y, u, v, out);
  return { codes: [out[0]!, out[1]!, out[2]!], linear: [out[3]!, out[4]!, out[5]!], clipped };
}

describe('range expansion (ITU-R BT.709-6 / BT.601-7 8-bit quantisation: black 16, white 235, chroma 16..240)', { tags: [OUTSIDE.bt709] }, () => {
  it('maps limited-range black and white to codes 0 and 255', () => {
    expect(decode(bt709Limited, 16, 128, 128).codes).toEqual([0, 0, 0]);
    const white = decode(bt709Limited, 235, 128, 128);
    for (const c of white.codes) expect(c).toBeCloseTo(255, 9);
    expect(white.clipped).toBe(true);
  });

  it('maps full-range grey 128 to code 128 and linear 0.215861 (IEC 61966-2-1)', { tags: [OUTSIDE.srgb] }, () => {
    const grey = decode({ ...bt709Limited, range: 'full' }, 128, 128, 128);
    for (const c of grey.codes) expect(c).toBeCloseTo(128, 9);
    for (const l of grey.linear) expect(l).toBeCloseTo(0.215861, 6);
  });

  it('clamps codes beyond the nominal range (superwhite 250, subblack 5)', () => {
    expect(decode(bt709Limited, 250, 128, 128).codes).toEqual([255, 255, 255]);
    expect(decode(bt709Limited, 5, 128, 128).codes).toEqual([0, 0, 0]);
  });

  it('interpolates linear light between codes for fractional code values', () => {
    const y = 126; // (126 − 16)/219·255 = 128.08 code
    const code = ((y - 16) / 219) * 255;
    const grey = decode(bt709Limited, y, 128, 128);
    expect(grey.codes[0]).toBeCloseTo(code, 9);
    expect(grey.linear[0]).toBeCloseTo(srgbToLinear(code / 255), 5);
  });
});

describe('YUV→RGB matrices', { tags: [OUTSIDE.bt709] }, () => {
  // 100 % colour bars in 8-bit limited range (common practice; the standard tables of
  // ITU-R BT.709 and BT.601 bars, from memory): [Y, Cb, Cr] → expected R'G'B' = primary.
  const bars709: Array<[string, [number, number, number], [number, number, number]]> = [
    ['red', [63, 102, 240], [255, 0, 0]],
    ['green', [173, 42, 26], [0, 255, 0]],
    ['blue', [32, 240, 118], [0, 0, 255]],
    ['yellow', [219, 16, 138], [255, 255, 0]],
  ];
  const bars601: Array<[string, [number, number, number], [number, number, number]]> = [
    ['red', [81, 90, 240], [255, 0, 0]],
    ['green', [145, 54, 34], [0, 255, 0]],
    ['blue', [41, 240, 110], [0, 0, 255]],
  ];

  it.each(bars709)('BT.709 %s bar decodes to its primary within 2 codes', (_name, [y, u, v], rgb) => {
    const { codes } = decode(bt709Limited, y, u, v);
    codes.forEach((c, i) => expect(Math.abs(c - rgb[i]!)).toBeLessThanOrEqual(2));
  });

  it.each(bars601)('BT.601 %s bar decodes to its primary within 2 codes', (_name, [y, u, v], rgb) => {
    const { codes } = decode(bt601Limited, y, u, v);
    codes.forEach((c, i) => expect(Math.abs(c - rgb[i]!)).toBeLessThanOrEqual(2));
  });

  it('the two matrices differ on saturated colour (the BT.709 green bar decoded as BT.601 gains red)', () => {
    const { codes } = decode(bt601Limited, 173, 42, 26);
    expect(codes[0]!).toBeGreaterThan(10);
  });

  it('counts a pixel as clipped when any channel reaches the clip code', () => {
    expect(decode(bt709Limited, 63, 102, 240).clipped).toBe(true); // red channel at 255
    expect(decode(bt709Limited, 120, 128, 128).clipped).toBe(false);
    expect(decode({ ...bt709Limited, clipCode: 120 }, 120, 128, 128).clipped).toBe(true);
  });
});

describe('10-bit samples and the BT.2020 matrix (ITU-R BT.2020-2 Tables 4 and 5)', () => {
  const hlg2020: CameraDecoding = { range: 'limited', matrix: 'bt2020', transfer: 'hlg', clipCode: 250 };

  it('maps 10-bit limited black 64 and white 940 to codes 0 and 255, neutral chroma 512 (BT.2020-2 Table 5)', () => {
    const out = new Float64Array(6);
    const t = yuvTables(hlg2020, 10);
    decodePixel(t, 64, 512, 512, out);
    expect([out[0], out[1], out[2]]).toEqual([0, 0, 0]);
    decodePixel(t, 940, 512, 512, out);
    for (let k = 0; k < 3; k++) expect(out[k]).toBeCloseTo(255, 9);
    for (let k = 3; k < 6; k++) expect(out[k]).toBeCloseTo(1, 6); // HLG E′ = 1 → 1
  });

  it('keeps the two extra bits: Y = 502 and 503 decode to different light, a quarter of an 8-bit step apart', () => {
    const t = yuvTables(hlg2020, 10);
    const a = new Float64Array(6), b = new Float64Array(6);
    decodePixel(t, 502, 512, 512, a);
    decodePixel(t, 503, 512, 512, b);
    expect(b[0]! - a[0]!).toBeCloseTo(255 / 876, 9);
    expect(b[3]!).toBeGreaterThan(a[3]!);
    expect(a[3]).toBeCloseTo(hlgToLinear((502 - 64) / 876), 5);
  });

  it('inverts the BT.2020 non-constant-luminance encoding Y′ = 0.2627R′ + 0.6780G′ + 0.0593B′, Cb = (B′ − Y′)/1.8814, Cr = (R′ − Y′)/1.4746', () => {
    const rgb = [0.8, 0.3, 0.1];
    const y = 0.2627 * rgb[0]! + 0.678 * rgb[1]! + 0.0593 * rgb[2]!;
    const cb = (rgb[2]! - y) / 1.8814;
    const cr = (rgb[0]! - y) / 1.4746;
    // 10-bit limited quantisation, kept fractional here by decoding through the exact tables
    const t = yuvTables({ ...hlg2020, transfer: 'linear' }, 10);
    const Y = Math.round(64 + 876 * y), U = Math.round(512 + 896 * cb), V = Math.round(512 + 896 * cr);
    const out = new Float64Array(6);
    decodePixel(t, Y, U, V, out);
    for (let k = 0; k < 3; k++) expect(out[k]! / 255).toBeCloseTo(rgb[k]!, 2);
  });
});
