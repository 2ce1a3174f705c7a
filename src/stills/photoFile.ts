/**
 * Reading one photo file (edge: sharp and exifr): its size and depth, its EXIF exposure and
 * capture-time tags, the default transfer curve for its format, and the decoded pixels measured in
 * one go (the given regions at full resolution and, when asked, the block grid).
 * - photoInfo: size with EXIF orientation applied, 8 or 16 bits, format by content; the reason as
 *   a string when sharp cannot read it.
 * - readPhotoExif: ExposureTime, ISO, FNumber, DateTimeOriginal (as the camera wrote it),
 *   SubSecTimeOriginal, OffsetTimeOriginal; nulls when absent or unreadable.
 * - defaultTransfer: linear for 16-bit TIFF, sRGB otherwise (IEC 61966-2-1).
 * - measurePhoto: decode (orientation applied, ICC ignored: phone profiles such as Display P3
 *   share the sRGB curve), then measureImageRegions and photoBlockGrid on the same pixels.
 * @throws KerrError BAD_ARGUMENT (photoInfo) for a sample depth other than 8 or 16 bits;
 *   measurePhoto throws what sharp throws.
 * @example const info = await photoInfo('run1/step01_2kV.jpg', 'step01_2kV.jpg');
 */
import sharp from 'sharp';
import exifr from 'exifr';
import { KerrError } from '../errors.js';
import type { Rect, RegionSample, TransferName } from '../media/types.js';
import type { PhotoFormat } from './listStillPhotos.js';
import type { ExifExposure } from './relativeExposure.js';
import type { ExifCaptureTime } from './captureTimes.js';
import { measureImageRegions } from './measureImageRegions.js';
import { photoBlockGrid, type PhotoBlockGrid } from './photoBlockGrid.js';

export interface PhotoInfo {
  width: number;
  height: number;
  maxCode: 255 | 65535;
  /** Format by content (sharp), null for anything but JPEG, PNG and TIFF. */
  format: PhotoFormat | null;
}

export type PhotoExif = ExifExposure & ExifCaptureTime;

/** First line of an error's message. */
export const messageOf = (e: unknown): string => (e instanceof Error ? e.message : String(e)).split('\n')[0]!.trim();

export async function photoInfo(path: string, file: string): Promise<PhotoInfo | string> {
  let meta;
  try {
    meta = await sharp(path).metadata();
  } catch (e) {
    return messageOf(e);
  }
  if (meta.depth !== 'uchar' && meta.depth !== 'ushort') {
    throw new KerrError('BAD_ARGUMENT', `${file} has ${meta.depth ?? 'unknown'} samples; kerrtrace reads 8- and 16-bit images`, { path, hint: 'Export the photos as 8-bit JPEG/PNG or 16-bit PNG/TIFF' });
  }
  const size = meta.autoOrient ?? { width: meta.width, height: meta.height };
  const format = meta.format === 'jpeg' || meta.format === 'png' || meta.format === 'tiff' ? meta.format : null;
  return { width: size.width, height: size.height, maxCode: meta.depth === 'ushort' ? 65535 : 255, format };
}

export async function readPhotoExif(path: string): Promise<PhotoExif> {
  const none: PhotoExif = { exposureTimeS: null, iso: null, fNumber: null, dateTimeOriginal: null, subSecTimeOriginal: null, offsetTimeOriginal: null };
  const pickNumber = (v: unknown): number | null => {
    const x = Array.isArray(v) ? v[0] : v;
    return typeof x === 'number' && Number.isFinite(x) ? x : null;
  };
  const pickText = (v: unknown): string | null => (typeof v === 'string' ? v : typeof v === 'number' && Number.isFinite(v) ? String(v) : null);
  try {
    // reviveValues: false keeps DateTimeOriginal as the camera wrote it (no local-time Date).
    const tags = (await exifr.parse(path, {
      pick: ['ExposureTime', 'ISO', 'FNumber', 'DateTimeOriginal', 'SubSecTimeOriginal', 'OffsetTimeOriginal'],
      reviveValues: false,
    })) as Record<string, unknown> | undefined;
    if (!tags) return none;
    return {
      exposureTimeS: pickNumber(tags.ExposureTime), iso: pickNumber(tags.ISO), fNumber: pickNumber(tags.FNumber),
      dateTimeOriginal: pickText(tags.DateTimeOriginal), subSecTimeOriginal: pickText(tags.SubSecTimeOriginal), offsetTimeOriginal: pickText(tags.OffsetTimeOriginal),
    };
  } catch {
    return none; // no EXIF block or a format exifr cannot parse
  }
}

export function defaultTransfer(format: PhotoFormat, maxCode: 255 | 65535): TransferName {
  return format === 'tiff' && maxCode === 65535 ? 'linear' : 'srgb';
}

export async function measurePhoto(path: string, maxCode: 255 | 65535, lut: Float64Array, regions: Rect[], clipCode: number, gridStep: number | null): Promise<{ regions: RegionSample[]; grid: PhotoBlockGrid | null }> {
  const pipeline = sharp(path, { ignoreIcc: true }).autoOrient().removeAlpha();
  const { data, info } = maxCode === 65535
    ? await pipeline.toColourspace('rgb16').raw({ depth: 'ushort' }).toBuffer({ resolveWithObject: true })
    : await pipeline.toColourspace('srgb').raw().toBuffer({ resolveWithObject: true });
  const samples = maxCode === 65535 ? new Uint16Array(data.buffer, data.byteOffset, data.byteLength / 2) : new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
  const image = { data: samples, width: info.width, height: info.height, channels: info.channels };
  return {
    regions: measureImageRegions(image, regions, lut, clipCode),
    grid: gridStep === null ? null : photoBlockGrid(image, gridStep, lut, clipCode),
  };
}
