/**
 * The pictures of an analysed run, made from its one fit: the static/modulated maps (PNG figures
 * and float32 files), the regions found on them drawn on a video frame, and the one figure only
 * the maps give, the halo-to-core ratio. `--no-maps` skips exactly this: no frame is left out
 * here and no headline figure comes from here (frameExclusions, fitRun, runFigures do that).
 *
 * The halo-to-core ratio divides by the core's modulation amplitude in luminance: the maps'
 * grey-luma units are scaled by `gridLuminanceScale`, read on the rectangles whose combination is
 * the fit's beam intensity (`beamTerms`: beam minus surround).
 *
 * Orchestration only: the maths is in src/core/scatter; this file asks ffmpeg for one frame and
 * renders PNGs. It writes nothing: the caller stores `files` beside result.json. Problems that only
 * weaken a picture (no beam on the maps, no frame from the video) become warnings.
 * @example const mp = await mapProducts({ ... }); mp.haloToCoreRatio
 */
import { isKerrError } from '../errors.js';
import type { Quantity } from '../quantity.js';
import type { RunWarning } from '../result/schema.js';
import type { Rect } from '../media/types.js';
import { modulationMaps, type ModulationMaps } from '../core/scatter/modulationMaps.js';
import { regionsFromMaps, type ScatterRegions } from '../core/scatter/regionsFromMaps.js';
import { haloToCoreRatio } from '../core/scatter/haloToCoreRatio.js';
import { gridLuminanceScale } from '../core/scatter/gridLuminanceScale.js';
import { percentileSorted } from '../core/stats/percentileSorted.js';
import { renderMapPng } from '../maps/renderMapPng.js';
import { encodeMapFiles } from '../maps/encodeMapFiles.js';
import { renderRegionOverlay, type OverlayRegion } from '../maps/renderRegionOverlay.js';
import { renderLinearGreyPng } from '../maps/renderLinearGreyPng.js';
import { grabFramePng } from '../media/grabFrame.js';
import { atRows } from './gridAccess.js';
import { showFrame } from './showFrame.js';
import type { GridStore } from './measureClip.js';

export interface MapProductsInput {
  videoPath: string;
  grid: GridStore;
  times: Float64Array;
  /** Start time of the video stream, s (frame times are stream times). */
  startTimeS: number;
  camera: { width: number; height: number };
  intensity: Float64Array;
  modulation: Float64Array;
  used: Uint8Array;
  beam: Rect;
  /** The rectangles and weights whose sum is the fit's beam intensity (beam minus surround). */
  beamTerms: { rect: Rect; weight: number }[];
  /** Exposure gains per frame, only when a reference region gave them. */
  gain?: Float64Array;
  reference?: Rect;
  floorFraction: number;
  /** The exclusion stage found exposure drift without a reference: point at a candidate card. */
  exposureDrifted: boolean;
  /** The frame to draw the regions on, when the caller started taking it early (else the most modulated frame). */
  frame?: FrameGrab;
}

export interface AutoRegions {
  core: Rect;
  haloInner: Rect;
  haloOuter: Rect;
  dark: Rect | null;
  reference: Rect | null;
}

export interface MapProducts {
  haloToCoreRatio?: Quantity;
  warnings: RunWarning[];
  /** 'maps/static.png', 'maps/modulated.png', 'maps/static.f32', 'maps/modulated.f32', 'maps/maps.json', 'regions.png'. */
  files: Record<string, Uint8Array>;
  images: { frameWithRegionsPng: Buffer; staticMapPng: Buffer; modulatedMapPng: Buffer };
  /** Regions found on the maps, video pixels (null when no beam stood out on the maps). */
  autoRegions: AutoRegions | null;
}

/** The file names mapProducts returns, known before any map is made. */
export const MAP_FILES = ['maps/static.png', 'maps/modulated.png', 'maps/static.f32', 'maps/modulated.f32', 'maps/maps.json', 'regions.png'] as const;

function percentile(values: Float32Array, q: number): number {
  return percentileSorted(Float64Array.from(values).filter(Number.isFinite).sort(), q);
}

function rectText(r: Rect): string {
  return `${r.x},${r.y},${r.w},${r.h}`;
}

