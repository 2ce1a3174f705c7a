import { describe, expect, it } from 'vitest';
import { hysteresis, type BranchFitter } from '../../../src/core/scatter/hysteresis.js';
import { fitKerrCurve } from '../../../src/core/fit/fitKerrCurve.js';
import { crossedTransmission } from '../../../src/core/physics/kerr.js';
import { normalSource } from './syntheticRun.js';

const gapM = 0.005, lengthM = 0.05, amp = 0.5, floor = 0.005;
/** The full Kerr fit with the amplitude held, V_π free (what the pipeline passes). */
const fitter: BranchFitter = (voltageV, intensity) =>
  fitKerrCurve({ voltageV, intensity, effectiveLengthM: lengthM, gapM, polariserAngleDeg: 45, openLevel: amp, halfWaveGuessesV: [10000] });

/** Hold, ramp up to 1.1·V_π, ramp down, hold; V_π on the way down may differ. */
function sweep(vpiUp: number, vpiDown: number, seed: number) {
  const fps = 30, n = 20 * fps;
  const normal = normalSource(seed);
  const t = Float64Array.from({ length: n }, (_, f) => f / fps);
  const v = new Float64Array(n), i = new Float64Array(n);
  for (let f = 0; f < n; f++) {
    const s = t[f]!;
    let volts = 0, vpi = vpiUp;
    if (s >= 1.5 && s < 10) volts = (11000 * (s - 1.5)) / 8.5;
    else if (s >= 10 && s < 18.5) { volts = 11000 * (1 - (s - 10) / 8.5); vpi = vpiDown; }
    v[f] = volts;
    i[f] = floor + amp * crossedTransmission(Math.PI / 4, Math.PI * (volts / vpi) ** 2) + 0.003 * normal();
  }
  return { t, v, i, include: new Uint8Array(n).fill(1) };
}

describe('hysteresis', () => {
  it('flags a planted 4 % up/down difference of V_π (B differs by about 8 %)', () => {
    const s = sweep(10000, 10400, 71);
    const h = hysteresis({ voltageV: s.v, intensity: s.i, include: s.include, timesS: s.t, fitBranch: fitter });
    expect(h.result).not.toBeNull();
    const r = h.result!;
    // B = d²/(2·L·V_π²): hand calculation from the planted V_π values
    const bUp = gapM ** 2 / (2 * lengthM * 10000 ** 2), bDown = gapM ** 2 / (2 * lengthM * 10400 ** 2);
    expect(Math.abs(r.up.value - bUp) / bUp).toBeLessThan(0.01);
    expect(Math.abs(r.down.value - bDown) / bDown).toBeLessThan(0.01);
    expect(r.difference.value).toBeCloseTo(r.up.value - r.down.value, 20);
    expect(r.difference.stdErr).toBeCloseTo(Math.hypot(r.up.stdErr!, r.down.stdErr!), 20);
    expect(r.zScore).toBeGreaterThan(3);
    expect(r.flagged).toBe(true);
    expect(h.framesUp).toBeGreaterThan(200);
    expect(h.framesDown).toBeGreaterThan(200);
    expect(h.framesHeld).toBeGreaterThan(50);
  });

  it('does not flag a run without up/down difference', () => {
    const s = sweep(10000, 10000, 72);
    const h = hysteresis({ voltageV: s.v, intensity: s.i, include: s.include, timesS: s.t, fitBranch: fitter });
    expect(h.result!.flagged).toBe(false);
    expect(Math.abs(h.result!.zScore)).toBeLessThan(3);
  });

  it('gives a note instead of figures when the run has no falling part', () => {
    const s = sweep(10000, 10000, 73);
    const include = Uint8Array.from(s.t, (t) => (t < 10 ? 1 : 0));
    const h = hysteresis({ voltageV: s.v, intensity: s.i, include, timesS: s.t, fitBranch: fitter });
    expect(h.result).toBeNull();
    expect(h.note).toMatch(/falling/);
  });
});
