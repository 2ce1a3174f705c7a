/**
 * A photo series as a run result: the RunResult (result.json, source "stills") and one TraceRow
 * per photo, with the same fields, fit and derived figures as analyze, so that the reports and
 * `compare` treat a stills run like a video run.
 *
 * What differs from a video run, and how it is filled:
 * - sync: there is no second clock (each photo's voltage is given), so the offset is 0 s, marked
 *   manual, with no search curve: sync = {manual: true, offsetS: 0, sharpnessS: null,
 *   ambiguous: false, curve: {offsetS: [], score: []}}, syncOffset = {value: 0, unit: "s"}.
 * - trace time: timeS is the EXIF capture time in s after the earliest photo when every photo
 *   carries one (captureTimesS), else the photo's position 0, 1, 2 ... in name order;
 *   options.timeBasis says which ("exif-capture-time" or "photo-index").
 * - frames are photos: total, used, excluded by reason ("clipped", "unreadable", "not-finite");
 *   events are the clipped photos (size = clipped fraction of the beam region).
 * - log describes the voltages: rows = photos given a voltage, spanS = capture-time span (0 without
 *   capture times), no current column, no temperature.
 * - camera: photo width and height, fps null, transfer the curve(s) used ("srgb", or e.g.
 *   "srgb+linear" for a mixed series), range "full" (photos are full-range).
 * - model.darkLevel: median over the used photos of the dark region's level on the intensity
 *   scale (dark / relative exposure), 0 without --dark-roi.
 * Derived figures as in analyze: contrast ratio = highest / lowest fitted intensity over the
 * voltages used (401-point scan), quarter-wave voltage V_π/√2, floor fraction
 * (fitStillsSeries), linearised cross-check (src/core/fit/linearisedCrossCheck, shared with analyze).
 * Warnings: the reader's (exposure, clipping, regions...) then the fit's ("not-identifiable",
 * "fit-not-converged", "floor-not-positive", "linearised-disagrees"), with guide anchors where
 * one fits. Pure: the caller supplies the clock (createdAt), versions and input hashes.
 * @throws as fitStillsSeries (too few usable photos: BAD_ARGUMENT; fit failure: FIT_FAILED).
 * @example const { result, trace } = stillsRunResult({ series, cell, fitOptions: {}, label: 'run1', createdAt, tool, inputs, options: {} });
 */
import { quantity, type Quantity } from '../quantity.js';
import { RESULT_SCHEMA_VERSION, type InputFile, type RunEvent, type RunResult, type RunWarning, type TraceRow } from '../result/schema.js';
import type { GuideAnchor } from '../report/guide.js';
import { median } from '../measure/exposure.js';
import type { StillsSeries } from './readStillsSeries.js';
import { fitStillsSeries, type StillsFit } from './fitStillsSeries.js';
import { linearisedCrossCheck } from '../core/fit/linearisedCrossCheck.js';
import { linearisedDisagreement } from '../core/fit/linearisedDisagreement.js';

export interface StillsCell {
  lengthM: number;
  effectiveLengthM: number;
  gapM: number;
  polariserAngleDeg: number;
}

export interface StillsRunInput {
  series: StillsSeries;
  cell: StillsCell;
  fitOptions: { openLevel?: number; staticRetardanceRad?: number; robust?: boolean };
  label: string;
  /** ISO-8601 time of the run (the caller's clock). */
  createdAt: string;
  tool: RunResult['tool'];
  inputs: { stills: InputFile[]; volts?: InputFile };
  /** The options as given (SI or as typed); the series' own choices are added to them. */
  options: Record<string, unknown>;
}

export interface StillsRun {
  result: RunResult;
  trace: TraceRow[];
  fit: StillsFit;
}

/** Points of the scan of the fitted curve for the contrast ratio (as in analyze). */
const CONTRAST_SCAN_STEPS = 400;

