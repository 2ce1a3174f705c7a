import { describe, expect, it } from 'vitest';
import { createBlockMeter } from '../../src/measure/blockMeter.js';
import { srgbToLinear } from '../../src/core/camera/transfer.js';
import type { CameraDecoding, Frame } from '../../src/media/types.js';
import { KerrError } from '../../src/errors.js';
import { OUTSIDE } from '../setup/outsideSources.js';

const decoding: CameraDecoding = { range: 'limited', matrix: 'bt709', transfer: 'srgb', clipCode: 250 };

/** A 16-bit 4:4:4 overview whose block c holds the (fractional) source codes yuv(c) shifted to 16 bits. */
function overview(gw: number, gh: number, yuv: (c: number) => [number, number, number], sourceBits = 8): Frame {
  const cells = gw * gh;
  const words = new Uint16Array(3 * cells);
  const shift = 2 ** (16 - sourceBits);
  for (let c = 0; c < cells; c++) {
    const [y, u, v] = yuv(c);
    words[c] = Math.round(y * shift); words[cells + c] = Math.round(u * shift); words[2 * cells + c] = Math.round(v * shift);
  }
  return { index: 0, timeS: 0, width: gw, height: gh, data: new Uint8Array(words.buffer), bitDepth: 16 };
}

/** Rec. 709 luminance of limited-range 8-bit Y'CbCr codes, written out from ITU-R BT.709-6 (items 3.2, 3.3, 3.5) and the sRGB curve. */
function bt709Luminance(y: number, u: number, v: number): { r: number; g: number; b: number; luma: number } {
  const yp = (y - 16) / 219, cb = (u - 128) / 224, cr = (v - 128) / 224;
  const rp = yp + 1.5748 * cr; // 2(1 − 0.2126)
  const bp = yp + 1.8556 * cb; // 2(1 − 0.0722)
  const gp = (yp - 0.2126 * rp - 0.0722 * bp) / 0.7152;
  const clamp = (x: number): number => Math.min(1, Math.max(0, x));
  const r = srgbToLinear(clamp(rp)), g = srgbToLinear(clamp(gp)), b = srgbToLinear(clamp(bp));
  return { r, g, b, luma: 0.2126 * r + 0.7152 * g + 0.0722 * b };
}

describe('createBlockMeter', { tags: [OUTSIDE.bt709, OUTSIDE.srgb] }, () => {
  it('decodes each block mean like a pixel of those codes: BT.709 matrix, limited range, sRGB (ITU-R BT.709-6, IEC 61966-2-1)', () => {
    const codes: Array<[number, number, number]> = [[16, 128, 128], [235, 128, 128], [126, 128, 128], [120, 90, 170], [180, 160, 100], [100.5, 127.25, 130.75]];
    const meter = createBlockMeter(3, 2, decoding, 8);
    const luma = new Float32Array(6);
    const rgb = { r: new Float32Array(6), g: new Float32Array(6), b: new Float32Array(6) };
    meter.measure(overview(3, 2, (c) => codes[c]!), luma, new Uint8Array(1), 0, rgb);
    expect(luma[0]).toBeCloseTo(0, 6); // black
    expect(luma[1]).toBeCloseTo(1, 6); // nominal white
    codes.forEach(([y, u, v], c) => {
      const want = bt709Luminance(y, u, v);
      // tolerance: the linear table is interpolated between whole codes (sRGB's curvature over one code: < 3e-4 relative)
      expect(luma[c]!).toBeCloseTo(want.luma, 4);
      expect(rgb.r[c]!).toBeCloseTo(want.r, 4);
      expect(rgb.g[c]!).toBeCloseTo(want.g, 4);
      expect(rgb.b[c]!).toBeCloseTo(want.b, 4);
    });
  });

  it('reads a 10-bit source from words shifted by 6 bits (limited range 64..940, ITU-R BT.2020-2 Table 5)', () => {
    const meter = createBlockMeter(2, 1, decoding, 10);
    const luma = new Float32Array(2);
    meter.measure(overview(2, 1, (c) => (c === 0 ? [940, 512, 512] : [4 * 126, 512, 512]), 10), luma, new Uint8Array(1), 0);
    expect(luma[0]).toBeCloseTo(1, 6);
    expect(luma[1]).toBeCloseTo(bt709Luminance(126, 128, 128).luma, 4);
  });

  it('flags a block clipped when a channel of its mean reaches clipCode − 0.5, at the given bit offset', () => {
    const meter = createBlockMeter(4, 1, decoding, 8);
    const bits = new Uint8Array(2);
    // Y 232: R' = 255·216/219 ≈ 251.5 ≥ 249.5 (clipped); Y 228: 246.8 (not); a red block with Y 200 and Cr high: R' over
    meter.measure(overview(4, 1, (c) => [[232, 128, 128], [228, 128, 128], [200, 128, 200], [200, 128, 128]][c] as [number, number, number]), new Float32Array(4), bits, 5);
    const set = [...Array(16).keys()].filter((k) => (bits[k >> 3]! >> (k & 7)) & 1);
    expect(set).toEqual([5, 7]);
  });

  it('refuses an overview of another size or depth', () => {
    const meter = createBlockMeter(2, 2, decoding, 8);
    const frame = overview(2, 2, () => [100, 128, 128]);
    expect(() => meter.measure({ ...frame, bitDepth: 8 }, new Float32Array(4), new Uint8Array(1), 0)).toThrow(KerrError);
    expect(() => meter.measure({ ...frame, width: 4, height: 1 }, new Float32Array(4), new Uint8Array(1), 0)).toThrow(/block meter/);
    expect(() => meter.measure(frame, new Float32Array(3), new Uint8Array(1), 0)).toThrow(/4 entries/);
  });
});
