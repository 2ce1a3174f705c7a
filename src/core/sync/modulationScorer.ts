/**
 * How well a trial clock offset explains a measured intensity trace, for the video/log
 * synchronisation search (findSyncOffset).
 *
 * Model (crossed polarisers, DESIGN.md "What the camera really sees"): the intensity of frame k is
 * I_k ≈ a + b·sin²(π/2 · V(t_k − offset)²/V_π²), with V the log linearly interpolated at log time
 * t_k − offset. For a trial offset, `gather` collects the usable frames whose log time falls inside
 * the log, and stores u_k = V²/V_max² and the centred intensity. For a trial V_π (given as the
 * ratio r = V_π/V_max), a and b follow from ordinary least squares in closed form, and the score is
 * the coefficient of determination
 *   R² = S_mI² / (S_mm · S_II) when the slope b = S_mI/S_mm > 0, else 0,
 * with m_k = sin²(π/2 · u_k / r²), S_mm = Σ(m − m̄)², S_mI = Σ(m − m̄)(I − Ī), S_II = Σ(I − Ī)².
 * (Source: simple linear regression, any statistics text.) R² is dimensionless, in [0, 1].
 *
 * This is the Kerr modulation term of src/core/physics/modulationTerm.ts with its constant factor
 * sin²(2θ) dropped (R² does not change with scale) and no static retardance, written out here so
 * that the inner loop can use a table.
 * `scoreGrid` evaluates a set of V_π ratios with a tabulated sin² (linear interpolation over 4096
 * points per half period, error below 2e-7); `score` uses Math.sin for the refinement.
 *
 * A frame whose log time falls inside a gap of the log (an interval longer than GAP_FACTOR × the
 * median log interval: a logger dropout) is left out of that trial, never bridged by a straight
 * line, by the same rule as the voltage the fit reads (core/signal/interpolateLog, logGaps): a line under a
 * dropped peak reads the voltage low and pulls the offset (coverage study case 86: 72 ms off at a
 * stated 20 ms).
 *
 * Preconditions (checked by findSyncOffset, not here): frame times non-decreasing, log times
 * strictly increasing, V_max > 0. Never mutates its inputs.
 *
 * @example const scorer = createModulationScorer(frameT, frameI, logT, logV, 20);
 *   scorer.gather(0.9) > 0 && scorer.score(0.95) // ≈ 1 for a noiseless trace at offset 0.9 s
 */

import { lowerBound, segmentIndex, upperBound } from './sortedSearch.js';
import { logGaps } from '../signal/interpolateLog.js';

const TABLE_SIZE = 4096; // entries per half period π of sin²
const SIN2_TABLE = (() => {
  const table = new Float64Array(TABLE_SIZE + 1);
  for (let j = 0; j <= TABLE_SIZE; j++) {
    const s = Math.sin((j * Math.PI) / TABLE_SIZE);
    table[j] = s * s;
  }
  return table;
})();

export interface ModulationScorer {
  /** Collect the frames for a trial offset (s); returns how many fall inside the log, or 0 when fewer than `minFrames`. */
  gather(offsetS: number): number;
  /** R² at the gathered offset for V_π = ratio·V_max (Math.sin). */
  score(vpiRatio: number): number;
  /** Best R² over the given V_π ratios at the gathered offset (tabulated sin²), and the index of the best ratio. */
  scoreGrid(vpiRatios: Float64Array): { score: number; index: number };
  /** Number of usable frames whose video time lies in [logStart + offset, logEnd + offset]. */
  overlapFrames(offsetS: number): number;
  /** Largest absolute voltage in the log, V. */
  readonly maxAbsVoltageV: number;
}

/** The frames gathered for one trial offset: (V/V_max)² and centred intensity, first `count` entries valid. */
interface Gathered {
  u: Float64Array;
  centred: Float64Array;
  count: number;
  /** Σ(I − Ī)² over the gathered frames. */
  sumSquaresI: number;
}

interface Trace {
  frameTimesS: Float64Array;
  intensity: Float64Array;
  logTimeS: Float64Array;
  /** Log voltage divided by its largest |V|. */
  logVoltageNorm: Float64Array;
  /** 1 for each log interval [j, j+1] that is a gap (logGaps). */
  gapAfter: Uint8Array;
}

export function createModulationScorer(
  frameTimesS: Float64Array,
  intensity: Float64Array,
  logTimeS: Float64Array,
  logVoltageV: Float64Array,
  minFrames: number,
): ModulationScorer {
  const logCount = logTimeS.length;
  let maxAbsVoltageV = 0;
  for (let i = 0; i < logCount; i++) maxAbsVoltageV = Math.max(maxAbsVoltageV, Math.abs(logVoltageV[i]));
  const logVoltageNorm = new Float64Array(logCount);
  for (let i = 0; i < logCount; i++) logVoltageNorm[i] = logVoltageV[i] / maxAbsVoltageV;
  const trace: Trace = { frameTimesS, intensity, logTimeS, logVoltageNorm, gapAfter: logGaps(logTimeS) };
  const logStartS = logTimeS[0];
  const logEndS = logTimeS[logCount - 1];
  const g: Gathered = { u: new Float64Array(frameTimesS.length), centred: new Float64Array(frameTimesS.length), count: 0, sumSquaresI: 0 };
  return {
    gather: (offsetS) => gatherFrames(g, trace, offsetS, minFrames),
    score: (vpiRatio) => scoreExact(g, vpiRatio),
    scoreGrid: (vpiRatios) => scoreTabulated(g, vpiRatios),
    overlapFrames: (offsetS) => upperBound(frameTimesS, logEndS + offsetS) - lowerBound(frameTimesS, logStartS + offsetS),
    maxAbsVoltageV,
  };
}

