/**
 * Standard uncertainty of the sync offset (s). Two parts in quadrature:
 * - the sync search's own estimate from the curvature of its score at the optimum, which assumes
 *   independent frames, widened by the fit's correlation factor √(n/n_eff) (the same residuals);
 * - the timing of a frame: a frame integrates light over its exposure and its time stamp says
 *   neither when within the frame interval Δt that happened nor how late the encoder lets the
 *   picture follow; taken as rectangular over one median frame interval, Δt/√12 (JCGM 100:2008
 *   §4.3.7 with a full width Δt);
 * - with a log that holds steps, the timing of its steps: a step recorded between two samples
 *   happened somewhere inside that interval, and on a stepped drive the edges are what place the
 *   offset. Each edge is rectangular over the median log interval, and the sampling falls on
 *   different steps at different phases, so over N steps the offset's share is
 *   Δt_log/√(12·N) (`logSteps`; none for a smooth log, whose interpolant places changes between
 *   samples). Coverage study: stepped runs with 3.8–4 Hz logs put the offset 52–62 ms off at a
 *   stated 12–13 ms.
 * undefined when the offset was given (no search) — then the budget has no sync term.
 * Pure. @example syncOffsetUncertaintyS(0.001, 2, frameTimes at 30 fps) ≈ √(0.002² + 0.00962²) ≈ 0.0098
 */
export function syncOffsetUncertaintyS(searchStdErrS: number | undefined, inflation: number, frameTimesS: Float64Array, logSteps?: { intervalS: number; count: number }): number | undefined {
  if (searchStdErrS === undefined) return undefined;
  const n = frameTimesS.length;
  const d: number[] = [];
  for (let k = 1; k < n; k++) d.push(frameTimesS[k]! - frameTimesS[k - 1]!);
  d.sort((a, b) => a - b);
  const dt = d.length > 0 ? d[d.length >> 1]! : 0;
  const search = Number.isFinite(searchStdErrS) ? searchStdErrS * Math.max(1, inflation) : 0;
  const logStep = logSteps && logSteps.count > 0 && Number.isFinite(logSteps.intervalS) && logSteps.intervalS > 0
    ? logSteps.intervalS / Math.sqrt(12 * logSteps.count) : 0;
  return Math.hypot(search, dt / Math.sqrt(12), logStep);
}
