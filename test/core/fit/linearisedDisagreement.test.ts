import { describe, expect, it } from 'vitest';
import type { LinearisedCrossCheck } from '../../../src/core/fit/linearisedCrossCheck.js';
import { linearisedDisagreement } from '../../../src/core/fit/linearisedDisagreement.js';

// Nitrobenzene-like B = 2.4e-12 m/V² (J. Lux web notes; docs/references.md).
const FIT = { value: 2.4e-12, stdErr: 0.015e-12, unit: 'm/V^2' };
const check = (value: number, zScore: number): LinearisedCrossCheck => ({ kerrConstant: { value, stdErr: 0.01e-12, unit: 'm/V^2' }, points: 6, agreesWithFit: Math.abs(zScore) < 3, zScore });

describe('linearisedDisagreement', () => {
  it('warns when |z| ≥ 3, B differs by more than 2 % and the fit is identifiable, naming B and z', () => {
    const text = linearisedDisagreement(check(2.64e-12, -12.04), FIT, true);
    expect(text).toContain('B = 2.640e-12 m/V^2');
    expect(text).toContain('12.0 standard errors');
  });

  it('stays quiet for a small z, a difference within 2 %, an unidentifiable fit or no cross-check', () => {
    expect(linearisedDisagreement(check(2.64e-12, 2.9), FIT, true)).toBeNull();
    expect(linearisedDisagreement(check(2.44e-12, 8), FIT, true)).toBeNull(); // 1.7 %
    expect(linearisedDisagreement(check(2.64e-12, 12), FIT, false)).toBeNull();
    expect(linearisedDisagreement(null, FIT, true)).toBeNull();
    expect(linearisedDisagreement(check(2.64e-12, Number.NaN), FIT, true)).toBeNull();
  });
});
