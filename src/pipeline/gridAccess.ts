/**
 * Reading a block store whether it keeps one row per frame or is bounded (blockStore.ts): the
 * clip's frame count, every frame's mean over all blocks, the full-rate blocks of a box (from the
 * rows, or from the bounded store's window when the box lies inside it), and per-frame values
 * picked for the rows a bounded store kept. Pure.
 * @example const means = frameMeansOf(grid); const src = fullRateBlocks(grid, box) // null: outside the window
 */
import { frameMeans } from '../core/events/frameMeans.js';
import type { CellBox } from '../core/regions/cellGeometry.js';
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

/** Full-rate blocks of a box: a frame-major store `width` blocks wide and the box in its coordinates. */
export interface FullRateBlocks {
  data: Float32Array;
  clipped: Uint8Array | undefined;
  rgb: GridStore['rgb'];
  width: number;
  cells: number;
  frames: number;
  box: CellBox;
}

/** The box's blocks at every frame, or null when a bounded store's window does not hold the box. */
export function fullRateBlocks(grid: GridStore, box: CellBox): FullRateBlocks | null {
  const frames = clipFrames(grid);
  const w = grid.window;
  if (!w) return { data: grid.data, clipped: grid.clipped, rgb: grid.rgb, width: grid.gridWidth, cells: grid.gridWidth * grid.gridHeight, frames, box };
  if (box.x0 < w.box.x0 || box.y0 < w.box.y0 || box.x1 > w.box.x1 || box.y1 > w.box.y1) return null;
  const width = w.box.x1 - w.box.x0 + 1;
  return {
    data: w.data, clipped: w.clipped, rgb: w.rgb, width, cells: width * (w.box.y1 - w.box.y0 + 1), frames,
    box: { x0: box.x0 - w.box.x0, y0: box.y0 - w.box.y0, x1: box.x1 - w.box.x0, y1: box.y1 - w.box.y0 },
  };
}

/** Sum over a box of blocks at every frame (rows, then columns), or null when a bounded store's window does not hold it. */
export function boxSumSeries(grid: GridStore, box: CellBox): Float64Array | null {
  const src = fullRateBlocks(grid, box);
  if (!src) return null;
  const out = new Float64Array(src.frames);
  const b = src.box;
  for (let f = 0; f < src.frames; f++) {
    let s = 0;
    for (let y = b.y0; y <= b.y1; y++) {
      const row = f * src.cells + y * src.width;
      for (let x = b.x0; x <= b.x1; x++) s += src.data[row + x]!;
    }
    out[f] = s;
  }
  return out;
}

/** A per-frame series picked at the frames the store's rows hold (the series itself when every frame has a row). */
export function atRows<T extends Float64Array | Uint8Array>(grid: GridStore, perFrame: T): T {
  const rows = grid.frameOf;
  if (!rows) return perFrame;
  const out = new (perFrame.constructor as new (n: number) => T)(rows.length);
  for (let r = 0; r < rows.length; r++) out[r] = perFrame[rows[r]!]!;
  return out;
}
