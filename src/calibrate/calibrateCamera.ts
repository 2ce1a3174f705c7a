/**
 * `kerrtrace calibrate-camera`: a camera response profile from a calibration recording, a clip or
 * a photo set of the beam with the analyser turned through known angles (docs/camera-response.md).
 *
 * Video: probe; decode range and matrix from the tags (the transfer does not matter: the profile
 * maps code values); pass 1 finds the beam's bright core from each block's brightest level over
 * the clip (core/camera/brightCore); pass 2 reads the core's mean R'G'B' code values in every frame
 * at full precision (10-bit clips too); frames with more than 1 % clipped pixels are left out; the
 * channel with the widest range is used. The light of each frame comes from Malus's law
 * (core/camera/malusLight): from the angle table (`anglesPath`: steps, frames within 0.3 s after a
 * step left out; or a continuous record, rows under 0.5 s apart, interpolated) or from a steady rotation whose period is found in the clip.
 * Photos: every JPEG/PNG/TIFF of the folder whose name holds its angle (`ang030.jpg`,
 * `step3_45deg.jpg`), decoded as the stills command does (orientation applied, ICC ignored); the
 * core from the brightest photo. Then fitResponseTable gives the monotone table and its residual.
 *
 * Edge module (reads files, runs ffmpeg). @throws KerrError FILE_NOT_FOUND, NOT_A_VIDEO,
 * BAD_ARGUMENT (photos without angles in their names), BAD_CSV, NOT_IDENTIFIABLE (too little range,
 * no rotation found), UNSUPPORTED_ENCODING (a colour matrix that cannot be decoded).
 * @example const profile = await calibrateCamera({ inputPath: 'cal.mp4' }, { toolVersion: '0.1.0' })
 */
import { readFile, stat } from 'node:fs/promises';
import { basename, join } from 'node:path';
import exifr from 'exifr';
import sharp from 'sharp';
import { KerrError } from '../errors.js';
import { decodingFor } from '../core/camera/decodingFor.js';
import { brightCore } from '../core/camera/brightCore.js';
import { fitResponseTable } from '../core/camera/fitResponseTable.js';
import { lightFromAngles, lightFromSteadyRotation } from '../core/camera/malusLight.js';
import { responseAt } from '../core/camera/responseTable.js';
import { toLinear } from '../core/camera/transfer.js';
import { probeMedia } from '../media/probe.js';
import { openAnalysisStream } from '../media/analysisStream.js';
import { readMediaTags } from '../media/readMediaTags.js';
import type { ResponseTable, TransferName } from '../media/types.js';
import { createGridSampler } from '../measure/gridSampler.js';
import { createRegionMeter } from '../measure/regionMeter.js';
import { measureImageRegions } from '../stills/measureImageRegions.js';
import { listStillPhotos } from '../stills/listStillPhotos.js';
import { CAMERA_PROFILE_KIND, CAMERA_PROFILE_VERSION, type CameraProfile } from '../io/cameraProfile.js';
import { anglesAtTimes, parseAngleTable } from './parseAngleTable.js';

export interface CalibrateOptions {
  /** A video file, or a folder of photos with the angle in each file name. */
  inputPath: string;
  /** Stepped angle table (CSV time_s,angle_deg) for a clip; omit for a steady rotation. */
  anglesPath?: string;
  onProgress?: (stage: string, done: number, total: number) => void;
}

export interface CalibrateHooks {
  toolVersion: string;
  /** The clock, passed in (ISO-8601). */
  now: string;
}

/** Extra notes the command prints beside the profile. */
export interface CalibrationOutcome {
  profile: CameraProfile;
  notes: string[];
}

const CLIPPED_LIMIT = 0.01;
const DEFAULT_SETTLE_S = 0.3;

export async function calibrateCamera(o: CalibrateOptions, hooks: CalibrateHooks): Promise<CalibrationOutcome> {
  let isFolder: boolean;
  try {
    isFolder = (await stat(o.inputPath)).isDirectory();
  } catch {
    throw new KerrError('FILE_NOT_FOUND', `no file or folder at ${o.inputPath}`, { path: o.inputPath, hint: 'Give the calibration clip, or the folder of calibration photos' });
  }
  if (isFolder) {
    if (o.anglesPath !== undefined) throw new KerrError('BAD_ARGUMENT', '--angles is for a clip; photos carry their angle in the file name', { path: '--angles', hint: 'Name the photos like ang030.jpg, or give a clip' });
    return calibrateFromPhotos(o, hooks);
  }
  return calibrateFromVideo(o, hooks);
}

