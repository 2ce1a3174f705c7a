import { describe, expect, it } from 'vitest';
import { contrastRatio, usedVoltageRange } from '../../../src/core/figures/contrastRatio.js';

// A straight-line "fit" I = floor + amp·(V/10 kV)², so the scan's extremes are at the range ends.
const line = (floor: number, amp: number, sf?: number, sa?: number) => ({
  predict: (v: number) => floor + amp * (v / 10000) ** 2,
  floorLevel: { value: floor, ...(sf !== undefined ? { stdErr: sf } : {}) },
  amplitude: { value: amp, ...(sa !== undefined ? { stdErr: sa } : {}) },
});

describe('contrastRatio', () => {
  it('highest over lowest fitted level over the used range, error by first-order propagation (worked by hand)', () => {
    const { ratio, floorNotPositive } = contrastRatio(line(0.02, 0.4, 0.001, 0.01), 0, 10000);
    expect(floorNotPositive).toBe(false);
    expect(ratio.value).toBeCloseTo(0.42 / 0.02, 10);
    // σ_hi = √(0.001² + 0.01²) (t = 1), σ_lo = 0.001 (t = 0): 21·√((σ_hi/0.42)² + (0.001/0.02)²)
    const expected = 21 * Math.hypot(Math.hypot(0.001, 0.01) / 0.42, 0.001 / 0.02);
    expect(ratio.stdErr).toBeCloseTo(expected, 10);
  });

  it('only the used range counts: from 5 kV up the lowest level is floor + amp/4', () => {
    expect(contrastRatio(line(0.02, 0.4), 5000, 10000).ratio.value).toBeCloseTo(0.42 / 0.12, 10);
  });

  it('a floor at or below zero: unbounded, flagged, no error', () => {
    const r = contrastRatio(line(-0.01, 0.4, 0.001, 0.01), 0, 10000);
    expect(r.floorNotPositive).toBe(true);
    expect(r.ratio).toEqual({ value: Infinity });
  });

  it('usedVoltageRange: least and greatest |V| over the chosen indices', () => {
    expect(usedVoltageRange([0, -3000, 500, 9000], [1, 2])).toEqual([500, 3000]);
  });
});
