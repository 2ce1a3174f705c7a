/**
 * The run record's camera-response section and its warnings: which response turned code values
 * into light (the file's tags, the --transfer option, or a measured profile), and the run's own
 * check of it (core/fit/checkCameraResponse). A check that departs from the assumed response
 * warns "camera-response" with the exponent, its uncertainty and the effect on B, pointing to
 * the calibration section of the guide; a profile whose own fit is poor warns "camera-profile".
 * Pure. Throws nothing.
 */
import type { CameraDecoding } from '../media/types.js';
import type { CameraProfile } from '../io/cameraProfile.js';
import type { ResponseCheck } from '../core/fit/checkCameraResponse.js';
import type { CameraResponseRecord, RunWarning } from '../result/schema.js';

/** A profile residual above this (relative to the light range) is worth a warning: our choice; a clean calibration clip scatters by 1–3 % per frame from noise and compression. */
export const PROFILE_RESIDUAL_WARNING = 0.05;

export interface CameraResponseInput {
  decoding: CameraDecoding;
  bitDepth: number;
  transferFromOption: boolean;
  profile?: { path: string; profile: CameraProfile };
  check: ResponseCheck;
}

export function cameraResponseRecord(input: CameraResponseInput): { record: CameraResponseRecord; warnings: RunWarning[] } {
  const { decoding, check, profile } = input;
  const record: CameraResponseRecord = {
    route: profile ? 'profile' : input.transferFromOption ? 'option' : 'tags',
    transfer: decoding.transfer,
    matrix: decoding.matrix,
    bitDepth: input.bitDepth,
    check: {
      checked: check.checked,
      reason: check.reason,
      gamma: check.gamma,
      kerrConstantAtGamma: check.kerrConstantAtGamma,
      relativeShiftB: check.relativeShiftB,
      standardUncertainty: check.standardUncertainty,
      departs: check.departs,
      gammaUncertainty: check.gammaUncertainty,
    },
  };
  const warnings: RunWarning[] = [];
  if (profile) {
    const p = profile.profile;
    record.profile = { path: profile.path, createdAt: p.createdAt, camera: p.camera, residualRms: p.fit.residualRms, codeRange: p.codeRange };
    if (p.fit.residualRms > PROFILE_RESIDUAL_WARNING) {
      warnings.push({
        code: 'camera-profile',
        message: `the camera profile ${profile.path} fits its own calibration with a residual of ${(p.fit.residualRms * 100).toFixed(1)} % of the light range; record the calibration again with the camera locked`,
        guideSection: 'calibrate-camera',
      });
    }
    if (p.decoding.bitDepth !== input.bitDepth || p.decoding.matrix !== decoding.matrix) {
      warnings.push({
        code: 'camera-profile',
        message: `the camera profile was made from ${p.decoding.bitDepth}-bit ${p.decoding.matrix} footage but this run is ${input.bitDepth}-bit ${decoding.matrix}; a profile holds only for the mode it was made in`,
        guideSection: 'calibrate-camera',
      });
    }
  }
  if (check.checked && check.departs) {
    const assumed = profile ? 'its camera profile' : `its ${decoding.transfer} transfer`;
    warnings.push({
      code: 'camera-response',
      message: `the footage departs from ${assumed}: the light goes as the linearised intensity to the power ${check.gamma.value.toFixed(3)} ± ${check.gamma.stdErr.toFixed(3)} (1 expected), which moves B by ${(check.relativeShiftB * 100).toFixed(1)} %; this enters the uncertainty as the camera-response term. Lock the camera and make a camera profile (kerrtrace calibrate-camera), then analyse with --camera-profile`,
      guideSection: 'calibrate-camera',
    });
  }
  return { record, warnings };
}
