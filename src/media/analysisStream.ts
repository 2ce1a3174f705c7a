/**
 * One decode for the analysis pass: an overview of the whole picture, shrunk by ffmpeg to one
 * pixel per step×step block (`crop` to whole blocks, then `scale` with area averaging), plus a
 * full-resolution crop of each region, each on its own pipe. Only a few hundred kilobytes per
 * frame reach Node instead of the whole picture, so the pass costs little more than decoding.
 *
 * The overview comes in one of two forms:
 * - `'luma8'` (default): 8-bit 4:2:0 whatever the source; cheap, for finding a beam (calibrate).
 * - `'yuv16'`: planar 4:4:4 in 16-bit little-endian words, `scale=…:flags=area` with the input
 *   and output range pinned to the source's (`in_range = out_range`), so swscale does no range
 *   conversion and a block's word is its mean source code times 2^(16 − source bits), with
 *   fractional precision (measured with ffmpeg 6/7: 8-bit code 235 → 60160 = 235·256; 10-bit 940 →
 *   60160 = 940·64). Each block then has its mean Y′, Cb and Cr, which src/measure/blockMeter
 *   decodes with the same colour decoding as the region meter.
 * Either way the overview averages code values (gamma-encoded) within each block; linearising the
 * average is not the same as averaging linear light where a block is not uniform (the edge of a
 * small bright spot): docs/analyze.md gives the measured size of that difference.
 * `notes` holds the stream's timing remarks (e.g. more frames than timestamps) once read.
 * Buffers are REUSED from one frame to the next.
 */
import { validateRect } from '../core/regions/validateRect.js';
import { alignCrop, expectedFrameCount, rawPixelFormat, rawPixelFormat8 } from './frameStream.js';
import type { ProbeResult } from './probe.js';
import { rawBitDepth, runRawPipes, type RawPipesPlan } from './rawVideoPipes.js';
import type { Frame, Rect } from './types.js';

export interface AnalysisFrames {
  index: number;
  timeS: number;
  /** gridWidth × gridHeight, one pixel per block (null when no overview was asked for). */
  overview: Frame | null;
  /** The aligned crop of each region, in the order given. */
  regions: Frame[];
}

export interface AnalysisStreamOptions {
  /** Block size of the overview in pixels; omit for regions only. */
  step?: number;
  /** Form of the overview (see the file comment); 'yuv16' needs the source's range. */
  overview?: { kind: 'luma8' } | { kind: 'yuv16'; range: 'limited' | 'full' };
  /** Read at most this many frames. */
  maxFrames?: number;
  onProgress?: (done: number, total: number) => void;
  signal?: AbortSignal;
}

export interface AnalysisStream {
  frames: AsyncGenerator<AnalysisFrames, void, undefined>;
  gridWidth: number;
  gridHeight: number;
  /** The aligned crop of each region, and each region's place inside its crop. */
  crops: Rect[];
  offsets: Rect[];
  /** Bits per sample of the region crops (8, or 10/12/16 as 16-bit words). */
  regionBitDepth: number;
  /** Bits per sample of the overview: 8 ('luma8') or 16 ('yuv16', 4:4:4). */
  overviewBitDepth: number;
  /** Timing remarks made while streaming (filled as frames are read). */
  readonly notes: readonly string[];
}

export function openAnalysisStream(probe: ProbeResult, regions: readonly Rect[], opts: AnalysisStreamOptions = {}): AnalysisStream {
  const { width, height } = probe.info;
  const crops = regions.map((r, k) => alignCrop(validateRect(r, width, height, `region ${k + 1}`), width, height));
  const offsets = regions.map((r, k) => ({ x: r.x - crops[k]!.x, y: r.y - crops[k]!.y, w: r.w, h: r.h }));
  const step = opts.step;
  const gridWidth = step ? Math.floor(width / step) : 0;
  const gridHeight = step ? Math.floor(height / step) : 0;
  const outputs: RawPipesPlan['outputs'] = [];
  const overview = opts.overview ?? { kind: 'luma8' };
  if (step) {
    const range = overview.kind === 'yuv16' ? (overview.range === 'full' ? 'pc' : 'tv') : '';
    outputs.push({
      filter: `crop=${gridWidth * step}:${gridHeight * step}:0:0,scale=${gridWidth}:${gridHeight}:flags=area${range ? `:in_range=${range}:out_range=${range}` : ''}`,
      width: gridWidth,
      height: gridHeight,
      pixelFormat: overview.kind === 'yuv16' ? 'yuv444p16le' : rawPixelFormat8(probe),
    });
  }
  for (const c of crops) outputs.push({ filter: c.w === width && c.h === height ? '' : `crop=${c.w}:${c.h}:${c.x}:${c.y}`, width: c.w, height: c.h });
  if (outputs.length === 0) outputs.push({ filter: 'crop=2:2:0:0', width: 2, height: 2 });
  const plan: RawPipesPlan = { probe, outputs, expectedFrames: expectedFrameCount(probe, opts.maxFrames), pixelFormat: rawPixelFormat(probe) };
  if (opts.maxFrames !== undefined) plan.maxFrames = opts.maxFrames;
  const pipeOptions: Parameters<typeof runRawPipes>[1] = {};
  if (opts.onProgress) pipeOptions.onProgress = opts.onProgress;
  if (opts.signal) pipeOptions.signal = opts.signal;
  const run = runRawPipes(plan, pipeOptions);
  const regionBitDepth = rawBitDepth(plan.pixelFormat);
  const first = step ? 1 : 0;
  const overviewBitDepth = step && overview.kind === 'yuv16' ? 16 : 8;
  async function* frames(): AsyncGenerator<AnalysisFrames, void, undefined> {
    for await (const set of run.frames) {
      yield {
        index: set.index,
        timeS: set.timeS,
        overview: step ? { index: set.index, timeS: set.timeS, width: gridWidth, height: gridHeight, data: set.buffers[0]!, bitDepth: overviewBitDepth } : null,
        regions: crops.map((c, k): Frame => ({ index: set.index, timeS: set.timeS, width: c.w, height: c.h, data: set.buffers[first + k]!, bitDepth: regionBitDepth })),
      };
    }
  }
  return { frames: frames(), gridWidth, gridHeight, crops, offsets, regionBitDepth, overviewBitDepth, get notes() { return run.notes; } };
}
