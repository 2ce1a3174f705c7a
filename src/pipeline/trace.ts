/**
 * The trace pipeline: one decoding pass over a video that measures the user's regions in every
 * frame (what `kerrtrace trace` prints, and the benchmark's case (b)).
 *
 * probe → camera decoding from the stream's tags (overridable) → the decoding pass shared with
 * analyze (decodePass.ts: one decode, each region cropped inside ffmpeg and sent through its own
 * pipe, so only those pixels reach Node; regions nested in the next share one crop) → region meter
 * → dark subtraction and exposure correction.
 *
 * Corrected series, per channel c and frame t: (roi_c,t − dark_c,t) / gain_t, with
 * gain_t = (ref_t − dark_t) / median(ref − dark) from the reference region's luminance
 * (see measure/exposure.ts); no dark region: dark = 0; no reference region: gain = 1.
 * Values are linear light (1 = full-scale white). Frames keep their container timestamps.
 *
 * @throws KerrError BAD_ARGUMENT (no region), BAD_REGION (a region outside the frame, named by its
 *   option), the probe's and the frame stream's errors (FILE_NOT_FOUND, NOT_A_VIDEO,
 *   TRUNCATED_MEDIA, FFMPEG_FAILED...), BAD_REGION from the exposure correction when the reference
 *   region is black.
 * @example
 * const t = await traceVideo('run1.mp4', { regions: [{ x: 300, y: 200, w: 40, h: 40 }] });
 * t.timeS[10]; t.corrected[0].luma[10];
 */
import { KerrError } from '../errors.js';
import { decodingFor, type DecodingChoice } from '../core/camera/decodingFor.js';
import { openFrameStream, type FrameStreamOptions } from '../media/frameStream.js';
import { decodePass } from './decodePass.js';
import { probeMedia, type ProbeResult } from '../media/probe.js';
import type { CameraDecoding, Rect, VideoInfo } from '../media/types.js';
import { exposureGains, type ExposureGains } from '../measure/exposure.js';
import { validateRect } from '../measure/rect.js';
import { createRegionMeter, type RegionMeasurement } from '../measure/regionMeter.js';

export interface TraceOptions {
  /** Regions to trace (at least one), displayed-frame pixels. */
  regions: Rect[];
  /** A region with no beam: its per-frame value is subtracted. */
  dark?: Rect;
  /** A region of constant true brightness: its changes are divided out as exposure gain. */
  reference?: Rect;
  /** Overrides of the decoding read from the stream's tags (transfer, range, matrix, clip code). */
  decoding?: Partial<CameraDecoding>;
  /** Crop each region inside ffmpeg (default true); false sends whole frames through one pipe. */
  cropToRegions?: boolean;
  maxFrames?: number;
  onProgress?: (done: number, total: number) => void;
  signal?: AbortSignal;
  /** A probe of the same file made earlier. */
  probe?: ProbeResult;
}

/** Per-frame series of one region, linear units. */
export interface RegionSeries {
  rect: Rect;
  luma: Float64Array;
  r: Float64Array;
  g: Float64Array;
  b: Float64Array;
  clippedFraction: Float64Array;
}

export interface TraceResult {
  info: VideoInfo;
  probe: ProbeResult;
  decoding: DecodingChoice;
  /** Guesses and remarks for the user (decoding, timing, exposure). */
  notes: string[];
  frames: number;
  /** Presentation time of each frame, s (container timestamps). */
  timeS: Float64Array;
  /** Raw region means, in the order given. */
  regions: RegionSeries[];
  dark?: RegionSeries;
  reference?: RegionSeries;
  /** Exposure gains from the reference region (absent without one). */
  gains?: ExposureGains;
  /** (region − dark)/gain per channel; clippedFraction as measured. */
  corrected: RegionSeries[];
  /** The crops ffmpeg delivered (even-aligned regions), or the whole frame once. */
  crops: Rect[];
}

function emptySeries(rect: Rect, capacity: number): RegionSeries {
  return {
    rect,
    luma: new Float64Array(capacity),
    r: new Float64Array(capacity),
    g: new Float64Array(capacity),
    b: new Float64Array(capacity),
    clippedFraction: new Float64Array(capacity),
  };
}

const SERIES_KEYS = ['luma', 'r', 'g', 'b', 'clippedFraction'] as const;

function resize(series: RegionSeries, length: number): RegionSeries {
  const out = emptySeries(series.rect, length);
  for (const key of SERIES_KEYS) out[key].set(series[key].subarray(0, Math.min(length, series[key].length)));
  return out;
}

