/**
 * Reads a folder of photos taken at known voltages into a measured series for the Kerr fit:
 * per photo the voltage, the beam region's mean linear luminance with the dark region subtracted
 * and the exposure normalised, the clipped fraction, the relative exposure and (when every photo
 * carries one) the EXIF capture time.
 *
 * Steps (settings and cheap checks first, pixels last):
 * 1. list the photos (JPEG/PNG/TIFF; HEIC refused with a conversion hint) — listStillPhotos;
 * 2. voltages from the CSV (`voltsPath`, parseStillsMap) or from the file names
 *    (voltageFromFileName); photos missing from a CSV are left out and counted;
 * 3. sizes (EXIF orientation applied) must agree; bit depth 8 or 16; regions inside the frame;
 * 4. EXIF exposure time, ISO, f-number and capture time (exifr) → relative exposure t·ISO/N²
 *    against the first readable photo (relativeExposure), capture times (captureTimesS); without
 *    exposure EXIF a --reference-roi, if given, measures the exposure (ref − dark against the
 *    first readable photo), otherwise a warning says that nothing can tell;
 * 5. decode with sharp (embedded ICC profiles ignored: phone profiles such as Display P3 share
 *    the sRGB curve), linearise (default sRGB for 8-bit images and 16-bit PNG, linear for 16-bit
 *    TIFF; `transfer` overrides all), measure regions (measureImageRegions, Rec. 709 luminance);
 * 6. intensity = (roi − dark) / relative exposure (linear units, 1 = full-scale white of the
 *    first readable photo's exposure);
 * 7. the open photo (`openPhotoPath`, analyser parallel, no field), when given, is measured the
 *    same way and put on the same scale: its exposure relative to the first readable photo comes
 *    from the same basis (EXIF pair, or its reference region; taken as equal when the series has
 *    neither, with a note). Its intensity is the open level I_amp.
 * Clipping: a pixel with any channel at or above `clipLevel` of full scale (default 250/255)
 * counts as clipped; photos with more than 1 % of the beam region clipped are named in a warning.
 * Rule for bad photos (skip and count, never drop silently): a photo that cannot be decoded stays
 * in the series with NaN values, its reason in `unreadable`, and a warning names it; when no
 * photo can be read the whole series is refused.
 * Warnings carry a stable code and, where one fits, the anchor of docs/recording-a-run.md
 * (src/report/guide.ts).
 *
 * Edge module: reads files. Throws KerrError with one line and a hint for: no photos, HEIC,
 * photos of different sizes, unsupported bit depth, a CSV naming missing files, a file given two
 * voltages, names without a voltage, regions outside the frame (BAD_REGION), no readable photo,
 * and (BAD_ARGUMENT with path --open-photo) an open photo that is missing, unreadable, of another
 * size, clipped, without the EXIF the series uses, not brighter than its dark region, or one of
 * the series' photos.
 * @example const s = await readStillsSeries('run1', { roi: { x: 100, y: 80, w: 40, h: 40 } }); s.intensity
 */
import { access, readFile } from 'node:fs/promises';
import { basename, dirname, extname, join, resolve } from 'node:path';
import sharp from 'sharp';
import exifr from 'exifr';
import { SYNC_SETTINGS } from '../core/sync/findSyncOffset.js';
import { KerrError } from '../errors.js';
import type { Rect, RegionSample, ResponseTable, TransferName } from '../media/types.js';
import type { RunWarning } from '../result/schema.js';
import type { GuideAnchor } from '../report/guide.js';
import { validateRect } from '../measure/rect.js';
import { exposureGains } from '../measure/exposure.js';
import { HEIC_HINT, listStillPhotos, type PhotoFormat } from './listStillPhotos.js';
import { parseStillsMap } from './parseStillsMap.js';
import { voltageFromFileName } from './voltageFromFileName.js';
import { relativeExposure, type ExifExposure } from './relativeExposure.js';
import { captureTimesS, type ExifCaptureTime } from './captureTimes.js';
import { codeToLinearLut } from './codeToLinearLut.js';
import { measureImageRegions } from './measureImageRegions.js';
import { CLIPPED_FRACTION_LIMIT } from '../core/figures/clippedFractionLimit.js';

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
  /** A measured camera response (camera profile) used instead of any transfer curve. */
  response?: ResponseTable;
  /** Clipping threshold as a fraction of full scale; default 250/255. */
  clipLevel?: number;
  /**
   * A photo with the analyser parallel and no field (same camera position; any exposure that the
   * series' exposure basis can relate to the first photo): measured like the series to give the
   * open level.
   */
  openPhotoPath?: string;
  /** Called after each photo is decoded (done, total). */
  onProgress?: (done: number, total: number) => void;
}