/** Index of the channel with the widest range of mean codes. */
function widestChannel(series: Float64Array[], keep: Uint8Array): number {
  let best = 0, bestRange = -1;
  series.forEach((s, c) => {
    let lo = Infinity, hi = -Infinity;
    for (let i = 0; i < s.length; i++) if (keep[i]) { lo = Math.min(lo, s[i]!); hi = Math.max(hi, s[i]!); }
    if (hi - lo > bestRange) { bestRange = hi - lo; best = c; }
  });
  return best;
}

/** Largest gap between the table and the tagged curve (both scaled 0..1 over the code range). */
function departureFromTags(table: ResponseTable, codeRange: [number, number], transfer: TransferName | null): number | null {
  if (transfer === null) return null;
  const [lo, hi] = codeRange;
  const t0 = toLinear(transfer, lo / 255), t1 = toLinear(transfer, hi / 255);
  const r0 = responseAt(table, lo), r1 = responseAt(table, hi);
  let worst = 0;
  for (let k = 0; k <= 100; k++) {
    const c = lo + ((hi - lo) * k) / 100;
    const tagged = (toLinear(transfer, c / 255) - t0) / (t1 - t0);
    const measured = (responseAt(table, c) - r0) / (r1 - r0);
    worst = Math.max(worst, Math.abs(tagged - measured));
  }
  return worst;
}

const CHANNELS = ['r', 'g', 'b'] as const;

/** The profile record: what the fit found, where it came from, and the run's provenance. */
function profileOf(hooks: CalibrateHooks, camera: Record<string, string>, settings: Record<string, string>, decoding: CameraProfile['decoding'], source: CameraProfile['source'],
  fit: { table: ResponseTable; codeRange: [number, number]; residualRms: number }, tagged: TransferName | null): CameraProfile {
  return {
    kind: CAMERA_PROFILE_KIND,
    version: CAMERA_PROFILE_VERSION,
    createdAt: hooks.now,
    tool: { name: 'kerrtrace', version: hooks.toolVersion },
    camera,
    settings,
    decoding,
    source,
    response: fit.table,
    codeRange: fit.codeRange,
    fit: { residualRms: fit.residualRms, departureFromTags: departureFromTags(fit.table, fit.codeRange, tagged) ?? NaN },
  };
}

