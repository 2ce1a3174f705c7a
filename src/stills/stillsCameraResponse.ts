/**
 * The camera-response section of a photo-series result: the response used (transfer or camera
 * profile) and the run check of core/fit/checkCameraResponse on the photos the fit kept, with the
 * same record and warnings as a video run (pipeline/cameraResponseRecord). Also the relative
 * standard uncertainty the check puts on B, for the budget's camera-response term (as analyze:
 * an uncorrected known effect carried as an uncertainty, GUM 3.2.4 / F.2.4.5).
 * Pure. Throws nothing.
 */
import { checkCameraResponse } from '../core/fit/checkCameraResponse.js';
import type { KerrCurveFit } from '../core/fit/fitKerrCurve.js';
import type { CameraProfile } from '../io/cameraProfile.js';
import { cameraResponseRecord } from '../pipeline/cameraResponseRecord.js';
import type { CameraResponseRecord, RunWarning } from '../result/schema.js';
import type { TransferName } from '../media/types.js';

export interface StillsResponseChoice {
  transfer: TransferName;
  transferFromOption: boolean;
  profile?: { path: string; profile: CameraProfile };
}

export interface StillsResponseInput {
  fit: KerrCurveFit;
  /** Voltage and intensity of the photos the fit used (fit.outliers follows this order). */
  voltageV: Float64Array;
  intensity: Float64Array;
  effectiveLengthM: number;
  gapM: number;
  polariserAngleDeg: number;
  staticRetardanceRad: number;
  openLevel?: number;
  response: StillsResponseChoice;
}

export function stillsCameraResponse(i: StillsResponseInput): { record: CameraResponseRecord; warnings: RunWarning[]; cameraResponse?: { rel: number; note: string } } {
  const { fit } = i;
  const check = checkCameraResponse({
    voltageV: i.voltageV,
    intensity: i.intensity,
    used: Uint8Array.from(fit.outliers, (x) => 1 - x),
    fit: { floor: fit.floorLevel.value, amplitude: fit.amplitude.value, halfWaveVoltageV: fit.halfWaveVoltage.value },
    polariserAngleDeg: i.polariserAngleDeg,
    staticRetardanceRad: i.staticRetardanceRad,
    ...(i.openLevel !== undefined ? { openLevel: i.openLevel } : {}),
    effectiveLengthM: i.effectiveLengthM,
    gapM: i.gapM,
    kerrConstant: fit.kerrConstant.value,
    errorInflation: fit.errorInflation,
  });
  const out = cameraResponseRecord({
    decoding: { range: 'full', matrix: 'bt709', transfer: i.response.transfer, clipCode: 250 },
    bitDepth: 8,
    transferFromOption: i.response.transferFromOption,
    ...(i.response.profile ? { profile: i.response.profile } : {}),
    check,
  });
  const rel = out.record.check.standardUncertainty.value / fit.kerrConstant.value;
  if (!(Number.isFinite(rel) && rel > 0)) return out;
  const note = out.record.check.checked
    ? 'camera response check'
    : `no response check (sweep below 0.8·V_π, no open level): B refitted at γ = 1 ± ${out.record.check.gamma.stdErr} (prior)`;
  return { ...out, cameraResponse: { rel, note } };
}