/** Every frame's region means, read through the shared decoding pass (or whole frames when asked). */
async function readRegions(path: string, opts: TraceOptions, probe: ProbeResult, decoding: CameraDecoding, all: Rect[]): Promise<{ n: number; timeS: Float64Array; series: RegionSeries[]; crops: Rect[]; streamNotes: readonly string[] }> {
  const { info } = probe;
  let capacity = Math.max(16, (opts.maxFrames !== undefined ? Math.min(opts.maxFrames, probe.expectedFrames) : probe.expectedFrames) + 1);
  let timeS = new Float64Array(capacity);
  let series = all.map((r) => emptySeries(r, capacity));
  let n = 0;
  const record = (frameTimeS: number, samples: readonly RegionMeasurement[]): void => {
    if (n >= capacity) {
      capacity = Math.ceil(capacity * 1.5);
      const grown = new Float64Array(capacity);
      grown.set(timeS);
      timeS = grown;
      series = series.map((s) => resize(s, capacity));
    }
    timeS[n] = frameTimeS;
    for (let k = 0; k < samples.length; k++) {
      const s = series[k]!;
      const m = samples[k]!;
      s.luma[n] = m.luma;
      s.r[n] = m.r;
      s.g[n] = m.g;
      s.b[n] = m.b;
      s.clippedFraction[n] = m.clippedFraction;
    }
    n++;
  };

  const common: FrameStreamOptions = { probe };
  if (opts.maxFrames !== undefined) common.maxFrames = opts.maxFrames;
  if (opts.onProgress) common.onProgress = opts.onProgress;
  if (opts.signal) common.signal = opts.signal;
  let crops: Rect[];
  let streamNotes: readonly string[];
  if (opts.cropToRegions === false) {
    const stream = openFrameStream(path, common);
    const meter = createRegionMeter(info.width, info.height, all, decoding, undefined, (await stream.layout()).bitDepth);
    for await (const frame of stream) record(frame.timeS, meter.measure(frame));
    crops = [{ x: 0, y: 0, w: info.width, h: info.height }];
    streamNotes = stream.notes;
  } else {
    // the decoding pass analyze uses (decodePass.ts): one decode, each region cropped inside ffmpeg
    const pass = await decodePass(probe, decoding, {
      regions: all,
      ...(opts.maxFrames !== undefined ? { maxFrames: opts.maxFrames } : {}),
      ...(opts.onProgress ? { onProgress: opts.onProgress } : {}),
      ...(opts.signal ? { signal: opts.signal } : {}),
    });
    const samples: RegionMeasurement[] = all.map(() => ({ luma: 0, r: 0, g: 0, b: 0, pixelCount: 0, clippedFraction: 0, codeR: 0, codeG: 0, codeB: 0 }));
    for (let f = 0; f < pass.frames; f++) {
      for (let k = 0; k < all.length; k++) {
        const x = pass.regions[k]!;
        const m = samples[k]!;
        m.luma = x.luma[f]!; m.r = x.r[f]!; m.g = x.g[f]!; m.b = x.b[f]!; m.clippedFraction = x.clipped[f]!;
      }
      record(pass.times[f]!, samples);
    }
    crops = pass.crops;
    streamNotes = pass.notes;
  }
  timeS = timeS.slice(0, n);
  series = series.map((s) => resize(s, n));
  return { n, timeS, series, crops, streamNotes };
}

/**
 * Each region minus the dark region, divided by the exposure gain from the reference region
 * (when given); notes on a reference that is never brighter than the dark level or clips.
 */
function correctedSeries(regions: RegionSeries[], dark: RegionSeries | undefined, reference: RegionSeries | undefined, n: number, notes: string[]): { gains: ExposureGains | undefined; corrected: RegionSeries[] } {
  let gains: ExposureGains | undefined;
  if (reference) {
    gains = exposureGains(reference.luma, dark?.luma);
    if (gains.invalidFrames > 0) {
      notes.push(`the reference region was no brighter than the dark level in ${gains.invalidFrames} frames; those frames have no exposure correction (empty gain)`);
    }
    if (reference.clippedFraction.some((f) => f > 0.01)) {
      notes.push('the reference region has clipped pixels in some frames, so its gain there is too low; choose a darker grey patch');
    }
  }
  const corrected = regions.map((s) => {
    const out = emptySeries(s.rect, n);
    out.clippedFraction.set(s.clippedFraction);
    for (const key of ['luma', 'r', 'g', 'b'] as const) {
      const raw = s[key];
      const d = dark?.[key];
      const target = out[key];
      for (let i = 0; i < n; i++) target[i] = (raw[i]! - (d ? d[i]! : 0)) / (gains ? gains.gains[i]! : 1);
    }
    return out;
  });

  return { gains, corrected };
}

export async function traceVideo(path: string, opts: TraceOptions): Promise<TraceResult> {
  if (opts.regions.length === 0) {
    throw new KerrError('BAD_ARGUMENT', 'no region to trace', { path: '--roi', hint: 'Give at least one --roi x,y,w,h' });
  }
  const probe = opts.probe ?? (await probeMedia(path, opts.signal === undefined ? {} : { signal: opts.signal }));
  const { info } = probe;
  opts.regions.forEach((r) => validateRect(r, info.width, info.height, '--roi'));
  if (opts.dark) validateRect(opts.dark, info.width, info.height, '--dark-roi');
  if (opts.reference) validateRect(opts.reference, info.width, info.height, '--reference-roi');

  const decoding = decodingFor(info, opts.decoding ?? {});
  const notes = [...probe.notes, ...decoding.notes];

  const all: Rect[] = [...opts.regions];
  if (opts.dark) all.push(opts.dark);
  if (opts.reference) all.push(opts.reference);

  const { n, timeS, series, crops, streamNotes } = await readRegions(path, opts, probe, decoding, all);
  notes.push(...streamNotes);

  const regions = series.slice(0, opts.regions.length);
  let next = opts.regions.length;
  const dark = opts.dark ? series[next++] : undefined;
  const reference = opts.reference ? series[next++] : undefined;

  const { gains, corrected } = correctedSeries(regions, dark, reference, n, notes);
  const result: TraceResult = { info, probe, decoding, notes, frames: n, timeS, regions, corrected, crops };
  if (dark) result.dark = dark;
  if (reference) result.reference = reference;
  if (gains) result.gains = gains;
  return result;
}
