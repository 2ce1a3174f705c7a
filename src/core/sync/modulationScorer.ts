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
 * `scoreGrid` evaluates a set of V_π ratios with a tabulated sin² (linear interpolation over 4096
 * points per half period, error below 2e-7); `score` uses Math.sin for the refinement.
 *
 * Preconditions (checked by findSyncOffset, not here): frame times non-decreasing, log times
 * strictly increasing, V_max > 0. Never mutates its inputs.
 *
 * @example const scorer = createModulationScorer(frameT, frameI, logT, logV, 20);
 *   scorer.gather(0.9) > 0 && scorer.score(0.95) // ≈ 1 for a noiseless trace at offset 0.9 s
 */

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

export function createModulationScorer(
  frameTimesS: Float64Array,
  intensity: Float64Array,
  logTimeS: Float64Array,
  logVoltageV: Float64Array,
  minFrames: number,
): ModulationScorer {
  const frameCount = frameTimesS.length;
  const logCount = logTimeS.length;
  let maxAbsVoltageV = 0;
  for (let i = 0; i < logCount; i++) maxAbsVoltageV = Math.max(maxAbsVoltageV, Math.abs(logVoltageV[i]));
  const logVoltageNorm = new Float64Array(logCount);
  for (let i = 0; i < logCount; i++) logVoltageNorm[i] = logVoltageV[i] / maxAbsVoltageV;
  const logStartS = logTimeS[0];
  const logEndS = logTimeS[logCount - 1];

  const u = new Float64Array(frameCount); // (V/V_max)² of the gathered frames
  const centred = new Float64Array(frameCount); // I − Ī of the gathered frames
  let gathered = 0;
  let sumSquaresI = 0;

  /** First index with frameTimesS[index] ≥ t (lower bound). */
  const lowerBound = (t: number): number => {
    let lo = 0;
    let hi = frameCount;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (frameTimesS[mid] < t) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  /** First index with frameTimesS[index] > t (upper bound). */
  const upperBound = (t: number): number => {
    let lo = 0;
    let hi = frameCount;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (frameTimesS[mid] <= t) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };

  /** Index j of the log segment [t_j, t_j+1] holding log time t (clamped to the first and last segment). */
  const logSegment = (t: number): number => {
    let lo = 0;
    let hi = logCount - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >>> 1;
      if (logTimeS[mid] <= t) lo = mid;
      else hi = mid;
    }
    return lo;
  };

  const overlapFrames = (offsetS: number): number => upperBound(logEndS + offsetS) - lowerBound(logStartS + offsetS);

  const gather = (offsetS: number): number => {
    const first = lowerBound(logStartS + offsetS);
    const end = upperBound(logEndS + offsetS);
    gathered = 0;
    if (end - first < minFrames) return 0;
    // Two-pointer walk: frames and log samples are both in time order.
    let j = logSegment(frameTimesS[first] - offsetS);
    let sumI = 0;
    for (let k = first; k < end; k++) {
      const logT = frameTimesS[k] - offsetS;
      while (j < logCount - 2 && logTimeS[j + 1] <= logT) j++;
      const t0 = logTimeS[j];
      const t1 = logTimeS[j + 1];
      let fraction = (logT - t0) / (t1 - t0);
      if (fraction < 0) fraction = 0;
      else if (fraction > 1) fraction = 1;
      const v = logVoltageNorm[j] + (logVoltageNorm[j + 1] - logVoltageNorm[j]) * fraction;
      u[gathered] = v * v;
      centred[gathered] = intensity[k];
      sumI += intensity[k];
      gathered++;
    }
    const meanI = sumI / gathered;
    sumSquaresI = 0;
    for (let k = 0; k < gathered; k++) {
      const c = centred[k] - meanI;
      centred[k] = c;
      sumSquaresI += c * c;
    }
    return gathered;
  };

  const finish = (sumM: number, sumMM: number, sumMI: number): number => {
    if (sumMI <= 0 || sumSquaresI <= 0) return 0;
    const sMM = sumMM - (sumM * sumM) / gathered;
    if (!(sMM > 1e-12 * gathered)) return 0;
    return Math.min(1, (sumMI * sumMI) / (sMM * sumSquaresI));
  };

  const score = (vpiRatio: number): number => {
    if (gathered === 0) return 0;
    const c = Math.PI / 2 / (vpiRatio * vpiRatio);
    let sumM = 0;
    let sumMM = 0;
    let sumMI = 0;
    for (let k = 0; k < gathered; k++) {
      const s = Math.sin(c * u[k]);
      const m = s * s;
      sumM += m;
      sumMM += m * m;
      sumMI += m * centred[k];
    }
    return finish(sumM, sumMM, sumMI);
  };

  const scoreGrid = (vpiRatios: Float64Array): { score: number; index: number } => {
    let best = 0;
    let index = 0;
    if (gathered === 0) return { score: 0, index };
    for (let g = 0; g < vpiRatios.length; g++) {
      // sin²(x) is tabulated over one period π: x·TABLE_SIZE/π = c·u·TABLE_SIZE/π.
      const c = ((Math.PI / 2 / (vpiRatios[g] * vpiRatios[g])) * TABLE_SIZE) / Math.PI;
      let sumM = 0;
      let sumMM = 0;
      let sumMI = 0;
      for (let k = 0; k < gathered; k++) {
        const x = c * u[k];
        const whole = Math.floor(x);
        const j = whole & (TABLE_SIZE - 1);
        const m = SIN2_TABLE[j] + (SIN2_TABLE[j + 1] - SIN2_TABLE[j]) * (x - whole);
        sumM += m;
        sumMM += m * m;
        sumMI += m * centred[k];
      }
      const r2 = finish(sumM, sumMM, sumMI);
      if (r2 > best) {
        best = r2;
        index = g;
      }
    }
    return { score: best, index };
  };

  return { gather, score, scoreGrid, overlapFrames, maxAbsVoltageV };
}
