/**
 * A photo series as a run result: the RunResult (result.json, source "stills") and one TraceRow
 * per photo, built by the one run-record builder (src/result/buildRunRecord) with the same
 * figures, formulas, budget and gates as a video run, so that the reports and `compare` treat a
 * stills run like a video run.
 *
 * Order: the fit (fitStillsSeries: photos left out by reason) → the open level checked against the
 * brightest photos (core/gates/checkOpenLevel) → derived figures from the core (floor fraction,
 * contrast ratio with their uncertainties, linearised cross-check) → the camera-response check →
 * the uncertainty budget (stillsUncertainty) → the gates (stillsGates) → the record, built once.
 *
 * What differs from a video run, and how it is filled:
 * - sync: there is no second clock (each photo's voltage is given), so the offset is 0 s, marked
 *   manual, with no search curve; the budget has no sync or ramp term.
 * - trace time: timeS is the EXIF capture time in s after the earliest photo when every photo
 *   carries one (captureTimesS), else the photo's position 0, 1, 2 ... in name order;
 *   options.timeBasis says which ("exif-capture-time" or "photo-index").
 * - frames are photos: total, used, excluded by reason ("clipped", "unreadable", "not-finite");
 *   events are the clipped photos (size = clipped fraction of the beam region).
 * - log describes the voltages: rows = photos given a voltage, spanS = capture-time span (0 without
 *   capture times), no current column, no temperature.
 * - camera: photo width and height, fps null, transfer the curve(s) used ("srgb", or e.g.
 *   "srgb+linear" for a mixed series), range "full" (photos are full-range).
 * - regions: the beam (given or found: beamAuto), the dark region or the outer rectangle of the
 *   surround rings (surround), the reference region.
 * - model.darkLevel: median over the used photos of the subtracted background (dark region or
 *   surround) on the intensity scale (background / relative exposure); 0 when nothing was subtracted.
 * Warnings: the reader's (exposure, clipping, regions...) then the fit's ("not-identifiable",
 * "fit-not-converged", "floor-not-positive", "linearised-disagrees"), the camera response's and
 * the gates'. Pure: the caller supplies the clock (createdAt), versions and input hashes.
 * @throws as fitStillsSeries (too few usable photos: BAD_ARGUMENT; fit failure: FIT_FAILED);
 *   checkOpenLevel (an open level below the brightest photos: BAD_ARGUMENT naming its option).
 * @example const { result, trace } = stillsRunResult({ series, cell, fitOptions: {}, label: 'run1', createdAt, tool, inputs, options: {} });
 */
import { quantity } from '../quantity.js';
import type { InputFile, RunEvent, RunResult, RunWarning, TraceRow } from '../result/schema.js';
import type { GuideAnchor } from '../report/guide.js';
import { median } from '../measure/exposure.js';
import type { StillsSeries } from './readStillsSeries.js';
import { fitStillsSeries, type StillsFit } from './fitStillsSeries.js';
import { linearisedCrossCheck } from '../core/fit/linearisedCrossCheck.js';
import { linearisedDisagreement } from '../core/fit/linearisedDisagreement.js';
import { contrastRatio, usedVoltageRange } from '../core/figures/contrastRatio.js';
import { floorFractionUncertainty } from '../core/figures/floorFraction.js';
import { checkOpenLevel } from '../core/gates/checkOpenLevel.js';
import { buildRunRecord } from '../result/buildRunRecord.js';
import { stillsCameraResponse, type StillsResponseChoice } from './stillsCameraResponse.js';
import { stillsUncertainty } from './stillsUncertainty.js';
import { stillsGates } from './stillsGates.js';

export interface StillsCell {
  lengthM: number;
  effectiveLengthM: number;
  gapM: number;
  polariserAngleDeg: number;
}

/** Accuracy and tolerances for the budget (absent: the defaults below, tolerances 0). */
export interface StillsBudgetSettings {
  /** Voltage meter accuracy, ± percent of reading (default DEFAULT_PHOTO_VOLTS_ACCURACY_PERCENT). */
  voltsAccuracyPercent?: number;
  gapToleranceM?: number;
  lengthToleranceM?: number;
}

