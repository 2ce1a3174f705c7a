import { describe, expect, it } from 'vitest';
import { spikeFreeTrend } from '../../../src/core/signal/spikeFreeTrend.js';
import { robustLocalQuadratic } from '../../../src/core/signal/robustLocalQuadratic.js';

// Shapes worked by hand; the trend must never lie below a noise-free series at a step, a smooth
// peak or a sharp turn (else the series would look like a spike there), and must not follow a spike.
const n = 61;
const times = Float64Array.from({ length: n }, (_, i) => i / 30);
const all = new Uint8Array(n).fill(1);
const h = 8;

function neverBelow(x: Float64Array): void {
  const m = spikeFreeTrend(x, all, times, h);
  for (let i = 0; i < n; i++) expect(m[i]!).toBeGreaterThanOrEqual(x[i]! - 1e-12);
}

describe('spikeFreeTrend', () => {
  it('does not lie below a step (the running median keeps it)', () => {
    neverBelow(Float64Array.from({ length: n }, (_, i) => (i < 30 ? 0.1 : 0.5)));
  });

  it('does not lie below a smooth peak (the local quadratic keeps it)', () => {
    neverBelow(Float64Array.from(times, (t) => 1 - 2 * (t - 1) ** 2));
  });

  it('does not lie below the sharp turn of a triangular sweep (the side lines keep it)', () => {
    // rises at 0.5/s, falls at 0.5/s: a Λ with its corner at t = 1 s
    neverBelow(Float64Array.from(times, (t) => 1 - 0.5 * Math.abs(t - 1)));
    // the quadratic alone rounds the corner off (so the side lines are needed)
    const x = Float64Array.from(times, (t) => 1 - 0.5 * Math.abs(t - 1));
    expect(robustLocalQuadratic(x, all, times, h)[30]!).toBeLessThan(x[30]! - 1e-3);
  });

  it('stays below a four-frame spike on a noisy hold by more than half its height', () => {
    const x = Float64Array.from({ length: n }, (_, i) => 0.2 + 0.002 * Math.sin(i * 12.9898));
    for (let i = 28; i < 32; i++) x[i] = x[i]! + 0.3;
    const m = spikeFreeTrend(x, all, times, h);
    for (let i = 28; i < 32; i++) expect(m[i]! - 0.2).toBeLessThan(0.15);
  });

  it('rejects mismatched lengths', () => {
    expect(() => spikeFreeTrend(new Float64Array(3), new Uint8Array(3), new Float64Array(2), 1)).toThrow(/one entry per frame/);
  });
});
