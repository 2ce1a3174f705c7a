/**
 * Decoded frames of a video as an async iterable, straight from ffmpeg's raw output pipe in the
 * decoder's native planar YUV 4:2:0 (`-f rawvideo -pix_fmt yuv420p`, or yuvj420p for full-range
 * JPEG-style sources so no range conversion happens). Asking ffmpeg for RGB or grey goes through
 * its scaler and costs about 20 % (docs/DESIGN.md, "Speed"); conversion happens later, only for
 * the pixels used.
 *
 * - Timing: frame k carries the k-th presentation timestamp of the container (see probe.ts), so
 *   variable-frame-rate footage is timed correctly; frames are never timed as index/fps unless the
 *   file has no timestamps at all (then the probe says so in its notes).
 * - Rotation metadata is applied by ffmpeg (autorotate), so frames are in the displayed
 *   orientation; crop and scale run inside ffmpeg, after the rotation. A crop's left and top are
 *   rounded down to even pixels and its right and bottom up (chroma is shared by 2x2 pixels), the
 *   crop actually used is in `layout()`.
 * - One preallocated frame buffer is filled from the pipe's chunks (no per-chunk copies or joins, no
 *   whole-frame loops in JS); `Frame.data` is that buffer and is REUSED for the next frame.
 * - Backpressure: the pipe is only read while the consumer asks for the next frame, so memory stays
 *   flat however long the clip is.
 * - The ffmpeg child is killed and reaped when the loop ends early (`break`), throws, or the
 *   AbortSignal fires; `closed()` resolves with its exit once it is gone.
 * - Several separate regions are cheaper through openRegionStream (only their pixels cross the pipe).
 * The pipe handling lives in rawVideoPipes.ts, shared with the region stream.
 *
 * @throws (while iterating) KerrError TRUNCATED_MEDIA when the data ends before all expected frames
 *   arrived (details: framesRead, framesExpected); FFMPEG_FAILED when ffmpeg fails otherwise;
 *   FFMPEG_MISSING; BAD_REGION for a crop outside the frame; BAD_ARGUMENT for a bad scale width or
 *   frame limit; the probe's errors (FILE_NOT_FOUND, NOT_A_VIDEO...); the AbortSignal's reason.
 * @example
 * for await (const frame of openFrameStream('run1.mp4', { crop: { x: 100, y: 80, w: 64, h: 64 } })) {
 *   console.log(frame.index, frame.timeS, frame.data[0]); // copy what you keep: data is reused
 * }
 */
import { invalid } from '../errors.js';
import { validateRect } from '../core/regions/validateRect.js';
import type { ProbeResult } from './probe.js';
import { plannedStream, type PlannedStream } from './plannedStream.js';
import { rawBitDepth, yuv420FrameBytes, type RawPipesPlan, type RawPixelFormat } from './rawVideoPipes.js';
import type { Frame, Rect } from './types.js';

export { yuv420FrameBytes, type ChildExit } from './rawVideoPipes.js';

export interface FrameStreamOptions {
  /** Region of the displayed frame to deliver (aligned outward to even pixels). */
  crop?: Rect;
  /** Scale the (cropped) picture to this width inside ffmpeg; the height keeps the aspect, even. */
  scaleToWidth?: number;
  /** Stop after this many frames (counted from the first). */
  maxFrames?: number;
  /** Called after each frame is read, with frames done and frames expected. */
  onProgress?: (done: number, total: number) => void;
  signal?: AbortSignal;
  /** A probe of the same file made earlier (saves running ffprobe again). */
  probe?: ProbeResult;
}

export interface FrameStreamLayout {
  probe: ProbeResult;
  /** Crop applied, in displayed-frame pixels (the whole frame when none was asked for). */
  crop: Rect;
  width: number;
  height: number;
  frameBytes: number;
  expectedFrames: number;
  pixelFormat: RawPixelFormat;
  /** Bits per sample of the delivered frames (8, or 10/12/16 as 16-bit words). */
  bitDepth: number;
}

export type FrameStream = PlannedStream<FrameStreamLayout, Frame>;

