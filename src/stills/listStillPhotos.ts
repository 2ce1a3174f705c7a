/**
 * Lists the photos of a stills folder (not recursive): JPEG (`.jpg`, `.jpeg`), PNG (`.png`) and
 * TIFF (`.tif`, `.tiff`), case-insensitive, hidden files skipped, in natural order (`step2`
 * before `step10`). Each candidate's first bytes are checked against its format's signature.
 *
 * - HEIC/HEIF photos (`.heic`, `.heif`, `.hif`, or HEIF content under an image extension) are
 *   refused with a line on how to convert them, unless a JPEG/PNG/TIFF of the same name sits
 *   beside them (then they are skipped and counted).
 * - Camera raw files (DNG, CR2, NEF, ARW...) and other image formats are skipped and counted.
 * - Other files (the voltage CSV, notes) are ignored and counted.
 * Edge module (reads the folder).
 * @throws KerrError FILE_NOT_FOUND (no such folder), BAD_ARGUMENT (not a folder, no photos,
 *   HEIC/HEIF, a file whose content is not the format its name says).
 * @example await listStillPhotos('run1') // { photos: ['00V.jpg', '500V.jpg'], skipped: [], ignored: ['volts.csv'] }
 */
import { open, readdir, stat } from 'node:fs/promises';
import { extname, join } from 'node:path';
import { KerrError } from '../errors.js';
import { missingPathText } from '../io/missingPathText.js';

export type PhotoFormat = 'jpeg' | 'png' | 'tiff';

export interface StillPhotoListing {
  /** File names (not paths), natural order. */
  photos: string[];
  formats: PhotoFormat[];
  /** Image files not read, with the reason. */
  skipped: Array<{ file: string; reason: string }>;
  /** Non-image files. */
  ignored: string[];
}

const PHOTO_EXTENSIONS: Record<string, PhotoFormat> = { '.jpg': 'jpeg', '.jpeg': 'jpeg', '.png': 'png', '.tif': 'tiff', '.tiff': 'tiff' };
const HEIF_EXTENSIONS = new Set(['.heic', '.heif', '.hif']);
const RAW_EXTENSIONS = new Set(['.dng', '.cr2', '.cr3', '.crw', '.nef', '.nrw', '.arw', '.srf', '.sr2', '.raf', '.orf', '.rw2', '.pef', '.srw', '.raw', '.3fr', '.iiq', '.x3f']);
const OTHER_IMAGE_EXTENSIONS = new Set(['.webp', '.gif', '.bmp', '.avif', '.jxl', '.jp2', '.psd', '.exr', '.hdr']);
const HEIF_BRANDS = new Set(['heic', 'heix', 'hevc', 'hevx', 'heim', 'heis', 'hevm', 'hevs', 'mif1', 'msf1', 'avif', 'avis']);

export const HEIC_HINT =
  'kerrtrace reads JPEG, PNG and TIFF only: export the photos as JPEG from the phone (on iPhones choose Settings > Camera > Formats > Most Compatible before shooting), or convert them with an image converter, keeping full resolution';

/**
 * Format from the first bytes: JPEG FF D8 FF, PNG 89 50 4E 47, TIFF "II*\0" or "MM\0*", HEIF
 * (ISO/IEC 23008-12, AVIF included) an "ftyp" box whose major or a compatible brand is a HEIF brand.
 */
export function sniffImageFormat(head: Uint8Array): PhotoFormat | 'heif' | 'unknown' {
  if (head.length >= 3 && head[0] === 0xff && head[1] === 0xd8 && head[2] === 0xff) return 'jpeg';
  if (head.length >= 4 && head[0] === 0x89 && head[1] === 0x50 && head[2] === 0x4e && head[3] === 0x47) return 'png';
  if (head.length >= 4 && ((head[0] === 0x49 && head[1] === 0x49 && head[2] === 0x2a && head[3] === 0x00) || (head[0] === 0x4d && head[1] === 0x4d && head[2] === 0x00 && head[3] === 0x2a))) return 'tiff';
  if (head.length >= 12 && String.fromCharCode(...head.subarray(4, 8)) === 'ftyp') {
    const boxEnd = Math.min(head.length, (head[0]! << 24) | (head[1]! << 16) | (head[2]! << 8) | head[3]!);
    // major brand at 8, minor version at 12, compatible brands from 16 to the end of the box
    const brandAt = (offset: number): string => String.fromCharCode(...head.subarray(offset, offset + 4));
    if (HEIF_BRANDS.has(brandAt(8))) return 'heif';
    for (let offset = 16; offset + 4 <= boxEnd; offset += 4) if (HEIF_BRANDS.has(brandAt(offset))) return 'heif';
  }
  return 'unknown';
}

