/**
 * Reading the log at frame times. A slow sine logged at 2 Hz: the chord between samples reads |V|
 * low on every arc (issue 12 saw B +5.7 % from it), a monotone cubic (Fritsch & Carlson 1980) far
 * less; a dropout is left out and flagged, never bridged; a step stays a straight line (no ringing).
 */
import { describe, expect, it } from 'vitest';
import { interpolateLog, logGaps } from '../../../src/core/signal/interpolateLog.js';
import { interpolateAt } from '../../../src/core/signal/interpolate.js';

describe('interpolateLog', () => {
  const f = (t: number) => 10000 * Math.sin((Math.PI * t) / 8) ** 2; // one slow arc over 8 s
  const tLog = Float64Array.from({ length: 17 }, (_x, k) => k * 0.5); // 2 Hz
  const vLog = Float64Array.from(tLog, f);
  const q = Float64Array.from({ length: 241 }, (_x, k) => k / 30);

  it('follows a slow sine between 2 Hz samples at least 2.5× better than straight lines (max error; PCHIP flattens the very top, which bounds its gain)', () => {
    const cubic = interpolateLog(tLog, vLog, q).valueV;
    const line = interpolateAt(tLog, vLog, q);
    let eC = 0, eL = 0;
    for (let i = 0; i < q.length; i++) { eC = Math.max(eC, Math.abs(cubic[i]! - f(q[i]!))); eL = Math.max(eL, Math.abs(line[i]! - f(q[i]!))); }
    expect(eC * 2.5).toBeLessThan(eL);
  });

  it('leaves frames inside a dropout (> 4 median intervals) out and flags them; outside the log is NaN but not a gap', () => {
    const keep = Array.from(tLog.keys()).filter((k) => k < 6 || k > 11); // 3.0 s … 5.5 s missing: the peak
    const t = Float64Array.from(keep, (k) => tLog[k]!);
    const v = Float64Array.from(keep, (k) => vLog[k]!);
    const r = interpolateLog(t, v, [2.0, 4.0, 9.0]);
    expect(r.gap[1]).toBe(1);
    expect(Number.isNaN(r.valueV[1]!)).toBe(true);
    expect(r.gap[0]).toBe(0);
    expect(r.valueV[0]).toBeCloseTo(f(2), -1);
    expect(r.gap[2]).toBe(0);
    expect(Number.isNaN(r.valueV[2]!)).toBe(true);
  });

  it('uses the straight line across a step, so the value never leaves the two levels', () => {
    const t = Float64Array.from([0, 1, 2, 3, 4, 5]);
    const v = Float64Array.from([0, 0, 0, 5000, 5000, 5000]);
    const r = interpolateLog(t, v, [2.5, 2.25, 1.5, 3.5]);
    expect(r.valueV[0]).toBeCloseTo(2500, 9);
    expect(r.valueV[1]).toBeCloseTo(1250, 9);
    expect(r.linear[0]).toBe(1);
    expect(r.valueV[2]).toBeCloseTo(0, 9);
    expect(r.valueV[3]).toBeCloseTo(5000, 9);
  });

  it('counts the steps between the first and the last query, and neither a dropout nor a smooth arc as one', () => {
    // a staircase logged at 4 Hz: 0 → 1 kV → 2 kV → 3 kV, each level held 1 s
    const t = Float64Array.from({ length: 17 }, (_x, k) => k * 0.25);
    const v = Float64Array.from(t, (x) => 1000 * Math.min(3, Math.floor(x)));
    expect(interpolateLog(t, v, [0.1, 3.9]).stepCount).toBe(3);
    expect(interpolateLog(t, v, [0.1, 1.6]).stepCount).toBe(1); // only the step at 1 s lies between
    expect(interpolateLog(tLog, vLog, q).stepCount).toBe(0);
    const keep = Array.from(tLog.keys()).filter((k) => k < 6 || k > 11);
    expect(interpolateLog(Float64Array.from(keep, (k) => tLog[k]!), Float64Array.from(keep, (k) => vLog[k]!), q).stepCount).toBe(0);
  });

  it('calls an interval a gap when it is longer than 4 median intervals (the one rule the sync search shares)', () => {
    expect(Array.from(logGaps(Float64Array.of(0, 1, 2, 10, 11)))).toEqual([0, 0, 1, 0]); // 8 s > 4 × 1 s
    expect(Array.from(logGaps(Float64Array.of(0, 1, 2, 6, 7)))).toEqual([0, 0, 0, 0]); // 4 s is not more than 4 × 1 s
  });
});
