import { describe, expect, it } from 'vitest';
import { formatQuantity } from '../src/quantity.js';

// Rounding rule: the uncertainty to two significant digits and the value to the same decimal
// place (GUM, JCGM 100:2008, §7.2.6). Expected strings are written out by hand.
describe('formatQuantity', () => {
  it('rounds the value to the last digit of a two-digit standard error, never to fewer digits', () => {
    expect(formatQuantity({ value: 11179.43, stdErr: 6.5, unit: 'V' })).toBe('11179.4 ± 6.5 V');
    expect(formatQuantity({ value: 0.45573, stdErr: 0.00055, unit: 's' })).toBe('0.45573 ± 0.00055 s');
    expect(formatQuantity({ value: 84.3312, stdErr: 1.234 })).toBe('84.3 ± 1.2');
  });
  it('writes very small and very large numbers in exponent form with matching digits', () => {
    expect(formatQuantity({ value: 2.20573e-12, stdErr: 1.19e-15, unit: 'm/V^2' })).toBe('2.2057e-12 ± 1.2e-15 m/V^2');
    expect(formatQuantity({ value: 1.8e-12, stdErr: 3.3e-14, unit: 'm/V^2' })).toBe('1.800e-12 ± 3.3e-14 m/V^2');
  });
  it('falls back to significant digits without a usable standard error', () => {
    expect(formatQuantity({ value: 11179.43, unit: 'V' })).toBe('11200 V');
    expect(formatQuantity({ value: 0.012345 })).toBe('0.0123');
    expect(formatQuantity({ value: Number.NaN, stdErr: 1 })).toBe('NaN ± 1');
  });
});
