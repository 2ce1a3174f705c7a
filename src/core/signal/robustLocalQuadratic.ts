/**
 * Robust local quadratic trend of a per-frame series over time (LOESS of degree 2 with bisquare
 * robustness weights: Cleveland 1979, "Robust locally weighted regression and smoothing
 * scatterplots", JASA 74:829). For each included frame t, over the included frames s with
 * |k(s) − k(t)| ≤ h (k numbers the included frames in time order):
 *
 *   minimise Σ w_s·(x_s − a − b·u_s − c·u_s²)²,   u_s = time_s − time_t,   trend_t = a
 *
 * with w_s = 1 first, then `iterations` (default 3, as in Cleveland's LOWESS) rounds of bisquare weights
 * w_s = (1 − (r_s / (4.685·σ))²)² for |r_s| < 4.685·σ, else 0, where r are the residuals of the
 * previous round and σ = 1.4826·MAD(r) of the window (Hampel 1974). A smooth peak or trough of
 * the series is followed (a running median would cut it off); a short excursion loses its weight
 * over the rounds, but a large one that pulled the first (unweighted) fit far is only partly
 * removed after three rounds: the quadratic alone is not a spike-free model (spikeFreeTrend
 * pairs it with a running median).
 *
 * Units: those of `values`; times in s. Returns NaN for frames not included. Pure; never mutates
 * its inputs. Throws KerrError INTERNAL for series of different length.
 * @example robustLocalQuadratic(x, include, timesS, 12)[t] → the trend at frame t
 */
import { KerrError } from '../../errors.js';

function solve3(m: number[], v: number[]): number {
  // Cramer's rule for the intercept of a 3×3 symmetric system [m0 m1 m2; m1 m2 m3; m2 m3 m4]·p = v
  const [s0, s1, s2, s3, s4] = m as [number, number, number, number, number];
  const det = s0 * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
  if (!(Math.abs(det) > 1e-300)) return NaN;
  const [v0, v1, v2] = v as [number, number, number];
  return (v0 * (s2 * s4 - s3 * s3) - s1 * (v1 * s4 - s3 * v2) + s2 * (v1 * s3 - s2 * v2)) / det;
}

function medianOf(a: number[]): number {
  const s = [...a].sort((x, y) => x - y);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
}

/** Weighted quadratic through (u, y); returns [a, b, c] or null when singular. */
function weightedQuadratic(u: number[], y: number[], w: number[]): [number, number, number] | null {
  const m = [0, 0, 0, 0, 0];
  const v = [0, 0, 0];
  for (let i = 0; i < u.length; i++) {
    let p = w[i]!;
    for (let k = 0; k < 5; k++) { m[k]! += p; if (k < 3) v[k]! += p * y[i]!; p *= u[i]!; }
  }
  const a = solve3(m, v);
  if (!Number.isFinite(a)) return null;
  // slope and curvature from the last two normal equations, given the exact intercept
  const det = m[2]! * m[4]! - m[3]! * m[3]!;
  if (!(Math.abs(det) > 1e-300)) return null;
  const r1 = v[1]! - a * m[1]!, r2 = v[2]! - a * m[2]!;
  return [a, (r1 * m[4]! - m[3]! * r2) / det, (m[2]! * r2 - m[3]! * r1) / det];
}

export function robustLocalQuadratic(values: Float64Array, include: Uint8Array, timesS: Float64Array, halfWindow: number, iterations = 3): Float64Array {
  if (include.length !== values.length || timesS.length !== values.length) throw new KerrError('INTERNAL', 'values, include and time series must have one entry per frame');
  const idx: number[] = [];
  for (let f = 0; f < values.length; f++) if (include[f] && Number.isFinite(values[f]!) && Number.isFinite(timesS[f]!)) idx.push(f);
  const out = new Float64Array(values.length).fill(NaN);
  for (let k = 0; k < idx.length; k++) {
    const t0 = timesS[idx[k]!]!;
    const u: number[] = [], y: number[] = [];
    for (let j = Math.max(0, k - halfWindow); j <= Math.min(idx.length - 1, k + halfWindow); j++) { u.push(timesS[idx[j]!]! - t0); y.push(values[idx[j]!]!); }
    let w = u.map(() => 1);
    let p = u.length >= 4 ? weightedQuadratic(u, y, w) : null;
    for (let it = 0; it < iterations && p; it++) {
      const r = y.map((yy, i) => yy - (p![0] + p![1] * u[i]! + p![2] * u[i]! ** 2));
      const sigma = 1.4826 * medianOf(r.map(Math.abs));
      if (!(sigma > 0)) break;
      w = r.map((ri) => { const z = ri / (4.685 * sigma); return Math.abs(z) < 1 ? (1 - z * z) ** 2 : 0; });
      p = weightedQuadratic(u, y, w) ?? p;
    }
    out[idx[k]!] = p ? p[0] : values[idx[k]!]!;
  }
  return out;
}
