/**
 * The command line's names for the inputs the core refers to in plain words. Core errors, gate
 * failures and warnings carry `inputs` (src/core/inputName.ts: 'beamRegion', 'gap', ...) instead
 * of option names; this table turns them into the options a user types, so a printed line still
 * says where to act, e.g. "... Give the beam region as x,y,w,h (--roi)".
 * @example withFlags('no beam found. Give the beam region', ['beamRegion']) // 'no beam found. Give the beam region (--roi)'
 */
import type { InputName } from '../src/core/inputName.js';

export const FLAG_FOR_INPUT: Readonly<Record<InputName, string>> = {
  beamRegion: '--roi',
  darkRegion: '--dark-roi',
  referenceRegion: '--reference-roi',
  gap: '--gap-mm',
  length: '--length-mm',
  electrodeHeight: '--electrode-height-mm',
  polariserAngle: '--polariser-angle-deg',
  syncOffset: '--offset-s',
  openLevel: '--open-level, --open-window or --open-video',
  baseline: '--baseline',
  transfer: '--transfer',
  cameraProfile: '--camera-profile',
  analyserAngles: '--angles',
};

/**
 * `line` with the options of `inputs` added in parentheses at the end, leaving out any the line
 * already names; the line unchanged when there is nothing to add.
 */
export function withFlags(line: string, inputs: readonly InputName[] | undefined): string {
  if (!inputs || inputs.length === 0) return line;
  const flags: string[] = [];
  for (const input of inputs) {
    const flag = FLAG_FOR_INPUT[input];
    if (flag === undefined || flags.includes(flag)) continue;
    const first = /--[a-z-]+/.exec(flag)?.[0];
    if (first !== undefined && new RegExp(`${first}(?![a-z-])`).test(line)) continue;
    flags.push(flag);
  }
  return flags.length === 0 ? line : `${line} (${flags.join('; ')})`;
}
