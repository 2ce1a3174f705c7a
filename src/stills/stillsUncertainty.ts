/**
 * The uncertainty budget of a photo run, from the core's term functions
 * (core/uncertainty/uncertaintyBudget: GUM, JCGM 100:2008), with the terms that apply to photos:
 * - statistical: V_π's relative standard error from the fit (correlated residuals accounted for);
 * - voltage calibration: the meter's accuracy, ± percent of reading, rectangular (u = a/√3);
 * - gap and length: the given tolerances, rectangular (u = a/√3);
 * - open level (only when the amplitude was held at an open level): V_π refitted with the open
 *   level ± its standard uncertainty, u_r = |V_π(+) − V_π(−)|/(2·V_π) (one-sided when level − u
 *   would not be positive); 0 with a note when the open level's uncertainty is not known;
 * - camera response: the relative standard uncertainty the response check puts on B, when known.
 * No sync term (each photo carries its voltage in the map or its file name: there is no second
 * clock) and no ramp term (a photo series has no rising and falling ramps in time).
 * Pure apart from calling the fit.
 * @example stillsUncertainty({ fit, curveInput, voltsAccuracyPercent: 1, gapM: 0.004, gapToleranceM: 5e-5, lengthM: 0.04, lengthToleranceM: 1e-4 }).kerrConstant.relativeCombined
 */
import { fitKerrCurve, type KerrCurveFit, type KerrCurveInput } from '../core/fit/fitKerrCurve.js';
import { kerrUncertaintyBudget, rectangularRelative, type UncertaintyBudget } from '../core/uncertainty/uncertaintyBudget.js';

export interface StillsUncertaintyInput {
  fit: KerrCurveFit;
  /** The input the fit ran on (the photos used), to refit with the open level moved. */
  curveInput: KerrCurveInput;
  /** Meter accuracy, ± percent of reading (limits). */
  voltsAccuracyPercent: number;
  gapM: number;
  gapToleranceM: number;
  /** Length the fit used (effective length when given) and its tolerance. */
  lengthM: number;
  lengthToleranceM: number;
  /** Standard uncertainty of the open level (undefined: not known) and how it was obtained; omit when no open level was used. */
  openLevel?: { stdErr: number | undefined; note: string };
  /** Relative standard uncertainty the camera response puts on B, and where it comes from. */
  cameraResponse?: { rel: number; note: string };
}

/** Relative change of V_π for a 1σ change of the open level, by refitting. */
function openLevelRelative(i: StillsUncertaintyInput, u: number): number {
  const level = i.curveInput.openLevel!;
  const vpi = i.fit.halfWaveVoltage.value;
  const at = (l: number): number => fitKerrCurve({ ...i.curveInput, openLevel: l, halfWaveGuessesV: [vpi], onlyGivenStarts: true }).halfWaveVoltage.value;
  const plus = at(level + u);
  const below = level - u > 0;
  const minus = below ? at(level - u) : vpi;
  const rel = Math.abs(plus - minus) / ((below ? 2 : 1) * vpi);
  return Number.isFinite(rel) ? rel : NaN;
}

export function stillsUncertainty(i: StillsUncertaintyInput): { kerrConstant: UncertaintyBudget; halfWaveVoltage: UncertaintyBudget } {
  const vpi = i.fit.halfWaveVoltage.value;
  let open: { openLevelRel: number; openLevelNote: string } | undefined;
  if (i.openLevel && i.curveInput.openLevel !== undefined) {
    const u = i.openLevel.stdErr;
    open = u !== undefined && u > 0
      ? { openLevelRel: openLevelRelative(i, u), openLevelNote: `V_π refitted with the open level ± ${u.toPrecision(2)} (${i.openLevel.note})` }
      : { openLevelRel: 0, openLevelNote: `open level uncertainty not known (${i.openLevel.note})` };
  }
  return kerrUncertaintyBudget({
    kerrConstant: i.fit.kerrConstant.value,
    halfWaveVoltageV: vpi,
    statisticalRel: (i.fit.halfWaveVoltage.stdErr ?? NaN) / vpi,
    syncRel: 0,
    syncNote: 'photos carry their voltage (voltage map or file names): no sync term',
    rampNote: 'a photo series has no rising and falling ramps in time: no ramp term',
    ...(open ?? {}),
    voltageCalibrationRel: rectangularRelative(i.voltsAccuracyPercent, 100),
    voltageCalibrationNote: i.voltsAccuracyPercent > 0 ? `voltage meter accuracy ±${i.voltsAccuracyPercent} % of reading (rectangular, /√3)` : 'voltage meter accuracy given as 0',
    gapRel: rectangularRelative(i.gapToleranceM, i.gapM),
    gapNote: i.gapToleranceM > 0 ? `gap ±${(i.gapToleranceM * 1000).toPrecision(3)} mm (rectangular, /√3)` : 'no gap tolerance given',
    lengthRel: rectangularRelative(i.lengthToleranceM, i.lengthM),
    lengthNote: i.lengthToleranceM > 0 ? `length ±${(i.lengthToleranceM * 1000).toPrecision(3)} mm (rectangular, /√3)` : 'no length tolerance given',
    ...(i.cameraResponse ? { cameraResponseRel: i.cameraResponse.rel, cameraResponseNote: i.cameraResponse.note } : {}),
  });
}
