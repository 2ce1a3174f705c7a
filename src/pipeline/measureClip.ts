/**
 * The decode-and-measure stage of analyze: probe the clip, choose its decoding, read every frame
 * ONCE (decodePass.ts: frame times, the colour-decoded block store for beam finding, flashes and
 * maps, and full-resolution colour means of the given beam, its surround rings and the user's
 * regions), find the beam when no region was given and measure it and its rings from the block
 * store of the same pass (blockSeries.ts; whole blocks, block means: docs/analyze.md "Data flow"
 * gives the measured difference from a pixel read), and measure an open-level clip when one was
 * given (its own decode). The probe's, the decoder's and the stream's remarks become warnings.
 * `ClipMeasurement.beam.r/g/b` of a found beam are NaN unless `channels: 'rgb'` was asked for.
 *
 * It returns per-frame series only: exposure correction, exclusions, sync and the fit come after
 * (src/pipeline/analyze.ts). Files and processes are touched here and in src/media only.
 */
import { KerrError } from '../errors.js';
import type { Rect, VideoInfo, CameraDecoding } from '../media/types.js';
import { probeMedia, type ProbeResult } from '../media/probe.js';
import { decodingFor } from '../core/camera/decodingFor.js';
import { decodingWarnings } from './decodingWarnings.js';
import { readCameraProfile, type CameraProfile } from '../io/cameraProfile.js';
import { decodePass, type GridStore, type RegionSeries } from './decodePass.js';
import { blockSeries } from './blockSeries.js';
import { validateRect } from '../measure/rect.js';
import { findBeam } from '../core/regions/findBeam.js';
import { cellBoxToRect, growCellBox, type CellBox } from '../core/regions/cellGeometry.js';
import { surroundWeights, type SurroundGeometry } from '../core/regions/localSurround.js';
import { surroundRings } from '../core/regions/surroundRings.js';
import { detectFlashes } from '../core/events/detectFlashes.js';
import type { RunWarning } from '../result/schema.js';

/** What measureClip needs from the run's options. */
export interface ClipOptions {
  videoPath: string;
  roi?: Rect;
  darkRoi?: Rect;
  referenceRoi?: Rect;
  openVideoPath?: string;
  transfer?: CameraDecoding['transfer'];
  cameraProfilePath?: string;
  /** 'rgb': the per-channel series of an automatically found beam are kept too (4× the block store). */
  channels?: 'rgb';
}

export type { GridStore, RegionSeries } from './decodePass.js';

/** Per-frame background under the beam: linear luminance and the three channels. */
export interface BackgroundSeries {
  luma: Float64Array;
  r: Float64Array;
  g: Float64Array;
  b: Float64Array;
}

export interface ClipMeasurement {
  info: VideoInfo;
  decoding: CameraDecoding;
  /** The camera profile used instead of the transfer curve, with its path. */
  cameraProfile?: { path: string; profile: CameraProfile };
  times: Float64Array;
  nFrames: number;
  grid: GridStore;
  beamRect: Rect;
  beamAuto: boolean;
  geom: SurroundGeometry | undefined;
  /** False when the beam leaves no room for surround rings and no dark region was given. */
  haveSurround: boolean;
  /** Full-resolution means of the beam region. */
  beam: RegionSeries;
  /** The background under the beam: the dark region, or the rings' extrapolation; zeros without either. */
  background: BackgroundSeries;
  /** Linear luminance of the dark and reference regions, when given. */
  darkLuma?: Float64Array;
  referenceLuma?: Float64Array;
  /** Beam minus background of every frame of the open-level clip (--open-video). */
  openVideoLevels?: number[];
  warnings: RunWarning[];
}

export interface ClipHooks {
  onProgress?: (stage: string, done: number, total: number) => void;
}

/**
 * Grid step: about 160 blocks across, at least 2 px, and at most ~60 M stored values (240 MB of
 * Float32) over `arrays` per-block arrays (1: luminance; 4 with the three channels).
 */
export function chooseGridStep(info: VideoInfo, arrays = 1): number {
  let step = Math.max(2, Math.ceil(info.width / 160));
  const frames = Math.max(1, info.frameCount);
  while ((info.width / step) * (info.height / step) * frames * arrays > 60e6) step++;
  return step;
}

function backgroundOf(regions: RegionSeries[], weights: readonly number[] | null, nFrames: number): BackgroundSeries {
  const out: BackgroundSeries = { luma: new Float64Array(nFrames), r: new Float64Array(nFrames), g: new Float64Array(nFrames), b: new Float64Array(nFrames) };
  if (!weights) return out;
  for (const k of ['luma', 'r', 'g', 'b'] as const) {
    const o = out[k];
    for (let i = 0; i < regions.length; i++) {
      const w = weights[i]!;
      const s = regions[i]![k];
      for (let f = 0; f < nFrames; f++) o[f] += w * s[f]!;
    }
  }
  return out;
}