export interface StillsSeries {
  voltageV: Float64Array;
  /** (roi − dark) / exposureRelative, linear units; NaN for an unreadable photo. */
  intensity: Float64Array;
  files: string[];
  clippedFraction: Float64Array;
  /** Against the first readable photo; NaN for an unreadable photo. */
  exposureRelative: Float64Array;
  warnings: RunWarning[];
  width: number;
  height: number;
  // Extras for reports and checks.
  notes: string[];
  roi: Rect;
  roiIsWholeFrame: boolean;
  darkRoi: Rect | null;
  referenceRoi: Rect | null;
  /** Mean linear luminance of the beam region before dark subtraction and exposure normalisation. */
  roiLinear: Float64Array;
  darkLinear: Float64Array | null;
  referenceLinear: Float64Array | null;
  exposureBasis: 'exif' | 'reference' | 'none';
  /** EXIF factors used for the exposure ("exposure time", "ISO", "f-number"); empty unless basis is exif. */
  exposureFactors: string[];
  voltageSource: 'csv' | 'file-names';
  transfers: TransferName[];
  /** 8 or 16 per photo; null for an unreadable photo. */
  bitDepths: Array<number | null>;
  /** Per photo: null when it was read, else why it could not be. */
  unreadable: Array<string | null>;
  /** EXIF capture time per photo, s after the earliest photo; null unless every photo has one (captureTimesS). */
  captureTimeS: Float64Array | null;
  /** Files in the folder that were not used, with the reason. */
  leftOut: Array<{ file: string; reason: string }>;
  /** The open photo, when one was given: its intensity on the series' scale is the open level. */
  openPhoto: OpenPhoto | null;
}

export interface OpenPhoto {
  path: string;
  /** (roi − dark) / exposureRelative, linear units: the open level I_amp. */
  intensity: number;
  exposureRelative: number;
  clippedFraction: number;
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
  /** Format by content (sharp), null for anything but JPEG, PNG and TIFF. */
  format: PhotoFormat | null;
}

const messageOf = (e: unknown): string => (e instanceof Error ? e.message : String(e)).split('\n')[0]!.trim();

