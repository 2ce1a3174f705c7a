import { describe, expect, it } from 'vitest';
import { baselineFloor } from '../../../src/core/scatter/baselineFloor.js';
import { quantity } from '../../../src/quantity.js';
import { isKerrError } from '../../../src/errors.js';

describe('baselineFloor', () => {
  it('splits the floor into polariser leak and scatter (hand calculation: 0.012 − 0.004, errors in quadrature)', () => {
    const r = baselineFloor(quantity(0.012, 0.0012), quantity(0.004, 0.0005));
    expect(r.polariserLeakFraction.value).toBe(0.004);
    expect(r.polariserLeakFraction.stdErr).toBe(0.0005);
    expect(r.scatterFloorFraction.value).toBeCloseTo(0.008, 15);
    expect(r.scatterFloorFraction.stdErr).toBeCloseTo(0.0013, 15); // √(0.0012² + 0.0005²) = 0.0013
  });

  it('leaves the error out when either run has none', () => {
    expect(baselineFloor(quantity(0.01), quantity(0.004, 0.001)).scatterFloorFraction.stdErr).toBeUndefined();
  });

  it('refuses a baseline without a finite floor fraction, naming the baseline input', () => {
    let caught: unknown;
    try { baselineFloor(quantity(0.01), quantity(NaN)); } catch (e) { caught = e; }
    expect(isKerrError(caught) && caught.code).toBe('BAD_RESULT');
    expect(isKerrError(caught) && caught.path).toBe('baseline');
    expect(isKerrError(caught) && caught.inputs).toEqual(['baseline']);
  });
});
