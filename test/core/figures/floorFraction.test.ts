import { describe, expect, it } from 'vitest';
import { floorFraction, floorFractionUncertainty, floorResponseTerm, FLOOR_COMPRESSION_REL_BPP, FLOOR_SURROUND_REL } from '../../../src/core/figures/floorFraction.js';

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

describe('floorResponseTerm: a power-law response read as linear moves ln f by (γ − 1)·ln f', () => {
  it('matches the exact change of f^(1/γ) for a small γ error (f = 0.01, γ = 1.02)', () => {
    // exact: a floor fraction f read through I_lin = I^(1/γ) comes out as f^(1/γ)
    const f = 0.01, dg = 0.02;
    const exact = Math.abs(Math.pow(f, 1 / (1 + dg)) - f);
    const term = floorResponseTerm(f, dg);
    expect(term).toBeCloseTo(Math.abs(f * Math.log(f)) * dg, 15); // 0.000921
    expect(term / exact).toBeGreaterThan(0.9);
    expect(term / exact).toBeLessThan(1.1);
  });

  it('is zero where it has no meaning (f ≤ 0, f ≥ 1, no γ uncertainty)', () => {
    expect(floorResponseTerm(0, 0.02)).toBe(0);
    expect(floorResponseTerm(-0.01, 0.02)).toBe(0);
    expect(floorResponseTerm(1.5, 0.02)).toBe(0);
    expect(floorResponseTerm(0.01, 0)).toBe(0);
  });
});

describe('floorFractionUncertainty: fit, camera response, surround and compression in quadrature', () => {
  it('worked by hand: f = 0.01 ± 0.0002, u_γ = 0.02, 0.1 bit per pixel', () => {
    const { fraction, terms } = floorFractionUncertainty({ value: 0.01, stdErr: 0.0002 }, { gammaUncertainty: 0.02, bitsPerPixel: 0.1 });
    const resp = 0.01 * Math.log(100) * 0.02; // 0.000921
    const surround = 0.01 * FLOOR_SURROUND_REL; // 0.0005
    const compression = (0.01 * FLOOR_COMPRESSION_REL_BPP) / 0.1; // 0.0008
    expect(terms).toEqual({ fit: 0.0002, cameraResponse: expect.closeTo(resp, 15), surround: expect.closeTo(surround, 15), compression: expect.closeTo(compression, 15) });
    expect(fraction.value).toBe(0.01);
    expect(fraction.stdErr).toBeCloseTo(Math.sqrt(0.0002 ** 2 + resp ** 2 + surround ** 2 + compression ** 2), 15);
  });

  it('photos have no compression term; a fraction without a value is left alone', () => {
    const { terms } = floorFractionUncertainty({ value: 0.02, stdErr: 0.001 }, { gammaUncertainty: 0.02 });
    expect(terms?.compression).toBeUndefined();
    expect(floorFractionUncertainty({ value: NaN }, { gammaUncertainty: 0.02 })).toEqual({ fraction: { value: NaN }, terms: null });
  });
});