/** Fill `g` with the frames whose log time lies inside the log and outside its gaps (two-pointer walk); 0 when fewer than minFrames. */
function gatherFrames(g: Gathered, trace: Trace, offsetS: number, minFrames: number): number {
  const { frameTimesS, intensity, logTimeS, logVoltageNorm, gapAfter } = trace;
  const logCount = logTimeS.length;
  const first = lowerBound(frameTimesS, logTimeS[0] + offsetS);
  const end = upperBound(frameTimesS, logTimeS[logCount - 1] + offsetS);
  g.count = 0;
  if (end - first < minFrames) return 0;
  // Two-pointer walk: frames and log samples are both in time order.
  let j = segmentIndex(logTimeS, frameTimesS[first] - offsetS);
  let sumI = 0;
  let gathered = 0;
  for (let k = first; k < end; k++) {
    const logT = frameTimesS[k] - offsetS;
    while (j < logCount - 2 && logTimeS[j + 1] <= logT) j++;
    const t0 = logTimeS[j];
    const t1 = logTimeS[j + 1];
    if (gapAfter[j] === 1 && logT > t0 && logT < t1) continue; // inside a dropout: not bridged
    let fraction = (logT - t0) / (t1 - t0);
    if (fraction < 0) fraction = 0;
    else if (fraction > 1) fraction = 1;
    const v = logVoltageNorm[j] + (logVoltageNorm[j + 1] - logVoltageNorm[j]) * fraction;
    g.u[gathered] = v * v;
    g.centred[gathered] = intensity[k];
    sumI += intensity[k];
    gathered++;
  }
  if (gathered < minFrames) { g.count = 0; return 0; }
  const meanI = sumI / gathered;
  let sumSquaresI = 0;
  for (let k = 0; k < gathered; k++) {
    const c = g.centred[k] - meanI;
    g.centred[k] = c;
    sumSquaresI += c * c;
  }
  g.count = gathered;
  g.sumSquaresI = sumSquaresI;
  return gathered;
}

/** R² = S_mI² / (S_mm · S_II) from the sums Σm, Σm², Σm·(I − Ī); 0 unless the slope is positive. */
function rSquared(g: Gathered, sumM: number, sumMM: number, sumMI: number): number {
  if (sumMI <= 0 || g.sumSquaresI <= 0) return 0;
  const sMM = sumMM - (sumM * sumM) / g.count;
  if (!(sMM > 1e-12 * g.count)) return 0;
  return Math.min(1, (sumMI * sumMI) / (sMM * g.sumSquaresI));
}

/** R² for one V_π ratio with Math.sin. */
function scoreExact(g: Gathered, vpiRatio: number): number {
  if (g.count === 0) return 0;
  const c = Math.PI / 2 / (vpiRatio * vpiRatio);
  let sumM = 0;
  let sumMM = 0;
  let sumMI = 0;
  for (let k = 0; k < g.count; k++) {
    const s = Math.sin(c * g.u[k]);
    const m = s * s;
    sumM += m;
    sumMM += m * m;
    sumMI += m * g.centred[k];
  }
  return rSquared(g, sumM, sumMM, sumMI);
}

/** Best R² over the V_π ratios with the tabulated sin², and the index of the best ratio (0 when none scores). */
function scoreTabulated(g: Gathered, vpiRatios: Float64Array): { score: number; index: number } {
  let best = 0;
  let index = 0;
  if (g.count === 0) return { score: 0, index };
  for (let r = 0; r < vpiRatios.length; r++) {
    // sin²(x) is tabulated over one period π: x·TABLE_SIZE/π = c·u·TABLE_SIZE/π.
    const c = ((Math.PI / 2 / (vpiRatios[r] * vpiRatios[r])) * TABLE_SIZE) / Math.PI;
    let sumM = 0;
    let sumMM = 0;
    let sumMI = 0;
    for (let k = 0; k < g.count; k++) {
      const x = c * g.u[k];
      const whole = Math.floor(x);
      const j = whole & (TABLE_SIZE - 1);
      const m = SIN2_TABLE[j] + (SIN2_TABLE[j + 1] - SIN2_TABLE[j]) * (x - whole);
      sumM += m;
      sumMM += m * m;
      sumMI += m * g.centred[k];
    }
    const r2 = rSquared(g, sumM, sumMM, sumMI);
    if (r2 > best) {
      best = r2;
      index = r;
    }
  }
  return { score: best, index };
}
