/**
 * Exposure gain per frame recomputed from the stored grid over the reference region (a card of
 * constant true brightness): g_t = R_t / median_t(R_t), R_t the mean of the blocks lying inside
 * the reference rectangle (the blocks it touches when it is smaller than one block). The same
 * definition as the analyze pass's gain from full-resolution region means; on the block grid it
 * differs only by the blocks at the rectangle's edge.
 *
 * Units: dimensionless (1 = typical exposure). Returns null when the rectangle misses the grid or
 * the reference is nearly black (median ≤ 1e-4 linear), like the analyze pass.
 * Pure; throws nothing.
 * @example referenceGain(grid, 300, 40, 30, 8, { x: 16, y: 16, w: 32, h: 32 })?.[0] → 1.02
 */
import type { Rect } from '../regions/rect.js';
import { median } from '../fit/robustScale.js';
import { boxSeries } from './boxSeries.js';
import { rectToCellBox } from '../regions/cellGeometry.js';

export function referenceGain(grid: Float32Array, frames: number, gridWidth: number, gridHeight: number, stepPx: number, reference: Rect): Float64Array | null {
  const box = rectToCellBox(reference, stepPx, gridWidth, gridHeight);
  if (!box) return null;
  const level = boxSeries(grid, frames, gridWidth, gridHeight, box);
  const typical = median(level);
  if (!(typical > 1e-4)) return null;
  const gain = new Float64Array(frames);
  for (let f = 0; f < frames; f++) gain[f] = level[f]! / typical;
  return gain;
}
