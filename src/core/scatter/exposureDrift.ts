/**
 * Exposure drift from the background: light outside the beam should stay constant; when it
 * changes by itself, the camera changed its exposure (or the room light changed).
 *
 * 1. Drive-following light is removed first, but only the physical kind: light scattered from the
 *    opening shutter can only ADD to the background, so a positive regression slope b of the
 *    level L_t on the modulation m_t (least squares over usable frames) is subtracted,
 *    L'_t = L_t − b·m_t. A negative slope (the camera turning its gain down as the spot
 *    brightens, a phone's automatic exposure) is exposure, and stays in.
 * 2. L' is smoothed by a running median over 5 frames (camera noise and single-frame events out).
 * 3. ratio = p95(L') / p5(L') over the frames judged; drifting when ratio > `limit` (default
 *    1.08, i.e. the background moves by more than about 8 %).
 *
 * Not judged (judged = false) when the background is too dark to measure a relative change:
 * p5(L') below `minLevel` (default 0.002 linear, about sRGB code 7).
 * Percentiles by linear interpolation between order statistics (Hyndman & Fan 1996, type 7).
 * Units: linear. Pure; throws KerrError INTERNAL for arrays of different length.
 * @example exposureDrift({ level, modulation, include }).ratio → 1.21 (drifting)
 */
import { KerrError } from '../../errors.js';
import { percentileSorted } from '../stats/percentileSorted.js';

export interface ExposureDriftInput {
  /** Background level per frame (raw, linear units). */
  level: Float64Array;
  modulation: Float64Array;
  /** 1 = frame may be judged (not a spark). */
  include: Uint8Array;
  limit?: number;
  minLevel?: number;
}

export interface ExposureDrift {
  judged: boolean;
  drifting: boolean;
  /** p95/p5 of the drive-free, smoothed background. */
  ratio: number;
  /** Slope of the background on m that was removed (≥ 0), linear units. */
  driveSlope: number;
  /** Background with the drive-following light removed, per frame (NaN where not judged). */
  driveFreeLevel: Float64Array;
}


export function exposureDrift(input: ExposureDriftInput): ExposureDrift {
  const { level, modulation, include } = input;
  const n = level.length;
  if (modulation.length !== n || include.length !== n) throw new KerrError('INTERNAL', 'level, modulation and include series must have one entry per frame');
  const limit = input.limit ?? 1.08;
  const minLevel = input.minLevel ?? 0.002;

  let sx = 0, sy = 0, k = 0;
  for (let f = 0; f < n; f++) {
    if (!include[f] || !Number.isFinite(modulation[f]!) || !Number.isFinite(level[f]!)) continue;
    sx += modulation[f]!; sy += level[f]!; k++;
  }
  let slope = 0;
  if (k >= 3) {
    const xm = sx / k, ym = sy / k;
    let sxx = 0, sxy = 0;
    for (let f = 0; f < n; f++) {
      if (!include[f] || !Number.isFinite(modulation[f]!) || !Number.isFinite(level[f]!)) continue;
      const dx = modulation[f]! - xm;
      sxx += dx * dx; sxy += dx * (level[f]! - ym);
    }
    if (sxx > 0) slope = Math.max(0, sxy / sxx);
  }
  const driveFree = new Float64Array(n).fill(NaN);
  for (let f = 0; f < n; f++) {
    if (!include[f] || !Number.isFinite(level[f]!)) continue;
    const m = modulation[f]!;
    driveFree[f] = level[f]! - (Number.isFinite(m) ? slope * m : 0);
  }
  const kept: number[] = [];
  for (let f = 0; f < n; f++) if (Number.isFinite(driveFree[f]!)) kept.push(f);
  if (kept.length < 5) return { judged: false, drifting: false, ratio: NaN, driveSlope: slope, driveFreeLevel: driveFree };

  const smooth = new Float64Array(kept.length);
  const win: number[] = [];
  for (let i = 0; i < kept.length; i++) {
    win.length = 0;
    for (let j = Math.max(0, i - 2); j <= Math.min(kept.length - 1, i + 2); j++) win.push(driveFree[kept[j]!]!);
    win.sort((a, b) => a - b);
    smooth[i] = win[win.length >> 1]!;
  }
  smooth.sort();
  const p5 = percentileSorted(smooth, 0.05);
  const p95 = percentileSorted(smooth, 0.95);
  if (!(p5 >= minLevel)) return { judged: false, drifting: false, ratio: NaN, driveSlope: slope, driveFreeLevel: driveFree };
  const ratio = p95 / p5;
  return { judged: true, drifting: ratio > limit, ratio, driveSlope: slope, driveFreeLevel: driveFree };
}
