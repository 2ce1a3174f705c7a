/**
 * Measures rectangular regions of planar YUV 4:2:0 frames: mean linear R, G, B, the Rec. 709
 * luminance of those means (0.2126 R + 0.7152 G + 0.0722 B, ITU-R BT.709-6 item 3.2), the pixel
 * count and the fraction of clipped pixels. Only the rows and columns of each region are read,
 * and only those pixels are converted (chroma is subsampled 2x2: pixel (x, y) uses chroma sample
 * (⌊x/2⌋, ⌊y/2⌋)).
 *
 * Per pixel: range expansion, YUV→R'G'B' matrix and linearisation as in core/camera/yuvToLinear.
 * Frames of more than 8 bits (Frame.bitDepth, 16-bit little-endian words) are read at full
 * precision through a Uint16Array view; the meter must be made for the same bit depth.
 * Means include clipped pixels (so they stay comparable frame to frame); `clippedFraction` says how
 * many there were (a pixel is clipped when any channel's code is at or above the clip code), and
 * the caller decides whether to exclude the frame. The mean gamma-encoded code values (0..255,
 * after range expansion, before linearisation) come along as codeR/G/B for diagnostics and for
 * comparison with image files.
 *
 * Row sums are accumulated separately and then added (less rounding than one long sum). The two
 * pixels of a row that share a chroma sample look it up once.
 * @throws KerrError BAD_REGION when a region does not fit the frame size given;
 *   KerrError INTERNAL when a frame of another size is passed to `measure`.
 * @example
 * const meter = createRegionMeter(320, 240, [{ x: 10, y: 10, w: 20, h: 20 }], decoding);
 * for await (const frame of openFrameStream('clip.mp4')) console.log(meter.measure(frame)[0].luma);
 */
import { KerrError } from '../errors.js';
import { yuvTables } from '../core/camera/yuvToLinear.js';
import type { CameraDecoding, Frame, Rect, RegionSample } from '../media/types.js';
import { validateRect } from './rect.js';

/** Rec. 709 luminance weights of linear R, G, B (ITU-R BT.709-6). */
export const LUMA_WEIGHTS = { r: 0.2126, g: 0.7152, b: 0.0722 } as const;

export interface RegionMeasurement extends RegionSample {
  /** Mean gamma-encoded code values (0..255, full range) of the region. */
  codeR: number;
  codeG: number;
  codeB: number;
}

export interface RegionMeter {
  readonly regions: readonly Rect[];
  /** One measurement per region, in the order given. */
  measure(frame: Frame): RegionMeasurement[];
}

