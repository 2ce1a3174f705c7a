import { describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { Jimp } from 'jimp';
import { renderMapPng, mapFigureLayout } from '../../src/maps/renderMapPng.js';
import { lightnessOf } from './lightness.js';

function gaussianMap(w: number, h: number): Float32Array {
  const v = new Float32Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) v[y * w + x] = 0.4 * Math.exp(-((x - w / 2) ** 2 + (y - h / 2) ** 2) / 20);
  return v;
}

describe('renderMapPng', () => {
  it('decodes with sharp and with jimp at the size the layout promises', async () => {
    const fig = await renderMapPng(gaussianMap(40, 30), 40, 30, { title: 'Modulated light', unit: 'linear', stepPx: 8 });
    const meta = await sharp(fig.png).metadata();
    expect(meta.format).toBe('png');
    expect(meta.width).toBe(fig.layout.width);
    expect(meta.height).toBe(fig.layout.height);
    const image = await Jimp.read(fig.png);
    expect(image.bitmap.width).toBe(fig.layout.width);
    expect(image.bitmap.height).toBe(fig.layout.height);
    expect(fig.layout).toEqual(mapFigureLayout(40, 30));
    expect(fig.layout.scalePx).toBe(24); // 960 px / 40 blocks
    expect(fig.range).toEqual([0, Math.max(...gaussianMap(40, 30))]);
  });

  it('draws a colour bar whose pixel columns darken monotonically from top to bottom', async () => {
    const fig = await renderMapPng(gaussianMap(40, 30), 40, 30, { title: 'Static light', unit: 'linear', stepPx: 8 });
    const { data, info } = await sharp(fig.png).removeAlpha().raw().toBuffer({ resolveWithObject: true });
    const { bar } = fig.layout;
    for (const x of [bar.x + 3, bar.x + Math.floor(bar.w / 2), bar.x + bar.w - 4]) {
      let prev = Infinity;
      let first = 0, last = 0;
      for (let y = bar.y + 1; y < bar.y + bar.h - 1; y++) {
        const o = (y * info.width + x) * 3;
        const l = lightnessOf(data[o]!, data[o + 1]!, data[o + 2]!);
        expect(l).toBeLessThanOrEqual(prev + 0.5); // 0.5 L* allows for resampling in the SVG renderer
        if (y === bar.y + 1) first = l;
        last = l;
        prev = l;
      }
      expect(first - last).toBeGreaterThan(70);
    }
  });

  it('upscales by nearest neighbour so blocks stay square and sharp', async () => {
    const w = 8, h = 6;
    const v = new Float32Array(w * h);
    v[2 * w + 3] = 1; // one bright block
    const fig = await renderMapPng(v, w, h, { title: 't', unit: 'u', stepPx: 4, range: [0, 1] });
    const { data, info } = await sharp(fig.png).removeAlpha().raw().toBuffer({ resolveWithObject: true });
    const { map, scalePx } = fig.layout;
    const at = (x: number, y: number) => { const o = (y * info.width + x) * 3; return lightnessOf(data[o]!, data[o + 1]!, data[o + 2]!); };
    const x0 = map.x + 3 * scalePx, y0 = map.y + 2 * scalePx;
    expect(at(x0 + 2, y0 + 2)).toBeGreaterThan(90);
    expect(at(x0 + scalePx - 3, y0 + scalePx - 3)).toBeGreaterThan(90);
    expect(at(x0 - 3, y0 + 2)).toBeLessThan(12);
    expect(at(x0 + scalePx + 2, y0 + 2)).toBeLessThan(12);
  });

  it('refuses a value count that does not match the size, and an inverted range', async () => {
    await expect(renderMapPng(new Float32Array(5), 2, 2, { title: 't', unit: 'u', stepPx: 1 })).rejects.toThrow(/needs 4 values/);
    await expect(renderMapPng(new Float32Array(4), 2, 2, { title: 't', unit: 'u', stepPx: 1, range: [1, 0] })).rejects.toThrow(/high above low/);
  });
});
