import { describe, expect, it } from 'vitest';
import { fitResponseTable } from '../../../src/core/camera/fitResponseTable.js';
import { checkResponseTable, responseAt, responseLut } from '../../../src/core/camera/responseTable.js';
import { lightFromAngles, lightFromSteadyRotation } from '../../../src/core/camera/malusLight.js';
import { srgbEncode, srgbDecode } from '../../../src/sim/transfer.js';

describe('response table', () => {
  it('interpolates linearly, extends the end segments, and tabulates like a transfer table', () => {
    const t = { code: [10, 100, 200], linear: [0, 0.2, 1] };
    expect(responseAt(t, 55)).toBeCloseTo(0.1, 12);
    expect(responseAt(t, 250)).toBeCloseTo(1.4, 12); // slope of the last segment 0.8/100
    expect(responseAt(t, 0)).toBeCloseTo(-10 * 0.2 / 90, 12);
    const lut = responseLut(t, 4);
    expect(lut.length).toBe(1022);
    expect(lut[400]).toBeCloseTo(0.2, 12);
  });

  it('refuses decreasing light or codes that do not increase', () => {
    expect(() => checkResponseTable({ code: [0, 1, 2], linear: [0, 0.5, 0.4] })).toThrow(/must not decrease/);
    expect(() => checkResponseTable({ code: [0, 1, 1], linear: [0, 0.5, 1] })).toThrow(/increase/);
  });
});

describe('fitResponseTable: the monotone curve of Malus-law light against code value', () => {
  it('recovers an sRGB camera from cos²θ light with a leak, up to scale and offset (IEC 61966-2-1 curve)', () => {
    const codes: number[] = [], light: number[] = [];
    for (let k = 0; k <= 360; k++) {
      const x = Math.cos((k * Math.PI) / 360) ** 2;
      const l = 0.02 + 0.7 * x; // leak 0.02, amplitude 0.7 (invented)
      codes.push(255 * srgbEncode(l));
      light.push(x);
    }
    const fit = fitResponseTable(codes, light);
    expect(fit.residualRms).toBeLessThan(0.003);
    // affine comparison with the true curve over the measured range
    const [lo, hi] = fit.codeRange;
    for (const c of [lo + 5, 80, 128, 180, hi - 5]) {
      const truth = (srgbDecode(c / 255) - srgbDecode(lo / 255)) / (srgbDecode(hi / 255) - srgbDecode(lo / 255));
      expect(responseAt(fit.table, c)).toBeCloseTo(truth, 2);
    }
  });

  it('refuses a calibration that spans only a few code values', () => {
    expect(() => fitResponseTable([100, 101, 102, 103, 101, 102, 100, 103], [0, 0.1, 0.2, 0.3, 0.1, 0.2, 0, 0.3])).toThrow(/spans only/);
  });
});

describe('Malus light from angles or a steady rotation', () => {
  const curve = (x: number) => 255 * srgbEncode(0.01 + 0.8 * x);
  it('finds the brightest angle from the phase of the first harmonic: within 0.1° for an even sampling of the half-turn, within 0.5° otherwise', () => {
    const even = Array.from({ length: 12 }, (_v, i) => 15 * i);
    expect(Math.abs(lightFromAngles(even, even.map((a) => curve(Math.cos(((a - 12) * Math.PI) / 180) ** 2))).brightestAtDeg - 12)).toBeLessThan(0.1);
    const uneven = Array.from({ length: 13 }, (_v, i) => -20 + 15 * i);
    expect(Math.abs(lightFromAngles(uneven, uneven.map((a) => curve(Math.cos(((a - 12) * Math.PI) / 180) ** 2))).brightestAtDeg - 12)).toBeLessThan(0.5);
  });

  it('finds the period of a steady rotation to 0.1 % from three light periods', () => {
    const times = Array.from({ length: 180 }, (_v, i) => i / 30);
    const codes = times.map((t) => curve(Math.cos(Math.PI * (t - 0.37) / 1.9) ** 2));
    const r = lightFromSteadyRotation(times, codes);
    expect(r.lightPeriodS / 1.9 - 1).toBeLessThan(1e-3);
    expect(Math.abs(r.light[Math.round(0.37 * 30)]! - 1)).toBeLessThan(1e-3);
  });

  it('refuses angles that cover too little of a half-turn, and a clip with no rotation', () => {
    expect(() => lightFromAngles([0, 10, 20, 30, 40], [200, 190, 170, 150, 120])).toThrow(/cover only/);
    const times = Array.from({ length: 100 }, (_v, i) => i / 30);
    expect(() => lightFromSteadyRotation(times, times.map(() => 100))).toThrow(/no steady rotation/);
  });
});