async function readHead(path: string): Promise<Uint8Array> {
  const handle = await open(path, 'r');
  try {
    const buf = new Uint8Array(32);
    const { bytesRead } = await handle.read(buf, 0, 32, 0);
    return buf.subarray(0, bytesRead);
  } finally {
    await handle.close();
  }
}

const stemOf = (name: string): string => name.slice(0, name.length - extname(name).length).toLowerCase();

export async function listStillPhotos(folder: string, option = 'FOLDER'): Promise<StillPhotoListing> {
  let info;
  try {
    info = await stat(folder);
  } catch {
    throw new KerrError('FILE_NOT_FOUND', missingPathText(folder, `the photo folder ${folder} does not exist`), { path: option, hint: 'Give the folder that holds the photos' });
  }
  if (!info.isDirectory()) {
    throw new KerrError('BAD_ARGUMENT', `${folder} is a file, not a folder of photos`, { path: option, hint: 'Give the folder that holds the photos (JPEG, PNG or TIFF)' });
  }
  const names = (await readdir(folder)).filter((n) => !n.startsWith('.')).sort((a, b) => a.localeCompare(b, 'en', { numeric: true, sensitivity: 'base' }));
  const readableStems = new Set(names.filter((n) => PHOTO_EXTENSIONS[extname(n).toLowerCase()] !== undefined).map(stemOf));

  const photos: string[] = [];
  const formats: PhotoFormat[] = [];
  const skipped: StillPhotoListing['skipped'] = [];
  const ignored: string[] = [];
  const refuseHeif = (file: string): never => {
    throw new KerrError('BAD_ARGUMENT', `${file} is a HEIC/HEIF photo, which kerrtrace does not read`, { path: join(folder, file), hint: HEIC_HINT });
  };
  for (const name of names) {
    const path = join(folder, name);
    const ext = extname(name).toLowerCase();
    if (!(await stat(path)).isFile()) continue;
    if (HEIF_EXTENSIONS.has(ext)) {
      if (readableStems.has(stemOf(name))) skipped.push({ file: name, reason: 'HEIC/HEIF (a JPEG, PNG or TIFF of the same name is read instead)' });
      else refuseHeif(name);
      continue;
    }
    if (RAW_EXTENSIONS.has(ext)) {
      skipped.push({ file: name, reason: 'camera raw file (export a 16-bit linear TIFF to use it)' });
      continue;
    }
    if (OTHER_IMAGE_EXTENSIONS.has(ext)) {
      skipped.push({ file: name, reason: `${ext.slice(1).toUpperCase()} is not read (convert to PNG or TIFF)` });
      continue;
    }
    const expected = PHOTO_EXTENSIONS[ext];
    if (expected === undefined) {
      ignored.push(name);
      continue;
    }
    const found = sniffImageFormat(await readHead(path));
    if (found === 'heif') refuseHeif(name);
    if (found !== expected) {
      throw new KerrError('BAD_ARGUMENT', `${name} does not look like a ${expected.toUpperCase()} file (its first bytes are ${found === 'unknown' ? 'not a known image signature' : `those of a ${found.toUpperCase()} file`})`, {
        path,
        hint: 'Re-export the photo as JPEG, PNG or TIFF with the matching extension, or move it out of the folder',
      });
    }
    photos.push(name);
    formats.push(expected);
  }
  if (photos.length === 0) {
    const seen = names.length === 0 ? 'the folder is empty' : `found only: ${names.slice(0, 5).join(', ')}${names.length > 5 ? ', ...' : ''}`;
    throw new KerrError('BAD_ARGUMENT', `no JPEG, PNG or TIFF photos in ${folder} (${seen})`, {
      path: option,
      hint: 'Put the photos (.jpg, .png or .tif) in the folder, or give the folder that holds them',
    });
  }
  return { photos, formats, skipped, ignored };
}
