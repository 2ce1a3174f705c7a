/**
 * The running fit on synthetic live data made from the Kerr law and Malus's law for crossed
 * polarisers, I = I_floor + I_amp·sin²(π/2·(V/V_π)²) (src/core/physics/kerr.ts), with the log on
 * another clock: B and the offset must come back.
 */
import { describe, expect, it } from 'vitest';
import { liveFit } from '../../src/live/liveFit.js';
import { halfWaveVoltageV } from '../../src/core/physics/kerr.js';

function synthetic(offsetS: number, noise: number, endS: number) {
  const B = 2.4e-12, L = 0.05, d = 0.005;
  const vpi = halfWaveVoltageV(B, L, d);
  const drive = (t: number) => (t < 2 ? 0 : t < 8 ? (1.15 * vpi * (t - 2)) / 6 : t < 14 ? 1.15 * vpi * (1 - (t - 8) / 6) : 0);
  let seed = 3;
  const rand = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648 - 0.5;
  const frames: number[] = [];
  const intensity: number[] = [];
  for (let t = 0; t <= endS; t += 1 / 30) {
    frames.push(t);
    const s = Math.sin((Math.PI / 2) * (drive(t) / vpi) ** 2);
    intensity.push(0.002 + 0.5 * s * s + noise * rand());
  }
  const logT: number[] = [];
  const logV: number[] = [];
  for (let tl = 0; tl + offsetS <= endS; tl += 0.1) { logT.push(tl); logV.push(drive(tl + offsetS)); }
  return { B, L, d, frames: Float64Array.from(frames), intensity: Float64Array.from(intensity), logT: Float64Array.from(logT), logV: Float64Array.from(logV) };
}

describe('liveFit', () => {
  it('recovers B within 1 % and the clock offset within a frame from a sweep past V_π', () => {
    const s = synthetic(0.45, 0.004, 16);
    const r = liveFit({ frameTimesS: s.frames, intensity: s.intensity, logTimeS: s.logT, logVoltageV: s.logV, gapM: s.d, effectiveLengthM: s.L });
    expect(r.status).toBe('ok');
    if (r.status !== 'ok') return;
    expect(Math.abs(r.kerrConstant.value / s.B - 1)).toBeLessThan(0.01);
    expect(Math.abs(r.offsetS - 0.45)).toBeLessThan(1 / 30);
    // the uncertainty covers the truth (3 σ)
    expect(Math.abs(r.kerrConstant.value - s.B)).toBeLessThan(3 * r.kerrConstant.stdErr! + 1e-18);
    expect(r.plot.voltageV.length).toBeLessThanOrEqual(400);
    expect(r.curve.voltageV.length).toBe(61);
  });

  it('waits, with a reason, while the log is too short or the drive has not moved', () => {
    const s = synthetic(0.45, 0.004, 16);
    const few = liveFit({ frameTimesS: s.frames, intensity: s.intensity, logTimeS: s.logT.subarray(0, 3), logVoltageV: s.logV.subarray(0, 3), gapM: s.d, effectiveLengthM: s.L });
    expect(few).toEqual({ status: 'waiting', reason: expect.stringMatching(/fewer than 5 rows/) });
    const flat = liveFit({ frameTimesS: s.frames.subarray(0, 50), intensity: s.intensity.subarray(0, 50), logTimeS: s.logT.subarray(0, 15), logVoltageV: s.logV.subarray(0, 15), gapM: s.d, effectiveLengthM: s.L });
    expect(flat.status).toBe('waiting');
    if (flat.status === 'waiting') expect(flat.reason).toMatch(/sync/);
  });

  it('leaves out frames marked unusable (an open-level capture) instead of fitting them', () => {
    const s = synthetic(0.45, 0.004, 16);
    const bright = Float64Array.from(s.intensity);
    const usable = new Uint8Array(bright.length).fill(1);
    for (let k = 300; k < 330; k++) { bright[k] = 5; usable[k] = 0; }
    const r = liveFit({ frameTimesS: s.frames, intensity: bright, usable, logTimeS: s.logT, logVoltageV: s.logV, gapM: s.d, effectiveLengthM: s.L });
    expect(r.status).toBe('ok');
    if (r.status === 'ok') expect(Math.abs(r.kerrConstant.value / s.B - 1)).toBeLessThan(0.01);
  });
});
