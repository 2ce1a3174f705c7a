/**
 * Checks that a voltage log can modulate a Kerr cell enough to synchronise a video with it: its
 * largest |V| must reach `minDriveV` (50 V: a liquid cell needs kilovolts, common practice), and
 * it must not hold a single level — the spread of V² between its 2nd and 98th percentiles must be
 * at least `singleLevelFraction` of the 98th percentile of V².
 *
 * Throws KerrError NOT_IDENTIFIABLE (path `log`) with a hint on units or on recording a ramp.
 * @example checkDriveModulates(logVoltageV, 50, 0.1) // returns nothing for a 0–10 kV ramp
 */
import { KerrError } from '../../errors.js';
import { roundTo } from './roundTo.js';

export function checkDriveModulates(logVoltageV: Float64Array, minDriveV: number, singleLevelFraction: number): void {
  const logCount = logVoltageV.length;
  let maxAbsV = 0;
  for (let i = 0; i < logCount; i++) maxAbsV = Math.max(maxAbsV, Math.abs(logVoltageV[i]));
  if (maxAbsV < minDriveV) {
    throw new KerrError('NOT_IDENTIFIABLE', `the log's voltage never exceeds ${roundTo(maxAbsV, 3)} V, too little to modulate a Kerr cell, so the video cannot be synchronised with it`, {
      path: 'log',
      hint: 'check that the voltage column is the supply output and that its unit is in the header (a log in kV needs a name like voltage_kV)',
    });
  }
  const squares = Float64Array.from(logVoltageV, (v) => v * v).sort();
  const lowSq = squares[Math.floor(0.02 * (logCount - 1))];
  const highSq = squares[Math.ceil(0.98 * (logCount - 1))];
  if (highSq - lowSq < singleLevelFraction * highSq) {
    throw new KerrError('NOT_IDENTIFIABLE', `the log holds a single voltage level (about ${roundTo(Math.sqrt(highSq), 3)} V), so the video cannot be synchronised with it`, {
      path: 'log',
      hint: 'record a ramp or steps while filming, or give the offset',
      inputs: ['syncOffset'],
    });
  }
}
