/**
 * The camera-response section of a photo-series result: the response used (transfer or camera
 * profile) and the run check of core/fit/checkCameraResponse on the photos the fit kept, with the
 * same record and warnings as a video run (pipeline/cameraResponseRecord).
 * Pure. Throws nothing.
 */
import { checkCameraResponse } from '../core/fit/checkCameraResponse.js';
import type { CameraProfile } from '../io/cameraProfile.js';
import { cameraResponseRecord } from '../pipeline/cameraResponseRecord.js';
import type { CameraResponseRecord, RunResult, RunWarning, TraceRow } from '../result/schema.js';
import type { TransferName } from '../media/types.js';

export function stillsCameraResponse(
  result: RunResult,
  trace: readonly TraceRow[],
  response: { transfer: TransferName; transferFromOption: boolean; profile?: { path: string; profile: CameraProfile } },
  openLevel?: number,
): { record: CameraResponseRecord; warnings: RunWarning[] } {
  const rows = trace.filter((r) => r.used && r.voltageV !== null);
  const check = checkCameraResponse({
    voltageV: Float64Array.from(rows, (r) => r.voltageV!),
    intensity: Float64Array.from(rows, (r) => r.intensity),
    used: new Uint8Array(rows.length).fill(1),
    fit: { floor: result.model.floorLevel.value, amplitude: result.model.amplitude.value, halfWaveVoltageV: result.halfWaveVoltage.value },
    polariserAngleDeg: result.cell.polariserAngleDeg,
    staticRetardanceRad: result.model.staticRetardanceRad,
    ...(openLevel !== undefined ? { openLevel } : {}),
    effectiveLengthM: result.cell.effectiveLengthM,
    gapM: result.cell.gapM,
    kerrConstant: result.kerrConstant.value,
    kerrStdErr: result.kerrConstant.stdErr ?? 0,
    errorInflation: result.fit.errorInflation,
  });
  return cameraResponseRecord({
    decoding: { range: 'full', matrix: 'bt709', transfer: response.transfer, clipCode: 250 },
    bitDepth: 8,
    transferFromOption: response.transferFromOption,
    ...(response.profile ? { profile: response.profile } : {}),
    check,
  });
}