/** Widens a rectangle to even left/top and even right/bottom (or the frame edge). */
export function alignCrop(rect: Rect, frameWidth: number, frameHeight: number): Rect {
  const x = rect.x - (rect.x % 2);
  const y = rect.y - (rect.y % 2);
  const right = Math.min(frameWidth, rect.x + rect.w + ((rect.x + rect.w) % 2));
  const bottom = Math.min(frameHeight, rect.y + rect.h + ((rect.y + rect.h) % 2));
  return { x, y, w: right - x, h: bottom - y };
}

/**
 * Output pixel format: for sources deeper than 8 bits (probe bitDepth, e.g. yuv420p10le, p010le,
 * HEVC Main 10), the planar 16-bit little-endian format of the same depth (yuv420p10le or
 * yuv420p12le; yuv420p16le above 12), so no bit is lost and ffmpeg only repacks or subsamples;
 * otherwise yuvj420p for full-range JPEG-style sources (no range conversion), else yuv420p.
 */
export function rawPixelFormat(probe: ProbeResult): RawPixelFormat {
  const depth = probe.info.bitDepth;
  if (depth > 8) return depth <= 10 ? 'yuv420p10le' : depth <= 12 ? 'yuv420p12le' : 'yuv420p16le';
  return probe.info.pixelFormat.startsWith('yuvj') ? 'yuvj420p' : 'yuv420p';
}

/** The 8-bit format for pictures that need no precision (overviews): yuvj420p for full range, else yuv420p. */
export function rawPixelFormat8(probe: ProbeResult): RawPixelFormat {
  return probe.info.pixelFormat.startsWith('yuvj') ? 'yuvj420p' : 'yuv420p';
}

/** Expected frame count under an optional limit; checks the limit. */
export function expectedFrameCount(probe: ProbeResult, maxFrames: number | undefined): number {
  if (maxFrames === undefined) return probe.expectedFrames;
  if (!Number.isInteger(maxFrames) || maxFrames < 1) throw invalid('a whole number of frames, 1 or more', 'maxFrames', maxFrames);
  return Math.min(probe.expectedFrames, maxFrames);
}

function planLayout(probe: ProbeResult, opts: FrameStreamOptions): { layout: FrameStreamLayout; plan: RawPipesPlan } {
  const { info } = probe;
  const filters: string[] = [];
  let crop: Rect = { x: 0, y: 0, w: info.width, h: info.height };
  if (opts.crop !== undefined) {
    validateRect(opts.crop, info.width, info.height, 'crop');
    crop = alignCrop(opts.crop, info.width, info.height);
    if (crop.w !== info.width || crop.h !== info.height) filters.push(`crop=${crop.w}:${crop.h}:${crop.x}:${crop.y}`);
  }
  let width = crop.w;
  let height = crop.h;
  if (opts.scaleToWidth !== undefined) {
    const w = opts.scaleToWidth;
    if (!Number.isInteger(w) || w < 2 || w > 16384) throw invalid('a whole width of 2 to 16384 pixels', 'scaleToWidth', w);
    if (w !== width) {
      height = Math.max(2, 2 * Math.round((crop.h * w) / crop.w / 2));
      width = w;
      filters.push(`scale=${width}:${height}:flags=area`);
    }
  }
  const expectedFrames = expectedFrameCount(probe, opts.maxFrames);
  const pixelFormat = rawPixelFormat(probe);
  const plan: RawPipesPlan = { probe, outputs: [{ filter: filters.join(','), width, height }], expectedFrames, pixelFormat };
  if (opts.maxFrames !== undefined) plan.maxFrames = opts.maxFrames;
  const bitDepth = rawBitDepth(pixelFormat);
  const frameBytes = (bitDepth > 8 ? 2 : 1) * yuv420FrameBytes(width, height);
  return { layout: { probe, crop, width, height, frameBytes, expectedFrames, pixelFormat, bitDepth }, plan };
}

export function openFrameStream(path: string, opts: FrameStreamOptions = {}): FrameStream {
  return plannedStream(path, opts, (probe) => planLayout(probe, opts),
    (set, layout): Frame => ({ index: set.index, timeS: set.timeS, width: layout.width, height: layout.height, data: set.buffers[0]!, bitDepth: layout.bitDepth }),
    'frame stream');
}
