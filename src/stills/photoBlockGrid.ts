/**
 * The block grid of one decoded photo: the photo cut into step×step blocks (grid width ⌊W/step⌋,
 * height ⌊H/step⌋, the right and bottom remainders left out, as the video grid in
 * core/regions/cellGeometry), each block holding the mean Rec. 709 luminance of its linear pixels
 * (0.2126 R + 0.7152 G + 0.0722 B, ITU-R BT.709-6) and the share of its pixels with any channel at
 * or above `clipCode`. Unlike the video grid (luma read as if grey) this is the true luminance of
 * every pixel, so the mean over any block-aligned rectangle, taken from the grid, equals the
 * full-resolution region mean (measureImageRegions) up to rounding: the photo is decoded once.
 * Block step for a photo: gridStepFor (about 160 blocks across, at least 2 px).
 * Pure. Units: linear light, 1.0 = full-scale white.
 * @throws KerrError INTERNAL when the sample buffer does not match width × height × channels or the
 *   step does not fit the photo.
 * @example photoBlockGrid({ data, width: 4, height: 4, channels: 3 }, 2, lut, 250).luma // 4 block means
 */
import { KerrError } from '../errors.js';
import type { DecodedImage } from './measureImageRegions.js';

export interface PhotoBlockGrid {
  step: number;
  gridWidth: number;
  gridHeight: number;
  /** Mean linear luminance per block, row-major. */
  luma: Float64Array;
  /** Share of clipped pixels per block. */
  clipped: Float64Array;
}

/** About 160 blocks across the photo, at least 2 px a block. */
export function gridStepFor(width: number): number {
  return Math.max(2, Math.ceil(width / 160));
}

export function photoBlockGrid(image: DecodedImage, step: number, codeToLinear: Float64Array, clipCode: number): PhotoBlockGrid {
  const { data, width, height, channels } = image;
  if (data.length !== width * height * channels || channels < 1 || channels > 4 || !(step >= 1) || step > Math.min(width, height)) {
    throw new KerrError('INTERNAL', `photo grid: ${data.length} samples for ${width}×${height}×${channels}, step ${step}`);
  }
  const gw = Math.floor(width / step), gh = Math.floor(height / step);
  const luma = new Float64Array(gw * gh);
  const clipped = new Float64Array(gw * gh);
  const colour = channels >= 3;
  for (let y = 0; y < gh * step; y++) {
    const row = Math.floor(y / step) * gw;
    let i = y * width * channels;
    for (let x = 0; x < gw * step; x++, i += channels) {
      const cr = data[i]!;
      const cg = colour ? data[i + 1]! : cr;
      const cb = colour ? data[i + 2]! : cr;
      const cell = row + Math.floor(x / step);
      luma[cell] += 0.2126 * codeToLinear[cr]! + 0.7152 * codeToLinear[cg]! + 0.0722 * codeToLinear[cb]!;
      if (cr >= clipCode || cg >= clipCode || cb >= clipCode) clipped[cell]! += 1;
    }
  }
  const count = step * step;
  for (let c = 0; c < luma.length; c++) {
    luma[c]! /= count;
    clipped[c]! /= count;
  }
  return { step, gridWidth: gw, gridHeight: gh, luma, clipped };
}
