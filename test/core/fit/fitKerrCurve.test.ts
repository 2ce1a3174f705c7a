/**
 * The central Kerr-curve fit on synthetic sweeps made here (seeded noise, invented cell numbers):
 * the data come from an explicit Jones product written in this file, not from the code's model;
 * σ coverage, effective-variance weighting (Orear 1982) and the AR(1) error inflation (Bence 1995)
 * are checked against their formulas. Synthetic truth: self-consistency, with the optics independent.
 */
import { describe, expect, it } from 'vitest';
import { fitKerrCurve, type KerrCurveInput } from '../../../src/core/fit/fitKerrCurve.js';
import { seededNormal, seededRandom } from '../../helpers/random.js';

/**
 * Transmission of polariser (angle α to the field) → retarder (slow/fast axes along and across the
 * field, retardance δ) → analyser (angle β), computed as an explicit Jones product (any optics
 * text, e.g. Hecht, Optics, ch. 8): E = (cos α, sin α) after the polariser, the retarder delays
 * the y component by δ, the analyser projects on (cos β, sin β); T = |a|². Independent of the
 * closed form the code uses.
 */
function jonesTransmission(alphaRad: number, betaRad: number, deltaRad: number): number {
  const re = Math.cos(betaRad) * Math.cos(alphaRad) + Math.sin(betaRad) * Math.sin(alphaRad) * Math.cos(deltaRad);
  const im = -Math.sin(betaRad) * Math.sin(alphaRad) * Math.sin(deltaRad);
  return re * re + im * im;
}

const DEG = Math.PI / 180;
// A cell like test-media/cfr-ramp (invented numbers): B = 2.4e-12 m/V², L = 50 mm, d = 5 mm.
const B_TRUE = 2.4e-12;
const L_M = 0.05;
const D_M = 0.005;
const VPI_TRUE = D_M / Math.sqrt(2 * B_TRUE * L_M); // Vπ = d/√(2·B·L) ≈ 10206 V

/** δ = 2π·B·L·V²/d² (Kerr law, Δn = λ·B·E²). */
const retardance = (v: number): number => (2 * Math.PI * B_TRUE * L_M * v * v) / (D_M * D_M);

/** A triangle sweep 0 → peak → 0 over n frames. */
function sweep(n: number, peakV: number): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => peakV * (1 - Math.abs((2 * i) / (n - 1) - 1)));
}

function expectWithin3Sigma(q: { value: number; stdErr?: number }, truth: number): void {
  expect(q.stdErr).toBeGreaterThan(0);
  expect(Math.abs(q.value - truth), `${q.value} ± ${q.stdErr} vs ${truth}`).toBeLessThanOrEqual(3 * q.stdErr!);
}

describe('fitKerrCurve start loop (several V_π starts keep the fit on the right branch)', () => {
  // A sweep to 1.8·V_π: T = sin²(π/2·(V/V_π)²) rises, peaks at V_π, falls and rises again, so a
  // single start can settle on a wrong branch (DESIGN.md, "Identifiability"); the loop must keep
  // the start of lowest residual. Data from the Jones product above (crossed at 45°), seeded noise.
  it('recovers V_π within 3σ although some starts settle elsewhere, and reports every start', () => {
    const voltageV = sweep(400, 1.8 * VPI_TRUE);
    const noise = seededNormal(21);
    const intensity = Float64Array.from(voltageV, (v) => 0.02 + 0.6 * jonesTransmission(45 * DEG, 135 * DEG, retardance(v)) + 0.004 * noise());
    const fit = fitKerrCurve({ voltageV, intensity, effectiveLengthM: L_M, gapM: D_M, polariserAngleDeg: 45 });
    expectWithin3Sigma(fit.halfWaveVoltage, VPI_TRUE);
    expect(fit.startResults.length).toBe(fit.starts);
    const bestRss = Math.min(...fit.startResults.map((s) => s.rss));
    // Some starts end on another branch with a clearly larger residual: the choice mattered.
    expect(fit.startResults.some((s) => s.rss > 2 * bestRss && Math.abs(s.halfWaveV / VPI_TRUE - 1) > 0.05)).toBe(true);
  });
});

