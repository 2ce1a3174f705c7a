import { describe, expect, it } from 'vitest';
import { nextGain, wantedGain } from '../../src/sim/exposure.js';

describe('auto-exposure with a first-order lag', () => {
  const auto = { targetMean: 0.2, lagS: 0.5, minGain: 0.1, maxGain: 10 };

  it('wants target/mean, clamped to its limits', () => {
    expect(wantedGain(auto, 0.1)).toBeCloseTo(2, 12);
    expect(wantedGain(auto, 0.001)).toBe(10);
    expect(wantedGain(auto, 100)).toBe(0.1);
  });

  it('covers 1 − 1/e ≈ 63.2 % of a step after one time constant (first-order lag, any control text)', () => {
    let gain = 1; // settled for mean 0.2
    const dtS = 0.01;
    for (let t = 0; t < 0.5 - 1e-9; t += dtS) gain = nextGain(auto, gain, 0.1, dtS); // the scene darkens: wanted gain 2
    expect((gain - 1) / (2 - 1)).toBeCloseTo(1 - Math.exp(-1), 6);
  });

  it('jumps at once when the lag is zero', () => {
    expect(nextGain({ ...auto, lagS: 0 }, 1, 0.05, 0.033)).toBeCloseTo(4, 12);
  });
});
