/**
 * Reads a folder of photos taken at known voltages into a measured series for the Kerr fit:
 * per photo the voltage, the beam region's mean linear luminance with the dark region subtracted
 * and the exposure normalised, the clipped fraction and the relative exposure.
 *
 * Steps (settings and cheap checks first, pixels last):
 * 1. list the photos (JPEG/PNG/TIFF; HEIC refused with a conversion hint) — listStillPhotos;
 * 2. voltages from the CSV (`voltsPath`, parseStillsMap) or from the file names
 *    (voltageFromFileName); photos missing from a CSV are left out and counted;
 * 3. sizes (EXIF orientation applied) must agree; bit depth 8 or 16; regions inside the frame;
 * 4. EXIF exposure time, ISO and f-number (exifr) → relative exposure t·ISO/N² against the first
 *    photo (relativeExposure); without EXIF a --reference-roi, if given, measures the exposure
 *    (ref − dark against the first photo), otherwise a warning says that nothing can tell;
 * 5. decode with sharp (embedded ICC profiles ignored: phone profiles such as Display P3 share
 *    the sRGB curve), linearise (default sRGB for 8-bit images and 16-bit PNG, linear for 16-bit
 *    TIFF; `transfer` overrides all), measure regions (measureImageRegions, Rec. 709 luminance);
 * 6. intensity = (roi − dark) / relative exposure (linear units, 1 = full-scale white of the
 *    first photo's exposure).
 * Clipping: a pixel with any channel at or above `clipLevel` of full scale (default 250/255)
 * counts as clipped; photos with more than 1 % of the beam region clipped are named in a warning.
 *
 * Edge module: reads files. Throws KerrError with one line and a hint for: no photos, HEIC,
 * photos of different sizes, unsupported bit depth, a CSV naming missing files, a file given two
 * voltages, names without a voltage, regions outside the frame (BAD_REGION), unreadable images.
 * @example const s = await readStillsSeries('run1', { roi: { x: 100, y: 80, w: 40, h: 40 } }); s.intensity
 */
import { readFile } from 'node:fs/promises';
import { extname, join } from 'node:path';
import sharp from 'sharp';
import exifr from 'exifr';
import { KerrError } from '../errors.js';
import type { Rect, TransferName } from '../media/types.js';
import { validateRect } from '../measure/rect.js';
import { exposureGains } from '../measure/exposure.js';
import { listStillPhotos, type PhotoFormat } from './listStillPhotos.js';
import { parseStillsMap } from './parseStillsMap.js';
import { voltageFromFileName } from './voltageFromFileName.js';
import { relativeExposure, type ExifExposure } from './relativeExposure.js';
import { codeToLinearLut } from './codeToLinearLut.js';
import { measureImageRegions } from './measureImageRegions.js';
import { CLIPPED_WARNING_FRACTION } from './clippedLimit.js';

export interface StillsOptions {
  /** CSV mapping file → voltage; without it the voltages come from the file names. */
  voltsPath?: string;
  /** Beam region; default the whole frame (with a warning). */
  roi?: Rect;
  darkRoi?: Rect;
  /** A region of constant true brightness (grey card) to track exposure when EXIF is missing. */
  referenceRoi?: Rect;
  /** Overrides the per-file default transfer. */
  transfer?: TransferName;
  /** Clipping threshold as a fraction of full scale; default 250/255. */
  clipLevel?: number;
}

export interface StillsSeries {
  voltageV: Float64Array;
  /** (roi − dark) / exposureRelative, linear units. */
  intensity: Float64Array;
  files: string[];
  clippedFraction: Float64Array;
  exposureRelative: Float64Array;
  warnings: string[];
  width: number;
  height: number;
  // Extras for reports and checks.
  notes: string[];
  roi: Rect;
  roiIsWholeFrame: boolean;
  /** Mean linear luminance of the beam region before dark subtraction and exposure normalisation. */
  roiLinear: Float64Array;
  darkLinear: Float64Array | null;
  referenceLinear: Float64Array | null;
  exposureBasis: 'exif' | 'reference' | 'none';
  voltageSource: 'csv' | 'file-names';
  transfers: TransferName[];
  bitDepths: number[];
  /** Files in the folder that were not used, with the reason. */
  leftOut: Array<{ file: string; reason: string }>;
}

/** Relative spread of the reference region above which exposure "seems to vary". */
export const EXPOSURE_SPREAD_WARNING = 0.02;

const listNames = (names: string[], max = 3): string => `${names.slice(0, max).join(', ')}${names.length > max ? ` and ${names.length - max} more` : ''}`;
const percent = (x: number): string => `${Number((x * 100).toPrecision(2))}%`;

