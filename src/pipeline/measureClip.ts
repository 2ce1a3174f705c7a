/**
 * The decode-and-measure stage of analyze: probe the clip, choose its decoding, read every frame
 * once (frame times, the decimated luminance grid for beam finding, flashes and maps, and
 * full-resolution colour means of the beam, its surround rings and the user's regions), find the
 * beam when no region was given, and measure an open-level clip when one was given.
 *
 * It returns per-frame series only: exposure correction, exclusions, sync and the fit come after
 * (src/pipeline/analyze.ts). Files and processes are touched here and in src/media only.
 */
import { KerrError } from '../errors.js';
import type { Rect, VideoInfo, CameraDecoding } from '../media/types.js';
import { probeMedia, type ProbeResult } from '../media/probe.js';
import { openAnalysisStream } from '../media/analysisStream.js';
import { decodingFor } from '../core/camera/decodingFor.js';
import { decodingWarnings } from './decodingWarnings.js';
import { readCameraProfile, type CameraProfile } from '../io/cameraProfile.js';
import { createRegionMeter } from '../measure/regionMeter.js';
import { createGridSampler } from '../measure/gridSampler.js';
import { validateRect } from '../measure/rect.js';
import { findBeam } from '../core/regions/findBeam.js';
import { cellBoxToRect, growCellBox, type CellBox } from '../core/regions/cellGeometry.js';
import { surroundWeights, type SurroundGeometry } from '../core/regions/localSurround.js';
import { surroundRings } from '../core/regions/surroundRings.js';
import { isNestedChain, nestedPieces } from '../core/regions/nestedPieces.js';
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
}

export interface GridStore {
  data: Float32Array; // frames × cells
  frames: number;
  gridWidth: number;
  gridHeight: number;
  step: number;
}

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

/** Grid step: about 160 blocks across, at least 2 px, and at most ~60 M stored values. */
export function chooseGridStep(info: VideoInfo): number {
  let step = Math.max(2, Math.ceil(info.width / 160));
  const frames = Math.max(1, info.frameCount);
  while ((info.width / step) * (info.height / step) * frames > 60e6) step++;
  return step;
}

/** Per-frame means of one region: linear luminance, the three channels, and the clipped fraction. */
export interface RegionSeries {
  luma: Float64Array;
  r: Float64Array;
  g: Float64Array;
  b: Float64Array;
  clipped: Float64Array;
}

const SERIES_KEYS = ['luma', 'r', 'g', 'b', 'clipped'] as const;

interface PassOutput {
  times: Float64Array;
  grid: GridStore;
  regions: RegionSeries[];
  frames: number;
}

function newSeries(cap: number): RegionSeries {
  return { luma: new Float64Array(cap), r: new Float64Array(cap), g: new Float64Array(cap), b: new Float64Array(cap), clipped: new Float64Array(cap) };
}

function resizeSeries(s: RegionSeries, size: number): RegionSeries {
  const out = newSeries(size);
  for (const k of SERIES_KEYS) out[k].set(s[k].subarray(0, Math.min(size, s[k].length)));
  return out;
}

/**
 * One decoding pass: frame times, the block overview (linear luminance per block, as if grey:
 * cheap, for finding the beam, flashes and maps) and full-resolution colour means of the regions.
 */
