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
import type { CellBox } from '../core/regions/cellGeometry.js';
import { findClipBeam, type ClipBeam } from './findClipBeam.js';
import { fullRateBoxes } from './fullRateBoxes.js';
import { measureOpenClip } from './measureOpenClip.js';
import { surroundWeights, type SurroundGeometry } from '../core/regions/localSurround.js';
import { surroundRings } from '../core/regions/surroundRings.js';
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
  /** Whole-grid rows the block store keeps before it is bounded (default storeRows: about 30 s of 1080p); for tests. */
  maxGridRows?: number;
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
  /** Keyframe presentation times from the probe, s (empty when the container marks none). */
  keyframeTimesS: Float64Array;
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
 * Grid step: about 160 blocks across and at least 2 px, whatever the clip's length (the store is
 * bounded instead, storeRows).
 */
export function chooseGridStep(info: VideoInfo): number {
  return Math.max(2, Math.ceil(info.width / 160));
}

/**
 * Values the whole-grid rows of the block store may hold (our choice): 16 M, about what a 30-s
 * 1080p clip at 160 × 90 blocks needs (13 M), so clips up to about that length keep one row per
 * frame. A clip the probe says is longer gets a bounded store (blockStore.ts) from its first frame,
 * with rows for `BOUNDED_ROW_VALUES` values: half of that, so that its peak memory (rows plus a few
 * numbers per frame) stays at or below a 30-s clip's.
 */
export const STORE_ROW_VALUES = 16e6;
export const BOUNDED_ROW_VALUES = 8e6;

/**
 * Whole-grid rows the store keeps for a grid of `cells` blocks and `arrays` arrays per block, for a
 * clip of `expectedFrames` frames (a clip longer than its probe said is bounded at the larger cap).
 */
export function storeRows(cells: number, arrays: number, expectedFrames = 0): number {
  const perRow = cells * arrays;
  const budget = expectedFrames * perRow > STORE_ROW_VALUES ? BOUNDED_ROW_VALUES : STORE_ROW_VALUES;
  return Math.max(64, Math.floor(budget / perRow));
}

/**
 * A provisional beam (found on the first rows of a bounded store) stands for the clip's beam when
 * each edge of the beam found over the whole clip lies within this many blocks of it: a beam's
 * edge moves by a block with the frames the search sees (measured on the outside bench clips),
 * and both boxes then measure the same spot. Farther, the clip is read again (measureClip).
 */
export const PROVISIONAL_EDGE_BLOCKS = 1;

