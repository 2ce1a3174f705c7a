import { describe, expect, it } from 'vitest';
import { relativeExposure } from '../../src/stills/relativeExposure.js';

describe('relativeExposure', () => {
  it('H = t·ISO/N² against the first photo (photographic exposure law, common practice)', () => {
    const r = relativeExposure([
      { exposureTimeS: 1 / 100, iso: 100, fNumber: 2.8 },
      { exposureTimeS: 1 / 50, iso: 100, fNumber: 2.8 }, // twice the time
      { exposureTimeS: 1 / 100, iso: 200, fNumber: 4 }, // twice the ISO, (2.8/4)^2 of the light
    ]);
    expect(r.basis).toBe('exif');
    expect(r.factors).toEqual(['exposure time', 'ISO', 'f-number']);
    expect(r.varies).toBe(true);
    expect(Array.from(r.relative)).toEqual([1, 2, expect.closeTo(2 * (2.8 / 4) ** 2, 12)]);
  });

  it('one stop of shutter equals one stop of ISO', () => {
    const r = relativeExposure([{ exposureTimeS: 1 / 60, iso: 400, fNumber: 1.8 }, { exposureTimeS: 1 / 30, iso: 200, fNumber: 1.8 }]);
    expect(r.relative[1]).toBeCloseTo(1, 12);
    expect(r.varies).toBe(false);
  });

  it('no exposure time in every photo: basis none, all ones, and says how many had it', () => {
    const r = relativeExposure([{ exposureTimeS: 0.01, iso: 100, fNumber: 2 }, { exposureTimeS: null, iso: 100, fNumber: 2 }]);
    expect(r.basis).toBe('none');
    expect(Array.from(r.relative)).toEqual([1, 1]);
    expect(r.warnings.join(' ')).toMatch(/only 1 of 2 photos/);
    expect(relativeExposure([{ exposureTimeS: null, iso: null, fNumber: null }]).warnings).toEqual([]);
  });

  it('an ISO missing in some photos is taken as constant, with a warning', () => {
    const r = relativeExposure([{ exposureTimeS: 0.01, iso: 100, fNumber: null }, { exposureTimeS: 0.02, iso: null, fNumber: null }]);
    expect(r.factors).toEqual(['exposure time']);
    expect(r.relative[1]).toBe(2);
    expect(r.warnings.join(' ')).toMatch(/ISO is in the EXIF of only 1 of 2/);
  });
});