function findRegions(i: MapProductsInput, maps: ModulationMaps, warnings: RunWarning[]): ScatterRegions | null {
  if (maps.modulationSpan < 0.05) {
    warnings.push({ code: 'maps-weak', message: `the modulation term spans only ${maps.modulationSpan.toFixed(3)} over the frames used, so the static and modulated maps are noisy; sweep to a larger fraction of the half-wave voltage if the cell allows it safely`, guideSection: 'sweep' });
  }
  try {
    return regionsFromMaps(maps, { stepPx: i.grid.step });
  } catch (err) {
    if (!isKerrError(err)) throw err;
    warnings.push({ code: 'maps-no-beam', message: `${err.message}; the halo-to-core ratio is not reported` });
    return null;
  }
}

function halo(i: MapProductsInput, maps: ModulationMaps, regions: ScatterRegions | null, warnings: RunWarning[]): Quantity | undefined {
  if (!regions) return undefined;
  const { gridWidth: gw, gridHeight: gh, step } = i.grid;
  // The maps are in the grid's grey-luma units; the fit's beam intensity is luminance. Their ratio
  // on the beam region puts the core amplitude in the halo's unit.
  const lumaScale = gridLuminanceScale({
    modulatedMap: maps.modulatedMap, modulatedStdErr: maps.modulatedStdErr, gridWidth: gw, gridHeight: gh, stepPx: step,
    terms: i.beamTerms, intensity: i.intensity, modulation: i.modulation, usable: i.used,
  });
  const h = haloToCoreRatio(maps, regions, { ...(lumaScale ? { coreScale: lumaScale } : {}), floorFraction: i.floorFraction });
  if (h) return h.ratio;
  warnings.push({ code: 'no-far-dark', message: 'the beam leaves no dark area far from it on the maps, so the halo-to-core ratio is not reported; frame the cell with some dark background around it', guideSection: 'camera-still' });
  return undefined;
}

async function mapFigures(i: MapProductsInput, maps: ModulationMaps): Promise<[Buffer, Buffer]> {
  const { gridWidth: gw, gridHeight: gh, step } = i.grid;
  const exposureNote = i.gain ? ', exposure-corrected' : '';
  const staticHigh = Math.max(percentile(maps.staticMap, 0.995), 1e-6);
  const staticLow = Math.min(0, percentile(maps.staticMap, 0.005));
  const modHigh = Math.max(percentile(maps.modulatedMap, 1), 1e-6);
  const modLow = Math.min(0, percentile(maps.modulatedMap, 0.005));
  const [s, m] = await Promise.all([renderMapPng(maps.staticMap, gw, gh, {
    title: 'Static light: floor, scatter halo and ambient',
    unit: `intercept of the regression on the modulation term; linear units, 1 = full-scale white${exposureNote}`,
    stepPx: step, range: [staticLow, staticHigh > staticLow ? staticHigh : staticLow + 1e-6], note: `${maps.framesUsed} frames`,
  }), renderMapPng(maps.modulatedMap, gw, gh, {
    title: 'Modulated light: the Kerr-switched beam',
    unit: `slope of the regression on the modulation term (= modulation amplitude); linear units${exposureNote}`,
    stepPx: step, range: [modLow, modHigh > modLow ? modHigh : modLow + 1e-6], note: `${maps.framesUsed} frames`,
  })]);
  return [s.png, m.png];
}

function overlayRegions(i: MapProductsInput, regions: ScatterRegions | null): OverlayRegion[] {
  const overlay: OverlayRegion[] = [{ kind: 'beam', label: 'beam (fit)', rect: i.beam }];
  if (regions) {
    overlay.push({ kind: 'halo', label: 'halo', rect: regions.halo.outerRect, innerRect: regions.halo.innerRect });
    overlay.push({ kind: 'core', label: 'core', rect: regions.core.rect });
    if (regions.dark) overlay.push({ kind: 'dark', label: 'far dark', rect: regions.dark.rect });
  }
  if (i.reference) overlay.push({ kind: 'reference', label: 'reference (given)', rect: i.reference });
  else if (regions?.reference) overlay.push({ kind: 'reference', label: 'reference candidate', rect: regions.reference.rect });
  return overlay;
}


type Grabbed = { png: Buffer } | { error: unknown };

/** A frame to draw the regions on, being taken from the video (ffmpeg seeks and decodes it). */
export interface FrameGrab {
  index: number;
  grabbed: Promise<Grabbed>;
}

/**
 * Starts taking frame `index` from the video; the promise settles at once into a value (never an
 * unhandled rejection). Started early, the seek and decode run beside the fit on the other core.
 */
