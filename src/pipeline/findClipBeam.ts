/**
 * The beam of a clip found on its block store, with its surround rings, all as whole blocks:
 * the flashes (whole-frame brightness jumps) are left out of the search, findBeam takes the block
 * whose light varies most and its neighbours, and the rings follow at one block's gap and a third
 * of the beam's size each (the geometry analyze has always used). On a bounded store
 * (blockStore.ts) the flashes are judged at every frame and the search runs on the rows it kept.
 * Pure.
 */
import { findBeam } from '../core/regions/findBeam.js';
import { cellBoxToRect, type CellBox } from '../core/regions/cellGeometry.js';
import { beamSurroundBoxes, type GridDims } from './fullRateBoxes.js';
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
  return clipBeamAt(found.beam, grid);
}

/** A beam box with its rings as block boxes and pixel rectangles. */
export function clipBeamAt(beamBox: CellBox, grid: GridDims): ClipBeam {
  const boxes = beamSurroundBoxes(beamBox, grid.gridWidth, grid.gridHeight);
  const [beam, a0, a1, b1] = boxes.map((b) => cellBoxToRect(b, grid.step)) as [ReturnType<typeof cellBoxToRect>, ReturnType<typeof cellBoxToRect>, ReturnType<typeof cellBoxToRect>, ReturnType<typeof cellBoxToRect>];
  return { boxes, geom: { beam, a0, a1, b1 } };
}
