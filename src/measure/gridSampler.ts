/**
 * Cheap per-block brightness for per-pixel maps: the frame is cut into step×step blocks
 * (grid width ⌊W/step⌋, height ⌊H/step⌋; the right and bottom remainders are left out) and each
 * block gets the mean of the linearised luma of its pixels.
 *
 * Only the Y plane is read: chroma is ignored. Each pixel's luma code is range-expanded and
 * linearised as if the pixel were grey (L = transfer⁻¹(Y')), which is exact for neutral light and
 * a monotonic, nearly proportional stand-in for coloured light (for a pure-green source it reads
 * lower by roughly 0.7152^γ). That is what the static/modulated regression needs: a per-block value
 * linear in the light, at one look-up per pixel. For true Rec. 709 luminance of a few regions use
 * the region meter.
 *
 * Output: `out[gy·gridWidth + gx]` in linear units (0..1), written in place (Float32Array of
 * gridWidth·gridHeight entries). Sums run in a Float64Array row accumulator.
 * @throws KerrError BAD_ARGUMENT for a step below 1 or larger than the frame;
 *   KerrError INTERNAL for a frame of another size or an output array of the wrong length.
 * @example
 * const grid = createGridSampler(320, 240, 8, decoding); // 40 x 30 blocks
 * const out = new Float32Array(grid.gridWidth * grid.gridHeight);
 * grid.sample(frame, out);
 */
import { KerrError, invalid } from '../errors.js';
import { yuvTables } from '../core/camera/yuvToLinear.js';
import type { CameraDecoding, Frame } from '../media/types.js';

export interface GridSampler {
  readonly step: number;
  readonly gridWidth: number;
  readonly gridHeight: number;
  sample(frame: Frame, out: Float32Array): void;
}

export function createGridSampler(frameWidth: number, frameHeight: number, step: number, decoding: CameraDecoding): GridSampler {
  if (!Number.isInteger(step) || step < 1 || step > Math.min(frameWidth, frameHeight)) {
    throw invalid(`a whole block size from 1 to ${Math.min(frameWidth, frameHeight)} pixels`, 'grid step', step);
  }
  const gridWidth = Math.floor(frameWidth / step);
  const gridHeight = Math.floor(frameHeight / step);
  const lumaLinear = yuvTables(decoding).lumaLinear;
  const rowSums = new Float64Array(gridWidth);
  const usedWidth = gridWidth * step;
  const inverseCount = 1 / (step * step);

  return {
    step,
    gridWidth,
    gridHeight,
    sample(frame: Frame, out: Float32Array): void {
      if (frame.width !== frameWidth || frame.height !== frameHeight) {
        throw new KerrError('INTERNAL', `grid sampler made for ${frameWidth}x${frameHeight} frames was given ${frame.width}x${frame.height}`);
      }
      if (out.length !== gridWidth * gridHeight) {
        throw new KerrError('INTERNAL', `grid output needs ${gridWidth * gridHeight} entries, got ${out.length}`);
      }
      const data = frame.data;
      for (let gy = 0; gy < gridHeight; gy++) {
        rowSums.fill(0);
        const rowStart = gy * step;
        for (let row = rowStart; row < rowStart + step; row++) {
          const offset = row * frameWidth;
          let gx = 0;
          for (let col = 0; col < usedWidth; col += step) {
            let blockRow = 0;
            const end = offset + col + step;
            for (let p = offset + col; p < end; p++) blockRow += lumaLinear[data[p]!]!;
            rowSums[gx++] += blockRow;
          }
        }
        const outRow = gy * gridWidth;
        for (let gx = 0; gx < gridWidth; gx++) out[outRow + gx] = rowSums[gx]! * inverseCount;
      }
    },
  };
}
