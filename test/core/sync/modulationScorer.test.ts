import { linearRegression, linearRegressionLine, rSquared } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { createModulationScorer } from '../../../src/core/sync/modulationScorer.js';

const transmission = (voltageV: number, vpiV: number): number => Math.sin((Math.PI / 2) * (voltageV / vpiV) ** 2) ** 2;

/** A small scene: 10 s log at 20 Hz with a ramp to 1.2·V_π and back; frames at 25 fps; offset 0.6 s. */
function scene(noise: (k: number) => number) {
  const vpiV = 10_000;
  const offsetS = 0.6;
  const drive = (t: number): number => (t < 5 ? (1.2 * vpiV * t) / 5 : (1.2 * vpiV * (10 - t)) / 5);
  const logTimeS = Float64Array.from({ length: 201 }, (_, i) => i * 0.05);
  const logVoltageV = Float64Array.from(logTimeS, drive);
  const frameTimesS = Float64Array.from({ length: 250 }, (_, k) => k / 25);
  const intensity = Float64Array.from(frameTimesS, (t, k) => {
    const logT = Math.min(10, Math.max(0, t - offsetS));
    return 0.05 + 0.6 * transmission(drive(logT), vpiV) + noise(k);
  });
  return { vpiV, offsetS, logTimeS, logVoltageV, frameTimesS, intensity };
}

describe('createModulationScorer', () => {
  it('scores R² = 1 for a noiseless trace at the true offset and V_π', () => {
    const s = scene(() => 0);
    const scorer = createModulationScorer(s.frameTimesS, s.intensity, s.logTimeS, s.logVoltageV, 20);
    expect(scorer.maxAbsVoltageV).toBe(12_000);
    expect(scorer.gather(s.offsetS)).toBeGreaterThan(200);
    expect(scorer.score(s.vpiV / scorer.maxAbsVoltageV)).toBeCloseTo(1, 12);
    expect(scorer.score((1.2 * s.vpiV) / scorer.maxAbsVoltageV)).toBeLessThan(0.99);
  });

  it('agrees with simple-statistics\' linear regression R² on a noisy trace (outside library)', () => {
    const s = scene((k) => 0.02 * Math.sin(k * 12.9898) * Math.cos(k * 78.233)); // deterministic wiggle
    const scorer = createModulationScorer(s.frameTimesS, s.intensity, s.logTimeS, s.logVoltageV, 20);
    const trialOffsetS = 0.75;
    const ratio = 0.9;
    const used = scorer.gather(trialOffsetS);
    const pairs: number[][] = [];
    for (let k = 0; k < s.frameTimesS.length; k++) {
      const logT = s.frameTimesS[k] - trialOffsetS;
      if (logT < 0 || logT > 10) continue;
      const i = Math.min(199, Math.floor(logT / 0.05));
      const v = s.logVoltageV[i] + ((s.logVoltageV[i + 1] - s.logVoltageV[i]) * (logT - s.logTimeS[i])) / 0.05;
      pairs.push([transmission(v, ratio * scorer.maxAbsVoltageV), s.intensity[k]]);
    }
    expect(used).toBe(pairs.length);
    const expected = rSquared(pairs, linearRegressionLine(linearRegression(pairs)));
    expect(scorer.score(ratio)).toBeCloseTo(expected, 10);
    // The tabulated sin² agrees with Math.sin to better than 1e-6 in R².
    const grid = scorer.scoreGrid(Float64Array.of(0.5, ratio, 2));
    expect(grid.index).toBe(1);
    expect(Math.abs(grid.score - expected)).toBeLessThan(1e-6);
  });

  it('scores 0 when the intensity falls as the model rises (b > 0 only)', () => {
    const s = scene(() => 0);
    const inverted = Float64Array.from(s.intensity, (x) => 1 - x);
    const scorer = createModulationScorer(s.frameTimesS, inverted, s.logTimeS, s.logVoltageV, 20);
    scorer.gather(s.offsetS);
    expect(scorer.score(s.vpiV / scorer.maxAbsVoltageV)).toBe(0);
  });

  it('counts the frames inside the log and refuses an overlap below the minimum', () => {
    const s = scene(() => 0);
    const scorer = createModulationScorer(s.frameTimesS, s.intensity, s.logTimeS, s.logVoltageV, 100);
    // Log covers video times [offset, offset + 10]; frames at k/25 s up to 9.96 s.
    expect(scorer.overlapFrames(0)).toBe(250);
    expect(scorer.overlapFrames(5)).toBe(125); // 5.00 … 9.96 s
    expect(scorer.gather(5)).toBe(125);
    expect(scorer.overlapFrames(8)).toBe(50);
    expect(scorer.gather(8)).toBe(0);
    expect(scorer.score(1)).toBe(0);
  });
});
