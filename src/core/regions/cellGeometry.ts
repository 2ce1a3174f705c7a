/**
 * Block-grid geometry shared by the scatter maps: the analyze pass stores one mean per step×step
 * block (grid width ⌊W/step⌋, height ⌊H/step⌋, right and bottom remainders left out), and every
 * region found on the maps is a box of blocks that becomes a pixel rectangle for the user.
 *
 * A CellBox holds inclusive block indices (x0..x1, y0..y1).
 * Pure; nothing here throws.
 *
 * @example cellBoxToRect({ x0: 2, y0: 1, x1: 3, y1: 1 }, 8) → { x: 16, y: 8, w: 16, h: 8 }
 */
import type { Rect } from './rect.js';

/** A box of blocks: inclusive block indices. */
export interface CellBox {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/** Pixel rectangle covered by a box of blocks. */
export function cellBoxToRect(box: CellBox, stepPx: number): Rect {
  return { x: box.x0 * stepPx, y: box.y0 * stepPx, w: (box.x1 - box.x0 + 1) * stepPx, h: (box.y1 - box.y0 + 1) * stepPx };
}

/**
 * Blocks lying wholly inside a pixel rectangle; when none does (a rectangle smaller than a block),
 * the blocks it touches. Null when the rectangle misses the grid.
 * @example rectToCellBox({ x: 16, y: 8, w: 16, h: 8 }, 8, 40, 30) → { x0: 2, y0: 1, x1: 3, y1: 1 }
 */
export function rectToCellBox(rect: Rect, stepPx: number, gridWidth: number, gridHeight: number): CellBox | null {
  const clampX = (i: number) => Math.min(gridWidth - 1, Math.max(0, i));
  const clampY = (i: number) => Math.min(gridHeight - 1, Math.max(0, i));
  let x0 = Math.ceil(rect.x / stepPx);
  let y0 = Math.ceil(rect.y / stepPx);
  let x1 = Math.floor((rect.x + rect.w) / stepPx) - 1;
  let y1 = Math.floor((rect.y + rect.h) / stepPx) - 1;
  if (x1 < x0 || y1 < y0) {
    x0 = Math.floor(rect.x / stepPx);
    y0 = Math.floor(rect.y / stepPx);
    x1 = Math.ceil((rect.x + rect.w) / stepPx) - 1;
    y1 = Math.ceil((rect.y + rect.h) / stepPx) - 1;
  }
  if (x1 < 0 || y1 < 0 || x0 > gridWidth - 1 || y0 > gridHeight - 1) return null;
  return { x0: clampX(x0), y0: clampY(y0), x1: clampX(x1), y1: clampY(y1) };
}

/** The box grown by `by` blocks on every side, clipped to the grid. */
export function growCellBox(box: CellBox, by: number, gridWidth: number, gridHeight: number): CellBox {
  return {
    x0: Math.max(0, box.x0 - by),
    y0: Math.max(0, box.y0 - by),
    x1: Math.min(gridWidth - 1, box.x1 + by),
    y1: Math.min(gridHeight - 1, box.y1 + by),
  };
}

/** The same blocks: every edge equal. */
export function sameCellBox(a: CellBox, b: CellBox): boolean {
  return a.x0 === b.x0 && a.y0 === b.y0 && a.x1 === b.x1 && a.y1 === b.y1;
}

export function cellBoxesOverlap(a: CellBox, b: CellBox): boolean {
  return a.x0 <= b.x1 && b.x0 <= a.x1 && a.y0 <= b.y1 && b.y0 <= a.y1;
}

export function cellBoxContains(box: CellBox, x: number, y: number): boolean {
  return x >= box.x0 && x <= box.x1 && y >= box.y0 && y <= box.y1;
}

export function cellBoxArea(box: CellBox): number {
  return (box.x1 - box.x0 + 1) * (box.y1 - box.y0 + 1);
}

/**
 * The 4-connected blocks reachable from `start` whose value is at least `limit` (and, when
 * `bounds` is given, inside it): their mask, bounding box and count. Iterative (no recursion).
 */
export function floodFill(map: ArrayLike<number>, w: number, h: number, start: number, limit: number, bounds: CellBox | null = null): { mask: Uint8Array; box: CellBox; count: number } {
  const mask = new Uint8Array(w * h);
  const stack = [start];
  mask[start] = 1;
  const box: CellBox = { x0: start % w, y0: Math.floor(start / w), x1: start % w, y1: Math.floor(start / w) };
  let count = 0;
  while (stack.length > 0) {
    const c = stack.pop()!;
    count++;
    const x = c % w;
    const y = (c - x) / w;
    box.x0 = Math.min(box.x0, x); box.x1 = Math.max(box.x1, x);
    box.y0 = Math.min(box.y0, y); box.y1 = Math.max(box.y1, y);
    const next = [x > 0 ? c - 1 : -1, x < w - 1 ? c + 1 : -1, y > 0 ? c - w : -1, y < h - 1 ? c + w : -1];
    for (const m of next) {
      if (m < 0 || mask[m] || !(map[m]! >= limit)) continue;
      if (bounds) {
        const mx = m % w;
        const my = (m - mx) / w;
        if (mx < bounds.x0 || mx > bounds.x1 || my < bounds.y0 || my > bounds.y1) continue;
      }
      mask[m] = 1;
      stack.push(m);
    }
  }
  return { mask, box, count };
}
