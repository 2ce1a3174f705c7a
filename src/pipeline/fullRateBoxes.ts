/**
 * The boxes of blocks an analyze run reads at every frame, from the beam alone: the beam and its
 * surround rings (when the beam was found on the grid), the box whose outside judges sparks
 * (findSparks) and the keep-out box whose outside is the background level (frameExclusions). A
 * bounded block store (blockStore.ts) keeps per-frame sums of exactly these boxes, so each is made
 * here, once, for the store and for its readers alike. Pure.
 *
 * Ring geometry (the one analyze has always used): a0 one block out, a1 and b1 a third of the
 * beam's size further each (at least 2 blocks). Keep-out: the beam grown by half its width (at
 * least 2 blocks), or the beam itself when that would cover the whole grid.
 * @example beamSurroundBoxes({ x0: 10, y0: 10, x1: 18, y1: 18 }, 160, 90)[3] → grown by 7
 */
import { growCellBox, rectToCellBox, cellBoxArea, sameCellBox, type CellBox } from '../core/regions/cellGeometry.js';
import type { Rect } from '../media/types.js';

/** Block geometry of a grid. */
export interface GridDims {
  gridWidth: number;
  gridHeight: number;
  step: number;
}

/** The beam and its rings a0, a1, b1 as block boxes. */
export function beamSurroundBoxes(beam: CellBox, gridWidth: number, gridHeight: number): [CellBox, CellBox, CellBox, CellBox] {
  const grow = (c: CellBox, by: number): CellBox => growCellBox(c, by, gridWidth, gridHeight);
  const size = Math.max(beam.x1 - beam.x0 + 1, beam.y1 - beam.y0 + 1);
  const ring = Math.max(2, Math.round(size / 3));
  return [beam, grow(beam, 1), grow(beam, 1 + ring), grow(beam, 1 + 2 * ring)];
}

/** The blocks touched by a pixel rectangle (rounded outward), clipped to the grid: the spark search's inside. */
export function sparkBox(grid: GridDims, outer: Rect): CellBox {
  const x0 = Math.floor(outer.x / grid.step), y0 = Math.floor(outer.y / grid.step);
  const x1 = Math.min(grid.gridWidth - 1, Math.ceil((outer.x + outer.w) / grid.step) - 1);
  const y1 = Math.min(grid.gridHeight - 1, Math.ceil((outer.y + outer.h) / grid.step) - 1);
  return { x0, y0, x1, y1 };
}

/** The beam grown by half its width (at least 2 blocks); the beam alone when that covers the grid; null off the grid. */
export function keepOutBox(grid: GridDims, beamRect: Rect): CellBox | null {
  const gw = grid.gridWidth, gh = grid.gridHeight;
  const beamBox = rectToCellBox(beamRect, grid.step, gw, gh);
  if (!beamBox) return null;
  const grown = growCellBox(beamBox, Math.max(2, Math.ceil((beamBox.x1 - beamBox.x0 + 1) / 2)), gw, gh);
  return cellBoxArea(grown) >= gw * gh ? beamBox : grown;
}

/**
 * Every box read at every frame for a beam: its rings when given (a found beam), the spark box of
 * the outer ring (or of the beam without rings) and the keep-out box; each once.
 */
export function fullRateBoxes(grid: GridDims, beamRect: Rect, outerRect: Rect, beamBoxes?: readonly CellBox[]): CellBox[] {
  const out: CellBox[] = [];
  const keepOut = keepOutBox(grid, beamRect);
  for (const b of [...(beamBoxes ?? []), sparkBox(grid, outerRect), ...(keepOut ? [keepOut] : [])]) {
    if (!out.some((o) => sameCellBox(o, b))) out.push(b);
  }
  return out;
}