/** Default meter accuracy, ± percent of reading: a typical high-voltage divider and meter (common practice; the same default as analyze's logger). */
export const DEFAULT_PHOTO_VOLTS_ACCURACY_PERCENT = 1;

export interface StillsRunInput {
  series: StillsSeries;
  cell: StillsCell;
  fitOptions: { openLevel?: number; staticRetardanceRad?: number; robust?: boolean };
  /** Where the open level came from (its option, named when it is refused) and its standard uncertainty. */
  openLevelSource?: { option: string; stdErr: number | undefined; note: string };
  budget?: StillsBudgetSettings;
  /** The response that turned codes into light (default: the series' first transfer, from the files). */
  response?: StillsResponseChoice;
  label: string;
  /** ISO-8601 time of the run (the caller's clock). */
  createdAt: string;
  tool: RunResult['tool'];
  inputs: { stills: InputFile[]; volts?: InputFile; cameraProfile?: InputFile };
  /** The options as given (SI or as typed); the series' own choices are added to them. */
  options: Record<string, unknown>;
  /** Warnings of the run's edge work (e.g. regions.png not drawn), listed after the rest. */
  edgeWarnings?: RunWarning[];
}

export interface StillsRun {
  result: RunResult;
  trace: TraceRow[];
  fit: StillsFit;
}

type Warn = (code: string, message: string, guideSection?: GuideAnchor) => void;

