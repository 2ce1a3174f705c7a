/**
 * The one Kerr fit of a run: fitKerrCurve on every frame not left out (frameExclusions, syncRun),
 * weighted by each frame's voltage uncertainty, started from the sync's V_π guess when it gave
 * one, with the open level when one is known. No frame is added or removed after it: every
 * figure and product of the run comes from this fit.
 * Throws KerrError NOT_IDENTIFIABLE when the voltage stays at zero in the frames used.
 */
import { KerrError } from '../errors.js';
import { fitKerrCurve, type KerrCurveFit, type KerrCurveInput } from '../core/fit/fitKerrCurve.js';
import type { RunWarning } from '../result/schema.js';
import type { RunCell } from './runCell.js';

export interface FitRunInput {
  cell: RunCell;
  voltage: Float64Array;
  voltageSigmaV: Float64Array;
  intensity: Float64Array;
  excluded: readonly (string | null)[];
  openLevel: number | undefined;
  vpiHint: number | undefined;
  /** Largest |V| in the whole log, V. */
  vAbsMax: number;
  robust: boolean;
}

export interface FittedRun {
  fit: KerrCurveFit;
  /** Frames used, in time order. */
  useIdx: number[];
  vUsed: Float64Array;
  iUsed: Float64Array;
  sUsed: Float64Array;
  /** The fit's settings without the data, for refits of the same model (budget, channels). */
  fitInput: Omit<KerrCurveInput, 'voltageV' | 'intensity'>;
  warnings: RunWarning[];
}

export function fitRun(i: FitRunInput): FittedRun {
  const useIdx: number[] = [];
  for (let f = 0; f < i.excluded.length; f++) if (!i.excluded[f]) useIdx.push(f);
  const vUsed = Float64Array.from(useIdx, (f) => i.voltage[f]!);
  const iUsed = Float64Array.from(useIdx, (f) => i.intensity[f]!);
  const sUsed = Float64Array.from(useIdx, (f) => i.voltageSigmaV[f]!);
  let vSpread = 0;
  for (const v of vUsed) vSpread = Math.max(vSpread, Math.abs(v));
  if (vSpread < 0.02 * i.vAbsMax || vSpread === 0) {
    throw new KerrError('NOT_IDENTIFIABLE', 'the voltage stays at zero in the frames that overlap the video', { path: '--volts', hint: 'Record a sweep while filming, or check --offset-s' });
  }
  const { cell } = i;
  const fitInput = {
    effectiveLengthM: cell.effectiveLengthM, gapM: cell.gapM, polariserAngleDeg: cell.polariserAngleDeg,
    ...(cell.staticRetardanceRad !== undefined ? { staticRetardanceRad: cell.staticRetardanceRad } : {}),
    ...(i.openLevel !== undefined ? { openLevel: i.openLevel } : {}),
    ...(i.vpiHint !== undefined ? { halfWaveGuessesV: [i.vpiHint] } : {}),
    robust: i.robust,
  };
  const fit = fitKerrCurve({ voltageV: vUsed, intensity: iUsed, voltageSigmaV: sUsed, ...fitInput });
  const warnings: RunWarning[] = [];
  if (!fit.identifiable) {
    warnings.push({ code: 'not-identifiable', message: `the sweep reaches only about ${(fit.maxVoltageOverHalfWave * 100).toFixed(0)}% of the half-wave voltage, so brightness and half-wave voltage trade off (correlation ${fit.ampVpiCorrelation.toFixed(3)}, relative error of B ${(fit.relStdErrB * 100).toFixed(0)}%). Record an open level (analyser parallel, no field: --open-window, --open-video or --open-level) or sweep higher if the cell allows it safely`, guideSection: 'open-level' });
  }
  if (!fit.converged) warnings.push({ code: 'fit-not-converged', message: `the fit stopped without converging (${fit.reason})` });
  return { fit, useIdx, vUsed, iUsed, sUsed, fitInput, warnings };
}
