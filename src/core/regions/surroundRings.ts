/**
 * The two rings around a beam rectangle that the local surround (localSurround.ts) is measured
 * in, when the beam was given rather than found: a gap of 15 % of the beam's shorter side (at
 * least 2 px) keeps the beam's own edge out, then ring A and ring B are each 25 % of that side
 * wide (at least 4 px). Every rectangle is clipped to the frame. Shared by analyze (--roi) and the
 * live view (a drawn or found beam), so both subtract the same surround.
 * Pure; throws nothing.
 * @example surroundRings({ x: 100, y: 80, w: 40, h: 40 }, 320, 240).a0 → { x: 94, y: 74, w: 52, h: 52 }
 */
import type { Rect } from './rect.js';
import type { SurroundGeometry } from './localSurround.js';

/** r grown by `byPx` on every side, clipped to a frame of w × h. */
export function growRect(r: Rect, byPx: number, w: number, h: number): Rect {
  const x0 = Math.max(0, r.x - byPx);
  const y0 = Math.max(0, r.y - byPx);
  const x1 = Math.min(w, r.x + r.w + byPx);
  const y1 = Math.min(h, r.y + r.h + byPx);
  return { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
}

export function surroundRings(beam: Rect, frameWidth: number, frameHeight: number): SurroundGeometry {
  const side = Math.min(beam.w, beam.h);
  const gapPx = Math.max(2, Math.round(0.15 * side));
  const ringPx = Math.max(4, Math.round(0.25 * side));
  const a0 = growRect(beam, gapPx, frameWidth, frameHeight);
  const a1 = growRect(a0, ringPx, frameWidth, frameHeight);
  const b1 = growRect(a1, ringPx, frameWidth, frameHeight);
  return { beam, a0, a1, b1 };
}
