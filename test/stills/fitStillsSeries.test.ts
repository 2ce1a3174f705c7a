import { describe, expect, it } from 'vitest';
import { fitStillsSeries, type StillsFitInput } from '../../src/stills/fitStillsSeries.js';
import { isKerrError } from '../../src/errors.js';
import { crossedTransmission, DEG, halfWaveVoltageV } from '../../src/core/physics/kerr.js';

const B = 2.4e-12, L = 0.05, D = 0.005; // nitrobenzene (Lux notes); our own cell
const VPI = halfWaveVoltageV(B, L, D);

/** Exact crossed-polariser intensities (Jones calculus, T = sin²(δ/2), DESIGN.md), optional static retardance. */
function input(volts: number[], opts: { clipped?: number[]; floor?: number; amp?: number; staticRad?: number } = {}): StillsFitInput {
  const n = volts.length;
  const intensity = Float64Array.from(volts, (v) => (opts.floor ?? 0.03) + (opts.amp ?? 0.4) * crossedTransmission(45 * DEG, Math.PI * (v / VPI) ** 2 + (opts.staticRad ?? 0)));
  const clippedFraction = new Float64Array(n);
  for (const i of opts.clipped ?? []) clippedFraction[i] = 0.2;
  return { voltageV: Float64Array.from(volts), intensity, clippedFraction, effectiveLengthM: L, gapM: D, polariserAngleDeg: 45 };
}
const SWEEP = [0, 2000, 4000, 6000, 8000, 9000, 10000, 11000, 12000, 13000];

describe('fitStillsSeries', () => {
  it('recovers B, V_pi and the floor fraction from exact crossed-polariser data', () => {
    const x = input(SWEEP);
    const r = fitStillsSeries(x);
    expect(r.fit.kerrConstant.value / B).toBeCloseTo(1, 6);
    expect(r.fit.halfWaveVoltage.value / VPI).toBeCloseTo(1, 6);
    expect(r.floorFraction.value).toBeCloseTo(0.03 / 0.4, 6);
    expect(r.model[6]).toBeCloseTo(x.intensity[6]!, 9);
    expect(r.usedIndex).toEqual(SWEEP.map((_, i) => i));
  });

  it('leaves clipped and pre-excluded (unreadable) photos out of the fit and counts them; the fit still works', () => {
    const x = input(SWEEP, { clipped: [6] });
    x.intensity[6] = 0.2; // what a clipped photo reads: wrong
    x.intensity[2] = NaN;
    const r = fitStillsSeries({ ...x, preExcluded: [null, null, 'unreadable', null, null, null, null, null, null, null] });
    expect(r.used[6]).toBe(0);
    expect(r.excludedReason[6]).toBe('clipped');
    expect(r.excludedReason[2]).toBe('unreadable');
    expect(r.excluded).toEqual({ clipped: 1, unreadable: 1 });
    expect(r.usedIndex).not.toContain(6);
    expect(r.fit.kerrConstant.value / B).toBeCloseTo(1, 5);
  });

  it('too few photos or voltages: refused with one line saying what is missing', () => {
    const refusal = (x: StillsFitInput): string => {
      try {
        fitStillsSeries(x);
      } catch (e) {
        if (isKerrError(e)) return `${e.code}: ${e.oneLine()}`;
        throw e;
      }
      return 'no error';
    };
    expect(refusal(input([0, 5000, 10000]))).toMatch(/^BAD_ARGUMENT: .*at least 6 usable photos at 4 or more different voltages; this series has 3 usable photo\(s\) at 3 voltage\(s\)\. Take more photos/);
    expect(refusal(input([0, 0, 0, 5000, 5000, 10000, 10000]))).toMatch(/7 usable photo\(s\) at 3 voltage\(s\)/);
    expect(refusal(input([0, 2000, 4000, 6000, 8000, 10000], { clipped: [5] }))).toMatch(/5 usable photo\(s\) at 5 voltage\(s\) \(left out: 1 clipped\)/);
  });

  it('a known static retardance is used by the fit (δ = π(V/V_π)² + δ_static)', () => {
    const x = input(SWEEP, { staticRad: 0.4 });
    const withIt = fitStillsSeries({ ...x, staticRetardanceRad: 0.4 });
    expect(withIt.fit.kerrConstant.value / B).toBeCloseTo(1, 5);
    const without = fitStillsSeries(x);
    expect(Math.abs(without.fit.kerrConstant.value / B - 1)).toBeGreaterThan(0.01); // the option matters
  });

  it('Huber weighting (default) resists a bad photo; robust: false is plain least squares', () => {
    const x = input([0, 1000, 2000, 3000, 4000, 5000, 6000, 7000, 8000, 9000, 10000, 11000, 12000]);
    x.intensity[8] = x.intensity[8]! + 0.08; // a stray reflection in one photo
    const robust = fitStillsSeries(x);
    const plain = fitStillsSeries({ ...x, robust: false });
    expect(Math.abs(robust.fit.kerrConstant.value / B - 1)).toBeLessThan(Math.abs(plain.fit.kerrConstant.value / B - 1));
    expect(robust.fit.outliers[8]).toBe(1);
  });

  it('an open level holds the amplitude fixed', () => {
    const r = fitStillsSeries({ ...input([0, 500, 1000, 1500, 2000, 2500, 3000, 3500]), openLevel: 0.4 });
    expect(r.fit.amplitude.value).toBe(0.4);
    expect(r.fit.kerrConstant.value / B).toBeCloseTo(1, 5);
  });

  it('a sweep far below V_pi with a little noise is not identifiable (DESIGN.md, identifiability)', () => {
    const x = input([0, 500, 1000, 1500, 2000, 2500, 3000, 0, 500, 1000, 1500, 2000, 2500, 3000]);
    // camera noise of 0.003 (deterministic pattern): at 0.3·V_pi the Kerr signal is only ~0.007
    const pattern = [1, -1, 0.5, -0.5, 0.8, -0.3, 0.1];
    x.intensity.forEach((_, i) => (x.intensity[i]! += 0.003 * pattern[i % pattern.length]! * (i < 7 ? 1 : -1)));
    expect(fitStillsSeries(x).fit.identifiable).toBe(false);
  });
});