function edgesWithin(a: CellBox, b: CellBox, blocks: number): boolean {
  return Math.abs(a.x0 - b.x0) <= blocks && Math.abs(a.y0 - b.y0) <= blocks && Math.abs(a.x1 - b.x1) <= blocks && Math.abs(a.y1 - b.y1) <= blocks;
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

/** The regions the pass reads at full resolution, in order, and where each one is. */
function planRegions(o: ClipOptions, width: number, height: number): { regions: Rect[]; idx: Record<string, number>; geom: SurroundGeometry | undefined } {
  const regions: Rect[] = [];
  const idx: Record<string, number> = {};
  const add = (name: string, r: Rect) => { idx[name] = regions.length; regions.push(r); };
  let geom: SurroundGeometry | undefined;
  if (o.roi) {
    add('beam', o.roi);
    if (!o.darkRoi) {
      geom = surroundRings(o.roi, width, height);
      add('a0', geom.a0);
      add('a1', geom.a1);
      add('b1', geom.b1);
    }
  }
  if (o.darkRoi) add('dark', o.darkRoi);
  if (o.referenceRoi) add('reference', o.referenceRoi);
  return { regions, idx, geom };
}

/** The background under the beam: the dark region, or the rings' extrapolation; none without room for rings. */
function backgroundFor(o: ClipOptions, geom: SurroundGeometry | undefined, darkSeries: RegionSeries | undefined, rings: RegionSeries[], nFrames: number, warnings: RunWarning[]): { background: BackgroundSeries; haveSurround: boolean } {
  if (o.darkRoi) return { background: backgroundOf([darkSeries!], [1], nFrames), haveSurround: true };
  const sw = surroundWeights(geom!);
  if (sw.ringACount < 16) {
    warnings.push({ code: 'no-surround', message: 'the beam region leaves no room for a surround ring, so the floor includes any background light; give --dark-roi', guideSection: 'camera-still' });
    return { background: backgroundOf([], null, nFrames), haveSurround: false };
  }
  const c = sw.coefficients;
  return { background: backgroundOf(rings, [c[1], c[2], c[3]], nFrames), haveSurround: true };
}

/** Decode once, find the beam and its surround, measure the open clip; see the file comment. */
export async function measureClip(opened: OpenedClip, o: ClipOptions, hooks: ClipHooks = {}): Promise<ClipMeasurement> {
  const warnings: RunWarning[] = [...opened.warnings];
  const { probe, decoding, decodingOverrides, cameraProfile } = opened;
  const info = probe.info;
  const plan = planRegions(o, info.width, info.height);
  const { idx } = plan;
  let geom = plan.geom;
  const channels = o.channels === 'rgb' && !o.roi;
  const step = chooseGridStep(info);
  const gw = Math.floor(info.width / step), gh = Math.floor(info.height / step);
  // A given beam fixes the full-rate boxes at once; a beam to be found, the one found on the rows so far.
  const dims = { gridWidth: gw, gridHeight: gh, step };
  let provisional: ClipBeam | null = null;
  const boxesFor = (rows: GridStore): CellBox[] | null => {
    if (o.roi) return fullRateBoxes(dims, o.roi, geom?.b1 ?? o.roi);
    try {
      provisional = findClipBeam(rows);
    } catch (e) {
      if (e instanceof KerrError && e.code === 'BAD_REGION') return null; // no beam in the frames so far: ask again later
      throw e;
    }
    return fullRateBoxes(dims, provisional.geom.beam, provisional.geom.b1, provisional.boxes);
  };
  const arrays = channels ? 4 : 1;
  const pass = await decodePass(probe, decoding, {
    regions: plan.regions, overviewStep: step, ringRowStride: 2, channels,
    bounded: { maxRows: o.maxGridRows ?? storeRows(gw * gh, arrays, probe.expectedFrames), boxesFor },
    ...(hooks.onProgress ? { onProgress: (d: number, t: number) => hooks.onProgress!('decoding', d, t) } : {}),
  });
  for (const note of pass.notes) warnings.push({ code: 'probe', message: note });
  const nFrames = pass.frames;
  if (nFrames < 10) throw new KerrError('NOT_A_VIDEO', nFrames === 1 ? `${o.videoPath} has only one frame that can be decoded; at least 10 are needed` : `${o.videoPath} has only ${nFrames} frames that can be decoded; at least 10 are needed`, { hint: 'Record a longer clip' });
  const grid = pass.grid!;

  // ---- beam and its rings: given, or found and measured from whole blocks (no second decode) ----
  let beamAndRings: RegionSeries[];
  let blocks: { boxes: readonly CellBox[]; step: number } | undefined;
  if (o.roi) {
    beamAndRings = geom ? [pass.regions[idx.beam!]!, pass.regions[idx.a0!]!, pass.regions[idx.a1!]!, pass.regions[idx.b1!]!] : [pass.regions[idx.beam!]!];
  } else {
    let found = findClipBeam(grid);
    if (grid.tracked) {
      // a bounded store kept every frame of the provisional beam's boxes only
      const first = provisional as ClipBeam | null;
      if (!first || !edgesWithin(first.boxes[0], found.boxes[0], PROVISIONAL_EDGE_BLOCKS)) {
        // the beam over the whole clip is not where the first part of it put the kept boxes:
        // read the clip again with the beam found as the region (rare: a beam that moves or first lights late)
        const again = await measureClip(opened, { ...o, roi: found.geom.beam }, hooks);
        const b = found.geom.beam;
        again.warnings.push({ code: 'auto-region', message: `the beam region was found automatically at x=${b.x}, y=${b.y}, ${b.w}×${b.h} px, away from where the first part of the clip put it, so the clip was read a second time with that region (full resolution); check it in the report, or give --roi` });
        return { ...again, beamAuto: true };
      }
      found = first;
    }
    geom = found.geom;
    blocks = { boxes: found.boxes, step: grid.step };
    // docs/analyze.md gives the measured difference of block means from a full-resolution read
    beamAndRings = found.boxes.map((box) => blockSeries(grid, box));
    const b = geom.beam;
    warnings.push({ code: 'auto-region', message: `the beam region was found automatically at x=${b.x}, y=${b.y}, ${b.w}×${b.h} px and measured with its surround from ${grid.step}×${grid.step}-pixel block means (a sharp-edged spot reads a little low at its brightest); check it in the report, or give --roi for a full-resolution read` });
  }
  const beamRect = o.roi ?? geom!.beam;
  const { background, haveSurround } = backgroundFor(o, geom, o.darkRoi ? pass.regions[idx.dark!] : undefined, beamAndRings.slice(1), nFrames, warnings);

  // ---- the open level from a separate clip, read the same way as the beam ----
  const openVideoLevels = o.openVideoPath === undefined ? undefined : await measureOpenClip({
    path: o.openVideoPath, width: info.width, height: info.height, decodingOverrides, beamRect, haveSurround, geom,
    ...(o.darkRoi ? { darkRoi: o.darkRoi } : {}), ...(blocks ? { blocks } : {}),
  }, warnings);

  return {
    info, decoding, ...(cameraProfile ? { cameraProfile } : {}), times: pass.times, keyframeTimesS: probe.keyframeTimesS, nFrames, grid, beamRect, beamAuto: !o.roi, geom, haveSurround,
    beam: beamAndRings[0]!, background,
    ...(o.darkRoi ? { darkLuma: pass.regions[idx.dark!]!.luma } : {}),
    ...(o.referenceRoi ? { referenceLuma: pass.regions[idx.reference!]!.luma } : {}),
    ...(openVideoLevels ? { openVideoLevels } : {}),
    warnings,
  };
}