async function decodePass(path: string, probe: ProbeResult, decoding: CameraDecoding, regions: Rect[], step: number | null, onProgress?: (done: number, total: number) => void): Promise<PassOutput> {
  const info = probe.info;
  // Regions nested inside the next one (beam ⊂ rings) share one crop and are measured as disjoint
  // pieces, so every pixel is decoded into colour once.
  const groups: number[][] = [];
  for (let r = 0; r < regions.length; r++) {
    const last = groups[groups.length - 1];
    if (last && isNestedChain([regions[last[last.length - 1]!]!, regions[r]!])) last.push(r);
    else groups.push([r]);
  }
  const outerOf = groups.map((g) => regions[g[g.length - 1]!]!);
  let cap = Math.max(16, info.frameCount + 8);
  let times = new Float64Array(cap);
  const stream = openAnalysisStream(probe, outerOf, { ...(step ? { step } : {}), ...(onProgress ? { onProgress } : {}) });
  const gw = stream.gridWidth;
  const gh = stream.gridHeight;
  const cells = gw * gh;
  let grid = new Float32Array(step ? cap * cells : 0);
  let series = regions.map(() => newSeries(cap));
  const plans = groups.map((g, k) => {
    const crop = stream.crops[k]!;
    const local = g.map((r) => ({ ...regions[r]!, x: regions[r]!.x - crop.x, y: regions[r]!.y - crop.y }));
    const { pieces, ringOf } = nestedPieces(local);
    // Rings (pieces outside the innermost region) hold slowly varying background: every other row.
    const strides = ringOf.map((k) => (k > 0 ? 2 : 1));
    return { members: g, ringOf, pieces, meter: createRegionMeter(crop.w, crop.h, pieces, decoding, strides, stream.regionBitDepth), counts: g.map((r) => regions[r]!.w * regions[r]!.h) };
  });
  const acc = new Float64Array(5);
  const sampler = step ? createGridSampler(gw, gh, 1, decoding) : null;
  let n = 0;
  const growTo = (next: number) => {
    const t2 = new Float64Array(next); t2.set(times); times = t2;
    if (step) { const g2 = new Float32Array(next * cells); g2.set(grid); grid = g2; }
    series = series.map((x) => resizeSeries(x, next));
    cap = next;
  };
  for await (const frame of stream.frames) {
    if (n >= cap) growTo(Math.ceil(cap * 1.5));
    times[n] = frame.timeS;
    if (sampler && frame.overview) sampler.sample(frame.overview, grid.subarray(n * cells, (n + 1) * cells));
    for (let k = 0; k < plans.length; k++) {
      const plan = plans[k]!;
      const parts = plan.meter.measure(frame.regions[k]!);
      acc.fill(0);
      let piece = 0;
      for (let m = 0; m < plan.members.length; m++) {
        // cumulative sums: rect m = rect m−1 plus the pieces of ring m
        while (piece < parts.length && plan.ringOf[piece] === m) {
          const p = parts[piece]!;
          const c = plan.pieces[piece]!.w * plan.pieces[piece]!.h; // the piece's area, also when rows were skipped
          acc[0] += p.luma * c; acc[1] += p.r * c; acc[2] += p.g * c; acc[3] += p.b * c; acc[4] += p.clippedFraction * c;
          piece++;
        }
        const x = series[plan.members[m]!]!;
        const count = plan.counts[m]!;
        x.luma[n] = acc[0]! / count; x.r[n] = acc[1]! / count; x.g[n] = acc[2]! / count; x.b[n] = acc[3]! / count; x.clipped[n] = acc[4]! / count;
      }
    }
    n++;
  }
  return {
    times: times.slice(0, n),
    grid: { data: step ? grid.subarray(0, n * cells) : grid, frames: n, gridWidth: gw, gridHeight: gh, step: step ?? 0 },
    regions: series.map((x) => resizeSeries(x, n)),
    frames: n,
  };
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
  const step = chooseGridStep(info);
  const pass = await decodePass(o.videoPath, probe, decoding, regions, step, hooks.onProgress ? (d, t) => hooks.onProgress!('decoding', d, t) : undefined);
  const nFrames = pass.frames;
  if (nFrames < 10) throw new KerrError('NOT_A_VIDEO', nFrames === 1 ? `${o.videoPath} has only one frame that can be decoded; at least 10 are needed` : `${o.videoPath} has only ${nFrames} frames that can be decoded; at least 10 are needed`, { hint: 'Record a longer clip' });
  const { grid } = pass;
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
    // The grid reads luminance as if every pixel were grey, which is fast and fine for finding the
    // beam but not proportional for coloured light; a second pass reads the beam and its rings at
    // full resolution with the full colour decoding (the decode is the cost; the meter is cheap).
    const second = await decodePass(o.videoPath, probe, decoding, [beamRect, geom.a0, geom.a1, geom.b1], null, hooks.onProgress ? (d, t) => hooks.onProgress!('measuring the beam', d, t) : undefined);
    if (second.frames !== nFrames) {
      throw new KerrError('TRUNCATED_MEDIA', `the second pass over ${o.videoPath} read ${second.frames} frames, the first ${nFrames}`, { hint: 'Check that the file is not being written while kerrtrace reads it' });
    }
    beamAndRings = second.regions;
    warn('auto-region', `the beam region was found automatically at x=${beamRect.x}, y=${beamRect.y}, ${beamRect.w}×${beamRect.h} px; check it in the report or give --roi`);
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
    const openPass = await decodePass(o.openVideoPath, openProbe, decodingFor(openInfo, decodingOverrides), openRegions, null);
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