/** A probed clip with its decoding chosen and the given regions checked against its frame. */
export interface OpenedClip {
  probe: ProbeResult;
  decoding: CameraDecoding;
  decodingOverrides: Partial<CameraDecoding>;
  cameraProfile?: { path: string; profile: CameraProfile };
  warnings: RunWarning[];
}

/** Probe the clip, choose its decoding and check the given regions lie on its frame (before any decoding). */
export async function openClip(o: ClipOptions): Promise<OpenedClip> {
  const cameraProfile = o.cameraProfilePath !== undefined ? { path: o.cameraProfilePath, profile: await readCameraProfile(o.cameraProfilePath) } : undefined;
  const decodingOverrides: Partial<CameraDecoding> = { ...(o.transfer ? { transfer: o.transfer } : {}), ...(cameraProfile ? { response: cameraProfile.profile.response } : {}) };
  const probe = await probeMedia(o.videoPath);
  const info = probe.info;
  const decoding = decodingFor(info, decodingOverrides);
  for (const [r, opt] of [[o.roi, '--roi'], [o.darkRoi, '--dark-roi'], [o.referenceRoi, '--reference-roi']] as const) {
    if (r) validateRect(r, info.width, info.height, opt);
  }
  return { probe, decoding, decodingOverrides, ...(cameraProfile ? { cameraProfile } : {}), warnings: decodingWarnings(probe.notes, decoding.notes) };
}