async function calibrateFromVideo(o: CalibrateOptions, hooks: CalibrateHooks): Promise<CalibrationOutcome> {
  const notes: string[] = [];
  const probe = await probeMedia(o.inputPath);
  const { info } = probe;
  notes.push(...probe.notes);
  // codes only: any transfer will do for measuring; the tag is recorded as it is
  const decoding = decodingFor(info, { transfer: 'linear' });
  notes.push(...decoding.notes.filter((n) => !/transfer/.test(n)));
  let tagged: TransferName | null = null;
  try { tagged = decodingFor(info).transfer; } catch { tagged = null; }

  // pass 1: each block's brightest level over the clip
  const step = Math.max(2, Math.ceil(info.width / 160));
  const overview = openAnalysisStream(probe, [], { step, ...(o.onProgress ? { onProgress: (d: number, t: number) => o.onProgress!('finding the beam', d, t) } : {}) });
  const sampler = createGridSampler(overview.gridWidth, overview.gridHeight, 1, decoding);
  const cells = overview.gridWidth * overview.gridHeight;
  const values = new Float32Array(cells);
  const brightest = new Float32Array(cells).fill(-Infinity);
  for await (const f of overview.frames) {
    sampler.sample(f.overview!, values);
    for (let i = 0; i < cells; i++) if (values[i]! > brightest[i]!) brightest[i] = values[i]!;
  }
  const box = brightCore(brightest, overview.gridWidth, overview.gridHeight);
  const core = { x: box.x0 * step, y: box.y0 * step, w: (box.x1 - box.x0 + 1) * step, h: (box.y1 - box.y0 + 1) * step };

  // pass 2: mean codes of the core, every frame, full precision
  const stream = openAnalysisStream(probe, [core], o.onProgress ? { onProgress: (d, t) => o.onProgress!('reading the beam', d, t) } : {});
  const meter = createRegionMeter(stream.crops[0]!.w, stream.crops[0]!.h, [stream.offsets[0]!], decoding, undefined, stream.regionBitDepth);
  const times: number[] = [];
  const codes: [number[], number[], number[]] = [[], [], []];
  const clipped: number[] = [];
  for await (const f of stream.frames) {
    const m = meter.measure(f.regions[0]!)[0]!;
    times.push(f.timeS);
    codes[0].push(m.codeR); codes[1].push(m.codeG); codes[2].push(m.codeB);
    clipped.push(m.clippedFraction);
  }
  const n = times.length;
  const keep = Uint8Array.from(clipped, (c) => (c > CLIPPED_LIMIT ? 0 : 1));
  const clippedCount = n - keep.reduce((a, b) => a + b, 0);
  if (clippedCount > 0) notes.push(`${clippedCount} of ${n} frames have clipped pixels in the beam and were left out; for the full curve keep the open level just below clipping`);
  const series = codes.map((c) => Float64Array.from(c));
  const channel = widestChannel(series, keep);
  const timeArr = Float64Array.from(times);

  let light: Float64Array;
  let source: CameraProfile['source'];
  if (o.anglesPath !== undefined) {
    let text: string;
    try { text = await readFile(o.anglesPath, 'utf8'); } catch {
      throw new KerrError('FILE_NOT_FOUND', `no angle table at ${o.anglesPath}`, { path: '--angles', hint: 'Give the CSV of time_s,angle_deg steps' });
    }
    const table = parseAngleTable(text, o.anglesPath);
    const angles = anglesAtTimes(table, timeArr, DEFAULT_SETTLE_S);
    for (let i = 0; i < n; i++) if (!Number.isFinite(angles[i]!)) keep[i] = 0;
    const idx = Array.from({ length: n }, (_v, i) => i).filter((i) => keep[i]);
    const found = lightFromAngles(idx.map((i) => angles[i]!), idx.map((i) => series[channel]![i]!));
    light = new Float64Array(n).fill(NaN);
    idx.forEach((i, k) => { light[i] = found.light[k]!; });
    source = { kind: 'angle-table', files: [basename(o.inputPath), basename(o.anglesPath)], points: idx.length, brightestAtDeg: found.brightestAtDeg, channel: CHANNELS[channel]! };
  } else {
    const idx = Array.from({ length: n }, (_v, i) => i).filter((i) => keep[i]);
    const found = lightFromSteadyRotation(idx.map((i) => timeArr[i]!), idx.map((i) => series[channel]![i]!));
    light = new Float64Array(n).fill(NaN);
    idx.forEach((i, k) => { light[i] = found.light[k]!; });
    source = { kind: 'rotating-analyser', files: [basename(o.inputPath)], points: idx.length, lightPeriodS: found.lightPeriodS, brightestAtDeg: found.brightestAtDeg, channel: CHANNELS[channel]! };
  }
  const used = Array.from({ length: n }, (_v, i) => i).filter((i) => keep[i] && Number.isFinite(light[i]!));
  const fit = fitResponseTable(used.map((i) => series[channel]![i]!), used.map((i) => light[i]!));
  source.points = fit.points;

  const tags = await readMediaTags(o.inputPath);
  const camera: Record<string, string> = {};
  for (const [k, v] of Object.entries(tags)) if (/^(make|model|software|manufacturer|com\.apple\.quicktime\.(make|model|software)|com\.android\.(version|manufacturer|model))$/i.test(k)) camera[k] = v;
  const settings: Record<string, string> = {
    size: `${info.width}x${info.height}`, pixelFormat: info.pixelFormat, bitDepth: String(info.bitDepth), codec: info.codec,
    colourTransfer: info.colourTransfer, colourMatrix: info.colourMatrix, colourPrimaries: info.colourPrimaries, colourRange: info.colourRange,
    ...(info.meanFps !== null ? { fps: info.meanFps.toFixed(3) } : {}),
    ...(tags.creation_time ? { recordedAt: tags.creation_time } : {}),
  };
  const profile = profileOf(hooks, camera, settings, { range: decoding.range, matrix: decoding.matrix, transferTag: info.colourTransfer, bitDepth: info.bitDepth }, source, fit, tagged);
  return { profile, notes };
}

/** The angle in a photo's file name: "ang030", "angle-45", "45deg", "45.5_deg"; null when none. */
export function angleFromFileName(name: string): number | null {
  const stem = name.replace(/\.[^.]+$/, '');
  const m = /(?:^|[^a-z])ang(?:le)?[_-]?(-?\d+(?:\.\d+)?)/i.exec(stem) ?? /(-?\d+(?:\.\d+)?)[_-]?deg/i.exec(stem);
  return m ? Number(m[1]) : null;
}

async function decodePhoto(path: string): Promise<{ data: Uint8Array; width: number; height: number; channels: number }> {
  const { data, info } = await sharp(path, { ignoreIcc: true }).autoOrient().removeAlpha().toColourspace('srgb').raw().toBuffer({ resolveWithObject: true });
  return { data: new Uint8Array(data.buffer, data.byteOffset, data.byteLength), width: info.width, height: info.height, channels: info.channels };
}