/** Size and depth of one photo, or the reason it cannot be read. @throws KerrError for a depth kerrtrace does not read. */
async function photoInfo(path: string, file: string): Promise<PhotoInfo | string> {
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

type PhotoExif = ExifExposure & ExifCaptureTime;

async function readExif(path: string): Promise<PhotoExif> {
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

function defaultTransfer(format: PhotoFormat, maxCode: 255 | 65535): TransferName {
  return format === 'tiff' && maxCode === 65535 ? 'linear' : 'srgb';
}

/** Decodes one photo (orientation applied, ICC ignored) and measures the regions. Throws what sharp throws. */
async function measurePhoto(path: string, maxCode: 255 | 65535, lut: Float64Array, regions: Rect[], clipCode: number): Promise<RegionSample[]> {
  const pipeline = sharp(path, { ignoreIcc: true }).autoOrient().removeAlpha();
  const { data, info } = maxCode === 65535
    ? await pipeline.toColourspace('rgb16').raw({ depth: 'ushort' }).toBuffer({ resolveWithObject: true })
    : await pipeline.toColourspace('srgb').raw().toBuffer({ resolveWithObject: true });
  const samples = maxCode === 65535 ? new Uint16Array(data.buffer, data.byteOffset, data.byteLength / 2) : new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
  return measureImageRegions({ data: samples, width: info.width, height: info.height, channels: info.channels }, regions, lut, clipCode);
}

export async function readStillsSeries(folder: string, opts: StillsOptions = {}): Promise<StillsSeries> {
  const warnings: RunWarning[] = [];
  const warn = (code: string, message: string, guideSection?: GuideAnchor): void => {
    warnings.push(guideSection ? { code, message, guideSection } : { code, message });
  };
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
    if (notListed.length > 0) warn('photos-not-in-map', `${notListed.length} photo(s) in the folder are not in ${opts.voltsPath} and were left out: ${listNames(notListed)}`);
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

  // Unit sanity, as for a video's log (core/sync/findSyncOffset: a liquid cell needs kilovolts):
  // photo voltages that are not all zero but never exceed 50 V are kilovolts read as volts.
  let maxAbsV = 0;
  for (const v of voltages) maxAbsV = Math.max(maxAbsV, Math.abs(v));
  if (maxAbsV > 0 && maxAbsV < SYNC_SETTINGS.minDriveV) {
    throw new KerrError('BAD_ARGUMENT', `the photo voltages never exceed ${maxAbsV} V, too little to modulate a Kerr cell: they look like kilovolts read as volts`, {
      path: voltageSource === 'file-names' ? photos[0]! : opts.voltsPath ?? '--volts',
      hint: voltageSource === 'file-names'
        ? 'Write the unit in the file names, e.g. step07_4.5kV.jpg'
        : 'Put the unit in the voltage column\'s header, e.g. voltage_kV or U [kV]',
    });
  }

  // The open photo: cheap checks now, pixels at the end.
  if (opts.openPhotoPath !== undefined) {
    const path = opts.openPhotoPath;
    try {
      await access(path);
    } catch {
      throw new KerrError('FILE_NOT_FOUND', `the open photo ${path} does not exist`, { path: '--open-photo', hint: 'Give the photo taken with the analyser parallel and no field' });
    }
    if (resolve(dirname(path)) === resolve(folder) && photos.includes(basename(path))) {
      throw new KerrError('BAD_ARGUMENT', `the open photo ${basename(path)} is also one of the series' photos`, { path: '--open-photo', hint: 'Move the open photo out of the folder (or leave it out of the --volts CSV), so it is not fitted as a point of the sweep' });
    }
  }

  // 3. Sizes and depths; a photo that cannot be read is skipped and counted.
  const n = photos.length;
  const unreadable: Array<string | null> = new Array<string | null>(n).fill(null);
  const infos: Array<PhotoInfo | null> = [];
  for (let i = 0; i < n; i++) {
    const info = await photoInfo(join(folder, photos[i]!), photos[i]!);
    if (typeof info === 'string') {
      unreadable[i] = info;
      infos.push(null);
    } else infos.push(info);
  }
  const first = infos.findIndex((info) => info !== null);
  if (first < 0) throw noneReadable(photos, unreadable, folder);
  const width = infos[first]!.width;
  const height = infos[first]!.height;
  infos.forEach((info, i) => {
    if (info !== null && (info.width !== width || info.height !== height)) {
      throw new KerrError('BAD_ARGUMENT', `the photos differ in size: ${photos[first]} is ${width}x${height} but ${photos[i]} is ${info.width}x${info.height}`, {
        path: join(folder, photos[i]!),
        hint: 'Take the whole series from one camera position at one size and orientation (or crop all photos identically)',
      });
    }
  });
  const bitDepths = infos.map((info) => (info === null ? null : info.maxCode === 65535 ? 16 : 8));
  if (new Set(bitDepths.filter((d) => d !== null)).size > 1) warn('mixed-bit-depth', 'the series mixes 8-bit and 16-bit photos; check that they were all processed the same way');
  const roiIsWholeFrame = opts.roi === undefined;
  const roi = opts.roi ?? { x: 0, y: 0, w: width, h: height };
  validateRect(roi, width, height, '--roi');
  if (opts.darkRoi) validateRect(opts.darkRoi, width, height, '--dark-roi');
  if (opts.referenceRoi) validateRect(opts.referenceRoi, width, height, '--reference-roi');
  if (roiIsWholeFrame) warn('whole-photo-region', 'no --roi given: the whole photo was measured; give the beam region with --roi x,y,w,h for a cleaner signal');
  if (!opts.darkRoi) warn('no-dark-region', 'no --dark-roi given: the black level and ambient light stay in the intensity, so the fitted floor, the floor fraction and the contrast ratio include them; give a region with no beam with --dark-roi');

  // 4. EXIF: exposure settings and capture times.
  const exif: PhotoExif[] = [];
  for (const p of photos) exif.push(await readExif(join(folder, p)));
  const captureTimeS = captureTimesS(exif);
  if (captureTimeS !== null) {
    for (let i = 1; i < n; i++) {
      if (captureTimeS[i]! < captureTimeS[i - 1]!) {
        warn('capture-order', `the EXIF capture times do not follow the order of the file names (${photos[i]} was taken before ${photos[i - 1]}); the photos are used in name order, check that the names are right`);
        break;
      }
    }
  }

  // 5. Pixels.
  const transfers = infos.map((info, i) => opts.transfer ?? defaultTransfer(formats[i]!, info?.maxCode ?? 255));
  if (opts.transfer === undefined && transfers.some((t, i) => t === 'linear' && infos[i] !== null)) {
    notes.push('16-bit TIFF photos were read as linear (no transfer curve); give --transfer srgb if your converter wrote gamma-encoded TIFF');
  }
  const clipLevel = opts.clipLevel ?? 250 / 255;
  const regions: Rect[] = [roi, ...(opts.darkRoi ? [opts.darkRoi] : []), ...(opts.referenceRoi ? [opts.referenceRoi] : [])];
  const roiLinear = new Float64Array(n).fill(NaN);
  const darkLinear = opts.darkRoi ? new Float64Array(n).fill(NaN) : null;
  const referenceLinear = opts.referenceRoi ? new Float64Array(n).fill(NaN) : null;
  const clippedFraction = new Float64Array(n).fill(NaN);
  const luts = new Map<string, Float64Array>();
  for (let i = 0; i < n; i++) {
    const info = infos[i];
    if (info === null || info === undefined) {
      opts.onProgress?.(i + 1, n);
      continue;
    }
    const path = join(folder, photos[i]!);
    const maxCode = info.maxCode;
    const key = `${opts.response ? 'profile' : transfers[i]}/${maxCode}`;
    let lut = luts.get(key);
    if (lut === undefined) {
      lut = codeToLinearLut(transfers[i]!, maxCode, opts.response);
      luts.set(key, lut);
    }
    let measured: RegionSample[];
    try {
      measured = await measurePhoto(path, maxCode, lut, regions, Math.round(clipLevel * maxCode));
    } catch (e) {
      unreadable[i] = messageOf(e);
      bitDepths[i] = null;
      opts.onProgress?.(i + 1, n);
      continue;
    }
    roiLinear[i] = measured[0]!.luma;
    clippedFraction[i] = measured[0]!.clippedFraction;
    if (darkLinear) darkLinear[i] = measured[1]!.luma;
    if (referenceLinear) referenceLinear[i] = measured[opts.darkRoi ? 2 : 1]!.luma;
    opts.onProgress?.(i + 1, n);
  }
  const readable: number[] = [];
  for (let i = 0; i < n; i++) if (unreadable[i] === null) readable.push(i);
  if (readable.length === 0) throw noneReadable(photos, unreadable, folder);
  const unreadableNames = photos.filter((_, i) => unreadable[i] !== null);
  if (unreadableNames.length > 0) {
    const firstBad = unreadable.findIndex((u) => u !== null);
    warn('unreadable', unreadableNames.length === 1
      ? `${photos[firstBad]} could not be read and was left out (${unreadable[firstBad]}); re-export it as JPEG, PNG or TIFF`
      : `${unreadableNames.length} photos could not be read and were left out: ${listNames(unreadableNames)} (${photos[firstBad]}: ${unreadable[firstBad]}); re-export them as JPEG, PNG or TIFF`);
  }
  const refPhoto = readable[0]!;

  // Exposure basis: EXIF, else the reference region, else none (and say so). Relative to the first readable photo.
  const fromExif = relativeExposure(readable.map((i) => exif[i]!));
  for (const m of fromExif.warnings) warn('exposure-exif-partial', m, 'lock-exposure');
  let exposureRelative = new Float64Array(n).fill(NaN);
  readable.forEach((i, k) => (exposureRelative[i] = fromExif.relative[k]!));
  let exposureBasis: StillsSeries['exposureBasis'] = fromExif.basis;
  if (fromExif.basis === 'exif') {
    notes.push(`exposure normalised from EXIF (${fromExif.factors.join(', ')})${fromExif.varies ? '' : ': identical in every photo'}`);
    if (referenceLinear) {
      const check = new Float64Array(n);
      for (let i = 0; i < n; i++) check[i] = (referenceLinear[i]! - (darkLinear ? darkLinear[i]! : 0)) / exposureRelative[i]!;
      const spread = spreadOf(check);
      if (spread > 0.05) warn('exposure-exif-mismatch', `after the EXIF exposure normalisation the reference region still changes by ${percent(spread)} between photos: the light itself may have changed, or the EXIF values are not the ones used`, 'lock-exposure');
    }
  } else if (referenceLinear) {
    const gains = exposureGains(referenceLinear, darkLinear ?? undefined).gains;
    const firstGain = gains[refPhoto]!;
    if (!(firstGain > 0)) {
      throw new KerrError('BAD_REGION', `the reference region is not brighter than the dark level in ${photos[refPhoto]}`, { path: '--reference-roi', hint: 'Put the reference region on a lit grey card that stays in view in every photo' });
    }
    exposureRelative = gains.map((g) => g / firstGain);
    exposureBasis = 'reference';
    const spread = spreadOf(exposureRelative);
    if (spread > EXPOSURE_SPREAD_WARNING) {
      warn('exposure-drift', `the photos carry no exposure EXIF and the reference region changes by ${percent(spread)}: the exposure seems to vary; intensities were normalised by the reference region (lock exposure and ISO next time)`, 'lock-exposure');
    } else notes.push(`no exposure EXIF; the reference region is steady within ${percent(EXPOSURE_SPREAD_WARNING)}, intensities normalised by it`);
  } else {
    warn('exposure-unknown', 'the photos carry no exposure EXIF and no --reference-roi was given: kerrtrace cannot tell whether the exposure changed between photos; lock exposure and ISO (manual mode), or give --reference-roi on a grey card in view', 'lock-exposure');
  }

  const intensity = new Float64Array(n);
  for (let i = 0; i < n; i++) intensity[i] = (roiLinear[i]! - (darkLinear ? darkLinear[i]! : 0)) / exposureRelative[i]!;

  const clippedPhotos = photos.filter((_, i) => clippedFraction[i]! > CLIPPED_FRACTION_LIMIT);
  if (clippedPhotos.length > 0) {
    warn('clipping', `${clippedPhotos.length} photo(s) have more than ${percent(CLIPPED_FRACTION_LIMIT)} of the beam region clipped (${listNames(clippedPhotos)}): their intensity reads low and they were left out of the fit; lower the exposure or add an ND filter`, 'avoid-clipping');
  }
  // 7. The open photo, measured like the series and put on its exposure scale.
  let openPhoto: OpenPhoto | null = null;
  if (opts.openPhotoPath !== undefined) {
    const path = opts.openPhotoPath;
    const fail = (message: string, hint: string): KerrError => new KerrError('BAD_ARGUMENT', message, { path: '--open-photo', hint });
    const info = await photoInfo(path, basename(path));
    if (typeof info === 'string' || info.format === null) {
      throw fail(`the open photo ${path} could not be read as a JPEG, PNG or TIFF photo${typeof info === 'string' ? ` (${info})` : ''}`, HEIC_HINT);
    }
    if (info.width !== width || info.height !== height) {
      throw fail(`the open photo is ${info.width}x${info.height} but the series is ${width}x${height}`, 'Take the open photo from the same camera position, at the same size and orientation');
    }
    const transfer = opts.transfer ?? defaultTransfer(info.format, info.maxCode);
    let measured: RegionSample[];
    try {
      measured = await measurePhoto(path, info.maxCode, codeToLinearLut(transfer, info.maxCode, opts.response), regions, Math.round(clipLevel * info.maxCode));
    } catch (e) {
      throw fail(`the open photo ${path} could not be decoded (${messageOf(e)})`, 'Re-export it as JPEG, PNG or TIFF');
    }
    const clipped = measured[0]!.clippedFraction;
    if (clipped > CLIPPED_FRACTION_LIMIT) {
      throw fail(`${percent(clipped)} of the beam region of the open photo is clipped, so the open level would read low`, 'Take the open photo at a shorter exposure time, with its exposure EXIF (or the grey card of --reference-roi in view) so kerrtrace can relate it to the series');
    }
    const darkOpen = opts.darkRoi ? measured[1]!.luma : 0;
    let exposure = 1;
    if (exposureBasis === 'exif') {
      const pair = relativeExposure([exif[refPhoto]!, await readExif(path)]);
      if (pair.basis !== 'exif') throw fail('the open photo carries no exposure time in its EXIF, but the series was normalised by EXIF', 'Give the open photo as the camera wrote it, with its EXIF');
      for (const m of pair.warnings) warn('exposure-exif-partial', `open photo: ${m}`, 'lock-exposure');
      exposure = pair.relative[1]!;
    } else if (exposureBasis === 'reference') {
      const refOpen = measured[opts.darkRoi ? 2 : 1]!.luma - darkOpen;
      const refFirst = referenceLinear![refPhoto]! - (darkLinear ? darkLinear[refPhoto]! : 0);
      exposure = refOpen / refFirst;
      if (!(exposure > 0)) throw fail('the reference region of the open photo is not brighter than its dark level', 'Keep the grey card of --reference-roi lit and in view in the open photo too');
    } else {
      notes.push('the open photo is taken to have the first photo\'s exposure: there is no exposure EXIF or reference region to tell');
    }
    const intensity = (measured[0]!.luma - darkOpen) / exposure;
    if (!(intensity > 0)) throw fail('the beam region of the open photo is not brighter than its dark region', 'Check the regions and that the analyser was turned parallel');
    openPhoto = { path, intensity, exposureRelative: exposure, clippedFraction: clipped };
  }

  const usedTransfers = [...new Set(readable.map((i) => transfers[i]!))];
  if (usedTransfers.length > 1) warn('mixed-transfer', `the photos were linearised with different transfer curves (${usedTransfers.join(', ')}); give --transfer to use one for all`);

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
    darkRoi: opts.darkRoi ?? null,
    referenceRoi: opts.referenceRoi ?? null,
    roiLinear,
    darkLinear,
    referenceLinear,
    exposureBasis,
    exposureFactors: fromExif.basis === 'exif' ? fromExif.factors : [],
    voltageSource,
    transfers,
    bitDepths,
    unreadable,
    captureTimeS,
    leftOut,
    openPhoto,
  };
}

function noneReadable(photos: string[], unreadable: Array<string | null>, folder: string): KerrError {
  return new KerrError('BAD_ARGUMENT', `none of the ${photos.length} photo(s) in ${folder} could be read (${photos[0]}: ${unreadable[0] ?? 'unknown reason'})`, {
    path: join(folder, photos[0]!),
    hint: 'Re-export the photos as JPEG, PNG or TIFF',
  });
}
