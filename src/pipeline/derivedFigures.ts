/**
 * Figures derived from the run's one fit: the floor fraction I_floor/I_amp, the contrast ratio
 * (brightest over darkest model level over the voltages used), the linearised cross-check, the
 * camera-response check and record (docs/camera-response.md) and, with --channels rgb, B per
 * colour channel (each fitted with its own amplitude near the luminance fit's V_π).
 *
 * Floor fraction and contrast ratio come from the core formulas shared with photo runs
 * (src/core/figures: first-order propagation, correlations ignored); the floor fraction's
 * uncertainty adds the camera-response, surround and compression terms to the fit's
 * (floorFractionUncertainty).
 */
import { quantity, type Quantity } from '../quantity.js';
import { floorFraction, floorFractionUncertainty, type FloorFractionTerms } from '../core/figures/floorFraction.js';
import { contrastRatio } from '../core/figures/contrastRatio.js';
import { fitKerrCurve, type KerrCurveFit } from '../core/fit/fitKerrCurve.js';
import { linearisedCrossCheck } from '../core/fit/linearisedCrossCheck.js';
import { linearisedDisagreement } from '../core/fit/linearisedDisagreement.js';
import { checkCameraResponse } from '../core/fit/checkCameraResponse.js';
import { cameraResponseRecord } from './cameraResponseRecord.js';
import type { CameraDecoding } from '../media/types.js';
import type { CameraProfile } from '../io/cameraProfile.js';
import type { RunResult, RunWarning } from '../result/schema.js';
import type { FittedRun } from './fitRun.js';
import type { RunCell } from './runCell.js';

export interface DerivedFigures {
  /** With its combined uncertainty (floorFractionTerms). */
  floorFraction: Quantity;
  floorFractionTerms?: FloorFractionTerms;
  contrastRatio: Quantity;
  linearised: RunResult['linearised'];
  cameraResponse: NonNullable<RunResult['cameraResponse']>;
  channels?: NonNullable<RunResult['channels']>;
  warnings: RunWarning[];
}

export interface DerivedInput {
  fitted: FittedRun;
  cell: RunCell;
  openLevel: number | undefined;
  decoding: CameraDecoding;
  bitDepth: number;
  transferFromOption: boolean;
  cameraProfile?: { path: string; profile: CameraProfile };
  channelIntensity?: { r: Float64Array; g: Float64Array; b: Float64Array };
  /** The clip's bits per pixel per frame (the floor fraction's compression term). */
  bitsPerPixel?: number;
}

/** Floor fraction and contrast ratio by the core formulas photo runs use too (src/core/figures). */
function levels(fit: KerrCurveFit, vUsed: Float64Array): { floorFraction: Quantity; contrastRatio: Quantity } {
  let vMin = Infinity, vMax = 0;
  for (const v of vUsed) { vMin = Math.min(vMin, Math.abs(v)); vMax = Math.max(vMax, Math.abs(v)); }
  return { floorFraction: floorFraction(fit.floorLevel, fit.amplitude), contrastRatio: contrastRatio(fit, vMin, vMax).ratio };
}

function channelFits(d: DerivedInput): NonNullable<RunResult['channels']> {
  const { fitted } = d;
  const ci = d.channelIntensity!;
  const vpi0 = fitted.fit.halfWaveVoltage.value;
  // The open level is a luminance figure, so each channel fits its own amplitude.
  const { openLevel: _luminanceOpen, ...channelInput } = fitted.fitInput;
  const one = (series: Float64Array): Quantity => {
    try {
      const f = fitKerrCurve({
        voltageV: fitted.vUsed, intensity: Float64Array.from(fitted.useIdx, (i) => series[i]!), voltageSigmaV: fitted.sUsed, ...channelInput,
        // a channel's V_π lies near the luminance fit's (dispersion is tens of per cent at most)
        halfWaveGuessesV: [vpi0, 0.8 * vpi0, 1.25 * vpi0], onlyGivenStarts: true,
      });
      return f.identifiable ? f.kerrConstant : quantity(NaN, undefined, 'm/V^2');
    } catch {
      return quantity(NaN, undefined, 'm/V^2');
    }
  };
  return {
    r: one(ci.r), g: one(ci.g), b: one(ci.b),
    note: 'each camera channel is a broad band of wavelengths, so these are band averages of B (the Kerr constant varies with wavelength); a channel with too little light gives no number',
  };
}

export function derivedFigures(d: DerivedInput): DerivedFigures {
  const { fit, vUsed, iUsed } = d.fitted;
  const { cell } = d;
  const warnings: RunWarning[] = [];
  const { floorFraction, contrastRatio } = levels(fit, vUsed);
  if (!Number.isFinite(contrastRatio.value)) warnings.push({ code: 'floor-not-positive', message: 'the fitted floor is at or below the surround level, so the contrast ratio is unbounded; check the dark and beam regions', guideSection: 'camera-still' });
  const linearised = linearisedCrossCheck({
    voltageV: vUsed, intensity: iUsed, outliers: fit.outliers,
    floorLevel: fit.floorLevel.value, amplitude: fit.amplitude.value, halfWaveVoltageV: fit.halfWaveVoltage.value,
    polariserAngleDeg: cell.polariserAngleDeg, gapM: cell.gapM, effectiveLengthM: cell.effectiveLengthM, fitKerrConstant: fit.kerrConstant,
  });
  const disagreement = linearisedDisagreement(linearised, fit.kerrConstant, fit.identifiable);
  if (disagreement !== null) warnings.push({ code: 'linearised-disagrees', message: disagreement });
  const response = cameraResponseRecord({
    decoding: d.decoding, bitDepth: d.bitDepth, transferFromOption: d.transferFromOption,
    ...(d.cameraProfile ? { profile: d.cameraProfile } : {}),
    check: checkCameraResponse({
      voltageV: vUsed, intensity: iUsed, used: Uint8Array.from(fit.outliers, (x) => 1 - x),
      fit: { floor: fit.floorLevel.value, amplitude: fit.amplitude.value, halfWaveVoltageV: fit.halfWaveVoltage.value },
      polariserAngleDeg: cell.polariserAngleDeg, ...(cell.staticRetardanceRad !== undefined ? { staticRetardanceRad: cell.staticRetardanceRad } : {}),
      ...(d.openLevel !== undefined ? { openLevel: d.openLevel } : {}),
      effectiveLengthM: cell.effectiveLengthM, gapM: cell.gapM, kerrConstant: fit.kerrConstant.value, errorInflation: fit.errorInflation,
    }),
  });
  warnings.push(...response.warnings);
  const floor = floorFractionUncertainty(floorFraction, { gammaUncertainty: response.record.check.gammaUncertainty ?? 0, ...(d.bitsPerPixel !== undefined ? { bitsPerPixel: d.bitsPerPixel } : {}) });
  return {
    floorFraction: floor.fraction, ...(floor.terms ? { floorFractionTerms: floor.terms } : {}), contrastRatio, linearised, cameraResponse: response.record, warnings,
    ...(d.channelIntensity ? { channels: channelFits(d) } : {}),
  };
}
