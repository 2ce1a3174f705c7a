import { describe, expect, it } from 'vitest';
import { paletteColour, paletteLut } from '../../src/maps/sequentialPalette.js';

import { lightnessOf } from './lightness.js';

describe('sequential palette', () => {
  it('rises strictly in CIE L* over all 256 entries, from dark to light', () => {
    const lut = paletteLut();
    let prev = -Infinity;
    for (let i = 0; i < 256; i++) {
      const l = lightnessOf(lut[3 * i]!, lut[3 * i + 1]!, lut[3 * i + 2]!);
      expect(l).toBeGreaterThan(prev);
      prev = l;
    }
    expect(lightnessOf(...paletteColour(0))).toBeLessThan(12);
    expect(lightnessOf(...paletteColour(1))).toBeGreaterThan(90);
  });

  it('is not a grey ramp: the middle carries colour', () => {
    const [r, g, b] = paletteColour(0.5);
    expect(Math.max(r, g, b) - Math.min(r, g, b)).toBeGreaterThan(60);
  });

  it('clamps values outside [0, 1] and non-finite values', () => {
    expect(paletteColour(-3)).toEqual(paletteColour(0));
    expect(paletteColour(7)).toEqual(paletteColour(1));
    expect(paletteColour(NaN)).toEqual(paletteColour(0));
  });
});
