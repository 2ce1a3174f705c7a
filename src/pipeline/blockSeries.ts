/**
 * Per-frame means of a region made of whole blocks, read from the block store of a decoding pass
 * (decodePass.ts) instead of a second pass over the clip: for frame f,
 * luma_f = Σ_{c ∈ box} grid[f·cells + c] / |box| (every block has step² pixels, so this is the mean
 * over the box's pixels of the per-block decoded values), likewise R, G, B when the store has
 * channels (NaN otherwise), and clipped_f = (clipped blocks in the box) / |box|, a lower bound of
 * the pixel fraction (see src/measure/blockMeter).
 *
 * Units: linear light (0..1); clipped is a fraction.
 * A bounded store (blockStore.ts) is read from its window, which keeps every frame.
 * @throws KerrError INTERNAL for a store without clip bits (decodePass always makes them), or a box
 *   outside a bounded store's window; the box must lie on the grid (cellBoxToRect geometry).
 * @example
 * const beam = blockSeries(pass.grid, { x0: 70, y0: 40, x1: 82, y1: 52 });
 */
import { KerrError } from '../errors.js';
import type { CellBox } from '../core/regions/cellGeometry.js';
import { newSeries, type GridStore, type RegionSeries } from './decodePass.js';
import { fullRateBlocks } from './gridAccess.js';

export function blockSeries(grid: GridStore, box: CellBox): RegionSeries {
  const src = fullRateBlocks(grid, box);
  if (!src) throw new KerrError('INTERNAL', 'the region lies outside the blocks the bounded store kept at every frame');
  const clipBits = src.clipped;
  if (!clipBits) throw new KerrError('INTERNAL', 'the block store has no clip bits, so a region cannot be measured from it');
  const { frames, width, cells } = src;
  const b = src.box;
  const out = newSeries(frames);
  const count = (b.x1 - b.x0 + 1) * (b.y1 - b.y0 + 1);
  const sources: Array<[Float32Array, Float64Array]> = [[src.data, out.luma]];
  if (src.rgb) sources.push([src.rgb.r, out.r], [src.rgb.g, out.g], [src.rgb.b, out.b]);
  else { out.r.fill(NaN); out.g.fill(NaN); out.b.fill(NaN); }
  for (let f = 0; f < frames; f++) {
    const off = f * cells;
    for (const [data, dst] of sources) {
      let s = 0;
      for (let y = b.y0; y <= b.y1; y++) {
        const row = off + y * width;
        for (let x = b.x0; x <= b.x1; x++) s += data[row + x]!;
      }
      dst[f] = s / count;
    }
    let clipped = 0;
    for (let y = b.y0; y <= b.y1; y++) {
      const row = off + y * width;
      for (let x = b.x0; x <= b.x1; x++) {
        const bit = row + x;
        clipped += (clipBits[bit >> 3]! >> (bit & 7)) & 1;
      }
    }
    out.clipped[f] = clipped / count;
  }
  return out;
}
