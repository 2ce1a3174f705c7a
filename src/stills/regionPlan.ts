/**
 * Which rectangles of a photo are measured at full resolution and how their means become the
 * beam level, the background under the beam and the reference level:
 * - beam: the given or found beam rectangle (absent while the beam is still to be found on the
 *   block grid);
 * - background: the dark region when one is given; else the local surround from the rings a0, a1,
 *   b1 around the beam (core/regions/localSurround weights, as analyze), when ring A holds at least
 *   MIN_RING_PIXELS pixels; else none (0);
 * - reference: the grey-card region, when given.
 * Pure; throws nothing.
 * @example const plan = regionPlan({ beam, dark: null, surround: surroundRings(beam, w, h), reference: null }); planLevels(plan, samples).background
 */
import type { Rect, RegionSample } from '../media/types.js';
import { surroundWeights, type SurroundGeometry } from '../core/regions/localSurround.js';

/** Fewest pixels in ring A for a surround (as analyze: fewer leave no room for one). */
export const MIN_RING_PIXELS = 16;

export interface RegionPlan {
  rects: Rect[];
  beam: number | null;
  dark: number | null;
  /** Indices of a0, a1, b1 and the weights of [beam, a0, a1, b1]. */
  rings: { index: [number, number, number]; coefficients: [number, number, number, number]; geometry: SurroundGeometry } | null;
  reference: number | null;
}

export interface PlanRegions {
  beam: Rect | null;
  dark: Rect | null;
  /** Rings around the beam; used only without a dark region. */
  surround: SurroundGeometry | null;
  reference: Rect | null;
}

/** The plan; `surroundRoom` is false when rings were asked for but ring A is too small. */
export function regionPlan(r: PlanRegions): { plan: RegionPlan; surroundRoom: boolean } {
  const rects: Rect[] = [];
  const add = (rect: Rect): number => rects.push(rect) - 1;
  const beam = r.beam ? add(r.beam) : null;
  const dark = r.dark ? add(r.dark) : null;
  let rings: RegionPlan['rings'] = null;
  let surroundRoom = true;
  if (!r.dark && r.surround) {
    const w = surroundWeights(r.surround);
    if (w.ringACount >= MIN_RING_PIXELS) rings = { index: [add(r.surround.a0), add(r.surround.a1), add(r.surround.b1)], coefficients: w.coefficients, geometry: r.surround };
    else surroundRoom = false;
  }
  const reference = r.reference ? add(r.reference) : null;
  return { plan: { rects, beam, dark, rings, reference }, surroundRoom };
}

/** Background under the beam from the means of [beam, a0, a1, b1]. */
export function surroundLevel(coefficients: readonly number[], a0: number, a1: number, b1: number): number {
  return coefficients[1]! * a0 + coefficients[2]! * a1 + coefficients[3]! * b1;
}

/** The levels of one photo from its measured rectangles (NaN where the plan has no such region; background 0 without one). */
export function planLevels(plan: RegionPlan, s: readonly RegionSample[]): { beam: number; beamClipped: number; background: number; dark: number; surround: number; reference: number } {
  const at = (k: number | null): number => (k === null ? NaN : s[k]!.luma);
  const dark = at(plan.dark);
  const surround = plan.rings ? surroundLevel(plan.rings.coefficients, at(plan.rings.index[0]), at(plan.rings.index[1]), at(plan.rings.index[2])) : NaN;
  return {
    beam: at(plan.beam),
    beamClipped: plan.beam === null ? NaN : s[plan.beam]!.clippedFraction,
    background: plan.dark !== null ? dark : plan.rings ? surround : 0,
    dark, surround,
    reference: at(plan.reference),
  };
}
