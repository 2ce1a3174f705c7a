/**
 * The voltage log read at frame times, respecting what the log can tell:
 * - inside a gap in the log (an interval longer than GAP_FACTOR × the median sample interval, a
 *   logger dropout) the value is NaN and the query is flagged `gap`: a straight line across a
 *   dropout would invent the voltage, e.g. far below a peak it missed;
 * - where the log is smooth, a monotone piecewise-cubic Hermite interpolant (PCHIP: Fritsch &
 *   Carlson, SIAM J. Numer. Anal. 17, 238 (1980), with the weighted-harmonic-mean slopes of
 *   Fritsch & Butland, SIAM J. Sci. Stat. Comput. 5, 300 (1984), as in Moler, "Numerical
 *   Computing with MATLAB", §3.4). It follows a slow sine between coarse samples (a straight
 *   chord reads |V| low on every arc) and never overshoots the samples;
 * - across a step (an interval whose change is more than STEP_RATIO × the larger change of its
 *   neighbours, and larger than 6 noise standard deviations) and on the two intervals beside it,
 *   the straight line between samples, which cannot ring.
 * Outside [t_0, t_{n−1}] the value is NaN (no extrapolation), not flagged as a gap.
 *
 * Units: times in s, values in V (any consistent units). Pure; never mutates its inputs.
 * Throws KerrError BAD_ARGUMENT for unequal lengths, fewer than 2 samples or times that do not
 * increase strictly.
 * @example interpolateLog(Float64Array.of(0, 1, 2, 10, 11), Float64Array.of(0, 1, 2, 10, 11), [0.5, 5]).valueV → [0.5, NaN]
 */
import { invalid } from '../../errors.js';

export const GAP_FACTOR = 4;
export const STEP_RATIO = 4;

export interface LogReading {
  valueV: Float64Array;
  /** 1 where the query falls in a log gap (left NaN). */
  gap: Uint8Array;
  /** 1 where the straight line was used (a step nearby). */
  linear: Uint8Array;
  /** Steps of the log (not gaps) between the earliest and the latest query that fell inside it. */
  stepCount: number;
}

export function medianInterval(timeS: Float64Array): number {
  const d = new Float64Array(timeS.length - 1);
  for (let i = 1; i < timeS.length; i++) d[i - 1] = timeS[i]! - timeS[i - 1]!;
  d.sort();
  return d[d.length >> 1]!;
}

/**
 * The log's gaps: 1 for each interval [t_k, t_k+1] longer than GAP_FACTOR × the median sample
 * interval (a logger dropout), else 0; n − 1 flags for n samples. The one rule for "a gap" that
 * the voltage read here and the sync search (core/sync/modulationScorer) both follow.
 * @example logGaps(Float64Array.of(0, 1, 2, 10, 11)) → [0, 0, 1, 0]
 */
export function logGaps(timeS: Float64Array): Uint8Array {
  const gapLimit = GAP_FACTOR * medianInterval(timeS);
  const flags = new Uint8Array(Math.max(0, timeS.length - 1));
  for (let k = 0; k + 1 < timeS.length; k++) flags[k] = timeS[k + 1]! - timeS[k]! > gapLimit ? 1 : 0;
  return flags;
}

