/**
 * A pixel rectangle in the displayed frame (rotation applied), top-left origin, in whole pixels:
 * column `x` and row `y` of the top-left corner (0-based), width `w` and height `h`.
 * The core's one geometry type: regions (beam, surround, dark, reference), map windows and
 * decoding crops all use it. The media layer re-exports it from `src/media/types.ts`.
 * @example const beam: Rect = { x: 100, y: 80, w: 40, h: 30 }; // columns 100..139, rows 80..109
 */
export interface Rect {
  x: number;
  y: number;
  w: number;
  h: number;
}
