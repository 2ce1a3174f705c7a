/**
 * Static and modulated light per block: for every block of the stored luminance grid, the
 * ordinary least-squares line of the block's intensity on the modulation term m(t),
 *
 *   y_c(t) = I_c(t) / g(t) = a_c + b_c·m(t) + ε,
 *
 * over the frames that were used in the fit (usable, m finite, gain positive). The intercept a_c
 * is the static light (closed-shutter floor, scatter halo, ambient, black level) and the slope b_c
 * the Kerr-modulated light: with m = sin²(2θ)·sin²(δ/2) from the fit, b_c is the block's
 * modulation amplitude I_amp. g(t) is the exposure gain when one is known (1 otherwise).
 *
 * Formulas (textbook simple linear regression, e.g. Draper & Smith, "Applied Regression
 * Analysis", 3rd ed., §1.2–1.4), with x centred on its mean x̄ so that the slope needs no
 * cancelling difference:
 *   b = Σ(x−x̄)·y / Σ(x−x̄)²,  a = ȳ − b·x̄,
 *   s² = (Σ(y−ȳ)² − b²·Σ(x−x̄)²)/(n−2),  se(b) = s/√Sxx,  se(a) = s·√(1/n + x̄²/Sxx).
 * Each block's values are also shifted by its first value before summing (Σ(y−ȳ)² then loses no
 * digits to a large mean). Accumulation is in Float64Array; cost is one pass over frames×blocks
 * with four multiply-adds per value (the per-frame mean level is summed in the same pass).
 *
 * Units: the grid's linear units (1.0 = full-scale white); slope per unit of m (dimensionless).
 * Throws KerrError INTERNAL for arrays of inconsistent length, NOT_IDENTIFIABLE when fewer than 3
 * frames qualify or m does not vary over them (static and modulated light cannot be told apart).
 * Never mutates its inputs.
 *
 * @example
 *   // two blocks, 4 frames: block 0 = 0.1 + 0.5·m, block 1 = 0.2 (static)
 *   modulationMaps({ grid: Float32Array.of(0.1,0.2, 0.35,0.2, 0.6,0.2, 0.225,0.2), frames: 4,
 *     gridWidth: 2, gridHeight: 1, modulation: Float64Array.of(0, 0.5, 1, 0.25), usable: Uint8Array.of(1,1,1,1) })
 *   → staticMap ≈ [0.1, 0.2], modulatedMap ≈ [0.5, 0]
 */
import { KerrError } from '../../errors.js';

export interface ModulationMapsInput {
  /** frames × blocks, row-major per frame (gy·gridWidth + gx), linear units. */
  grid: Float32Array;
  frames: number;
  gridWidth: number;
  gridHeight: number;
  /** Modulation term per frame (NaN where the voltage is unknown). */
  modulation: Float64Array;
  /** 1 = frame used in the fit. */
  usable: Uint8Array;
  /** Exposure gain per frame (measured / typical); the grid is divided by it. */
  gain?: Float64Array;
}

export interface ModulationMaps {
  width: number;
  height: number;
  /** Intercept a per block: static light, linear units. */
  staticMap: Float32Array;
  /** Slope b per block: modulated light per unit of m, linear units. */
  modulatedMap: Float32Array;
  staticStdErr: Float32Array;
  modulatedStdErr: Float32Array;
  /** RMS of the regression residual per block (temporal variation the drive does not explain), linear units. */
  residualStd: Float32Array;
  /** Highest raw block value over the frames regressed (before the gain), for clipping checks. */
  maxLevel: Float32Array;
  framesUsed: number;
  /** Frames skipped by reason: not usable, m unknown, gain not positive. */
  framesSkipped: { unusable: number; noModulation: number; badGain: number };
  modulationMean: number;
  /** max − min of m over the frames regressed. */
  modulationSpan: number;
  /** Mean of all blocks per frame, raw (no gain), every frame: the exposure checks use it. */
  frameMean: Float64Array;
}

