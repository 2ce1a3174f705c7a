/**
 * A stand-in video frame made from per-block linear light, for drawing regions on when no real
 * frame can be taken from the video: each block's value (linear, 1 = full-scale white) is encoded
 * with the sRGB transfer (IEC 61966-2-1: 12.92·L for L ≤ 0.0031308, else 1.055·L^(1/2.4) − 0.055)
 * to an 8-bit grey and drawn as a stepPx × stepPx square, so the image has the video's pixel
 * geometry (gridWidth·stepPx × gridHeight·stepPx).
 * Edge module (uses sharp). Throws KerrError INTERNAL when the value count is not width × height.
 * @example await renderLinearGreyPng(openLevels, 40, 30, 8) // 320×240 PNG
 */
import sharp from 'sharp';
import { KerrError } from '../errors.js';

export async function renderLinearGreyPng(values: Float32Array | Float64Array, gridWidth: number, gridHeight: number, stepPx: number): Promise<Buffer> {
  if (values.length !== gridWidth * gridHeight || !(gridWidth > 0 && gridHeight > 0)) {
    throw new KerrError('INTERNAL', `a ${gridWidth}×${gridHeight} block image needs ${gridWidth * gridHeight} values, not ${values.length}`);
  }
  const grey = Buffer.alloc(values.length);
  for (let c = 0; c < values.length; c++) {
    const l = Math.min(1, Math.max(0, Number.isFinite(values[c]!) ? values[c]! : 0));
    const v = l <= 0.0031308 ? 12.92 * l : 1.055 * Math.pow(l, 1 / 2.4) - 0.055;
    grey[c] = Math.round(v * 255);
  }
  const step = Math.max(1, Math.round(stepPx));
  return sharp(grey, { raw: { width: gridWidth, height: gridHeight, channels: 1 } })
    .resize(gridWidth * step, gridHeight * step, { kernel: 'nearest', fit: 'fill' })
    .png()
    .toBuffer();
}
