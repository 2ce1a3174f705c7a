/**
 * The open level of a run (analyser parallel, no field: the light the beam carries at full
 * transmission) and its standard uncertainty, from whichever of the three ways was given:
 * --open-level X±T (rectangular limit, u = T/√3), the median of the --open-window frames, or the
 * median of every frame of --open-video. A measured median has the standard error
 * √(π/2)·s/√n of normal frames (the asymptotic efficiency of the median, e.g. Kendall & Stuart).
 * Throws KerrError BAD_ARGUMENT when the open window holds fewer than 3 usable frames, and
 * checkOpenLevel's errors when the level lies below the brightest measured signal.
 */
import { KerrError } from '../errors.js';
import { median } from '../core/fit/robustScale.js';
import { checkOpenLevel } from '../core/gates/checkOpenLevel.js';

export interface OpenLevel {
  level: number | undefined;
  /** Standard uncertainty (undefined: not given) and how the level was obtained. */
  stdErr: number | undefined;
  note: string;
}

export interface OpenLevelInput {
  openLevel?: number;
  openLevelTolerance?: number;
  openWindowS?: [number, number];
  openVideoPath?: string;
  openWindowLevels: number[] | null;
  openVideoLevels: number[] | undefined;
  times: Float64Array;
  intensity: Float64Array;
  excluded: readonly (string | null)[];
}

function medianStdErr(vals: number[]): number {
  const mean = vals.reduce((s, x) => s + x, 0) / vals.length;
  const sd = Math.sqrt(vals.reduce((s, x) => s + (x - mean) ** 2, 0) / Math.max(1, vals.length - 1));
  return Math.sqrt(Math.PI / 2) * sd / Math.sqrt(vals.length);
}

export function openLevel(i: OpenLevelInput): OpenLevel {
  let out: OpenLevel = {
    level: i.openLevel,
    stdErr: i.openLevelTolerance !== undefined ? i.openLevelTolerance / Math.sqrt(3) : undefined,
    note: i.openLevelTolerance !== undefined ? `--open-level ±${i.openLevelTolerance} (rectangular, /√3)` : 'no tolerance given with --open-level (X±T)',
  };
  if (i.openWindowS && i.openWindowLevels) {
    const vals = i.openWindowLevels;
    const [a, b] = i.openWindowS;
    const n = i.times.length;
    if (vals.length < 3) throw new KerrError('BAD_ARGUMENT', `the open window ${a}–${b} s holds only ${vals.length} usable frame${vals.length === 1 ? '' : 's'}, at least 3 are needed (the video runs ${i.times[0]!.toFixed(2)}–${i.times[n - 1]!.toFixed(2)} s)`, { path: '--open-window', hint: 'Give START:END in seconds of this video where the analyser was parallel' });
    out = { level: median(vals), stdErr: medianStdErr(vals), note: `median of ${vals.length} open-window frames` };
  }
  if (i.openVideoLevels) {
    const vals = i.openVideoLevels;
    out = { level: median(vals), stdErr: medianStdErr(vals), note: `median of ${vals.length} open-video frames` };
  }
  if (out.level !== undefined) {
    checkOpenLevel(out.level, i.intensity, i.excluded.map((e) => !e), i.openWindowS ? '--open-window' : i.openVideoPath ? '--open-video' : '--open-level');
  }
  return out;
}
