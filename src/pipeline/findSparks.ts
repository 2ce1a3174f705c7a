/**
 * Sparks (flashes) of one clip: whole-frame brightness jumps on the decimated grid, judged again
 * on the light outside the beam and its rings when enough of the frame lies outside them (the
 * beam's own Kerr switching then cannot look like a flash). The maths is detectFlashes
 * (src/core/events); this file only chooses the series it runs on.
 * @example findSparks(clip).flags[f] === 1 → frame f is a spark
 */
import { detectFlashes, type FlashDetection } from '../core/events/detectFlashes.js';
import { boxSumSeries, frameMeansOf } from './gridAccess.js';
import { sparkBox } from './fullRateBoxes.js';
import type { ClipMeasurement } from './measureClip.js';

export function findSparks(clip: Pick<ClipMeasurement, 'grid' | 'geom' | 'beamRect' | 'nFrames'>): FlashDetection {
  const { grid } = clip;
  const cells = grid.gridWidth * grid.gridHeight;
  const frameMean = frameMeansOf(grid);
  const box = sparkBox(grid, clip.geom ? clip.geom.b1 : clip.beamRect);
  const inside = Math.max(0, box.x1 - box.x0 + 1) * Math.max(0, box.y1 - box.y0 + 1);
  // an empty box (a region in the grid's right or bottom remainder) has nothing inside to take out
  if (inside === 0 || cells - inside < 16) return detectFlashes(frameMean);
  const boxSum = boxSumSeries(grid, box);
  if (!boxSum) return detectFlashes(frameMean); // a box a bounded store did not track (not made by measureClip): the whole frame
  const outside = new Float64Array(frameMean.length);
  for (let f = 0; f < outside.length; f++) outside[f] = (frameMean[f]! * cells - boxSum[f]!) / (cells - inside);
  return detectFlashes(outside);
}
