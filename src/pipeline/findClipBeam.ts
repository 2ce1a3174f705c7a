/**
 * The beam of a clip found on its block store, with its surround rings, all as whole blocks:
 * the flashes (whole-frame brightness jumps) are left out of the search, findBeam takes the block
 * whose light varies most and its neighbours, and the rings follow at one block's gap and a third
 * of the beam's size each (the geometry analyze has always used). On a bounded store
 * (blockStore.ts) the flashes are judged at every frame and the search runs on the rows it kept.
 * Pure.
 */
import { findBeam } from '../core/regions/findBeam.js';
import { cellBoxToRect, growCellBox, type CellBox } from '../core/regions/cellGeometry.js';
import type { SurroundGeometry } from '../core/regions/localSurround.js';
import { detectFlashes } from '../core/events/detectFlashes.js';
import { atRows, frameMeansOf } from './gridAccess.js';
import type { GridStore } from './decodePass.js';

export interface ClipBeam {
  /** beam, a0, a1, b1 as block boxes. */
  boxes: readonly [CellBox, CellBox, CellBox, CellBox];
  geom: SurroundGeometry;
}

export function findClipBeam(grid: GridStore): ClipBeam {
  // flashes judged at every frame; the search runs on the rows the store keeps
  const flashes = detectFlashes(frameMeansOf(grid));
  const usable = atRows(grid, Uint8Array.from(flashes.flags, (x) => 1 - x));
  const found = findBeam({ grid: grid.data, frames: grid.frames, gridWidth: grid.gridWidth, gridHeight: grid.gridHeight, usable });
  const grow = (c: CellBox, by: number): CellBox => growCellBox(c, by, grid.gridWidth, grid.gridHeight);
  const size = Math.max(found.beam.x1 - found.beam.x0 + 1, found.beam.y1 - found.beam.y0 + 1);
  const ring = Math.max(2, Math.round(size / 3));
  const boxes = [found.beam, grow(found.beam, 1), grow(found.beam, 1 + ring), grow(found.beam, 1 + 2 * ring)] as const;
  const [beam, a0, a1, b1] = boxes.map((b) => cellBoxToRect(b, grid.step)) as [ReturnType<typeof cellBoxToRect>, ReturnType<typeof cellBoxToRect>, ReturnType<typeof cellBoxToRect>, ReturnType<typeof cellBoxToRect>];
  return { boxes, geom: { beam, a0, a1, b1 } };
}
