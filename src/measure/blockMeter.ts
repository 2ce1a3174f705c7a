/**
 * Colour-decodes a block overview: one 16-bit 4:4:4 pixel per step×step block of the picture,
 * holding the block's mean Y′, Cb and Cr (src/media/analysisStream, overview 'yuv16'), into each
 * block's linear R, G, B, its Rec. 709 luminance 0.2126 R + 0.7152 G + 0.0722 B (ITU-R BT.709-6
 * item 3.2, the weights of the region meter) and a clipped flag.
 *
 * A word w stands for the source code c = w / 2^(16 − n) of an n-bit source (ffmpeg's swscale
 * shifts when the range is pinned; see analysisStream), fractional after the block average. The
 * decoding is the region meter's (core/camera/yuvToLinear: range expansion, matrix, transfer table
 * or camera response, linear interpolation between table entries); the range and matrix steps are
 * affine in the code, so a fractional code is decoded exactly by the affine form of the tables.
 * A block counts as clipped when any channel of its decoded mean reaches the clip threshold
 * (clipCode − 0.5): a block with a few clipped pixels among darker ones is not flagged, so the
 * clipped fraction of a region measured from blocks is a lower bound of the pixel fraction.
 *
 * The one approximation: the block's codes are averaged before linearising, so where light varies
 * inside a block (the edge of a spot) the result differs from the mean of linear light (by Jensen's
 * inequality, lower for a convex transfer). docs/analyze.md gives its measured effect on B.
 *
 * Output per frame: `luma[c]` (and `r`, `g`, `b` when asked) for c = gy·gridWidth + gx in linear
 * units (0..1); clipped blocks set bit (bitOffset + c) of the `clipped` bit set.
 * @throws KerrError INTERNAL for a frame that is not gridWidth×gridHeight 16-bit, or outputs of the wrong length.
 * @example
 * const meter = createBlockMeter(160, 90, decoding, 8);
 * meter.measure(frame, lumaOut, clippedBits, frameIndex * 160 * 90);
 */
import { KerrError } from '../errors.js';
import { yuvTables } from '../core/camera/yuvToLinear.js';
import type { CameraDecoding, Frame } from '../media/types.js';
import { LUMA_WEIGHTS } from './regionMeter.js';

export interface BlockMeter {
  readonly gridWidth: number;
  readonly gridHeight: number;
  /**
   * Decodes one overview frame. `luma` gets gridWidth·gridHeight values; `rgb`, when given, the
   * three channels; bit `bitOffset + c` of `clipped` is set for a clipped block (never cleared).
   */
  measure(frame: Frame, luma: Float32Array, clipped: Uint8Array, bitOffset: number, rgb?: { r: Float32Array; g: Float32Array; b: Float32Array }): void;
}

export function createBlockMeter(gridWidth: number, gridHeight: number, decoding: CameraDecoding, sourceBitDepth: number): BlockMeter {
  const t = yuvTables(decoding, sourceBitDepth);
  // The range and matrix tables are affine in the code: value(c) = value(0) + c·(value(1) − value(0)).
  const affine = (table: Float64Array): [number, number] => [table[0]!, table[1]! - table[0]!];
  const [y0, yK] = affine(t.yCode);
  const [rv0, rvK] = affine(t.rFromV);
  const [gu0, guK] = affine(t.gFromU);
  const [gv0, gvK] = affine(t.gFromV);
  const [bu0, buK] = affine(t.bFromU);
  const toCode = 1 / 2 ** (16 - sourceBitDepth);
  const { linear, perCode, clipThreshold } = t;
  const cells = gridWidth * gridHeight;
  return {
    gridWidth,
    gridHeight,
    measure(frame, luma, clipped, bitOffset, rgb): void {
      if (frame.width !== gridWidth || frame.height !== gridHeight || (frame.bitDepth ?? 8) !== 16 || frame.data.length < 6 * cells) {
        throw new KerrError('INTERNAL', `block meter made for ${gridWidth}x${gridHeight} 16-bit 4:4:4 overviews was given ${frame.width}x${frame.height} at ${frame.bitDepth ?? 8} bits`);
      }
      if (luma.length !== cells || (rgb && (rgb.r.length !== cells || rgb.g.length !== cells || rgb.b.length !== cells))) {
        throw new KerrError('INTERNAL', `block outputs need ${cells} entries`);
      }
      const words = new Uint16Array(frame.data.buffer, frame.data.byteOffset, 3 * cells);
      for (let c = 0; c < cells; c++) {
        const y = words[c]! * toCode;
        const u = words[cells + c]! * toCode;
        const v = words[2 * cells + c]! * toCode;
        const base = y0 + yK * y;
        const rc = base + rv0 + rvK * v;
        const gc = base + gu0 + guK * u + gv0 + gvK * v;
        const bc = base + bu0 + buK * u;
        if (rc >= clipThreshold || gc >= clipThreshold || bc >= clipThreshold) {
          const bit = bitOffset + c;
          clipped[bit >> 3] |= 1 << (bit & 7);
        }
        // linear light by interpolation in the table, written out (no helper call per channel, so
        // the values stay unboxed doubles)
        let x = (rc <= 0 ? 0 : rc >= 255 ? 255 : rc) * perCode;
        let i = x | 0;
        let lo = linear[i]!;
        const r = lo + (x - i) * (linear[i + 1]! - lo);
        x = (gc <= 0 ? 0 : gc >= 255 ? 255 : gc) * perCode;
        i = x | 0;
        lo = linear[i]!;
        const g = lo + (x - i) * (linear[i + 1]! - lo);
        x = (bc <= 0 ? 0 : bc >= 255 ? 255 : bc) * perCode;
        i = x | 0;
        lo = linear[i]!;
        const b = lo + (x - i) * (linear[i + 1]! - lo);
        luma[c] = LUMA_WEIGHTS.r * r + LUMA_WEIGHTS.g * g + LUMA_WEIGHTS.b * b;
        if (rgb) { rgb.r[c] = r; rgb.g[c] = g; rgb.b[c] = b; }
      }
    },
  };
}
