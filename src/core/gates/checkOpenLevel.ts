/**
 * An open level (analyser parallel, no field) is the most light the beam can give: the crossed
 * run's signal I = I_floor + I_amp·sin²(2θ)·sin²(δ/2) never exceeds it by more than the floor. An
 * open level below the brightest measured signal is impossible — wrong region, wrong clip, a
 * different exposure — and would force a wrong V_π. Refused when the 99th percentile of the used
 * frames' intensity exceeds OPEN_LEVEL_MARGIN (1.1) × the open level (the margin covers the floor
 * and noise). Pure; throws KerrError BAD_ARGUMENT with `path` = `source` (how the caller names where
 * the level came from: an option name on the command line, a field name elsewhere) and input
 * `openLevel`.
 * @example checkOpenLevel(0.3, intensities, usable, 'openLevel') // throws when the beam reaches 0.5
 */
import { KerrError } from '../../errors.js';

export const OPEN_LEVEL_MARGIN = 1.1;

export function checkOpenLevel(openLevel: number, intensity: Float64Array, usable: ArrayLike<boolean | number>, source: string): void {
  const vals: number[] = [];
  for (let f = 0; f < intensity.length; f++) if (usable[f] && Number.isFinite(intensity[f]!)) vals.push(intensity[f]!);
  if (vals.length < 10) return;
  vals.sort((a, b) => a - b);
  const p99 = vals[Math.min(vals.length - 1, Math.floor(0.99 * vals.length))]!;
  if (!(openLevel > 0) || p99 > OPEN_LEVEL_MARGIN * openLevel) {
    throw new KerrError('BAD_ARGUMENT', `the open level ${openLevel.toPrecision(3)} is below the brightest measured signal (${p99.toPrecision(3)}, 99th percentile): the analyser-parallel light cannot be dimmer than the crossed run`, { path: source, hint: 'Check that the open level comes from the same beam region, camera settings and clip of the analyser set parallel', inputs: ['openLevel'] });
  }
}