function spreadOf(values: Float64Array): number {
  let lo = Infinity, hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  return lo > 0 ? hi / lo - 1 : Infinity;
}

/** Matches CSV names to photo names: exact, then case-insensitive, then without extension. */
function matchMapToPhotos(mapNames: string[], photos: string[], csvName: string): Map<string, string> {
  const byLower = new Map<string, string[]>();
  const byStem = new Map<string, string[]>();
  for (const p of photos) {
    const lower = p.toLowerCase();
    byLower.set(lower, [...(byLower.get(lower) ?? []), p]);
    const stem = lower.slice(0, lower.length - extname(lower).length);
    byStem.set(stem, [...(byStem.get(stem) ?? []), p]);
  }
  const photoSet = new Set(photos);
  const result = new Map<string, string>(); // photo → csv name
  const missing: string[] = [];
  for (const raw of mapNames) {
    const name = raw.split(/[\\/]/).pop()!;
    const lower = name.toLowerCase();
    const candidates = photoSet.has(name) ? [name] : (byLower.get(lower) ?? byStem.get(lower) ?? []);
    if (candidates.length !== 1) {
      missing.push(raw);
      continue;
    }
    const photo = candidates[0]!;
    if (result.has(photo)) {
      throw new KerrError('BAD_CSV', `${csvName} names the photo ${photo} twice (as ${result.get(photo)} and ${raw})`, { path: csvName, hint: 'Keep one row per photo' });
    }
    result.set(photo, raw);
  }
  if (missing.length > 0) {
    throw new KerrError('BAD_CSV', `${csvName} names ${missing.length === 1 ? 'a photo' : `${missing.length} photos`} not found in the folder: ${listNames(missing)}`, {
      path: csvName,
      hint: 'The file column must hold the photo names exactly as in the folder (extension optional); fix the names or remove those rows',
    });
  }
  return result;
}

interface PhotoInfo {
  width: number;
  height: number;
  maxCode: 255 | 65535;
}

async function photoInfo(path: string, file: string): Promise<PhotoInfo> {
  let meta;
  try {
    meta = await sharp(path).metadata();
  } catch (e) {
    throw new KerrError('BAD_ARGUMENT', `${file} could not be read as an image (${e instanceof Error ? e.message : String(e)})`, { path, hint: 'Re-export the photo as JPEG, PNG or TIFF, or move it out of the folder' });
  }
  if (meta.depth !== 'uchar' && meta.depth !== 'ushort') {
    throw new KerrError('BAD_ARGUMENT', `${file} has ${meta.depth ?? 'unknown'} samples; kerrtrace reads 8- and 16-bit images`, { path, hint: 'Export the photos as 8-bit JPEG/PNG or 16-bit PNG/TIFF' });
  }
  const size = meta.autoOrient ?? { width: meta.width, height: meta.height };
  return { width: size.width, height: size.height, maxCode: meta.depth === 'ushort' ? 65535 : 255 };
}

async function exifExposure(path: string): Promise<ExifExposure> {
  const pickNumber = (v: unknown): number | null => {
    const x = Array.isArray(v) ? v[0] : v;
    return typeof x === 'number' && Number.isFinite(x) ? x : null;
  };
  try {
    const tags = (await exifr.parse(path, { pick: ['ExposureTime', 'ISO', 'FNumber'] })) as Record<string, unknown> | undefined;
    if (!tags) return { exposureTimeS: null, iso: null, fNumber: null };
    return { exposureTimeS: pickNumber(tags.ExposureTime), iso: pickNumber(tags.ISO), fNumber: pickNumber(tags.FNumber) };
  } catch {
    return { exposureTimeS: null, iso: null, fNumber: null }; // no EXIF block or a format exifr cannot parse
  }
}

function defaultTransfer(format: PhotoFormat, maxCode: 255 | 65535): TransferName {
  return format === 'tiff' && maxCode === 65535 ? 'linear' : 'srgb';
}

