/**
 * Per-frame sum (`boxTotals`) or mean of the luminance grid over a box of blocks (`boxSeries`), or over everything
 * outside a box (`outsideBoxSeries`, from the whole-frame means so that only the box's blocks are
 * visited: frames × box area additions rather than frames × all blocks).
 *
 *   inside_t  = Σ_{c∈box} G[t,c] / |box|
 *   outside_t = (N·mean_t − Σ_{c∈box} G[t,c]) / (N − |box|)      (N blocks in the frame)
 *
 * Units: the grid's linear units. Pure; throws KerrError INTERNAL when the box leaves the grid or
 * covers all of it (nothing outside).
 * @example boxSeries(grid, 100, 40, 30, { x0: 2, y0: 2, x1: 5, y1: 5 })[0] → 0.18
 */
import { KerrError } from '../../errors.js';
import { cellBoxArea, type CellBox } from '../regions/cellGeometry.js';

function checkBox(box: CellBox, gridWidth: number, gridHeight: number): void {
  if (box.x0 < 0 || box.y0 < 0 || box.x1 >= gridWidth || box.y1 >= gridHeight || box.x1 < box.x0 || box.y1 < box.y0) {
    throw new KerrError('INTERNAL', `block box ${JSON.stringify(box)} does not lie inside a ${gridWidth}×${gridHeight} grid`);
  }
}

/** Σ over the box at every frame (rows, then columns): the sums boxSeries divides by the box's area. */
export function boxTotals(grid: Float32Array, frames: number, gridWidth: number, gridHeight: number, box: CellBox): Float64Array {
  checkBox(box, gridWidth, gridHeight);
  const cells = gridWidth * gridHeight;
  const out = new Float64Array(frames);
  for (let f = 0; f < frames; f++) {
    let s = 0;
    const off = f * cells;
    for (let y = box.y0; y <= box.y1; y++) {
      const row = off + y * gridWidth;
      for (let x = box.x0; x <= box.x1; x++) s += grid[row + x]!;
    }
    out[f] = s;
  }
  return out;
}

export function boxSeries(grid: Float32Array, frames: number, gridWidth: number, gridHeight: number, box: CellBox): Float64Array {
  const area = cellBoxArea(box);
  return boxTotals(grid, frames, gridWidth, gridHeight, box).map((s) => s / area);
}

export function outsideBoxSeries(grid: Float32Array, frameMean: Float64Array, gridWidth: number, gridHeight: number, box: CellBox): Float64Array {
  const cells = gridWidth * gridHeight;
  const area = cellBoxArea(box);
  if (area >= cells) throw new KerrError('INTERNAL', 'the block box covers the whole grid, so nothing lies outside it');
  const inside = boxSeries(grid, frameMean.length, gridWidth, gridHeight, box);
  const out = new Float64Array(frameMean.length);
  for (let f = 0; f < frameMean.length; f++) out[f] = (cells * frameMean[f]! - area * inside[f]!) / (cells - area);
  return out;
}
