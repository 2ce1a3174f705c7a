import { describe, expect, it } from 'vitest';
import { checkCameraResponse, posteriorGamma, posteriorResponseTerm, PRIOR_GAMMA_STD_ERR } from '../../../src/core/fit/checkCameraResponse.js';
import { fitKerrCurve } from '../../../src/core/fit/fitKerrCurve.js';
import { makeRng } from '../../../src/sim/rng.js';

const L = 0.05, D = 0.005, B = 2.4e-12;
const VPI = D / Math.sqrt(2 * B * L); // V_π = d/√(2BL) (Kerr law)

/** A sweep to `reach`·V_π and back; the camera reports (F + A·u)^(1/γ) plus noise (invented test data). */
function run(gamma: number, reach: number, seed: number, withOpenLevel = false, noise = 0.002) {
  const rng = makeRng(seed);
  const n = 400;
  const v = new Float64Array(n), y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    v[i] = reach * VPI * Math.sin((Math.PI * i) / (n - 1));
    const u = Math.sin((Math.PI / 2) * (v[i]! / VPI) ** 2) ** 2;
    y[i] = Math.pow(0.01 + 0.5 * u, 1 / gamma) + noise * rng.normal();
  }
  const fit = fitKerrCurve({ voltageV: v, intensity: y, effectiveLengthM: L, gapM: D, polariserAngleDeg: 45 });
  const check = checkCameraResponse({
    voltageV: v, intensity: y, used: Uint8Array.from(fit.outliers, (x) => 1 - x),
    fit: { floor: fit.floorLevel.value, amplitude: fit.amplitude.value, halfWaveVoltageV: fit.halfWaveVoltage.value },
    polariserAngleDeg: 45, effectiveLengthM: L, gapM: D,
    kerrConstant: fit.kerrConstant.value, errorInflation: fit.errorInflation,
    // the open level is measured through the same camera: (floor + amplitude)^(1/γ)
    ...(withOpenLevel ? { openLevel: Math.pow(0.51, 1 / gamma) } : {}),
  });
  return { fit, check };
}

describe('checkCameraResponse: a power-law departure fitted jointly with V_π', () => {
  it('finds γ = 1 within its uncertainty on footage that follows its curve, and does not warn', () => {
    const { check } = run(1, 1.2, 3);
    expect(check.checked).toBe(true);
    expect(Math.abs(check.gamma.value - 1)).toBeLessThan(3 * check.gamma.stdErr + 1e-9);
    expect(check.departs).toBe(false);
  });

  it('recovers a departure γ = 1.3 on a sweep to 0.9 V_π (within 3σ), flags it, and B at the fitted γ is closer to the truth than B at γ = 1', () => {
    const { fit, check } = run(1.3, 0.9, 4);
    expect(check.departs).toBe(true);
    expect(Math.abs(check.gamma.value - 1.3)).toBeLessThan(3 * check.gamma.stdErr);
    expect(Math.abs(check.kerrConstantAtGamma.value / B - 1)).toBeLessThan(Math.abs(fit.kerrConstant.value / B - 1));
    // the named uncertainty term covers the error of the γ = 1 figure
    expect(check.standardUncertainty.value).toBeGreaterThan(0.8 * Math.abs(fit.kerrConstant.value - B));
  });

  it('runs on a low sweep when an open level is known, and finds the departure', () => {
    const { check } = run(1.3, 0.5, 6, true);
    expect(check.checked).toBe(true);
    expect(check.departs).toBe(true);
    expect(Math.abs(check.gamma.value - 1.3)).toBeLessThan(3 * check.gamma.stdErr + 0.02);
  });

  it('is skipped, with its reason, when the sweep stays well below V_π and no open level is known; the term is then B refitted at the prior γ = 1 ± u', () => {
    const { check } = run(1.2, 0.5, 5);
    expect(check.checked).toBe(false);
    expect(check.reason).toMatch(/half-wave/);
    expect(check.gamma).toEqual({ value: 1, stdErr: PRIOR_GAMMA_STD_ERR });
    expect(check.standardUncertainty.value).toBeGreaterThan(0);
  });

  it('the prior term is the size of the error a departure of γ by u leaves in B (invented footage, γ = 1 + u, noise-free)', () => {
    const { fit, check } = run(1 + PRIOR_GAMMA_STD_ERR, 0.6, 7, false, 0);
    const error = Math.abs(fit.kerrConstant.value - B);
    expect(error).toBeGreaterThan(0);
    // a first-order sensitivity times u(γ): equal to the actual error within a third
    expect(check.standardUncertainty.value / error).toBeGreaterThan(0.67);
    expect(check.standardUncertainty.value / error).toBeLessThan(1.5);
  });
});

