/**
 * Sparks (flashes) of one clip: whole-frame brightness jumps on the decimated grid, judged again
 * on the light outside the beam and its rings when enough of the frame lies outside them (the
 * beam's own Kerr switching then cannot look like a flash). The maths is detectFlashes
 * (src/core/events); this file only chooses the series it runs on.
 * @example findSparks(clip).flags[f] === 1 → frame f is a spark
 */
import { detectFlashes, type FlashDetection } from '../core/events/detectFlashes.js';
import { boxSumSeries, frameMeansOf } from './gridAccess.js';
import type { ClipMeasurement } from './measureClip.js';

export function findSparks(clip: Pick<ClipMeasurement, 'grid' | 'geom' | 'beamRect' | 'nFrames'>): FlashDetection {
  const { grid } = clip;
  const cells = grid.gridWidth * grid.gridHeight;
  const frameMean = frameMeansOf(grid);
  const outer = clip.geom ? clip.geom.b1 : clip.beamRect;
  const cx0 = Math.floor(outer.x / grid.step), cy0 = Math.floor(outer.y / grid.step);
  const cx1 = Math.min(grid.gridWidth - 1, Math.ceil((outer.x + outer.w) / grid.step) - 1);
  const cy1 = Math.min(grid.gridHeight - 1, Math.ceil((outer.y + outer.h) / grid.step) - 1);
  const inside = Math.max(0, cx1 - cx0 + 1) * Math.max(0, cy1 - cy0 + 1);
  if (cells - inside < 16) return detectFlashes(frameMean);
  const boxSum = boxSumSeries(grid, { x0: cx0, y0: cy0, x1: cx1, y1: cy1 });
  if (!boxSum) return detectFlashes(frameMean); // outside a bounded store's window: the whole frame
  const outside = new Float64Array(frameMean.length);
  for (let f = 0; f < outside.length; f++) outside[f] = (frameMean[f]! * cells - boxSum[f]!) / (cells - inside);
  return detectFlashes(outside);
}