export function stillsRunResult(input: StillsRunInput): StillsRun {
  const { series, cell, fitOptions } = input;
  const fitted = fitStillsSeries({
    voltageV: series.voltageV, intensity: series.intensity, clippedFraction: series.clippedFraction,
    effectiveLengthM: cell.effectiveLengthM, gapM: cell.gapM, polariserAngleDeg: cell.polariserAngleDeg,
    preExcluded: series.unreadable.map((u) => (u === null ? null : 'unreadable')),
    ...(fitOptions.openLevel !== undefined ? { openLevel: fitOptions.openLevel } : {}),
    ...(fitOptions.staticRetardanceRad !== undefined ? { staticRetardanceRad: fitOptions.staticRetardanceRad } : {}),
    ...(fitOptions.robust !== undefined ? { robust: fitOptions.robust } : {}),
  });
  const { fit, usedIndex } = fitted;
  if (fitOptions.openLevel !== undefined) checkOpenLevel(fitOptions.openLevel, series.intensity, fitted.used, input.openLevelSource?.option ?? '--open-level');
  const warnings: RunWarning[] = series.warnings.slice();
  const warn: Warn = (code, message, guideSection) => { warnings.push(guideSection ? { code, message, guideSection } : { code, message }); };
  fitWarnings(fitted, warn);
  const [vMin, vMax] = usedVoltageRange(series.voltageV, usedIndex);
  const contrast = contrastRatio(fit, vMin, vMax);
  if (contrast.floorNotPositive) warn('floor-not-positive', 'the fitted floor is at or below the dark level, so the contrast ratio is unbounded; check the dark and beam regions', 'camera-still');
  const vUsed = fitted.curveInput.voltageV, iUsed = fitted.curveInput.intensity;
  const linearised = linearisedCrossCheck({
    voltageV: vUsed, intensity: iUsed, outliers: fit.outliers,
    floorLevel: fit.floorLevel.value, amplitude: fit.amplitude.value, halfWaveVoltageV: fit.halfWaveVoltage.value, fitKerrConstant: fit.kerrConstant,
    polariserAngleDeg: cell.polariserAngleDeg, gapM: cell.gapM, effectiveLengthM: cell.effectiveLengthM,
  });
  const disagreement = linearisedDisagreement(linearised, fit.kerrConstant, fit.identifiable);
  if (disagreement !== null) warn('linearised-disagrees', disagreement);
  const response = stillsCameraResponse({
    fit, voltageV: vUsed, intensity: iUsed, effectiveLengthM: cell.effectiveLengthM, gapM: cell.gapM, polariserAngleDeg: cell.polariserAngleDeg,
    staticRetardanceRad: fitOptions.staticRetardanceRad ?? 0, ...(fitOptions.openLevel !== undefined ? { openLevel: fitOptions.openLevel } : {}),
    response: input.response ?? { transfer: series.transfers[0] ?? 'srgb', transferFromOption: false },
  });
  warnings.push(...response.warnings);
  const b = input.budget ?? {};
  const floor = floorFractionUncertainty(fitted.floorFraction, { gammaUncertainty: response.record.check.gammaUncertainty ?? 0 });
  const uncertainty = stillsUncertainty({
    fit, curveInput: fitted.curveInput,
    voltsAccuracyPercent: b.voltsAccuracyPercent ?? DEFAULT_PHOTO_VOLTS_ACCURACY_PERCENT,
    gapM: cell.gapM, gapToleranceM: b.gapToleranceM ?? 0, lengthM: cell.effectiveLengthM, lengthToleranceM: b.lengthToleranceM ?? 0,
    ...(fitOptions.openLevel !== undefined ? { openLevel: { stdErr: input.openLevelSource?.stdErr, note: input.openLevelSource?.note ?? 'open level given' } } : {}),
    ...(response.cameraResponse ? { cameraResponse: response.cameraResponse } : {}),
  });
  const gates = stillsGates({ fit, kerrStdErr: uncertainty.kerrConstant.combinedStdErr, halfWaveStdErrV: uncertainty.halfWaveVoltage.combinedStdErr, voltageV: vUsed, intensity: iUsed });
  warnings.push(...gates.warnings, ...(input.edgeWarnings ?? []));
  const { trace, events } = stillsTrace(series, fitted);
  const result = buildRunRecord({
    label: input.label, createdAt: input.createdAt, source: 'stills', tool: input.tool,
    inputs: { stills: input.inputs.stills, ...(input.inputs.volts ? { volts: input.inputs.volts } : {}), ...(input.inputs.cameraProfile ? { cameraProfile: input.inputs.cameraProfile } : {}) },
    options: stillsOptions(input),
    cell: { ...cell, electrodeHeightM: null, wavelengthNm: null },
    camera: { width: series.width, height: series.height, fps: null, variableFrameRate: false, transfer: usedTransfers(series).join('+'), range: 'full' },
    regions: stillsRegions(series),
    figures: { kerrConstant: fit.kerrConstant, halfWaveVoltage: fit.halfWaveVoltage, syncOffset: quantity(0, undefined, 's'), floorFraction: floor.fraction, contrastRatio: contrast.ratio },
    uncertainty,
    validity: { valid: gates.failures.length === 0, failures: gates.failures },
    identifiable: fit.identifiable,
    identifiability: { ampVpiCorrelation: fit.ampVpiCorrelation, relStdErrB: fit.relStdErrB, maxVoltageOverHalfWave: fit.maxVoltageOverHalfWave, openLevelUsed: fitOptions.openLevel !== undefined },
    model: {
      darkLevel: backgroundLevel(series, usedIndex), floorLevel: fit.floorLevel, amplitude: fit.amplitude, kerrConstant: fit.kerrConstant,
      effectiveLengthM: cell.effectiveLengthM, gapM: cell.gapM, polariserAngleDeg: cell.polariserAngleDeg, staticRetardanceRad: fitOptions.staticRetardanceRad ?? 0,
    },
    fit: {
      converged: fit.converged, iterations: fit.iterations, reason: fit.reason, residualRms: fit.residualRms, degreesOfFreedom: fit.degreesOfFreedom,
      starts: fit.starts, robust: fitOptions.robust === false ? 'none' : 'huber', residualAutocorrelation: fit.residualAutocorrelation, errorInflation: fit.errorInflation,
      effectiveFrames: fit.effectiveFrames, startResults: fit.startResults, residualOverFrameNoise: fit.residualRms / gates.noise,
    },
    linearised,
    sync: { manual: true, offsetS: 0, sharpnessS: null, ambiguous: false, curve: { offsetS: [], score: [] } },
    frames: { total: series.files.length, used: usedIndex.length, excluded: fitted.excluded },
    events,
    log: { rows: series.files.length, spanS: captureSpanS(series), currentColumn: false, temperatureC: null },
    warnings,
    extras: { cameraResponse: response.record, ...(floor.terms ? { floorFractionTerms: floor.terms } : {}) },
  });
  return { result, trace, fit: fitted };
}

