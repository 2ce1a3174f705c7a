/**
 * The local surround under the beam, on images drawn here: the two-ring extrapolation is exact for
 * a background b(r²) = b₀ + b₁·r² (so the expected level is that profile averaged over the beam,
 * computed by brute force), a linear gradient cancels, and rectMoments equals the closed form
 * Σ(x − c)² = n·(m − c)² + n(n² − 1)/12 for n pixel centres with mean m (sum of squares).
 */
import { describe, expect, it } from 'vitest';
import { rectMoments, surroundWeights, type SurroundGeometry } from '../../../src/core/regions/localSurround.js';
import type { Rect } from '../../../src/media/types.js';

const W = 200;
const H = 160;

/** Brute-force mean of an image function over a rectangle, at pixel centres. */
function rectMean(r: Rect, f: (x: number, y: number) => number): number {
  let s = 0;
  for (let y = r.y; y < r.y + r.h; y++) for (let x = r.x; x < r.x + r.w; x++) s += f(x + 0.5, y + 0.5);
  return s / (r.w * r.h);
}

function grow(r: Rect, by: number): Rect {
  const x0 = Math.max(0, r.x - by), y0 = Math.max(0, r.y - by);
  const x1 = Math.min(W, r.x + r.w + by), y1 = Math.min(H, r.y + r.h + by);
  return { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
}

function geometry(beam: Rect, gap = 4, ring = 8): SurroundGeometry {
  const a0 = grow(beam, gap);
  const a1 = grow(a0, ring);
  return { beam, a0, a1, b1: grow(a1, ring) };
}

function estimate(g: SurroundGeometry, f: (x: number, y: number) => number): number {
  const c = surroundWeights(g).coefficients;
  const means = [g.beam, g.a0, g.a1, g.b1].map((r) => rectMean(r, f));
  return c.reduce((s, k, i) => s + k * means[i]!, 0);
}

describe('rectMoments', () => {
  it('matches the closed-form sum of squared distances', () => {
    const r = { x: 13, y: 40, w: 21, h: 9 };
    const cx = 30.25, cy = 41.5;
    const sumSq = (x0: number, n: number, c: number) => {
      const m = x0 + n / 2; // mean of the pixel centres x0 + 0.5 … x0 + n − 0.5
      return n * (m - c) ** 2 + (n * (n * n - 1)) / 12;
    };
    const got = rectMoments(r, cx, cy);
    expect(got.count).toBe(21 * 9);
    expect(got.sumR2).toBeCloseTo(sumSq(r.x, r.w, cx) * r.h + sumSq(r.y, r.h, cy) * r.w, 8);
  });
});

describe('surroundWeights', () => {
  const beam = { x: 80, y: 60, w: 30, h: 24 };
  const cx = beam.x + beam.w / 2, cy = beam.y + beam.h / 2;

  it('recovers a quadratic halo under the beam exactly (b₀ + b₁·r², averaged over the beam)', () => {
    const g = geometry(beam);
    const halo = (x: number, y: number) => 0.05 - 1e-5 * ((x - cx) ** 2 + (y - cy) ** 2);
    const w = surroundWeights(g);
    expect(w.extrapolated).toBe(true);
    expect(w.coefficients[0]).toBe(0);
    // weights of a level estimate sum to one (a constant background comes back unchanged)
    expect(w.coefficients.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
    expect(estimate(g, halo)).toBeCloseTo(rectMean(beam, halo), 12);
    // a single ring would read the halo too dark: the extrapolation matters
    const ringA = (rectMean(g.a1, halo) * g.a1.w * g.a1.h - rectMean(g.a0, halo) * g.a0.w * g.a0.h) / (g.a1.w * g.a1.h - g.a0.w * g.a0.h);
    expect(rectMean(beam, halo) - ringA).toBeGreaterThan(1e-3);
  });

  it('cancels a linear brightness gradient across the frame', () => {
    const g = geometry(beam);
    const tilt = (x: number, y: number) => 0.1 + 3e-4 * (x - cx) - 2e-4 * (y - cy);
    expect(estimate(g, tilt)).toBeCloseTo(0.1, 12);
  });

  it('at the frame edge with no room for ring B, falls back to the mean of ring A', () => {
    const edgeBeam = { x: 4, y: 60, w: 30, h: 24 };
    const a0 = grow(edgeBeam, 4);
    const a1 = { ...grow(a0, 8) };
    const g: SurroundGeometry = { beam: edgeBeam, a0, a1, b1: a1 }; // b1 = a1: ring B is empty
    const w = surroundWeights(g);
    expect(w.extrapolated).toBe(false);
    expect(w.ringBCount).toBe(0);
    const f = (x: number, y: number) => 0.02 + 1e-4 * x * y;
    const ringA = (rectMean(a1, f) * a1.w * a1.h - rectMean(a0, f) * a0.w * a0.h) / (a1.w * a1.h - a0.w * a0.h);
    expect(estimate(g, f)).toBeCloseTo(ringA, 12);
    // and no ring at all: zero weights, zero ring count
    expect(surroundWeights({ beam: edgeBeam, a0, a1: a0, b1: a0 })).toMatchObject({ ringACount: 0, coefficients: [0, 0, 0, 0] });
  });
});
