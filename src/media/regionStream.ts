/**
 * Decoded pixels of a few regions of every frame, from one ffmpeg decode that writes each region's
 * crop to its own pipe (`split` then `crop`, raw planar YUV 4:2:0). Only the regions' bytes cross
 * the pipes, so tracing three small regions of 1080p footage costs little more than decoding it,
 * where piping whole frames into Node costs about half as much again (bench/run.ts measures both).
 *
 * Each region is widened to even edges (chroma is shared by 2x2 pixels; see alignCrop); the
 * delivered Frame for a region covers that aligned crop, and `layout().offsets[k]` says where the
 * asked-for region sits inside it. Frames carry the container's presentation times, like
 * openFrameStream; rotation metadata is applied first, so regions are in displayed pixels.
 * Buffers are REUSED from one frame to the next: copy what you keep.
 *
 * @throws BAD_REGION for a region outside the frame or an empty list (BAD_ARGUMENT); while
 *   iterating, the errors of openFrameStream (TRUNCATED_MEDIA, FFMPEG_FAILED, ...).
 * @example
 * const stream = openRegionStream('run1.mp4', [{ x: 900, y: 480, w: 120, h: 120 }]);
 * for await (const f of stream) console.log(f.index, f.timeS, f.regions[0].data[0]);
 */
import { KerrError } from '../errors.js';
import { validateRect } from '../core/regions/validateRect.js';
import { alignCrop, expectedFrameCount, rawPixelFormat } from './frameStream.js';
import type { ProbeResult } from './probe.js';
import { plannedStream, type PlannedStream } from './plannedStream.js';
import { rawBitDepth, type RawPipesPlan } from './rawVideoPipes.js';
import type { Frame, Rect } from './types.js';

export interface RegionFrames {
  index: number;
  timeS: number;
  /** One frame per region: the aligned crop, planar 4:2:0, in the order given. */
  regions: Frame[];
}

export interface RegionStreamOptions {
  maxFrames?: number;
  onProgress?: (done: number, total: number) => void;
  signal?: AbortSignal;
  probe?: ProbeResult;
}

export interface RegionStreamLayout {
  probe: ProbeResult;
  /** The aligned crop delivered for each region, displayed-frame pixels. */
  crops: Rect[];
  /** Each asked-for region relative to its crop (x, y inside the crop; same w, h). */
  offsets: Rect[];
  expectedFrames: number;
  /** Bits per sample of the delivered frames (8, or 10/12/16 as 16-bit words). */
  bitDepth: number;
}

export type RegionStream = PlannedStream<RegionStreamLayout, RegionFrames>;

function planRegions(probe: ProbeResult, regions: readonly Rect[], opts: RegionStreamOptions): { layout: RegionStreamLayout; plan: RawPipesPlan } {
  if (regions.length === 0) throw new KerrError('BAD_ARGUMENT', 'no region to read', { hint: 'Give at least one region' });
  const { width, height } = probe.info;
  const crops = regions.map((r, k) => alignCrop(validateRect(r, width, height, `region ${k + 1}`), width, height));
  const offsets = regions.map((r, k) => ({ x: r.x - crops[k]!.x, y: r.y - crops[k]!.y, w: r.w, h: r.h }));
  const expectedFrames = expectedFrameCount(probe, opts.maxFrames);
  const plan: RawPipesPlan = {
    probe,
    outputs: crops.map((c) => ({
      filter: c.w === width && c.h === height ? '' : `crop=${c.w}:${c.h}:${c.x}:${c.y}`,
      width: c.w,
      height: c.h,
    })),
    expectedFrames,
    pixelFormat: rawPixelFormat(probe),
  };
  if (opts.maxFrames !== undefined) plan.maxFrames = opts.maxFrames;
  return { layout: { probe, crops, offsets, expectedFrames, bitDepth: rawBitDepth(plan.pixelFormat) }, plan };
}

export function openRegionStream(path: string, regions: readonly Rect[], opts: RegionStreamOptions = {}): RegionStream {
  return plannedStream(path, opts, (probe) => planRegions(probe, regions, opts),
    (set, layout): RegionFrames => ({
      index: set.index,
      timeS: set.timeS,
      regions: layout.crops.map((c, k): Frame => ({ index: set.index, timeS: set.timeS, width: c.w, height: c.h, data: set.buffers[k]!, bitDepth: layout.bitDepth })),
    }),
    'region stream');
}