/** Decode once, find the beam and its surround, measure the open clip; see the file comment. */
export async function measureClip(opened: OpenedClip, o: ClipOptions, hooks: ClipHooks = {}): Promise<ClipMeasurement> {
  const warnings: RunWarning[] = [...opened.warnings];
  const warn = (code: string, message: string, guideSection?: string) => {
    warnings.push(guideSection ? { code, message, guideSection } : { code, message });
  };
  const { probe, decoding, decodingOverrides, cameraProfile } = opened;
  const info = probe.info;

  // ---- one decoding pass ----
  const regions: Rect[] = [];
  const idx: Record<string, number> = {};
  const add = (name: string, r: Rect) => { idx[name] = regions.length; regions.push(r); };
  let geom: SurroundGeometry | undefined;
  if (o.roi) {
    add('beam', o.roi);
    if (!o.darkRoi) {
      geom = surroundRings(o.roi, info.width, info.height);
      add('a0', geom.a0);
      add('a1', geom.a1);
      add('b1', geom.b1);
    }
  }
  if (o.darkRoi) add('dark', o.darkRoi);
  if (o.referenceRoi) add('reference', o.referenceRoi);
  const channels = o.channels === 'rgb' && !o.roi;
  const step = chooseGridStep(info, channels ? 4 : 1);
  const pass = await decodePass(probe, decoding, {
    regions, overviewStep: step, ringRowStride: 2, channels,
    ...(hooks.onProgress ? { onProgress: (d: number, t: number) => hooks.onProgress!('decoding', d, t) } : {}),
  });
  for (const note of pass.notes) warn('probe', note);
  const nFrames = pass.frames;
  if (nFrames < 10) throw new KerrError('NOT_A_VIDEO', nFrames === 1 ? `${o.videoPath} has only one frame that can be decoded; at least 10 are needed` : `${o.videoPath} has only ${nFrames} frames that can be decoded; at least 10 are needed`, { hint: 'Record a longer clip' });
  const grid = pass.grid!;
  const times = pass.times;

  // ---- beam and its rings ----
  let beamRect: Rect;
  let beamAuto = false;
  /** Series of [beam, a0, a1, b1] (rings absent with a dark region). */
  let beamAndRings: RegionSeries[];
  if (o.roi) {
    beamRect = o.roi;
    beamAndRings = geom ? [pass.regions[idx.beam!]!, pass.regions[idx.a0!]!, pass.regions[idx.a1!]!, pass.regions[idx.b1!]!] : [pass.regions[idx.beam!]!];
  } else {
    // whole-frame brightness jumps (flashes) are left out of the search
    const cells = grid.gridWidth * grid.gridHeight;
    const frameMean = new Float64Array(nFrames);
    for (let f = 0; f < nFrames; f++) {
      let s = 0;
      const off = f * cells;
      for (let c = 0; c < cells; c++) s += grid.data[off + c]!;
      frameMean[f] = s / cells;
    }
    const flashes = detectFlashes(frameMean);
    const found = findBeam({ grid: grid.data, frames: nFrames, gridWidth: grid.gridWidth, gridHeight: grid.gridHeight, usable: Uint8Array.from(flashes.flags, (x) => 1 - x) });
    beamAuto = true;
    const gw = grid.gridWidth, gh = grid.gridHeight;
    const growCells = (c: CellBox, by: number): CellBox => growCellBox(c, by, gw, gh);
    const size = Math.max(found.beam.x1 - found.beam.x0 + 1, found.beam.y1 - found.beam.y0 + 1);
    const ring = Math.max(2, Math.round(size / 3));
    const boxes = [found.beam, growCells(found.beam, 1), growCells(found.beam, 1 + ring), growCells(found.beam, 1 + 2 * ring)] as const;
    beamRect = cellBoxToRect(found.beam, grid.step);
    geom = { beam: beamRect, a0: cellBoxToRect(boxes[1], grid.step), a1: cellBoxToRect(boxes[2], grid.step), b1: cellBoxToRect(boxes[3], grid.step) };
    // The beam and its rings are whole blocks, so they are measured from the block store of the
    // same pass (colour-decoded block means; docs/analyze.md gives the measured difference from a
    // full-resolution read): no second decode.
    beamAndRings = boxes.map((box) => blockSeries(grid, box));
    warn('auto-region', `the beam region was found automatically at x=${beamRect.x}, y=${beamRect.y}, ${beamRect.w}×${beamRect.h} px and measured with its surround from ${grid.step}×${grid.step}-pixel block means (a sharp-edged spot reads a little low at its brightest); check it in the report, or give --roi for a full-resolution read`);
  }

  // ---- the background under the beam ----
  let haveSurround = true;
  let background: BackgroundSeries;
  if (o.darkRoi) {
    background = backgroundOf([pass.regions[idx.dark!]!], [1], nFrames);
  } else {
    const sw = surroundWeights(geom!);
    if (sw.ringACount < 16) {
      haveSurround = false;
      warn('no-surround', 'the beam region leaves no room for a surround ring, so the floor includes any background light; give --dark-roi', 'camera-still');
      background = backgroundOf([], null, nFrames);
    } else {
      const c = sw.coefficients;
      background = backgroundOf(beamAndRings.slice(1), [c[1], c[2], c[3]], nFrames);
    }
  }

  // ---- the open level from a separate clip ----
  let openVideoLevels: number[] | undefined;
  if (o.openVideoPath) {
    const openProbe = await probeMedia(o.openVideoPath);
    const openInfo = openProbe.info;
    if (openInfo.width !== info.width || openInfo.height !== info.height) {
      throw new KerrError('BAD_ARGUMENT', `the open video is ${openInfo.width}×${openInfo.height} but the run is ${info.width}×${info.height}`, { path: '--open-video', hint: 'Record the open level with the same camera settings' });
    }
    const openRegions: Rect[] = [beamRect];
    if (o.darkRoi) openRegions.push(o.darkRoi);
    else if (haveSurround) openRegions.push(geom!.a0, geom!.a1, geom!.b1);
    const sw = geom ? surroundWeights(geom).coefficients : [0, 0, 0, 0];
    const openPass = await decodePass(openProbe, decodingFor(openInfo, decodingOverrides), { regions: openRegions, ringRowStride: 2 });
    for (const note of openPass.notes) warn('probe', `open video: ${note}`);
    openVideoLevels = [];
    for (let f = 0; f < openPass.frames; f++) {
      let bg = 0;
      if (o.darkRoi) bg = openPass.regions[1]!.luma[f]!;
      else if (haveSurround) {
        bg = sw[1]! * openPass.regions[1]!.luma[f]! + sw[2]! * openPass.regions[2]!.luma[f]! + sw[3]! * openPass.regions[3]!.luma[f]!;
      }
      openVideoLevels.push(openPass.regions[0]!.luma[f]! - bg);
    }
  }

  return {
    info, decoding, ...(cameraProfile ? { cameraProfile } : {}), times, nFrames, grid, beamRect, beamAuto, geom, haveSurround,
    beam: beamAndRings[0]!, background,
    ...(o.darkRoi ? { darkLuma: pass.regions[idx.dark!]!.luma } : {}),
    ...(o.referenceRoi ? { referenceLuma: pass.regions[idx.reference!]!.luma } : {}),
    ...(openVideoLevels ? { openVideoLevels } : {}),
    warnings,
  };
}
