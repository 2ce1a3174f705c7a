/**
 * The angle table of a stepped calibration recording: a CSV with the video time (s) and the
 * analyser angle (degrees, 0 = parallel to the polariser) at which the analyser was set from that
 * time on, one row per step, e.g.
 *   time_s,angle_deg
 *   0,0
 *   2.1,15
 * Comma, semicolon or tab separated; a header line (any text) is skipped; blank lines and lines
 * starting with # are ignored. Times must increase. Pure.
 * @throws KerrError BAD_CSV naming the line, for a row that is not two numbers or a time that
 *   does not increase, or fewer than 2 rows.
 * @example parseAngleTable('0,0\n2,15\n', 'steps.csv') // { timeS: [0, 2], angleDeg: [0, 15] }
 */
import { KerrError } from '../errors.js';

export interface AngleTable {
  timeS: number[];
  angleDeg: number[];
}

export function parseAngleTable(text: string, path: string): AngleTable {
  const timeS: number[] = [];
  const angleDeg: number[] = [];
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  lines.forEach((raw, k) => {
    const line = raw.trim();
    if (line === '' || line.startsWith('#')) return;
    const cells = line.split(/[,;\t]/).map((c) => c.trim());
    const t = Number(cells[0]), a = Number(cells[1]);
    if (cells.length < 2 || cells[0] === '' || cells[1] === '' || !Number.isFinite(t) || !Number.isFinite(a)) {
      if (timeS.length === 0 && !/^-?[\d.]/.test(cells[0] ?? '')) return; // the header
      throw new KerrError('BAD_CSV', `${path}:${k + 1}: expected a time in s and an angle in degrees, got "${line}"`, { path: `${path}:${k + 1}`, hint: 'Write one "time_s,angle_deg" row per step' });
    }
    if (timeS.length > 0 && !(t > timeS[timeS.length - 1]!)) {
      throw new KerrError('BAD_CSV', `${path}:${k + 1}: the time ${t} s does not come after ${timeS[timeS.length - 1]} s`, { path: `${path}:${k + 1}`, hint: 'List the steps in the order they were recorded' });
    }
    timeS.push(t);
    angleDeg.push(a);
  });
  if (timeS.length < 2) throw new KerrError('BAD_CSV', `${path} lists ${timeS.length} angle step(s)`, { path, hint: 'Give at least two rows of time_s,angle_deg (better: 0° to 90° in 15° steps)' });
  return { timeS, angleDeg };
}

/** Rows closer than this (median interval, s) are a continuous record of the angle, not steps. */
export const CONTINUOUS_BELOW_S = 0.5;

/**
 * The angle at each frame time. A stepped table (median row interval ≥ 0.5 s): the angle of the
 * last step, or NaN within `settleS` after a step (the analyser is being turned) and before the
 * first step. A continuous record (rows closer than that, e.g. from an encoder on a turntable):
 * interpolated linearly between rows, NaN outside them.
 */
export function anglesAtTimes(table: AngleTable, timesS: ArrayLike<number>, settleS: number): Float64Array {
  const out = new Float64Array(timesS.length);
  const gaps = table.timeS.slice(1).map((t, k) => t - table.timeS[k]!).sort((a, b) => a - b);
  const continuous = gaps[gaps.length >> 1]! < CONTINUOUS_BELOW_S;
  const last = table.timeS.length - 1;
  let k = 0;
  for (let i = 0; i < timesS.length; i++) {
    const t = timesS[i]!;
    while (k + 1 < table.timeS.length && table.timeS[k + 1]! <= t) k++;
    if (t < table.timeS[0]!) out[i] = NaN;
    else if (continuous) {
      out[i] = k === last ? (t === table.timeS[last]! ? table.angleDeg[last]! : NaN)
        : table.angleDeg[k]! + ((t - table.timeS[k]!) / (table.timeS[k + 1]! - table.timeS[k]!)) * (table.angleDeg[k + 1]! - table.angleDeg[k]!);
    } else out[i] = t < table.timeS[k]! + settleS ? NaN : table.angleDeg[k]!;
  }
  return out;
}