function fitWarnings(fitted: StillsFit, warn: Warn): void {
  const { fit } = fitted;
  if (!fit.identifiable) {
    warn('not-identifiable', `the photos reach only about ${(fit.maxVoltageOverHalfWave * 100).toFixed(0)}% of the half-wave voltage, so brightness and half-wave voltage trade off (correlation ${fit.ampVpiCorrelation.toFixed(3)}, relative error of B ${(fit.relStdErrB * 100).toFixed(0)}%). Give the open level (analyser parallel, no field) with --open-level, or take photos at higher voltage if the cell allows it safely`, 'open-level');
  }
  if (!fit.converged) warn('fit-not-converged', `the fit stopped without converging (${fit.reason})`);
}

/** One trace row per photo, and the clipped photos as events. */
function stillsTrace(series: StillsSeries, fitted: StillsFit): { trace: TraceRow[]; events: RunEvent[] } {
  const times = series.captureTimeS;
  const timeOf = (i: number): number => (times ? times[i]! : i);
  const trace: TraceRow[] = [];
  const events: RunEvent[] = [];
  for (let i = 0; i < series.files.length; i++) {
    const v = series.voltageV[i]!;
    const model = Number.isFinite(fitted.model[i]!) ? fitted.model[i]! : null;
    const intensity = series.intensity[i]!;
    trace.push({
      frameIndex: i, timeS: timeOf(i), voltageV: Number.isFinite(v) ? v : null, intensity, model,
      residual: model !== null && Number.isFinite(intensity) ? intensity - model : null,
      used: fitted.used[i] === 1, excludedReason: fitted.excludedReason[i] ?? null,
    });
    if (fitted.excludedReason[i] === 'clipped') events.push({ kind: 'clipped', frameIndex: i, timeS: timeOf(i), size: series.clippedFraction[i]! });
  }
  return { trace, events };
}

function stillsOptions(input: StillsRunInput): Record<string, unknown> {
  const s = input.series;
  return {
    ...input.options,
    voltageSource: s.voltageSource, exposureBasis: s.exposureBasis, exposureFactors: s.exposureFactors,
    timeBasis: s.captureTimeS ? 'exif-capture-time' : 'photo-index', notes: s.notes,
  };
}

function stillsRegions(s: StillsSeries): RunResult['regions'] {
  return {
    beam: s.roi, beamAuto: s.beamAuto,
    ...(s.darkRoi ? { dark: s.darkRoi } : {}),
    ...(!s.darkRoi && s.surround ? { surround: s.surround.b1 } : {}),
    ...(s.referenceRoi ? { reference: s.referenceRoi } : {}),
  };
}

/** Median over the used photos of the subtracted background on the intensity scale; 0 when none. */
function backgroundLevel(s: StillsSeries, usedIndex: readonly number[]): number {
  const bg = s.darkLinear ?? s.surroundLinear;
  if (!bg) return 0;
  const onScale = usedIndex.map((i) => bg[i]! / s.exposureRelative[i]!);
  return onScale.length > 0 ? median(onScale) : 0;
}

function usedTransfers(s: StillsSeries): string[] {
  return [...new Set(s.transfers.filter((_, i) => s.unreadable[i] === null))];
}

function captureSpanS(s: StillsSeries): number {
  let spanS = 0;
  if (s.captureTimeS) for (const t of s.captureTimeS) spanS = Math.max(spanS, t);
  return spanS;
}
