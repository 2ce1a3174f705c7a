/**
 * The bright core of a beam in a grid of block values (e.g. each block's brightest level over a
 * calibration): the block holding the peak, grown as a square while every block in the square
 * stays at or above `fraction` of the peak (default 0.8), at most `maxRadius` blocks (default 4)
 * each way. Over such a core the light is nearly uniform, so the mean code value of the core is
 * close to the code of its mean light (what a response calibration needs).
 * Pure. @throws KerrError NOT_IDENTIFIABLE when the grid is empty or flat (no peak).
 * @example brightCore(values, 160, 120) // { x0: 78, y0: 58, x1: 81, y1: 61 } (block indexes, inclusive)
 */
import { KerrError } from '../../errors.js';

export interface CellBox { x0: number; y0: number; x1: number; y1: number }

export function brightCore(values: ArrayLike<number>, gridWidth: number, gridHeight: number, fraction = 0.8, maxRadius = 4): CellBox {
  let peak = -Infinity, at = -1, low = Infinity;
  for (let i = 0; i < gridWidth * gridHeight; i++) {
    const v = values[i]!;
    if (v > peak) { peak = v; at = i; }
    if (v < low) low = v;
  }
  if (at < 0 || !(peak > low)) throw new KerrError('NOT_IDENTIFIABLE', 'no bright spot found in the calibration pictures', { hint: 'Point the camera at the beam and keep it in view' });
  const cx = at % gridWidth, cy = Math.floor(at / gridWidth);
  const threshold = low + fraction * (peak - low);
  let box: CellBox = { x0: cx, y0: cy, x1: cx, y1: cy };
  for (let r = 1; r <= maxRadius; r++) {
    const next = { x0: cx - r, y0: cy - r, x1: cx + r, y1: cy + r };
    if (next.x0 < 0 || next.y0 < 0 || next.x1 >= gridWidth || next.y1 >= gridHeight) break;
    let ok = true;
    for (let y = next.y0; y <= next.y1 && ok; y++) for (let x = next.x0; x <= next.x1; x++) if (values[y * gridWidth + x]! < threshold) { ok = false; break; }
    if (!ok) break;
    box = next;
  }
  return box;
}
