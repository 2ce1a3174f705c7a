import { describe, expect, it } from 'vitest';
import { measureImageRegions } from '../../src/stills/measureImageRegions.js';
import { codeToLinearLut } from '../../src/stills/codeToLinearLut.js';
import { OUTSIDE } from '../setup/outsideSources.js';

describe('codeToLinearLut', { tags: [OUTSIDE.srgb] }, () => {
  it('8-bit sRGB: code 128 → 0.215861 (IEC 61966-2-1 check value)', () => {
    expect(codeToLinearLut('srgb', 255)[128]).toBeCloseTo(0.215861, 6);
  });
  it('16-bit sRGB: V = 0.5 → 0.214041 (IEC 61966-2-1); the nearest code 32768 is within 2e-5', () => {
    expect(Math.abs(codeToLinearLut('srgb', 65535)[32768]! - 0.214041)).toBeLessThan(2e-5);
  });
  it('linear is code/maxCode', () => {
    const lut = codeToLinearLut('linear', 65535);
    expect(lut[65535]).toBe(1);
    expect(lut[13107]).toBeCloseTo(0.2, 12);
  });
});

describe('measureImageRegions', () => {
  it('means of linear channels, Rec. 709 luminance (ITU-R BT.709-6 weights), clipped fraction', { tags: [OUTSIDE.bt709] }, () => {
    const width = 4, height = 3, channels = 3;
    const data = new Uint8Array(width * height * channels);
    // region x=1..2, y=1..2: two pixels (255,0,0) and (0,255,0), two (0,0,255); one of each pure primary is clipped
    const set = (x: number, y: number, rgb: [number, number, number]): void => data.set(rgb, (y * width + x) * channels);
    set(1, 1, [255, 0, 0]);
    set(2, 1, [0, 255, 0]);
    set(1, 2, [0, 0, 255]);
    set(2, 2, [0, 0, 255]);
    const [s] = measureImageRegions({ data, width, height, channels }, [{ x: 1, y: 1, w: 2, h: 2 }], codeToLinearLut('linear', 255), 250);
    expect(s!.r).toBeCloseTo(0.25, 12);
    expect(s!.g).toBeCloseTo(0.25, 12);
    expect(s!.b).toBeCloseTo(0.5, 12);
    expect(s!.luma).toBeCloseTo(0.2126 * 0.25 + 0.7152 * 0.25 + 0.0722 * 0.5, 12);
    expect(s!.pixelCount).toBe(4);
    expect(s!.clippedFraction).toBe(1);
  });

  it('grey images give R = G = B and touch only the region', () => {
    const data = new Uint16Array([0, 65535, 32768, 65535, 0, 0]);
    const [s] = measureImageRegions({ data, width: 3, height: 2, channels: 1 }, [{ x: 1, y: 0, w: 2, h: 1 }], codeToLinearLut('linear', 65535), 64250);
    expect(s!.r).toBeCloseTo((1 + 32768 / 65535) / 2, 12);
    expect(s!.luma).toBeCloseTo(s!.r, 12);
    expect(s!.clippedFraction).toBe(0.5);
  });

  it('refuses a buffer that does not match the size', () => {
    expect(() => measureImageRegions({ data: new Uint8Array(5), width: 2, height: 1, channels: 3 }, [], new Float64Array(256), 250)).toThrow(/expected 2×1×3/);
  });
});
