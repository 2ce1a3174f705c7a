import { describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { renderLinearGreyPng } from '../../src/maps/renderLinearGreyPng.js';

describe('renderLinearGreyPng', () => {
  it('encodes linear light with the sRGB transfer (IEC 61966-2-1: 8-bit code 128 ↔ linear 0.215861)', async () => {
    const png = await renderLinearGreyPng(Float32Array.of(0, 0.215861, 1, 2), 2, 2, 3);
    const { data, info } = await sharp(png).raw().toBuffer({ resolveWithObject: true });
    expect([info.width, info.height]).toEqual([6, 6]);
    const at = (x: number, y: number) => data[(y * info.width + x) * info.channels]!;
    expect(at(0, 0)).toBe(0);
    expect(at(4, 1)).toBe(128);
    expect(at(2, 5)).toBe(255);
    expect(at(5, 5)).toBe(255);
  });
});