export async function readStillsSeries(folder: string, opts: StillsOptions = {}): Promise<StillsSeries> {
  const warnings: string[] = [];
  const notes: string[] = [];
  const listing = await listStillPhotos(folder);
  const leftOut = [...listing.skipped];
  if (listing.skipped.length > 0) notes.push(`${listing.skipped.length} image file(s) not read: ${listNames(listing.skipped.map((s) => `${s.file} (${s.reason})`), 2)}`);

  // 2. Voltages.
  let photos = listing.photos;
  let formats = listing.formats;
  const voltages: number[] = [];
  let voltageSource: StillsSeries['voltageSource'];
  if (opts.voltsPath !== undefined) {
    voltageSource = 'csv';
    let text: string;
    try {
      text = await readFile(opts.voltsPath, 'utf8');
    } catch {
      throw new KerrError('FILE_NOT_FOUND', `the voltage map ${opts.voltsPath} does not exist`, { path: '--volts', hint: 'Give the CSV that lists each photo file and its voltage' });
    }
    const map = parseStillsMap(text, opts.voltsPath);
    const matched = matchMapToPhotos([...map.voltageByFile.keys()], photos, opts.voltsPath);
    const keep: number[] = [];
    photos.forEach((p, i) => {
      if (matched.has(p)) keep.push(i);
      else leftOut.push({ file: p, reason: `not in ${opts.voltsPath}` });
    });
    const notListed = photos.filter((p) => !matched.has(p));
    if (notListed.length > 0) warnings.push(`${notListed.length} photo(s) in the folder are not in ${opts.voltsPath} and were left out: ${listNames(notListed)}`);
    if (map.duplicates > 0) notes.push(`${map.duplicates} row(s) of ${opts.voltsPath} repeat a photo with the same voltage`);
    photos = keep.map((i) => listing.photos[i]!);
    formats = keep.map((i) => listing.formats[i]!);
    for (const p of photos) voltages.push(map.voltageByFile.get(matched.get(p)!)!.voltageV);
  } else {
    voltageSource = 'file-names';
    const without: string[] = [];
    for (const p of photos) {
      const v = voltageFromFileName(p);
      if (v === null) without.push(p);
      else voltages.push(v);
    }
    if (without.length > 0) {
      throw new KerrError('BAD_ARGUMENT', `no voltage in the file name of ${listNames(without)}`, {
        path: without[0]!,
        hint: 'Name the photos with their voltage (e.g. step07_12.5kV.jpg, 0450V.png, 3,2kV.tif; see docs/stills.md) or give a CSV with --volts',
      });
    }
  }

  // 3. Sizes and depths.
  const infos: PhotoInfo[] = [];
  for (const p of photos) infos.push(await photoInfo(join(folder, p), p));
  const width = infos[0]!.width;
  const height = infos[0]!.height;
  infos.forEach((info, i) => {
    if (info.width !== width || info.height !== height) {
      throw new KerrError('BAD_ARGUMENT', `the photos differ in size: ${photos[0]} is ${width}x${height} but ${photos[i]} is ${info.width}x${info.height}`, {
        path: join(folder, photos[i]!),
        hint: 'Take the whole series from one camera position at one size and orientation (or crop all photos identically)',
      });
    }
  });
  const bitDepths = infos.map((i) => (i.maxCode === 65535 ? 16 : 8));
  if (new Set(bitDepths).size > 1) warnings.push('the series mixes 8-bit and 16-bit photos; check that they were all processed the same way');
  const roiIsWholeFrame = opts.roi === undefined;
  const roi = opts.roi ?? { x: 0, y: 0, w: width, h: height };
  validateRect(roi, width, height, '--roi');
  if (opts.darkRoi) validateRect(opts.darkRoi, width, height, '--dark-roi');
  if (opts.referenceRoi) validateRect(opts.referenceRoi, width, height, '--reference-roi');
  if (roiIsWholeFrame) warnings.push('no --roi given: the whole photo was measured; give the beam region with --roi x,y,w,h for a cleaner signal');
  if (!opts.darkRoi) notes.push('no --dark-roi: the black level and ambient light stay in the intensity (the fit\'s floor absorbs them)');

  // 4. Exposure from EXIF.
  const exif: ExifExposure[] = [];
  for (const p of photos) exif.push(await exifExposure(join(folder, p)));
  const fromExif = relativeExposure(exif);
  warnings.push(...fromExif.warnings);

  // 5. Pixels.
  const transfers = infos.map((info, i) => opts.transfer ?? defaultTransfer(formats[i]!, info.maxCode));
  if (opts.transfer === undefined && transfers.some((t) => t === 'linear')) {
    notes.push('16-bit TIFF photos were read as linear (no transfer curve); give --transfer srgb if your converter wrote gamma-encoded TIFF');
  }
  const clipLevel = opts.clipLevel ?? 250 / 255;
  const regions: Rect[] = [roi, ...(opts.darkRoi ? [opts.darkRoi] : []), ...(opts.referenceRoi ? [opts.referenceRoi] : [])];
  const n = photos.length;
  const roiLinear = new Float64Array(n);
  const darkLinear = opts.darkRoi ? new Float64Array(n) : null;
  const referenceLinear = opts.referenceRoi ? new Float64Array(n) : null;
  const clippedFraction = new Float64Array(n);
  const luts = new Map<string, Float64Array>();
  for (let i = 0; i < n; i++) {
    const path = join(folder, photos[i]!);
    const maxCode = infos[i]!.maxCode;
    const key = `${transfers[i]}/${maxCode}`;
    let lut = luts.get(key);
    if (lut === undefined) {
      lut = codeToLinearLut(transfers[i]!, maxCode);
      luts.set(key, lut);
    }
    let decoded;
    try {
      const pipeline = sharp(path, { ignoreIcc: true }).autoOrient().removeAlpha();
      decoded = maxCode === 65535
        ? await pipeline.toColourspace('rgb16').raw({ depth: 'ushort' }).toBuffer({ resolveWithObject: true })
        : await pipeline.toColourspace('srgb').raw().toBuffer({ resolveWithObject: true });
    } catch (e) {
      throw new KerrError('BAD_ARGUMENT', `${photos[i]} could not be decoded (${e instanceof Error ? e.message : String(e)})`, { path, hint: 'Re-export the photo as JPEG, PNG or TIFF, or move it out of the folder' });
    }
    const { data, info } = decoded;
    const samples = maxCode === 65535 ? new Uint16Array(data.buffer, data.byteOffset, data.byteLength / 2) : new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
    const measured = measureImageRegions({ data: samples, width: info.width, height: info.height, channels: info.channels }, regions, lut, Math.round(clipLevel * maxCode));
    roiLinear[i] = measured[0]!.luma;
    clippedFraction[i] = measured[0]!.clippedFraction;
    if (darkLinear) darkLinear[i] = measured[1]!.luma;
    if (referenceLinear) referenceLinear[i] = measured[opts.darkRoi ? 2 : 1]!.luma;
  }

  // Exposure basis: EXIF, else the reference region, else none (and say so).
  let exposureRelative = fromExif.relative;
  let exposureBasis: StillsSeries['exposureBasis'] = fromExif.basis;
  if (fromExif.basis === 'exif') {
    notes.push(`exposure normalised from EXIF (${fromExif.factors.join(', ')})${fromExif.varies ? '' : ': identical in every photo'}`);
    if (referenceLinear) {
      const check = new Float64Array(n);
      for (let i = 0; i < n; i++) check[i] = (referenceLinear[i]! - (darkLinear ? darkLinear[i]! : 0)) / exposureRelative[i]!;
      const spread = spreadOf(check);
      if (spread > 0.05) warnings.push(`after the EXIF exposure normalisation the reference region still changes by ${percent(spread)} between photos: the light itself may have changed, or the EXIF values are not the ones used`);
    }
  } else if (referenceLinear) {
    const gains = exposureGains(referenceLinear, darkLinear ?? undefined).gains;
    const first = gains[0]!;
    if (!(first > 0)) {
      throw new KerrError('BAD_REGION', `the reference region is not brighter than the dark level in ${photos[0]}`, { path: '--reference-roi', hint: 'Put the reference region on a lit grey card that stays in view in every photo' });
    }
    exposureRelative = gains.map((g) => g / first);
    exposureBasis = 'reference';
    const spread = spreadOf(exposureRelative);
    if (spread > EXPOSURE_SPREAD_WARNING) {
      warnings.push(`the photos carry no exposure EXIF and the reference region changes by ${percent(spread)}: the exposure seems to vary; intensities were normalised by the reference region (lock exposure and ISO next time)`);
    } else notes.push(`no exposure EXIF; the reference region is steady within ${percent(EXPOSURE_SPREAD_WARNING)}, intensities normalised by it`);
  } else {
    warnings.push('the photos carry no exposure EXIF and no --reference-roi was given: kerrtrace cannot tell whether the exposure changed between photos; lock exposure and ISO (manual mode), or give --reference-roi on a grey card in view');
  }

  const intensity = new Float64Array(n);
  for (let i = 0; i < n; i++) intensity[i] = (roiLinear[i]! - (darkLinear ? darkLinear[i]! : 0)) / exposureRelative[i]!;

  const clippedPhotos = photos.filter((_, i) => clippedFraction[i]! > CLIPPED_WARNING_FRACTION);
  if (clippedPhotos.length > 0) {
    warnings.push(`${clippedPhotos.length} photo(s) have more than ${percent(CLIPPED_WARNING_FRACTION)} of the beam region clipped (${listNames(clippedPhotos)}): their intensity reads low; lower the exposure or add an ND filter`);
  }
  if (new Set(transfers).size > 1) warnings.push(`the photos were linearised with different transfer curves (${[...new Set(transfers)].join(', ')}); give --transfer to use one for all`);

  return {
    voltageV: Float64Array.from(voltages),
    intensity,
    files: photos,
    clippedFraction,
    exposureRelative,
    warnings,
    width,
    height,
    notes,
    roi,
    roiIsWholeFrame,
    roiLinear,
    darkLinear,
    referenceLinear,
    exposureBasis,
    voltageSource,
    transfers,
    bitDepths,
    leftOut,
  };
}