describe('fitKerrCurve', () => {
  it('the Jones product agrees with the closed form T = cos²(α−β) − sin2α·sin2β·sin²(δ/2)', () => {
    const rnd = seededRandom(3);
    for (let k = 0; k < 50; k++) {
      const a = rnd() * Math.PI, b = rnd() * Math.PI, d = rnd() * 3 * Math.PI;
      const closed = Math.cos(a - b) ** 2 - Math.sin(2 * a) * Math.sin(2 * b) * Math.sin(d / 2) ** 2;
      expect(jonesTransmission(a, b, d)).toBeCloseTo(closed, 12);
    }
  });

  it('recovers B, V_π, floor and amplitude at a polariser angle of 30° (crossed analyser at 120°), data from the Jones product', () => {
    const noise = seededNormal(11);
    const alpha = 30 * DEG;
    const beta = alpha + 90 * DEG;
    const i0 = 0.5; // light after the first polariser
    const floor = 0.01;
    const v = sweep(300, 1.15 * VPI_TRUE);
    const intensity = v.map((x) => floor + i0 * jonesTransmission(alpha, beta, retardance(x)) + 0.002 * noise());
    const fit = fitKerrCurve({ voltageV: v, intensity, effectiveLengthM: L_M, gapM: D_M, polariserAngleDeg: 30 });
    expect(fit.converged).toBe(true);
    expect(fit.identifiable).toBe(true);
    expectWithin3Sigma(fit.kerrConstant, B_TRUE);
    expectWithin3Sigma(fit.halfWaveVoltage, VPI_TRUE);
    expectWithin3Sigma(fit.floorLevel, floor);
    expectWithin3Sigma(fit.amplitude, i0); // the angle factor sin²(2·30°) = 0.75 is the model's, not the amplitude's
    expect(fit.predict(VPI_TRUE)).toBeCloseTo(floor + 0.75 * i0, 2);

    // Told 45° instead, the fit returns the same V_π and an amplitude smaller by sin²(60°) = 0.75.
    const at45 = fitKerrCurve({ voltageV: v, intensity, effectiveLengthM: L_M, gapM: D_M, polariserAngleDeg: 45 });
    expect(at45.halfWaveVoltage.value / fit.halfWaveVoltage.value).toBeCloseTo(1, 6);
    expect(at45.amplitude.value / fit.amplitude.value).toBeCloseTo(0.75, 6);
  });

  it('refuses a polariser along the field (no modulation) in one KerrError', () => {
    const v = sweep(50, 1.2 * VPI_TRUE);
    expect(() => fitKerrCurve({ voltageV: v, intensity: v.map(() => 0.1), effectiveLengthM: L_M, gapM: D_M, polariserAngleDeg: 0 }))
      .toThrow(expect.objectContaining({ code: 'BAD_ARGUMENT', message: expect.stringMatching(/0° to the field gives no modulation/) }));
  });

  it('a low sweep is not identifiable without an open level; with the true open level B comes back within 3σ', () => {
    const noise = seededNormal(5);
    const v = sweep(300, 0.45 * VPI_TRUE);
    const i0 = 0.4;
    const intensity = v.map((x) => 0.004 + i0 * jonesTransmission(45 * DEG, 135 * DEG, retardance(x)) + 0.002 * noise());
    const base: KerrCurveInput = { voltageV: v, intensity, effectiveLengthM: L_M, gapM: D_M, polariserAngleDeg: 45 };
    expect(fitKerrCurve(base).identifiable).toBe(false);
    const withOpen = fitKerrCurve({ ...base, openLevel: i0 });
    expect(withOpen.identifiable).toBe(true);
    expect(withOpen.amplitude.value).toBe(i0);
    expectWithin3Sigma(withOpen.kerrConstant, B_TRUE);
  });

  describe('voltage-uncertainty weighting (effective variance, Orear, Am. J. Phys. 50, 912 (1982))', () => {
    /**
     * A sweep whose logged voltage is off by N(0, σ_V) at every point, with σ_V = 5 V except every
     * fourth frame, where the log jumps (σ_V = 400 V, as at a step faster than the logger).
     */
    function noisyVoltages(seed: number) {
      const noiseI = seededNormal(seed);
      const noiseV = seededNormal(seed + 1000);
      const vTrue = sweep(240, 1.1 * VPI_TRUE);
      const sigmaV = vTrue.map((_, i) => (i % 4 === 0 ? 400 : 5));
      const logged = vTrue.map((x, i) => x + sigmaV[i]! * noiseV());
      const intensity = vTrue.map((x) => 0.005 + 0.3 * jonesTransmission(45 * DEG, 135 * DEG, retardance(x)) + 0.001 * noiseI());
      return { logged, intensity, sigmaV, sigmaI: 0.001 };
    }

    it('standardised residuals are r/√(s0² + (dI/dV·σ_V)²), with dI/dV from the model written out here', () => {
      const { logged, intensity, sigmaV } = noisyVoltages(21);
      // robust: false, so that the slope is taken at the final parameters (with Huber rounds the code
      // takes it at the plain fit that starts them)
      const fit = fitKerrCurve({ voltageV: logged, intensity, voltageSigmaV: sigmaV, effectiveLengthM: L_M, gapM: D_M, polariserAngleDeg: 45, robust: false });
      const amp = fit.amplitude.value;
      const vpi = fit.halfWaveVoltage.value;
      const s0 = fit.intensityNoise;
      let checked = 0;
      for (let i = 0; i < logged.length; i++) {
        const v = logged[i]!;
        // I = floor + amp·sin²(u), u = (π/2)(V/Vπ)²: dI/dV = amp·sin(2u)·π·V/Vπ²
        const u = (Math.PI / 2) * (v / vpi) ** 2;
        const slope = amp * Math.sin(2 * u) * Math.PI * v / (vpi * vpi);
        const r = intensity[i]! - fit.predict(v);
        const expected = r / Math.sqrt(s0 * s0 + (slope * sigmaV[i]!) ** 2);
        // the code differentiates numerically (central difference, step 1e-3·V): agreement to 1e-4
        expect(Math.abs(fit.standardizedResiduals[i]! - expected)).toBeLessThanOrEqual(1e-4 * Math.abs(expected) + 1e-9);
        checked++;
      }
      expect(checked).toBe(240);
      // frames with a 400 V voltage error on the steep part count as far less surprising
      const steep = Array.from(logged.keys()).filter((i) => i % 4 === 0 && logged[i]! > 0.4 * VPI_TRUE && logged[i]! < 0.9 * VPI_TRUE);
      expect(steep.length).toBeGreaterThan(10);
      for (const i of steep) expect(Math.abs(fit.standardizedResiduals[i]!)).toBeLessThan(Math.abs(intensity[i]! - fit.predict(logged[i]!)) / s0);
    });

    it('robust: false keeps the σ_V weights: the weighted normal equation of the free floor, Σ r_i/var_i = 0, holds (and the plain sum does not)', () => {
      const { logged, intensity, sigmaV } = noisyVoltages(33);
      const fit = fitKerrCurve({ voltageV: logged, intensity, voltageSigmaV: sigmaV, effectiveLengthM: L_M, gapM: D_M, polariserAngleDeg: 45, robust: false });
      // ∂/∂floor of Σ r_i²/var_i is −2·Σ r_i/var_i = 0 at the minimum (∂I/∂floor = 1). The code's
      // var_i is recovered from its standardised residuals: var_i = (r_i/z_i)².
      let sumW = 0, normW = 0, sumPlain = 0, sq = 0;
      for (let i = 0; i < logged.length; i++) {
        const r = intensity[i]! - fit.predict(logged[i]!);
        const z = fit.standardizedResiduals[i]!;
        const variance = (r / z) ** 2;
        sumW += r / variance;
        normW += 1 / variance;
        sumPlain += r;
        sq += r * r;
      }
      const weightedRatio = sumW / Math.sqrt(normW); // in units of one standardised residual
      const plainRatio = sumPlain / Math.sqrt(sq);
      expect(Math.abs(weightedRatio)).toBeLessThan(0.01);
      expect(Math.abs(plainRatio)).toBeGreaterThan(0.05);
    });

    it('weighting by σ_V makes B more accurate than ignoring it (20 seeded sweeps, same data both ways)', () => {
      let sqWeighted = 0, sqIgnored = 0, covered = 0;
      const runs = 20;
      for (let s = 0; s < runs; s++) {
        const { logged, intensity, sigmaV } = noisyVoltages(100 + s);
        const base: KerrCurveInput = { voltageV: logged, intensity, effectiveLengthM: L_M, gapM: D_M, polariserAngleDeg: 45 };
        const weighted = fitKerrCurve({ ...base, voltageSigmaV: sigmaV });
        const ignored = fitKerrCurve(base);
        sqWeighted += ((weighted.kerrConstant.value - B_TRUE) / B_TRUE) ** 2;
        sqIgnored += ((ignored.kerrConstant.value - B_TRUE) / B_TRUE) ** 2;
        if (Math.abs(weighted.kerrConstant.value - B_TRUE) <= 2 * weighted.kerrConstant.stdErr!) covered++;
      }
      const rmsWeighted = Math.sqrt(sqWeighted / runs);
      const rmsIgnored = Math.sqrt(sqIgnored / runs);
      expect(rmsWeighted).toBeLessThan(0.8 * rmsIgnored);
      // 2σ covers 95 % of normal errors; 20 sweeps: at least 16 (binomial, p(<16) ≈ 1.6 %)
      expect(covered).toBeGreaterThanOrEqual(16);
    });
  });

  it('widens the standard errors by about √((1+ρ)/(1−ρ)) for autocorrelated residuals (AR(1) noise, ρ = 0.7; Bence 1995; HAC estimate, Newey & West 1987)', () => {
    const white = seededNormal(8);
    const v = sweep(400, 1.15 * VPI_TRUE);
    let e = 0;
    const phi = 0.7;
    const intensity = v.map((x) => {
      e = phi * e + Math.sqrt(1 - phi * phi) * white();
      return 0.01 + 0.5 * jonesTransmission(45 * DEG, 135 * DEG, retardance(x)) + 0.002 * e;
    });
    const fit = fitKerrCurve({ voltageV: v, intensity, effectiveLengthM: L_M, gapM: D_M, polariserAngleDeg: 45 });
    const rho = fit.residualAutocorrelation;
    // lag-1 estimate of an AR(1) with 400 points: standard error ≈ √((1−φ²)/n) ≈ 0.036
    expect(Math.abs(rho - phi)).toBeLessThan(0.15);
    // The fit's per-parameter HAC estimate tends to the AR(1) factor; a Bartlett-kernel estimate
    // from 400 frames runs low by up to about a fifth (Andrews 1991, finite-sample bias), so the
    // check is a band around the closed form, and the estimate must be well above 1.
    const ar1 = Math.sqrt((1 + rho) / (1 - rho));
    expect(fit.errorInflation).toBeGreaterThan(0.75 * ar1);
    expect(fit.errorInflation).toBeLessThan(1.25 * ar1);
    expectWithin3Sigma(fit.kerrConstant, B_TRUE);
  });
});