export function modulationMaps(input: ModulationMapsInput): ModulationMaps {
  const { grid, frames, gridWidth, gridHeight, modulation, usable, gain } = input;
  const cells = gridWidth * gridHeight;
  if (!(cells > 0) || grid.length !== frames * cells) {
    throw new KerrError('INTERNAL', `the luminance grid holds ${grid.length} values, not ${frames} frames × ${cells} blocks`);
  }
  if (modulation.length !== frames || usable.length !== frames || (gain !== undefined && gain.length !== frames)) {
    throw new KerrError('INTERNAL', 'modulation, usable and gain series must have one entry per frame');
  }

  // Frames that enter the regression, and the centring of x.
  const chosen: number[] = [];
  const skipped = { unusable: 0, noModulation: 0, badGain: 0 };
  let xSum = 0;
  let xMin = Infinity;
  let xMax = -Infinity;
  for (let f = 0; f < frames; f++) {
    if (!usable[f]) { skipped.unusable++; continue; }
    const m = modulation[f]!;
    if (!Number.isFinite(m)) { skipped.noModulation++; continue; }
    if (gain !== undefined && !(gain[f]! > 0)) { skipped.badGain++; continue; }
    chosen.push(f);
    xSum += m;
    xMin = Math.min(xMin, m);
    xMax = Math.max(xMax, m);
  }
  const n = chosen.length;
  const xMean = n > 0 ? xSum / n : NaN;
  let sxx = 0;
  for (const f of chosen) sxx += (modulation[f]! - xMean) ** 2;
  if (n < 3 || !(sxx > 1e-12 * n) || !(xMax - xMin > 1e-6)) {
    throw new KerrError('NOT_IDENTIFIABLE', `the modulation term varies too little over the ${n} frames used (span ${Number.isFinite(xMax - xMin) ? (xMax - xMin).toPrecision(2) : 0}) to separate static from modulated light`, {
      hint: 'Record a sweep that opens the shutter noticeably, or give the beam region',
      inputs: ['beamRegion'],
    });
  }

  const shift = new Float64Array(cells);
  const sumY = new Float64Array(cells);
  const sumXY = new Float64Array(cells);
  const sumYY = new Float64Array(cells);
  const maxRaw = new Float64Array(cells).fill(-Infinity);
  const frameMean = new Float64Array(frames);
  {
    const f0 = chosen[0]!;
    const inv0 = gain !== undefined ? 1 / gain[f0]! : 1;
    const off0 = f0 * cells;
    for (let c = 0; c < cells; c++) shift[c] = grid[off0 + c]! * inv0;
  }
  // One pass over every frame: regression sums for the chosen frames, the mean level for all.
  let next = 0;
  for (let f = 0; f < frames; f++) {
    const off = f * cells;
    let frameSum = 0;
    if (chosen[next] === f) {
      next++;
      const xc = modulation[f]! - xMean;
      const inv = gain !== undefined ? 1 / gain[f]! : 1;
      for (let c = 0; c < cells; c++) {
        const raw = grid[off + c]!;
        frameSum += raw;
        const y = raw * inv - shift[c]!;
        sumY[c] += y;
        sumXY[c] += xc * y;
        sumYY[c] += y * y;
        if (raw > maxRaw[c]!) maxRaw[c] = raw;
      }
    } else {
      for (let c = 0; c < cells; c++) frameSum += grid[off + c]!;
    }
    frameMean[f] = frameSum / cells;
  }
  const maxLevel = Float32Array.from(maxRaw);

  const staticMap = new Float32Array(cells);
  const modulatedMap = new Float32Array(cells);
  const staticStdErr = new Float32Array(cells);
  const modulatedStdErr = new Float32Array(cells);
  const residualStd = new Float32Array(cells);
  const interceptFactor = Math.sqrt(1 / n + (xMean * xMean) / sxx);
  for (let c = 0; c < cells; c++) {
    const yMean = sumY[c]! / n;
    const slope = sumXY[c]! / sxx;
    const syy = sumYY[c]! - n * yMean * yMean;
    const rss = Math.max(0, syy - slope * slope * sxx);
    const s = n > 2 ? Math.sqrt(rss / (n - 2)) : NaN;
    modulatedMap[c] = slope;
    staticMap[c] = shift[c]! + yMean - slope * xMean;
    modulatedStdErr[c] = s / Math.sqrt(sxx);
    staticStdErr[c] = s * interceptFactor;
    residualStd[c] = s;
  }

  return {
    width: gridWidth,
    height: gridHeight,
    staticMap,
    modulatedMap,
    staticStdErr,
    modulatedStdErr,
    residualStd,
    maxLevel,
    framesUsed: n,
    framesSkipped: skipped,
    modulationMean: xMean,
    modulationSpan: xMax - xMin,
    frameMean,
  };
}