export function interpolateLog(timeS: Float64Array, valueV: Float64Array, queryS: ArrayLike<number>, noiseV = 0): LogReading {
  const n = timeS.length;
  if (valueV.length !== n) throw invalid(`${n} values (one per sample time)`, 'interpolateLog(valueV)', `${valueV.length} values`);
  if (n < 2) throw invalid('at least two samples', 'interpolateLog(timeS)', `${n}`);
  for (let i = 1; i < n; i++) if (!(timeS[i]! > timeS[i - 1]!)) throw invalid('strictly increasing sample times', 'interpolateLog(timeS)', `${timeS[i]} after ${timeS[i - 1]} at index ${i}`);
  const h = new Float64Array(n - 1);
  const delta = new Float64Array(n - 1);
  for (let k = 0; k < n - 1; k++) { h[k] = timeS[k + 1]! - timeS[k]!; delta[k] = (valueV[k + 1]! - valueV[k]!) / h[k]!; }
  const isGap = logGaps(timeS);
  // steps: an interval whose change dwarfs both neighbours' changes
  const change = Float64Array.from(h, (_x, k) => Math.abs(valueV[k + 1]! - valueV[k]!));
  const stepNear = new Uint8Array(n - 1);
  const isStep = new Uint8Array(n - 1);
  for (let k = 0; k < n - 1; k++) {
    const around = Math.max(k > 0 ? change[k - 1]! : 0, k < n - 2 ? change[k + 1]! : 0);
    if (change[k]! > STEP_RATIO * around && change[k]! > 6 * noiseV && change[k]! > 0) {
      for (let j = Math.max(0, k - 1); j <= Math.min(n - 2, k + 1); j++) stepNear[j] = 1;
      if (!isGap[k]) isStep[k] = 1;
    }
  }
  // PCHIP slopes (Fritsch–Butland weighted harmonic mean; zero at local extrema); one-sided at
  // the ends and beside gaps (a gap's chord says nothing about the slope).
  const d = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const left = k > 0 && !isGap[k - 1] ? k - 1 : -1;
    const right = k < n - 1 && !isGap[k] ? k : -1;
    if (left < 0 && right < 0) { d[k] = 0; continue; }
    if (left < 0 || right < 0) { d[k] = endSlope(h, delta, k, left < 0 ? right : left, left < 0, isGap, n); continue; }
    const dl = delta[left]!, dr = delta[right]!;
    if (dl === 0 || dr === 0 || Math.sign(dl) !== Math.sign(dr)) { d[k] = 0; continue; }
    const w1 = 2 * h[right]! + h[left]!;
    const w2 = h[right]! + 2 * h[left]!;
    d[k] = (w1 + w2) / (w1 / dl + w2 / dr);
  }
  const m = queryS.length;
  const out = new Float64Array(m);
  const gap = new Uint8Array(m);
  const linear = new Uint8Array(m);
  let k = 0;
  let qFirst = Infinity, qLast = -Infinity;
  for (let i = 0; i < m; i++) {
    const q = queryS[i]!;
    if (!(q >= timeS[0]! && q <= timeS[n - 1]!)) { out[i] = NaN; continue; }
    if (q < qFirst) qFirst = q;
    if (q > qLast) qLast = q;
    if (q < timeS[k]!) k = 0;
    while (k < n - 2 && timeS[k + 1]! <= q) k++;
    if (isGap[k] && q > timeS[k]! && q < timeS[k + 1]!) { out[i] = NaN; gap[i] = 1; continue; }
    const s = (q - timeS[k]!) / h[k]!;
    const y0 = valueV[k]!, y1 = valueV[k + 1]!;
    if (stepNear[k]) { out[i] = y0 + (y1 - y0) * s; linear[i] = 1; continue; }
    const s2 = s * s, s3 = s2 * s;
    out[i] = (2 * s3 - 3 * s2 + 1) * y0 + (s3 - 2 * s2 + s) * h[k]! * d[k]! + (-2 * s3 + 3 * s2) * y1 + (s3 - s2) * h[k]! * d[k + 1]!;
  }
  let stepCount = 0;
  for (let j = 0; j < n - 1; j++) if (isStep[j] && timeS[j + 1]! > qFirst && timeS[j]! < qLast) stepCount++;
  return { valueV: out, gap, linear, stepCount };
}

/** Three-point one-sided slope with the PCHIP shape limits (Moler §3.4), or the chord's slope. */
function endSlope(h: Float64Array, delta: Float64Array, k: number, seg: number, atLeftEnd: boolean, isGap: Uint8Array, n: number): number {
  const next = atLeftEnd ? seg + 1 : seg - 1;
  if (next < 0 || next > n - 2 || isGap[next]) return delta[seg]!;
  const h0 = h[seg]!, h1 = h[next]!, d0 = delta[seg]!, d1 = delta[next]!;
  let s = ((2 * h0 + h1) * d0 - h0 * d1) / (h0 + h1);
  if (Math.sign(s) !== Math.sign(d0)) s = 0;
  else if (Math.sign(d0) !== Math.sign(d1) && Math.abs(s) > Math.abs(3 * d0)) s = 3 * d0;
  void k;
  return s;
}