export function createRegionMeter(
  frameWidth: number,
  frameHeight: number,
  regions: readonly Rect[],
  decoding: CameraDecoding,
  /** Per region, read every k-th row only (default 1: every row). For smooth backgrounds such as
   * the rings around a beam, 2 halves the work; the mean stays unbiased where the light varies
   * slowly, and pixelCount then counts the pixels read. */
  rowStrides?: readonly number[],
  /** Bits per sample of the frames (8 default; 10, 12 or 16 for 16-bit words). */
  bitDepth = 8,
): RegionMeter {
  const checked = regions.map((r, i) => ({ ...validateRect(r, frameWidth, frameHeight, `region ${i + 1}`) }));
  const tables = yuvTables(decoding, bitDepth);
  const { yCode, rFromV, gFromU, gFromV, bFromU, linear, clipThreshold, perCode } = tables;
  const chromaWidth = (frameWidth + 1) >> 1;
  const chromaHeight = (frameHeight + 1) >> 1;
  const uOffset = frameWidth * frameHeight;
  const vOffset = uOffset + chromaWidth * chromaHeight;
  const frameBytes = vOffset + chromaWidth * chromaHeight;

  /**
   * One region's sums. The pixel arithmetic is written out in one loop over local variables (no
   * helper calls with number arguments and no typed-array accumulators), so V8 keeps every value an
   * unboxed double: a helper per pixel allocated a heap number per argument and made the garbage
   * collector run about once a frame (bench: 1080p, 151-px beam with rings).
   */
  function measureOne(data: Uint8Array | Uint16Array, rect: Rect, stride: number): RegionMeasurement {
    let sumR = 0, sumG = 0, sumB = 0, codeSumR = 0, codeSumG = 0, codeSumB = 0, clippedCount = 0;
    const x1 = rect.x + rect.w;
    const y1 = rect.y + rect.h;
    for (let row = rect.y; row < y1; row += stride) {
      const lumaRow = row * frameWidth;
      const chromaRow = (row >> 1) * chromaWidth;
      // Row sums are kept apart and then added (less rounding than one long sum).
      let rowR = 0, rowG = 0, rowB = 0, rowCodeR = 0, rowCodeG = 0, rowCodeB = 0;
      let rChroma = 0, gChroma = 0, bChroma = 0;
      for (let col = rect.x; col < x1; col++) {
        // pixels 2k and 2k+1 share one chroma sample: look it up at the first pixel of each pair
        if (col === rect.x || (col & 1) === 0) {
          const chromaIndex = chromaRow + (col >> 1);
          const u = data[uOffset + chromaIndex]!;
          const v = data[vOffset + chromaIndex]!;
          rChroma = rFromV[v]!;
          gChroma = gFromU[u]! + gFromV[v]!;
          bChroma = bFromU[u]!;
        }
        const base = yCode[data[lumaRow + col]!]!;
        let r = base + rChroma;
        let g = base + gChroma;
        let b = base + bChroma;
        if (r >= clipThreshold || g >= clipThreshold || b >= clipThreshold) clippedCount++;
        r = r <= 0 ? 0 : r >= 255 ? 255 : r;
        g = g <= 0 ? 0 : g >= 255 ? 255 : g;
        b = b <= 0 ? 0 : b >= 255 ? 255 : b;
        rowCodeR += r;
        rowCodeG += g;
        rowCodeB += b;
        r *= perCode; g *= perCode; b *= perCode;
        let i = r | 0;
        let lo = linear[i]!;
        rowR += lo + (r - i) * (linear[i + 1]! - lo);
        i = g | 0;
        lo = linear[i]!;
        rowG += lo + (g - i) * (linear[i + 1]! - lo);
        i = b | 0;
        lo = linear[i]!;
        rowB += lo + (b - i) * (linear[i + 1]! - lo);
      }
      sumR += rowR; sumG += rowG; sumB += rowB;
      codeSumR += rowCodeR; codeSumG += rowCodeG; codeSumB += rowCodeB;
    }
    const n = rect.w * Math.ceil(rect.h / stride);
    const r = sumR / n, g = sumG / n, b = sumB / n;
    return {
      r, g, b,
      luma: LUMA_WEIGHTS.r * r + LUMA_WEIGHTS.g * g + LUMA_WEIGHTS.b * b,
      pixelCount: n,
      clippedFraction: clippedCount / n,
      codeR: codeSumR / n, codeG: codeSumG / n, codeB: codeSumB / n,
    };
  }

  return {
    regions: checked,
    measure(frame: Frame): RegionMeasurement[] {
      const depth = frame.bitDepth ?? 8;
      const samples = depth > 8 ? new Uint16Array(frame.data.buffer, frame.data.byteOffset, frame.data.length >> 1) : frame.data;
      if (frame.width !== frameWidth || frame.height !== frameHeight || samples.length < frameBytes) {
        throw new KerrError('INTERNAL',
          `region meter made for ${frameWidth}x${frameHeight} frames was given a ${frame.width}x${frame.height} frame`);
      }
      if ((depth > 8) !== (bitDepth > 8)) throw new KerrError('INTERNAL', `region meter made for ${bitDepth}-bit samples was given a ${depth}-bit frame`);
      return checked.map((rect, i) => measureOne(samples, rect, rowStrides?.[i] ?? 1));
    },
  };
}
