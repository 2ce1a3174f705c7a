import { describe, expect, it } from 'vitest';
import { floorFraction } from '../../../src/core/figures/floorFraction.js';

describe('floorFraction', () => {
  it('first-order propagation worked by hand: 0.03±0.001 over 0.4±0.004 → 0.075 ± √((0.001/0.4)² + (0.03·0.004/0.16)²)', () => {
    const f = floorFraction({ value: 0.03, stdErr: 0.001 }, { value: 0.4, stdErr: 0.004 });
    expect(f.value).toBeCloseTo(0.075, 12);
    // by hand: 0.0025 and 0.00075 in quadrature = 0.00261008
    expect(f.stdErr).toBeCloseTo(0.00261008, 7);
  });

  it('a floor of exactly 0 keeps the floor error (σ_floor/I_amp), not 0', () => {
    const f = floorFraction({ value: 0, stdErr: 0.002 }, { value: 0.5, stdErr: 0.01 });
    expect(f.value).toBe(0);
    expect(f.stdErr).toBeCloseTo(0.004, 12);
  });

  it('no amplitude: NaN without error; no input errors: no error', () => {
    expect(floorFraction({ value: 0.1, stdErr: 0.01 }, { value: 0 })).toEqual({ value: NaN });
    expect(floorFraction({ value: 0.1 }, { value: 0.5 })).toEqual({ value: 0.2 });
  });
});
