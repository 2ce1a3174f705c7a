/**
 * Per-frame means of a region made of whole blocks, read from the block store of a decoding pass
 * (decodePass.ts) instead of a second pass over the clip: for frame f,
 * luma_f = Σ_{c ∈ box} grid[f·cells + c] / |box| (every block has step² pixels, so this is the mean
 * over the box's pixels of the per-block decoded values), likewise R, G, B when the store has
 * channels (NaN otherwise), and clipped_f = (clipped blocks in the box) / |box|, a lower bound of
 * the pixel fraction (see src/measure/blockMeter).
 *
 * Units: linear light (0..1); clipped is a fraction.
 * A bounded store (blockStore.ts) is read from the per-frame sums of the boxes it tracked.
 * @throws KerrError INTERNAL for a store without clip bits (decodePass always makes them), or a box
 *   a bounded store did not track; the box must lie on the grid (cellBoxToRect geometry).
 * @example
 * const beam = blockSeries(pass.grid, { x0: 70, y0: 40, x1: 82, y1: 52 });
 */
import { KerrError } from '../errors.js';
import type { CellBox } from '../core/regions/cellGeometry.js';
import { newSeries, type GridStore, type RegionSeries } from './decodePass.js';
import { boxSums } from './gridAccess.js';

export function blockSeries(grid: GridStore, box: CellBox): RegionSeries {
  const sums = boxSums(grid, box);
  if (!sums) throw new KerrError('INTERNAL', 'the region is not one of the boxes the bounded store kept at every frame');
  if (!sums.clippedBlocks) throw new KerrError('INTERNAL', 'the block store has no clip bits, so a region cannot be measured from it');
  const frames = sums.luma.length;
  const out = newSeries(frames);
  const { count } = sums;
  for (let f = 0; f < frames; f++) {
    out.luma[f] = sums.luma[f]! / count;
    out.clipped[f] = sums.clippedBlocks[f]! / count;
  }
  if (sums.rgb) {
    for (let f = 0; f < frames; f++) { out.r[f] = sums.rgb.r[f]! / count; out.g[f] = sums.rgb.g[f]! / count; out.b[f] = sums.rgb.b[f]! / count; }
  } else { out.r.fill(NaN); out.g.fill(NaN); out.b.fill(NaN); }
  return out;
}
