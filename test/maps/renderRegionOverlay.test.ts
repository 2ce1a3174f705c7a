import { describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { Jimp } from 'jimp';
import { renderRegionOverlay, OVERLAY_STYLE } from '../../src/maps/renderRegionOverlay.js';
import { isKerrError } from '../../src/errors.js';

const hex = (s: string) => [1, 3, 5].map((i) => parseInt(s.slice(i, i + 2), 16));

async function darkFrame(w: number, h: number): Promise<Buffer> {
  return sharp({ create: { width: w, height: h, channels: 3, background: { r: 10, g: 10, b: 12 } } }).png().toBuffer();
}

describe('renderRegionOverlay', () => {
  it('keeps the frame size, adds a legend band, and draws each kind in its own colour', async () => {
    const frame = await darkFrame(640, 480);
    const png = await renderRegionOverlay(frame, [
      { kind: 'core', label: 'core', rect: { x: 140, y: 100, w: 40, h: 40 } },
      { kind: 'dark', label: 'far dark', rect: { x: 10, y: 380, w: 40, h: 40 } },
    ]);
    const meta = await sharp(png).metadata();
    expect(meta.width).toBe(640);
    expect(meta.height!).toBeGreaterThan(480);
    const image = await Jimp.read(png);
    expect(image.bitmap.width).toBe(640);
    const { data, info } = await sharp(png).removeAlpha().raw().toBuffer({ resolveWithObject: true });
    const px = (x: number, y: number) => { const o = (y * info.width + x) * 3; return [data[o]!, data[o + 1]!, data[o + 2]!]; };
    // the core's solid left edge (x = 140) at mid-height is vermillion
    const [r, g, b] = px(140, 120);
    const want = hex(OVERLAY_STYLE.core.colour);
    expect(Math.abs(r - want[0]!) + Math.abs(g - want[1]!) + Math.abs(b - want[2]!)).toBeLessThan(40);
    // inside the box the frame is untouched
    expect(px(160, 120)).toEqual([10, 10, 12]);
    // the legend band is white
    expect(px(639, meta.height! - 2)).toEqual([255, 255, 255]);
  });

  it('scales rectangles given in video pixels to a frame of another size', async () => {
    const frame = await darkFrame(640, 480);
    const png = await renderRegionOverlay(frame, [{ kind: 'core', label: 'c', rect: { x: 280, y: 200, w: 80, h: 80 } }], { sourceWidth: 1280, sourceHeight: 960 });
    const { data, info } = await sharp(png).removeAlpha().raw().toBuffer({ resolveWithObject: true });
    const o = (120 * info.width + 140) * 3; // left edge at x = 140 in the half-size frame
    expect(data[o]!).toBeGreaterThan(150);
  });

  it('enlarges a small frame by a whole factor so the labels stay legible', async () => {
    const frame = await darkFrame(160, 120);
    const png = await renderRegionOverlay(frame, [{ kind: 'core', label: 'c', rect: { x: 70, y: 50, w: 20, h: 20 } }]);
    const { data, info } = await sharp(png).removeAlpha().raw().toBuffer({ resolveWithObject: true });
    expect(info.width).toBe(640);
    const o = (240 * info.width + 280) * 3; // left edge at x = 70·4
    expect(data[o]!).toBeGreaterThan(150);
  });

  it('refuses bytes that are not an image', async () => {
    let caught: unknown;
    try { await renderRegionOverlay(Buffer.from('not a png'), []); } catch (e) { caught = e; }
    expect(isKerrError(caught) && caught.code).toBe('BAD_ARGUMENT');
  });
});
