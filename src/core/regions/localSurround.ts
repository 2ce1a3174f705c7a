/**
 * The beam's local surround: the background light that lies under the beam, estimated from two
 * concentric rectangular rings just outside it. A wide forward-scatter halo is brighter near the
 * beam than further out; a single ring would read it too dark and leave the difference in the
 * floor. Modelling the surround as b(r²) = b₀ + b₁·r² (the first terms of any smooth, centred
 * profile) and reading it in two rings with mean squared radii r²_A < r²_B gives under the beam
 *   b_beam = b_A + (b_A − b_B)·(r²_A − r²_beam)/(r²_B − r²_A).
 * A linear brightness gradient across the frame cancels in each ring by symmetry. Light of the
 * beam's own tail that reaches the rings scales the floor and the amplitude alike, so the floor
 * fraction is unchanged by it.
 * Pure. Rectangles are in pixels, inner ⊂ outer; r² is measured from the beam rectangle's centre.
 */
import type { Rect } from './rect.js';

/** Pixel count and sum of squared distances (from (cx, cy), pixel centres) over a rectangle. */
export function rectMoments(r: Rect, cx: number, cy: number): { count: number; sumR2: number } {
  // Σ over x of (x + 0.5 − cx)² for x in [x0, x0+w): closed form of a sum of squares.
  const sumSq = (x0: number, n: number, c: number): number => {
    let s = 0;
    for (let i = 0; i < n; i++) {
      const d = x0 + i + 0.5 - c;
      s += d * d;
    }
    return s;
  };
  const sx = sumSq(r.x, r.w, cx);
  const sy = sumSq(r.y, r.h, cy);
  return { count: r.w * r.h, sumR2: sx * r.h + sy * r.w };
}

export interface SurroundGeometry {
  beam: Rect;
  /** Rectangles bounding the rings: ring A = a1 \ a0, ring B = b1 \ a1. */
  a0: Rect;
  a1: Rect;
  b1: Rect;
}

export interface SurroundWeights {
  /** b_beam = Σ_k coef_k · mean(rect_k) for the rects [beam, a0, a1, b1]; beam coefficient is 0. */
  coefficients: [number, number, number, number];
  ringACount: number;
  ringBCount: number;
  /** False when ring B is empty (frame edge) and the surround is ring A alone. */
  extrapolated: boolean;
}

/**
 * Linear weights that turn the mean values of the four rectangles into the surround level under
 * the beam, so the per-frame work is four multiplications.
 */
export function surroundWeights(g: SurroundGeometry): SurroundWeights {
  const cx = g.beam.x + g.beam.w / 2;
  const cy = g.beam.y + g.beam.h / 2;
  const mb = rectMoments(g.beam, cx, cy);
  const m0 = rectMoments(g.a0, cx, cy);
  const m1 = rectMoments(g.a1, cx, cy);
  const m2 = rectMoments(g.b1, cx, cy);
  const nA = m1.count - m0.count;
  const nB = m2.count - m1.count;
  if (nA <= 0) return { coefficients: [0, 0, 0, 0], ringACount: 0, ringBCount: 0, extrapolated: false };
  // ring means as combinations of rect means: ringA = (n1·mean1 − n0·mean0)/nA
  const ringA: [number, number, number, number] = [0, -m0.count / nA, m1.count / nA, 0];
  if (nB <= 0) return { coefficients: ringA, ringACount: nA, ringBCount: 0, extrapolated: false };
  const ringB: [number, number, number, number] = [0, 0, -m1.count / nB, m2.count / nB];
  const r2A = (m1.sumR2 - m0.sumR2) / nA;
  const r2B = (m2.sumR2 - m1.sumR2) / nB;
  const r2Beam = mb.sumR2 / mb.count;
  const k = (r2A - r2Beam) / (r2B - r2A);
  const c: [number, number, number, number] = [0, 0, 0, 0];
  for (let i = 0; i < 4; i++) c[i] = ringA[i]! + k * (ringA[i]! - ringB[i]!);
  return { coefficients: c, ringACount: nA, ringBCount: nB, extrapolated: true };
}