export function startFrameGrab(videoPath: string, times: Float64Array, startTimeS: number, index: number): FrameGrab {
  const start = Number.isFinite(startTimeS) ? startTimeS : 0;
  return { index, grabbed: grabFramePng(videoPath, Math.max(0, times[index]! - start)).then((png) => ({ png }), (error: unknown) => ({ error })) };
}

/** The regions drawn on the grabbed frame, or on a picture rebuilt from the maps without one. */
async function regionsPicture(i: MapProductsInput, maps: ModulationMaps, overlay: OverlayRegion[], show: number, grabbed: Grabbed, warnings: RunWarning[]): Promise<Buffer> {
  if ('png' in grabbed) return renderRegionOverlay(grabbed.png, overlay, { sourceWidth: i.camera.width, sourceHeight: i.camera.height, caption: `frame ${show} at ${i.times[show]!.toFixed(2)} s` });
  if (!isKerrError(grabbed.error)) throw grabbed.error;
  warnings.push({ code: 'overlay-frame', message: `regions are drawn on a picture rebuilt from the maps because no frame could be taken from the video (${grabbed.error.message})` });
  const { gridWidth: gw, gridHeight: gh, step } = i.grid;
  const open = new Float32Array(gw * gh);
  const mShow = Number.isFinite(i.modulation[show]!) ? i.modulation[show]! : maps.modulationMean;
  for (let c = 0; c < open.length; c++) open[c] = maps.staticMap[c]! + maps.modulatedMap[c]! * mShow;
  return renderRegionOverlay(await renderLinearGreyPng(open, gw, gh, step), overlay, { caption: `picture rebuilt from the maps (static + modulated × ${mShow.toFixed(2)})` });
}

export async function mapProducts(i: MapProductsInput): Promise<MapProducts> {
  const { grid } = i;
  const warnings: RunWarning[] = [];
  // the rows the store kept (every frame, or evenly spaced ones for a bounded store)
  const maps = modulationMaps({ grid: grid.data, frames: grid.frames, gridWidth: grid.gridWidth, gridHeight: grid.gridHeight, modulation: atRows(grid, i.modulation), usable: atRows(grid, i.used), ...(i.gain ? { gain: atRows(grid, i.gain) } : {}) });
  const regions = findRegions(i, maps, warnings);
  const haloToCoreRatio = halo(i, maps, regions, warnings);
  if (i.exposureDrifted && !i.reference && regions?.reference) {
    warnings.push({ code: 'reference-candidate', message: `a bright steady area at ${rectText(regions.reference.rect)} (x,y,w,h px) could serve as the reference region (--reference-roi) that corrects the exposure changes`, guideSection: 'lock-exposure' });
  }
  // ffmpeg seeks and decodes while the maps are rendered, or since the caller started it.
  // without a frame from the caller: the most modulated frame used (no keyframe times here)
  const grab = i.frame ?? startFrameGrab(i.videoPath, i.times, i.startTimeS, showFrame(i.modulation, Uint8Array.from(i.used, (u) => 1 - u), i.times, new Float64Array()));
  // the map figures and the regions picture are rendered at the same time (libvips threads)
  const [[staticMapPng, modulatedMapPng], frameWithRegionsPng] = await Promise.all([
    mapFigures(i, maps),
    grab.grabbed.then((grabbed) => regionsPicture(i, maps, overlayRegions(i, regions), grab.index, grabbed, warnings)),
  ]);
  const files: Record<string, Uint8Array> = {
    'maps/static.png': staticMapPng,
    'maps/modulated.png': modulatedMapPng,
    ...encodeMapFiles({ width: grid.gridWidth, height: grid.gridHeight, stepPx: grid.step, staticMap: maps.staticMap, modulatedMap: maps.modulatedMap, framesUsed: maps.framesUsed, exposureCorrected: i.gain !== undefined }),
    'regions.png': frameWithRegionsPng,
  };
  const autoRegions = regions ? {
    core: regions.core.rect, haloInner: regions.halo.innerRect, haloOuter: regions.halo.outerRect,
    dark: regions.dark?.rect ?? null, reference: regions.reference?.rect ?? null,
  } : null;
  return { ...(haloToCoreRatio ? { haloToCoreRatio } : {}), warnings, files, images: { frameWithRegionsPng, staticMapPng, modulatedMapPng }, autoRegions };
}
