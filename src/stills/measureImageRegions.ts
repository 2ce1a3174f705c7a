/**
 * Mean linear light of rectangular regions of one decoded photo: per region the mean linear R, G
 * and B, the Rec. 709 luminance of those means (0.2126 R + 0.7152 G + 0.0722 B, ITU-R BT.709-6;
 * linear, so the luminance of the mean equals the mean of the luminances), the pixel count and
 * the fraction of clipped pixels (any channel at or above `clipCode`).
 * Input: interleaved samples (8-bit or 16-bit, 1 to 4 channels, top-left origin); a grey image
 * (1–2 channels) gives R = G = B; a 4th channel (alpha) is ignored. Only the rows of each region
 * are touched; sums are Float64. Units: linear light, 1.0 = full-scale white. Pure.
 * @throws KerrError INTERNAL when the sample buffer does not match width × height × channels.
 * @example measureImageRegions({ data, width: 4, height: 4, channels: 3 }, [{ x: 0, y: 0, w: 2, h: 2 }], lut, 250)[0].luma
 */
import { KerrError } from '../errors.js';
import type { Rect, RegionSample } from '../media/types.js';

export interface DecodedImage {
  data: Uint8Array | Uint16Array;
  width: number;
  height: number;
  channels: number;
}

export function measureImageRegions(image: DecodedImage, regions: readonly Rect[], codeToLinear: Float64Array, clipCode: number): RegionSample[] {
  const { data, width, height, channels } = image;
  if (data.length !== width * height * channels || channels < 1 || channels > 4) {
    throw new KerrError('INTERNAL', `decoded image has ${data.length} samples, expected ${width}×${height}×${channels}`);
  }
  const colour = channels >= 3;
  return regions.map((rect) => {
    let sumR = 0, sumG = 0, sumB = 0, clipped = 0;
    for (let y = rect.y; y < rect.y + rect.h; y++) {
      let rowR = 0, rowG = 0, rowB = 0; // per-row partial sums keep the running totals well conditioned
      let i = (y * width + rect.x) * channels;
      for (let x = 0; x < rect.w; x++, i += channels) {
        const codeR = data[i]!;
        const codeG = colour ? data[i + 1]! : codeR;
        const codeB = colour ? data[i + 2]! : codeR;
        rowR += codeToLinear[codeR]!;
        rowG += codeToLinear[codeG]!;
        rowB += codeToLinear[codeB]!;
        if (codeR >= clipCode || codeG >= clipCode || codeB >= clipCode) clipped++;
      }
      sumR += rowR;
      sumG += rowG;
      sumB += rowB;
    }
    const count = rect.w * rect.h;
    const r = sumR / count, g = sumG / count, b = sumB / count;
    return { r, g, b, luma: 0.2126 * r + 0.7152 * g + 0.0722 * b, pixelCount: count, clippedFraction: clipped / count };
  });
}
