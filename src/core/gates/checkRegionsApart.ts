/**
 * The beam, the dark region and the reference region must not overlap: a reference region on the
 * beam "corrects" exposure with the signal itself (issue 12 saw B +29 %), a dark region on the
 * beam subtracts signal. Each pair of given regions is tested for any shared pixel (rectangles
 * x ≤ px < x + w, y ≤ py < y + h). Pure; throws KerrError BAD_REGION naming the option.
 * @example checkRegionsApart({ beam: {x:0,y:0,w:10,h:10}, reference: {x:5,y:5,w:10,h:10} }) // throws
 */
import { KerrError } from '../../errors.js';

export interface RegionRect { x: number; y: number; w: number; h: number }

export function rectsOverlap(a: RegionRect, b: RegionRect): boolean {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
}

export function checkRegionsApart(r: { beam: RegionRect; beamOption: string; dark?: RegionRect; reference?: RegionRect }): void {
  const pairs: [RegionRect | undefined, string, RegionRect | undefined, string][] = [
    [r.reference, '--reference-roi', r.beam, `the beam region (${r.beamOption})`],
    [r.dark, '--dark-roi', r.beam, `the beam region (${r.beamOption})`],
    [r.reference, '--reference-roi', r.dark, 'the dark region (--dark-roi)'],
  ];
  for (const [a, option, b, other] of pairs) {
    if (a && b && rectsOverlap(a, b)) {
      throw new KerrError('BAD_REGION', `${option} ${a.x},${a.y},${a.w},${a.h} overlaps ${other} at ${b.x},${b.y},${b.w},${b.h}`, { path: option, hint: 'Put the region on a part of the frame away from the beam and from the other regions (check with kerrtrace inspect)' });
    }
  }
}
