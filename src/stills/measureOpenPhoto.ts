/**
 * The open photo (analyser parallel, no field, same camera position), measured like the series
 * with the series' regions (beam, and dark region or surround rings) and put on its exposure
 * scale: relative to the first readable photo by the series' basis (EXIF pair, or its reference
 * region against the first photo's; taken as equal when the series has neither, with a note).
 * Its intensity (beam − background) / exposure is the open level I_amp.
 * Edge: reads the photo.
 * @throws KerrError BAD_ARGUMENT (path --open-photo) for an open photo that is unreadable, of
 *   another size, clipped beyond CLIPPED_FRACTION_LIMIT, without the EXIF the series uses, whose
 *   reference region is not brighter than its dark level, or whose beam is not brighter than its
 *   background.
 * @example const open = await measureOpenPhoto({ path, width, height, plan, ... }); open.photo.intensity
 */
import { basename } from 'node:path';
import { KerrError } from '../errors.js';
import type { ResponseTable, TransferName } from '../media/types.js';
import type { RunWarning } from '../result/schema.js';
import { CLIPPED_FRACTION_LIMIT } from '../core/figures/clippedFractionLimit.js';
import { HEIC_HINT } from './listStillPhotos.js';
import { codeToLinearLut } from './codeToLinearLut.js';
import { defaultTransfer, measurePhoto, messageOf, photoInfo, readPhotoExif, type PhotoExif } from './photoFile.js';
import { relativeExposure } from './relativeExposure.js';
import { planLevels, type RegionPlan } from './regionPlan.js';
import { percent } from './seriesExposure.js';

export interface OpenPhoto {
  path: string;
  /** (beam − background) / exposureRelative, linear units: the open level I_amp. */
  intensity: number;
  exposureRelative: number;
  clippedFraction: number;
}

export interface OpenPhotoInput {
  path: string;
  width: number;
  height: number;
  plan: RegionPlan;
  transfer?: TransferName;
  response?: ResponseTable;
  clipLevel: number;
  basis: 'exif' | 'reference' | 'none';
  /** EXIF of the series' first readable photo (the exposure reference). */
  firstExif: PhotoExif;
  /** Reference level minus dark of the first readable photo (basis "reference"). */
  firstReference: number;
}

const fail = (message: string, hint: string): KerrError => new KerrError('BAD_ARGUMENT', message, { path: '--open-photo', hint });

async function exposureOf(i: OpenPhotoInput, reference: number, warnings: RunWarning[], notes: string[]): Promise<number> {
  if (i.basis === 'exif') {
    const pair = relativeExposure([i.firstExif, await readPhotoExif(i.path)]);
    if (pair.basis !== 'exif') throw fail('the open photo carries no exposure time in its EXIF, but the series was normalised by EXIF', 'Give the open photo as the camera wrote it, with its EXIF');
    for (const m of pair.warnings) warnings.push({ code: 'exposure-exif-partial', message: `open photo: ${m}`, guideSection: 'lock-exposure' });
    return pair.relative[1]!;
  }
  if (i.basis === 'reference') {
    const exposure = reference / i.firstReference;
    if (!(exposure > 0)) throw fail('the reference region of the open photo is not brighter than its dark level', 'Keep the grey card of --reference-roi lit and in view in the open photo too');
    return exposure;
  }
  notes.push('the open photo is taken to have the first photo\'s exposure: there is no exposure EXIF or reference region to tell');
  return 1;
}

export async function measureOpenPhoto(i: OpenPhotoInput): Promise<{ photo: OpenPhoto; warnings: RunWarning[]; notes: string[] }> {
  const info = await photoInfo(i.path, basename(i.path));
  if (typeof info === 'string' || info.format === null) {
    throw fail(`the open photo ${i.path} could not be read as a JPEG, PNG or TIFF photo${typeof info === 'string' ? ` (${info})` : ''}`, HEIC_HINT);
  }
  if (info.width !== i.width || info.height !== i.height) {
    throw fail(`the open photo is ${info.width}x${info.height} but the series is ${i.width}x${i.height}`, 'Take the open photo from the same camera position, at the same size and orientation');
  }
  const transfer = i.transfer ?? defaultTransfer(info.format, info.maxCode);
  let levels;
  try {
    const measured = await measurePhoto(i.path, info.maxCode, codeToLinearLut(transfer, info.maxCode, i.response), i.plan.rects, Math.round(i.clipLevel * info.maxCode), null);
    levels = planLevels(i.plan, measured.regions);
  } catch (e) {
    throw fail(`the open photo ${i.path} could not be decoded (${messageOf(e)})`, 'Re-export it as JPEG, PNG or TIFF');
  }
  if (levels.beamClipped > CLIPPED_FRACTION_LIMIT) {
    throw fail(`${percent(levels.beamClipped)} of the beam region of the open photo is clipped, so the open level would read low`, 'Take the open photo at a shorter exposure time, with its exposure EXIF (or the grey card of --reference-roi in view) so kerrtrace can relate it to the series');
  }
  const warnings: RunWarning[] = [];
  const notes: string[] = [];
  const darkOpen = Number.isFinite(levels.dark) ? levels.dark : 0;
  const exposure = await exposureOf(i, levels.reference - darkOpen, warnings, notes);
  const intensity = (levels.beam - levels.background) / exposure;
  if (!(intensity > 0)) throw fail('the beam region of the open photo is not brighter than its dark region', 'Check the regions and that the analyser was turned parallel');
  return { photo: { path: i.path, intensity, exposureRelative: exposure, clippedFraction: levels.beamClipped }, warnings, notes };
}
