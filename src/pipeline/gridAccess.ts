/**
 * Reading a block store whether it keeps one row per frame or is bounded (blockStore.ts): the
 * clip's frame count, every frame's mean over all blocks, the sums over a box of blocks at every
 * frame (from the rows, or from the bounded store's tracked boxes), and per-frame values picked
 * for the rows a bounded store kept. Pure.
 * @example const means = frameMeansOf(grid); const sums = boxSums(grid, box) // null: a box the bounded store did not track
 */
import { frameMeans } from '../core/events/frameMeans.js';
import { cellBoxArea, sameCellBox, type CellBox } from '../core/regions/cellGeometry.js';
import { boxTotals } from '../core/scatter/boxSeries.js';
import type { GridStore } from './decodePass.js';

/** Frames of the clip (rows of an unbounded store). */
export function clipFrames(grid: GridStore): number {
  return grid.totalFrames ?? grid.frames;
}

/** Every frame's mean over all blocks (linear luminance). */
export function frameMeansOf(grid: GridStore): Float64Array {
  const cells = grid.gridWidth * grid.gridHeight;
  if (grid.frameSum) return grid.frameSum.map((s) => s / cells);
  return frameMeans(grid.data, grid.frames, cells);
}

/** A box's per-frame sums: luminance, channels (when the store has them) and clipped blocks; `count` blocks. */
export interface BoxSums {
  luma: Float64Array;
  rgb: { r: Float64Array; g: Float64Array; b: Float64Array } | undefined;
  /** Undefined when the store has no clip bits. */
  clippedBlocks: Float64Array | undefined;
  count: number;
}

function countClipped(bits: Uint8Array, frames: number, cells: number, width: number, b: CellBox): Float64Array {
  const out = new Float64Array(frames);
  for (let f = 0; f < frames; f++) {
    let n = 0;
    for (let y = b.y0; y <= b.y1; y++) {
      for (let x = b.x0; x <= b.x1; x++) {
        const bit = f * cells + y * width + x;
        n += (bits[bit >> 3]! >> (bit & 7)) & 1;
      }
    }
    out[f] = n;
  }
  return out;
}

/** Column k of a frame-major table of `nb` columns. */
function column(table: Float64Array, k: number, nb: number, frames: number): Float64Array {
  const out = new Float64Array(frames);
  for (let f = 0; f < frames; f++) out[f] = table[f * nb + k]!;
  return out;
}

/** Where a bounded store keeps the box's sums (−1: a box it did not track). */
function trackedIndex(grid: GridStore, box: CellBox): number {
  return grid.tracked!.boxes.findIndex((b) => sameCellBox(b, box));
}

/**
 * The box's sums at every frame, or null when a bounded store did not track this box (it keeps
 * only the boxes fullRateBoxes names for its beam).
 */
export function boxSums(grid: GridStore, box: CellBox): BoxSums | null {
  const count = cellBoxArea(box);
  const t = grid.tracked;
  if (!t) {
    const { frames, gridWidth: w, gridHeight: h } = grid;
    const sum = (data: Float32Array) => boxTotals(data, frames, w, h, box);
    const rgb = grid.rgb ? { r: sum(grid.rgb.r), g: sum(grid.rgb.g), b: sum(grid.rgb.b) } : undefined;
    return { luma: sum(grid.data), rgb, clippedBlocks: grid.clipped ? countClipped(grid.clipped, frames, w * h, w, box) : undefined, count };
  }
  const k = trackedIndex(grid, box);
  if (k < 0) return null;
  const nb = t.boxes.length, frames = clipFrames(grid);
  const rgb = t.rgb ? { r: column(t.rgb.r, k, nb, frames), g: column(t.rgb.g, k, nb, frames), b: column(t.rgb.b, k, nb, frames) } : undefined;
  return { luma: column(t.luma, k, nb, frames), rgb, clippedBlocks: column(t.clippedBlocks, k, nb, frames), count };
}

/** Sum of luminance over a box of blocks at every frame, or null for a box a bounded store did not track. */
export function boxSumSeries(grid: GridStore, box: CellBox): Float64Array | null {
  const t = grid.tracked;
  if (!t) return boxTotals(grid.data, grid.frames, grid.gridWidth, grid.gridHeight, box);
  const k = trackedIndex(grid, box);
  return k < 0 ? null : column(t.luma, k, t.boxes.length, clipFrames(grid));
}

/** A per-frame series picked at the frames the store's rows hold (the series itself when every frame has a row). */
export function atRows<T extends Float64Array | Uint8Array>(grid: GridStore, perFrame: T): T {
  const rows = grid.frameOf;
  if (!rows) return perFrame;
  const out = new (perFrame.constructor as new (n: number) => T)(rows.length);
  for (let r = 0; r < rows.length; r++) out[r] = perFrame[rows[r]!]!;
  return out;
}
