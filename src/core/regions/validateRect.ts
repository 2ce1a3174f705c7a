/**
 * Checks a pixel rectangle against a frame size: whole-pixel corner, width and height of at least
 * 1 pixel, and every pixel inside the `frameWidth` × `frameHeight` frame (displayed size, rotation
 * applied), i.e. x ≥ 0, y ≥ 0, x + w ≤ frameWidth, y + h ≤ frameHeight. Returns the rectangle.
 *
 * `regionName` is how the caller names the region in the message (an option name on the command
 * line, "the beam region" elsewhere); it is also the error's `path`. Pure.
 * @throws KerrError BAD_REGION: not whole pixels, empty, or reaching outside the frame; the message
 *   states the frame size.
 * @example validateRect({ x: 300, y: 0, w: 40, h: 30 }, 320, 240, 'the beam region') // throws: reaches x = 340
 */
import { KerrError, invalid } from '../../errors.js';
import type { Rect } from './rect.js';

export function validateRect(rect: Rect, frameWidth: number, frameHeight: number, regionName: string): Rect {
  const shown = `${rect.x},${rect.y},${rect.w},${rect.h}`;
  const whole = [rect.x, rect.y, rect.w, rect.h].every(Number.isInteger);
  if (!whole || rect.w <= 0 || rect.h <= 0) {
    throw invalid('a region with whole-pixel corner and positive width and height', regionName, shown,
      'Width and height must be at least 1 pixel', 'BAD_REGION');
  }
  const right = rect.x + rect.w;
  const bottom = rect.y + rect.h;
  if (rect.x < 0 || rect.y < 0 || right > frameWidth || bottom > frameHeight) {
    const reach = right > frameWidth ? `reaches x = ${right}` : bottom > frameHeight ? `reaches y = ${bottom}` : 'starts before the frame';
    throw new KerrError('BAD_REGION',
      `region ${shown} for ${regionName} ${reach}, outside the ${frameWidth}x${frameHeight} frame`,
      {
        path: regionName,
        hint: `Keep x+w ≤ ${frameWidth} and y+h ≤ ${frameHeight} (sizes as displayed, rotation applied; \`kerrtrace inspect\` prints them)`,
        details: { rect, frameWidth, frameHeight },
      });
  }
  return rect;
}
