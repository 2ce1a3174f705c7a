/**
 * Per-frame means of a region made of whole blocks, read from the block store of a decoding pass
 * (decodePass.ts) instead of a second pass over the clip: for frame f,
 * luma_f = Σ_{c ∈ box} grid[f·cells + c] / |box| (every block has step² pixels, so this is the mean
 * over the box's pixels of the per-block decoded values), likewise R, G, B when the store has
 * channels (NaN otherwise), and clipped_f = (clipped blocks in the box) / |box|, a lower bound of
 * the pixel fraction (see src/measure/blockMeter).
 *
 * Units: linear light (0..1); clipped is a fraction.
 * @throws KerrError INTERNAL for a store without clip bits (decodePass always makes them); the box
 *   must lie on the grid (cellBoxToRect geometry).
 * @example
 * const beam = blockSeries(pass.grid, { x0: 70, y0: 40, x1: 82, y1: 52 });
 */
import { KerrError } from '../errors.js';
import type { CellBox } from '../core/regions/cellGeometry.js';
import { newSeries, type GridStore, type RegionSeries } from './decodePass.js';

export function blockSeries(grid: GridStore, box: CellBox): RegionSeries {
  const { frames, gridWidth } = grid;
  const clipBits = grid.clipped;
  if (!clipBits) throw new KerrError('INTERNAL', 'the block store has no clip bits, so a region cannot be measured from it');
  const cells = grid.gridWidth * grid.gridHeight;
  const out = newSeries(frames);
  const count = (box.x1 - box.x0 + 1) * (box.y1 - box.y0 + 1);
  const sources: Array<[Float32Array, Float64Array]> = [[grid.data, out.luma]];
  if (grid.rgb) sources.push([grid.rgb.r, out.r], [grid.rgb.g, out.g], [grid.rgb.b, out.b]);
  else { out.r.fill(NaN); out.g.fill(NaN); out.b.fill(NaN); }
  for (let f = 0; f < frames; f++) {
    const off = f * cells;
    for (const [src, dst] of sources) {
      let s = 0;
      for (let y = box.y0; y <= box.y1; y++) {
        const row = off + y * gridWidth;
        for (let x = box.x0; x <= box.x1; x++) s += src[row + x]!;
      }
      dst[f] = s / count;
    }
    let clipped = 0;
    for (let y = box.y0; y <= box.y1; y++) {
      const row = off + y * gridWidth;
      for (let x = box.x0; x <= box.x1; x++) {
        const bit = row + x;
        clipped += (clipBits[bit >> 3]! >> (bit & 7)) & 1;
      }
    }
    out.clipped[f] = clipped / count;
  }
  return out;
}