export function stillsRunResult(input: StillsRunInput): StillsRun {
  const { series, cell, fitOptions } = input;
  const n = series.files.length;
  const fitted = fitStillsSeries({
    voltageV: series.voltageV,
    intensity: series.intensity,
    clippedFraction: series.clippedFraction,
    effectiveLengthM: cell.effectiveLengthM,
    gapM: cell.gapM,
    polariserAngleDeg: cell.polariserAngleDeg,
    preExcluded: series.unreadable.map((u) => (u === null ? null : 'unreadable')),
    ...(fitOptions.openLevel !== undefined ? { openLevel: fitOptions.openLevel } : {}),
    ...(fitOptions.staticRetardanceRad !== undefined ? { staticRetardanceRad: fitOptions.staticRetardanceRad } : {}),
    ...(fitOptions.robust !== undefined ? { robust: fitOptions.robust } : {}),
  });
  const { fit, usedIndex } = fitted;
  const warnings: RunWarning[] = series.warnings.slice();
  const warn = (code: string, message: string, guideSection?: GuideAnchor): void => {
    warnings.push(guideSection ? { code, message, guideSection } : { code, message });
  };
  if (!fit.identifiable) {
    warn('not-identifiable', `the photos reach only about ${(fit.maxVoltageOverHalfWave * 100).toFixed(0)}% of the half-wave voltage, so brightness and half-wave voltage trade off (correlation ${fit.ampVpiCorrelation.toFixed(3)}, relative error of B ${(fit.relStdErrB * 100).toFixed(0)}%). Give the open level (analyser parallel, no field) with --open-level, or take photos at higher voltage if the cell allows it safely`, 'open-level');
  }
  if (!fit.converged) warn('fit-not-converged', `the fit stopped without converging (${fit.reason})`);

  // Contrast: highest over lowest fitted intensity across the voltages used.
  let vMin = Infinity, vMax = 0;
  for (const i of usedIndex) {
    vMin = Math.min(vMin, Math.abs(series.voltageV[i]!));
    vMax = Math.max(vMax, Math.abs(series.voltageV[i]!));
  }
  let hi = -Infinity, lo = Infinity;
  for (let k = 0; k <= CONTRAST_SCAN_STEPS; k++) {
    const m = fit.predict(vMin + ((vMax - vMin) * k) / CONTRAST_SCAN_STEPS);
    hi = Math.max(hi, m);
    lo = Math.min(lo, m);
  }
  const contrastRatio = quantity(lo > 0 ? hi / lo : Infinity);
  if (!(lo > 0)) warn('floor-not-positive', 'the fitted floor is at or below the dark level, so the contrast ratio is unbounded; check the dark and beam regions', 'camera-still');

  const linearised = linearisedCrossCheck({
    voltageV: Float64Array.from(usedIndex, (i) => series.voltageV[i]!),
    intensity: Float64Array.from(usedIndex, (i) => series.intensity[i]!),
    outliers: fit.outliers,
    floorLevel: fit.floorLevel.value,
    amplitude: fit.amplitude.value,
    halfWaveVoltageV: fit.halfWaveVoltage.value,
    fitKerrConstant: fit.kerrConstant,
    polariserAngleDeg: cell.polariserAngleDeg,
    gapM: cell.gapM,
    effectiveLengthM: cell.effectiveLengthM,
  });
  const disagreement = linearisedDisagreement(linearised, fit.kerrConstant, fit.identifiable);
  if (disagreement !== null) warn('linearised-disagrees', disagreement);

  // Trace: one row per photo.
  const times = series.captureTimeS;
  const timeOf = (i: number): number => (times ? times[i]! : i);
  const trace: TraceRow[] = [];
  const events: RunEvent[] = [];
  for (let i = 0; i < n; i++) {
    const v = series.voltageV[i]!;
    const model = Number.isFinite(fitted.model[i]!) ? fitted.model[i]! : null;
    const intensity = series.intensity[i]!;
    trace.push({
      frameIndex: i,
      timeS: timeOf(i),
      voltageV: Number.isFinite(v) ? v : null,
      intensity,
      model,
      residual: model !== null && Number.isFinite(intensity) ? intensity - model : null,
      used: fitted.used[i] === 1,
      excludedReason: fitted.excludedReason[i] ?? null,
    });
    if (fitted.excludedReason[i] === 'clipped') events.push({ kind: 'clipped', frameIndex: i, timeS: timeOf(i), size: series.clippedFraction[i]! });
  }

  const darkOnScale: number[] = [];
  if (series.darkLinear) for (const i of usedIndex) darkOnScale.push(series.darkLinear[i]! / series.exposureRelative[i]!);
  const transfers = [...new Set(series.transfers.filter((_, i) => series.unreadable[i] === null))];
  let spanS = 0;
  if (times) for (const t of times) spanS = Math.max(spanS, t);
  const vpi: Quantity = fit.halfWaveVoltage;
  const inputs: RunResult['inputs'] = { stills: input.inputs.stills };
  if (input.inputs.volts) inputs.volts = input.inputs.volts;

  const result: RunResult = {
    schemaVersion: RESULT_SCHEMA_VERSION,
    kind: 'kerrtrace-run',
    label: input.label,
    createdAt: input.createdAt,
    source: 'stills',
    tool: input.tool,
    inputs,
    options: {
      ...input.options,
      voltageSource: series.voltageSource,
      exposureBasis: series.exposureBasis,
      exposureFactors: series.exposureFactors,
      timeBasis: times ? 'exif-capture-time' : 'photo-index',
      notes: series.notes,
    },
    cell: { ...cell, electrodeHeightM: null, wavelengthNm: null },
    camera: { width: series.width, height: series.height, fps: null, variableFrameRate: false, transfer: transfers.join('+'), range: 'full' },
    regions: {
      beam: series.roi,
      beamAuto: false,
      ...(series.darkRoi ? { dark: series.darkRoi } : {}),
      ...(series.referenceRoi ? { reference: series.referenceRoi } : {}),
    },
    kerrConstant: fit.kerrConstant,
    halfWaveVoltage: vpi,
    quarterWaveVoltage: quantity(vpi.value / Math.SQRT2, (vpi.stdErr ?? NaN) / Math.SQRT2, 'V'),
    syncOffset: quantity(0, undefined, 's'),
    floorFraction: fitted.floorFraction,
    contrastRatio,
    identifiable: fit.identifiable,
    identifiability: { ampVpiCorrelation: fit.ampVpiCorrelation, relStdErrB: fit.relStdErrB, maxVoltageOverHalfWave: fit.maxVoltageOverHalfWave, openLevelUsed: fitOptions.openLevel !== undefined },
    model: {
      darkLevel: darkOnScale.length > 0 ? median(darkOnScale) : 0,
      floorLevel: fit.floorLevel,
      amplitude: fit.amplitude,
      kerrConstant: fit.kerrConstant,
      effectiveLengthM: cell.effectiveLengthM,
      gapM: cell.gapM,
      polariserAngleDeg: cell.polariserAngleDeg,
      staticRetardanceRad: fitOptions.staticRetardanceRad ?? 0,
    },
    fit: {
      converged: fit.converged, iterations: fit.iterations, reason: fit.reason, residualRms: fit.residualRms, degreesOfFreedom: fit.degreesOfFreedom,
      starts: fit.starts, robust: fitOptions.robust === false ? 'none' : 'huber', residualAutocorrelation: fit.residualAutocorrelation, errorInflation: fit.errorInflation,
    },
    linearised,
    sync: { manual: true, offsetS: 0, sharpnessS: null, ambiguous: false, curve: { offsetS: [], score: [] } },
    frames: { total: n, used: usedIndex.length, excluded: fitted.excluded },
    events,
    log: { rows: n, spanS, currentColumn: false, temperatureC: null },
    warnings,
    files: {},
  };
  return { result, trace, fit: fitted };
}