describe('posteriorResponseTerm: the check combined with the prior γ = 1 ± u₀', () => {
  // B moves by s per unit of γ; the check measured γ̂ = 1 + shift/s with σ, so σ²(B_γ) − σ²(B₁) = s²σ²
  const s = 1e-12;
  const term = (gammaHat: number, sigma: number) =>
    posteriorResponseTerm({ gamma: gammaHat, gammaErr: sigma, slope: s, shift: s * (gammaHat - 1) });

  it('a weak check (σ ≫ u₀) gives the prior term |s|·u₀, as a run without a check', () => {
    expect(term(1.01, 1) / (s * PRIOR_GAMMA_STD_ERR)).toBeCloseTo(1, 3);
  });

  it('a sharp check (σ ≪ u₀) gives the shift plus its scatter', () => {
    const t = term(1.01, 1e-4);
    expect(t / (s * Math.hypot(0.01, 1e-4))).toBeCloseTo(1, 3);
  });

  it('equal weights halve the shift and the variance (the textbook mean of two measurements)', () => {
    const u0 = PRIOR_GAMMA_STD_ERR;
    // λ = 1/2: γ_p − 1 = (γ̂ − 1)/2, u_p² = u0²/2
    expect(term(1 + 2 * u0, u0) / (s * Math.hypot(u0, u0 / Math.SQRT2))).toBeCloseTo(1, 9);
  });

  it('a check that contradicts the prior (beyond 3 combined σ) leaves it out: the term is the check alone', () => {
    // 0.3 from 1 against √(0.05² + 0.02²) = 0.054: a conflict
    expect(term(1.3, 0.05) / (s * Math.hypot(0.3, 0.05))).toBeCloseTo(1, 9);
    // 0.1 from 1 against √(0.05² + 0.02²): no conflict, the prior pulls the term down
    expect(term(1.1, 0.05)).toBeLessThan(s * Math.hypot(0.1, 0.05));
  });
});

describe('posteriorGamma: what is known of γ after the check (the floor fraction uses it)', () => {
  it('is the B term divided by |s| without a conflict, and the check alone with one', () => {
    const s = 2e-12;
    for (const [g, sigma] of [[1.01, 0.005], [1.0, 0.05], [0.99, 0.02]] as const) {
      const p = posteriorGamma({ gamma: g, gammaErr: sigma });
      expect(p.conflict).toBe(false);
      expect(p.rmsError * s).toBeCloseTo(posteriorResponseTerm({ gamma: g, gammaErr: sigma, slope: s, shift: 0 }), 25);
    }
    const c = posteriorGamma({ gamma: 1.3, gammaErr: 0.05 });
    expect(c.conflict).toBe(true);
    expect(c.rmsError).toBeCloseTo(Math.hypot(0.3, 0.05), 12);
  });

  it('a check that did not run leaves the prior u₀ for the floor fraction', () => {
    const few = checkCameraResponse({
      voltageV: new Float64Array(5), intensity: new Float64Array(5), used: new Uint8Array(5).fill(1),
      fit: { floor: 0.01, amplitude: 1, halfWaveVoltageV: 1000 }, polariserAngleDeg: 45, effectiveLengthM: 0.05, gapM: 0.005, kerrConstant: 2.4e-12, errorInflation: 1,
    });
    expect(few.checked).toBe(false);
    expect(few.gammaUncertainty).toBe(PRIOR_GAMMA_STD_ERR);
  });
});
