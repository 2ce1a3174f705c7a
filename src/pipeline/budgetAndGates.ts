/**
 * The uncertainty budget of a run's one fit (runUncertainty: statistics widened for correlated
 * residuals, sync offset, logger accuracy, geometry, open level, camera response, ramps) and the
 * gates the run must pass before its figures count (runGates). The run's own camera-response
 * check enters the budget as an uncorrected known effect (GUM 3.2.4 / F.2.4.5); an explicit
 * cameraResponseRel wins.
 */
import { runUncertainty } from './runUncertainty.js';
import { syncOffsetUncertaintyS } from '../core/uncertainty/syncOffsetUncertainty.js';
import { runGates } from '../core/gates/runGates.js';
import { frameNoise } from '../core/gates/frameNoise.js';
import { explainedShare } from '../core/gates/explainedShare.js';
import { LIQUIDS } from '../data/liquids.js';
import type { RunResult, RunWarning } from '../result/schema.js';
import type { FittedRun } from './fitRun.js';
import type { RunCell } from './runCell.js';
import type { SyncedRun } from './syncRun.js';
import type { OpenLevel } from './openLevel.js';

/** Default logger accuracy, ± percent of reading: a typical high-voltage divider and meter (common practice). */
export const DEFAULT_VOLTS_ACCURACY_PERCENT = 1;

export interface BudgetInput {
  fitted: FittedRun;
  synced: SyncedRun;
  /** The run's final exclusions (every reason). */
  excluded: readonly (string | null)[];
  cell: RunCell;
  open: OpenLevel;
  times: Float64Array;
  intensity: Float64Array;
  cameraResponse: NonNullable<RunResult['cameraResponse']>;
  voltsAccuracyPercent?: number;
  cameraResponseRel?: number;
  bitsPerPixel: number;
}

export interface BudgetAndGates {
  uncertainty: NonNullable<RunResult['uncertainty']>;
  offsetStdErrS: number | undefined;
  validity: NonNullable<RunResult['validity']>;
  /** Robust frame-to-frame noise of the frames used (linear units). */
  frameNoise: number;
  warnings: RunWarning[];
}

/** [lowest, highest] Kerr constant in the built-in liquid table, m/V². */
function liquidKerrRange(): [number, number] {
  let lo = Infinity, hi = 0;
  for (const l of LIQUIDS) for (const k of l.kerrConstants) { lo = Math.min(lo, k.valueMPerV2); hi = Math.max(hi, k.valueMPerV2); }
  return [lo, hi];
}

export function budgetAndGates(b: BudgetInput): BudgetAndGates {
  const { fitted, synced, cell, open, times } = b;
  const { fit, useIdx } = fitted;
  const check = b.cameraResponse.check;
  const responseU = check.standardUncertainty.value / fit.kerrConstant.value;
  const cameraResponseRel = b.cameraResponseRel ?? (Number.isFinite(responseU) && responseU > 0 ? responseU : undefined);
  const offsetStdErrS = syncOffsetUncertaintyS(synced.offsetStdErrS, fit.errorInflation, times, synced.logSteps);
  const uncertainty = runUncertainty({
    fit,
    fitInput: { ...fitted.fitInput, intensity: fitted.iUsed, voltageSigmaV: fitted.sUsed, onlyGivenStarts: true },
    voltageAtOffset: (off) => synced.voltageAt(Float64Array.from(useIdx, (f) => times[f]! - off)),
    offsetS: synced.offsetS, offsetStdErrS,
    voltsAccuracyPercent: b.voltsAccuracyPercent ?? DEFAULT_VOLTS_ACCURACY_PERCENT,
    gapM: cell.gapM, gapToleranceM: cell.gapToleranceM,
    lengthM: cell.effectiveLengthM, lengthToleranceM: cell.lengthToleranceM,
    ...(cameraResponseRel !== undefined ? { cameraResponseRel } : {}),
    ...(open.level !== undefined ? { openLevel: { stdErr: open.stdErr, note: open.note } } : {}),
    ...(b.cameraResponseRel === undefined && cameraResponseRel !== undefined && !check.checked
      ? { cameraResponseNote: `no response check (sweep below 0.8·V_π, no open level): B refitted at γ = 1 ± ${check.gamma.stdErr} (prior)` } : {}),
    bitsPerPixel: b.bitsPerPixel,
    frames: { voltageV: synced.voltage, intensity: b.intensity, include: Uint8Array.from(b.excluded, (e) => (e ? 0 : 1)), timesS: times },
  });
  const noise = frameNoise(fitted.iUsed);
  const gates = runGates({
    kerrConstant: fit.kerrConstant.value, kerrConstantStdErr: uncertainty.kerrConstant.combinedStdErr,
    halfWaveVoltageV: fit.halfWaveVoltage.value, halfWaveStdErrV: uncertainty.halfWaveVoltage.combinedStdErr,
    converged: fit.converged, fitReason: fit.reason, identifiable: fit.identifiable, maxVoltageOverHalfWave: fit.maxVoltageOverHalfWave,
    ampVpiCorrelation: fit.ampVpiCorrelation, relStdErrB: fit.relStdErrB,
    residualRms: fit.intensityNoise, signalAmplitude: fit.amplitude.value, frameNoise: noise, bitsPerPixel: b.bitsPerPixel,
    explainedShare: explainedShare(fitted.iUsed, Float64Array.from(fitted.vUsed, (v) => fit.predict(v))),
    syncAmbiguous: synced.sync.ambiguous, plausibleRangeMPerV2: liquidKerrRange(),
  });
  return { uncertainty, offsetStdErrS, validity: { valid: gates.failures.length === 0, failures: gates.failures }, frameNoise: noise, warnings: gates.warnings };
}