async function calibrateFromPhotos(o: CalibrateOptions, hooks: CalibrateHooks): Promise<CalibrationOutcome> {
  const notes: string[] = [];
  const listing = await listStillPhotos(o.inputPath, 'FOLDER');
  const photos = listing.photos.map((file) => ({ file, angle: angleFromFileName(file) }));
  const missing = photos.filter((p) => p.angle === null).map((p) => p.file);
  if (missing.length > 0) {
    throw new KerrError('BAD_ARGUMENT', `${missing.length} calibration photo(s) have no angle in their name (${missing.slice(0, 3).join(', ')})`, {
      path: o.inputPath, hint: 'Name each photo after its analyser angle, e.g. ang000.jpg, ang015.jpg, … (0 = parallel)',
    });
  }
  const images = [];
  for (const [k, p] of photos.entries()) {
    images.push(await decodePhoto(join(o.inputPath, p.file)));
    o.onProgress?.('reading photos', k + 1, photos.length);
  }
  const { width, height, channels } = images[0]!;
  if (images.some((im) => im.width !== width || im.height !== height)) throw new KerrError('BAD_ARGUMENT', 'the calibration photos differ in size', { path: o.inputPath, hint: 'Take all photos with the same camera setting' });
  // the bright core from the brightest photo's block means
  let brightestIdx = 0, brightestSum = -1;
  images.forEach((im, k) => { let s = 0; for (let i = 0; i < im.data.length; i++) s += im.data[i]!; if (s > brightestSum) { brightestSum = s; brightestIdx = k; } });
  const step = Math.max(2, Math.ceil(width / 160));
  const gw = Math.floor(width / step), gh = Math.floor(height / step);
  const grid = new Float64Array(gw * gh);
  const im = images[brightestIdx]!;
  for (let y = 0; y < gh * step; y++) for (let x = 0; x < gw * step; x++) {
    let top = 0;
    for (let c = 0; c < Math.min(3, channels); c++) top = Math.max(top, im.data[(y * width + x) * channels + c]!);
    grid[Math.floor(y / step) * gw + Math.floor(x / step)] += top;
  }
  const box = brightCore(grid, gw, gh);
  const core = { x: box.x0 * step, y: box.y0 * step, w: (box.x1 - box.x0 + 1) * step, h: (box.y1 - box.y0 + 1) * step };
  const identity = Float64Array.from({ length: 256 }, (_v, k) => k);
  const codes: [number[], number[], number[]] = [[], [], []];
  const keep: number[] = [];
  for (const image of images) {
    const m = measureImageRegions(image, [core], identity, 255)[0]!;
    codes[0].push(m.r); codes[1].push(m.g); codes[2].push(m.b);
    keep.push(m.clippedFraction > CLIPPED_LIMIT ? 0 : 1);
  }
  const keepArr = Uint8Array.from(keep);
  const clippedCount = keep.length - keep.reduce((a, b) => a + b, 0);
  if (clippedCount > 0) notes.push(`${clippedCount} photos have clipped pixels in the beam and were left out`);
  const series = codes.map((c) => Float64Array.from(c));
  const channel = widestChannel(series, keepArr);
  const idx = photos.map((_p, i) => i).filter((i) => keepArr[i]);
  const found = lightFromAngles(idx.map((i) => photos[i]!.angle!), idx.map((i) => series[channel]![i]!));
  const fit = fitResponseTable(idx.map((i) => series[channel]![i]!), Array.from(found.light));

  const camera: Record<string, string> = {};
  const settings: Record<string, string> = { size: `${width}x${height}` };
  try {
    const tags = (await exifr.parse(join(o.inputPath, photos[0]!.file), {
      pick: ['Make', 'Model', 'Software', 'LensModel', 'ExposureTime', 'ISO', 'FNumber', 'WhiteBalance', 'ExposureMode', 'ExposureProgram', 'DateTimeOriginal'],
      reviveValues: false,
    })) as Record<string, unknown> | undefined;
    for (const [k, v] of Object.entries(tags ?? {})) {
      if (v === undefined || v === null) continue;
      (/^(Make|Model|Software|LensModel)$/.test(k) ? camera : settings)[k] = String(v);
    }
  } catch {
    notes.push('the photos carry no readable EXIF block, so the profile does not name the camera');
  }
  const profile = profileOf(hooks, camera, settings, { range: 'full', matrix: 'rgb', transferTag: 'srgb', bitDepth: 8 },
    { kind: 'photo-angles', files: photos.map((p) => p.file), points: fit.points, brightestAtDeg: found.brightestAtDeg, channel: CHANNELS[channel]! }, fit, 'srgb');
  return { profile, notes };
}
