/**
 * Finds the modulated beam on a decimated luminance grid stored for every frame: the block whose
 * light varies most over the run (95th minus 5th percentile over time, so that a few flashes do
 * not count), grown to its 4-connected neighbours that vary at least `threshold` times as much.
 * Pure; throws KerrError BAD_REGION when nothing in the frame follows the drive.
 */
import { KerrError } from '../../errors.js';
import { percentileSorted } from '../stats/percentileSorted.js';
import { percentileSpread } from '../stats/percentileSpread.js';
import { floodFill, type CellBox } from './cellGeometry.js';

export type { CellBox };

export interface BeamCells {
  beam: CellBox;
  /** Temporal variation (p95 − p5) of the strongest block and its median over the grid. */
  peakRange: number;
  medianRange: number;
  /** Per-block temporal range, gridWidth*gridHeight, for the region overlay or maps. */
  rangeMap: Float32Array;
}

export interface FindBeamInput {
  /** frames × cells, row-major per frame. */
  grid: Float32Array;
  frames: number;
  gridWidth: number;
  gridHeight: number;
  /** Frames to skip (e.g. sparks): 1 = usable. */
  usable?: Uint8Array;
  threshold?: number;
  maxSampleFrames?: number;
}


export function findBeam(input: FindBeamInput): BeamCells {
  const { grid, frames, gridWidth: gw, gridHeight: gh } = input;
  const cells = gw * gh;
  const threshold = input.threshold ?? 0.25;
  const maxSample = input.maxSampleFrames ?? 400;
  const chosen: number[] = [];
  const stride = Math.max(1, Math.floor(frames / maxSample));
  for (let f = 0; f < frames; f += stride) if (!input.usable || input.usable[f]) chosen.push(f);
  if (chosen.length < 5) {
    throw new KerrError('BAD_REGION', `only ${chosen.length} usable frames to look for the beam in`, {
      hint: 'Give the beam region as x,y,w,h',
      inputs: ['beamRegion'],
    });
  }
  const rangeMap = new Float32Array(cells);
  const series = new Float64Array(chosen.length);
  for (let c = 0; c < cells; c++) {
    for (let k = 0; k < chosen.length; k++) series[k] = grid[chosen[k]! * cells + c]!;
    rangeMap[c] = percentileSpread(series, 0.05, 0.95); // = p95 − p5 of the sorted series, without sorting
  }
  let peak = 0;
  for (let c = 1; c < cells; c++) if (rangeMap[c]! > rangeMap[peak]!) peak = c;
  const sortedRanges = Float64Array.from(rangeMap).sort();
  const medianRange = percentileSorted(sortedRanges, 0.5);
  const peakRange = rangeMap[peak]!;
  if (!(peakRange > 0) || peakRange < 4 * medianRange + 1e-4) {
    throw new KerrError('BAD_REGION', 'no part of the frame brightens and darkens clearly with the drive, so the beam could not be found automatically', {
      hint: 'Give the beam region as x,y,w,h (see `kerrtrace trace` to check a region)',
      inputs: ['beamRegion'],
    });
  }
  const { box } = floodFill(rangeMap, gw, gh, peak, threshold * peakRange);
  return { beam: box, peakRange, medianRange, rangeMap };
}
