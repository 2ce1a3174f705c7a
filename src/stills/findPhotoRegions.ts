/**
 * The beam and its surround found on the block grids of a photo series, as analyze finds them on
 * a video: the photos are taken at different voltages, so the beam is the area whose brightness
 * varies most across them (core/regions/findBeam on the grids, each divided by its photo's
 * relative exposure so a change of exposure does not read as modulation); the surround is two
 * rings of blocks around it, as analyze builds them: a one-block gap, then rings round(size/3) blocks
 * wide (at least 2), clipped to the grid (core/regions/cellGeometry), weighted by
 * core/regions/localSurround into the background under the beam.
 * The region means per photo come from the grids (exact block means over block-aligned
 * rectangles, see photoBlockGrid), with the beam's clipped share.
 * Pure. @throws KerrError BAD_REGION (from findBeam) when nothing varies clearly across the photos
 * or fewer than 5 photos are usable.
 * @example const found = findPhotoRegions(grids, exposureRelative, usable); found.beam
 */
import type { Rect } from '../media/types.js';
import { findBeam } from '../core/regions/findBeam.js';
import { cellBoxToRect, growCellBox, type CellBox } from '../core/regions/cellGeometry.js';
import type { SurroundGeometry } from '../core/regions/localSurround.js';
import type { PhotoBlockGrid } from './photoBlockGrid.js';

export interface PhotoRegions {
  beam: Rect;
  geometry: SurroundGeometry;
  /** Per photo: mean luminance of [beam, a0, a1, b1] (NaN for a photo without a grid). */
  means: [Float64Array, Float64Array, Float64Array, Float64Array];
  /** Per photo: clipped share of the beam region. */
  beamClipped: Float64Array;
}

/** Mean of a grid over a box of blocks. */
function boxMean(values: Float64Array, gw: number, box: CellBox): number {
  let s = 0;
  for (let y = box.y0; y <= box.y1; y++) for (let x = box.x0; x <= box.x1; x++) s += values[y * gw + x]!;
  return s / ((box.x1 - box.x0 + 1) * (box.y1 - box.y0 + 1));
}

export function findPhotoRegions(grids: ReadonlyArray<PhotoBlockGrid | null>, exposureRelative: Float64Array, usable: Uint8Array): PhotoRegions {
  const first = grids.find((g) => g !== null)!;
  const { gridWidth: gw, gridHeight: gh, step } = first;
  const cells = gw * gh;
  const n = grids.length;
  const stack = new Float32Array(n * cells);
  const ok = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const g = grids[i];
    const e = exposureRelative[i]!;
    if (!g || !usable[i] || !(e > 0)) continue;
    ok[i] = 1;
    for (let c = 0; c < cells; c++) stack[i * cells + c] = g.luma[c]! / e;
  }
  const found = findBeam({ grid: stack, frames: n, gridWidth: gw, gridHeight: gh, usable: ok });
  const size = Math.max(found.beam.x1 - found.beam.x0 + 1, found.beam.y1 - found.beam.y0 + 1);
  const ring = Math.max(2, Math.round(size / 3));
  const boxes = [found.beam, growCellBox(found.beam, 1, gw, gh), growCellBox(found.beam, 1 + ring, gw, gh), growCellBox(found.beam, 1 + 2 * ring, gw, gh)] as const;
  const [b, a0, a1, b1] = boxes.map((box) => cellBoxToRect(box, step)) as [Rect, Rect, Rect, Rect];
  const means = [0, 1, 2, 3].map(() => new Float64Array(n).fill(NaN)) as PhotoRegions['means'];
  const beamClipped = new Float64Array(n).fill(NaN);
  for (let i = 0; i < n; i++) {
    const g = grids[i];
    if (!g) continue;
    boxes.forEach((box, k) => (means[k]![i] = boxMean(g.luma, gw, box)));
    beamClipped[i] = boxMean(g.clipped, gw, found.beam);
  }
  return { beam: b, geometry: { beam: b, a0, a1, b1 }, means, beamClipped };
}
