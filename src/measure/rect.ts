/**
 * Regions of interest given on the command line as "x,y,w,h": pixel column and row of the
 * top-left corner in the displayed frame (rotation applied, 0-based), then width and height in
 * pixels. `parseRect` checks the form; `validateRect` (src/core/regions/validateRect.ts, re-exported here)
 * checks it against a frame size.
 *
 * @throws KerrError BAD_REGION: not four whole numbers, negative corner, zero or negative size,
 *   or (validateRect) reaching outside the frame; the message names the option and, for the
 *   frame check, states the frame size.
 * @example parseRect('100,80,40,30', '--roi') // { x: 100, y: 80, w: 40, h: 30 }
 * @example validateRect({ x: 300, y: 0, w: 40, h: 30 }, 320, 240, '--roi') // throws: reaches x = 340
 */
import { KerrError, invalid } from '../errors.js';
import type { Rect } from '../core/regions/rect.js';

// The frame check lives in the core (pure geometry); re-exported for the callers that import it from here.
export { validateRect } from '../core/regions/validateRect.js';

const RECT_PATTERN = /^\s*(-?\d+)\s*,\s*(-?\d+)\s*,\s*(-?\d+)\s*,\s*(-?\d+)\s*$/;

export function parseRect(text: string, optionName: string): Rect {
  const m = RECT_PATTERN.exec(text);
  if (!m) {
    throw invalid('a region as x,y,w,h in whole pixels (e.g. 120,80,40,40)', optionName, text,
      'Give four whole numbers separated by commas: left, top, width, height', 'BAD_REGION');
  }
  const [x, y, w, h] = [Number(m[1]), Number(m[2]), Number(m[3]), Number(m[4])];
  if (w <= 0 || h <= 0) {
    throw invalid('a region with positive width and height', optionName, text,
      'Width and height (the 3rd and 4th numbers) must be at least 1 pixel', 'BAD_REGION');
  }
  if (x < 0 || y < 0) {
    throw invalid('a region with its corner inside the frame (x and y of 0 or more)', optionName, text,
      'x and y count pixels from the top-left corner of the frame', 'BAD_REGION');
  }
  return { x, y, w, h };
}

/** Smallest rectangle holding all the given ones. */
export function boundingRect(rects: readonly Rect[]): Rect {
  if (rects.length === 0) throw new KerrError('INTERNAL', 'boundingRect needs at least one rectangle');
  let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity;
  for (const r of rects) {
    x0 = Math.min(x0, r.x);
    y0 = Math.min(y0, r.y);
    x1 = Math.max(x1, r.x + r.w);
    y1 = Math.max(y1, r.y + r.h);
  }
  return { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
}
