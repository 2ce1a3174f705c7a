import { describe, expect, it } from 'vitest';
import { createGridSampler } from '../../src/measure/gridSampler.js';
import { srgbToLinear, bt709ToLinear } from '../../src/core/camera/transfer.js';
import type { CameraDecoding, Frame } from '../../src/media/types.js';
import { KerrError } from '../../src/errors.js';
import { OUTSIDE } from '../setup/outsideSources.js';

const decoding: CameraDecoding = { range: 'limited', matrix: 'bt709', transfer: 'srgb', clipCode: 250 };

function lumaFrame(width: number, height: number, luma: (x: number, y: number) => number, chromaValue = 128): Frame {
  const chroma = 2 * ((width + 1) >> 1) * ((height + 1) >> 1);
  const data = new Uint8Array(width * height + chroma).fill(chromaValue);
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) data[y * width + x] = luma(x, y);
  return { index: 0, timeS: 0, width, height, data };
}

describe('createGridSampler', () => {
  it('has floor(W/step) x floor(H/step) blocks', () => {
    const g = createGridSampler(103, 50, 10, decoding);
    expect([g.gridWidth, g.gridHeight]).toEqual([10, 5]);
  });

  it('gives each block the mean of the sRGB-linearised expanded luma of its pixels (IEC 61966-2-1)', { tags: [OUTSIDE.srgb] }, () => {
    const W = 37, H = 26, step = 4;
    const luma = (x: number, y: number): number => 16 + ((x * 7 + y * 13) % 219);
    const g = createGridSampler(W, H, step, decoding);
    const out = new Float32Array(g.gridWidth * g.gridHeight);
    g.sample(lumaFrame(W, H, luma), out);
    for (let gy = 0; gy < g.gridHeight; gy++) {
      for (let gx = 0; gx < g.gridWidth; gx++) {
        let sum = 0;
        for (let y = gy * step; y < (gy + 1) * step; y++) for (let x = gx * step; x < (gx + 1) * step; x++) sum += srgbToLinear((luma(x, y) - 16) / 219);
        expect(out[gy * g.gridWidth + gx]).toBeCloseTo(sum / (step * step), 5);
      }
    }
  });

  it('follows the chosen transfer (BT.709 inverse OETF, ITU-R BT.709-6) and full range', { tags: [OUTSIDE.bt709] }, () => {
    const g = createGridSampler(8, 8, 8, { ...decoding, transfer: 'bt709', range: 'full' });
    const out = new Float32Array(1);
    g.sample(lumaFrame(8, 8, () => 128), out);
    expect(out[0]).toBeCloseTo(bt709ToLinear(128 / 255), 5);
  });

  it('ignores chroma (documented): the same luma with other chroma gives the same grid', () => {
    const g = createGridSampler(16, 16, 4, decoding);
    const a = new Float32Array(16), b = new Float32Array(16);
    g.sample(lumaFrame(16, 16, (x) => 50 + x, 128), a);
    g.sample(lumaFrame(16, 16, (x) => 50 + x, 30), b);
    expect(Array.from(a)).toEqual(Array.from(b));
  });

  it('rejects a bad step, a frame of another size and an output of the wrong length', () => {
    expect(() => createGridSampler(16, 16, 0, decoding)).toThrow(KerrError);
    expect(() => createGridSampler(16, 16, 2.5, decoding)).toThrow(KerrError);
    const g = createGridSampler(16, 16, 4, decoding);
    expect(() => g.sample(lumaFrame(18, 16, () => 16), new Float32Array(16))).toThrow(KerrError);
    expect(() => g.sample(lumaFrame(16, 16, () => 16), new Float32Array(15))).toThrow(KerrError);
  });
});
