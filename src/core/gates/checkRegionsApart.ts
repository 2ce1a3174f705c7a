/**
 * The beam, the dark region and the reference region must not overlap: a reference region on the
 * beam "corrects" exposure with the signal itself (issue 12 saw B +29 %), a dark region on the
 * beam subtracts signal. Each pair of given regions is tested for any shared pixel (rectangles
 * x ≤ px < x + w, y ≤ py < y + h). Pure; throws KerrError BAD_REGION naming both regions in
 * words and, as `inputs`, by their input names (the command line adds its option names).
 * @example checkRegionsApart({ beam: {x:0,y:0,w:10,h:10}, reference: {x:5,y:5,w:10,h:10} }) // throws
 */
import { KerrError } from '../../errors.js';
import type { InputName } from '../inputName.js';

export interface RegionRect { x: number; y: number; w: number; h: number }

export function rectsOverlap(a: RegionRect, b: RegionRect): boolean {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
}

/**
 * `beamOption` is how the caller names the beam region's source in the message (e.g. "found
 * automatically"); the error's `inputs` name the two regions that overlap, for the caller to
 * turn into option names.
 */
export function checkRegionsApart(r: { beam: RegionRect; beamOption: string; dark?: RegionRect; reference?: RegionRect }): void {
  type Named = [RegionRect | undefined, string, InputName];
  const reference: Named = [r.reference, 'the reference region', 'referenceRegion'];
  const dark: Named = [r.dark, 'the dark region', 'darkRegion'];
  const beam: Named = [r.beam, `the beam region (${r.beamOption})`, 'beamRegion'];
  for (const [[a, name, input], [b, other, otherInput]] of [[reference, beam], [dark, beam], [reference, dark]] as const) {
    if (a && b && rectsOverlap(a, b)) {
      throw new KerrError('BAD_REGION', `${name} ${a.x},${a.y},${a.w},${a.h} overlaps ${other} at ${b.x},${b.y},${b.w},${b.h}`, {
        path: input,
        hint: 'Put the region on a part of the frame away from the beam and from the other regions (check with kerrtrace inspect)',
        inputs: [input, otherInput],
      });
    }
  }
}
