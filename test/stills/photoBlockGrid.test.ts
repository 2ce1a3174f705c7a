import { describe, expect, it } from 'vitest';
import { gridStepFor, photoBlockGrid } from '../../src/stills/photoBlockGrid.js';
import { measureImageRegions } from '../../src/stills/measureImageRegions.js';

// A linear "LUT": code c → c/255 (so expected means are worked by hand).
const lut = Float64Array.from({ length: 256 }, (_, c) => c / 255);

describe('photoBlockGrid', () => {
  it('block means of Rec. 709 luminance (ITU-R BT.709-6 weights) and clipped shares, worked by hand; remainders left out', () => {
    // 5×2 RGB image, step 2: one row of 2 blocks, the 5th column left out.
    const px = [[255, 0, 0], [0, 255, 0], [0, 0, 255], [255, 255, 255], [9, 9, 9], [0, 0, 0], [0, 0, 0], [51, 51, 51], [51, 51, 51], [9, 9, 9]];
    const g = photoBlockGrid({ data: Uint8Array.from(px.flat()), width: 5, height: 2, channels: 3 }, 2, lut, 250);
    expect([g.gridWidth, g.gridHeight]).toEqual([2, 1]);
    // block 0: pixels (0,0) red, (1,0) green, (0,1) black, (1,1) black → (0.2126 + 0.7152)/4
    expect(g.luma[0]).toBeCloseTo((0.2126 + 0.7152) / 4, 12);
    // block 1: blue, white, 0.2, 0.2 → (0.0722 + 1 + 0.2 + 0.2)/4
    expect(g.luma[1]).toBeCloseTo((0.0722 + 1 + 0.4) / 4, 12);
    expect(Array.from(g.clipped)).toEqual([0.5, 0.5]); // red and green; blue and white reach 255
  });

  it('the mean over block-aligned rectangles equals the full-resolution region mean (one decode is enough)', () => {
    const w = 12, h = 8;
    const data = Uint8Array.from({ length: w * h * 3 }, (_, i) => (i * 37 + (i >> 3) * 11) % 256);
    const g = photoBlockGrid({ data, width: w, height: h, channels: 3 }, 4, lut, 250);
    const [full] = measureImageRegions({ data, width: w, height: h, channels: 3 }, [{ x: 4, y: 0, w: 8, h: 8 }], lut, 250);
    const fromGrid = (g.luma[1]! + g.luma[2]! + g.luma[4]! + g.luma[5]!) / 4;
    expect(fromGrid).toBeCloseTo(full!.luma, 12);
    expect((g.clipped[1]! + g.clipped[2]! + g.clipped[4]! + g.clipped[5]!) / 4).toBeCloseTo(full!.clippedFraction, 12);
  });

  it('about 160 blocks across, at least 2 px', () => {
    expect(gridStepFor(160)).toBe(2);
    expect(gridStepFor(6000)).toBe(38);
  });
});
