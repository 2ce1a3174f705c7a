/**
 * One decode for the analysis pass: an overview of the whole picture, shrunk by ffmpeg to one
 * pixel per step×step block (`crop` to whole blocks, then `scale` with area averaging), plus a
 * full-resolution crop of each region, each on its own pipe. Only a few hundred kilobytes per
 * frame reach Node instead of the whole picture, so the pass costs little more than decoding.
 *
 * The overview is 8-bit whatever the source (it only finds the beam, flashes and maps); the
 * region crops of a deeper source come as 16-bit words at full precision (see rawPixelFormat).
 * The overview averages code values (gamma-encoded Y′, U, V) within each block; linearising the
 * average is not the same as averaging linear light where a block is not uniform (the edge of a
 * small bright spot). The overview serves to find the beam, detect flashes and draw the
 * static/modulated maps; the numbers of the fit come from the regions, read pixel by pixel.
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
  /** Bits per sample of the region crops (8, or 10/12/16 as 16-bit words); the overview is always 8-bit. */
  regionBitDepth: number;
}

export function openAnalysisStream(probe: ProbeResult, regions: readonly Rect[], opts: AnalysisStreamOptions = {}): AnalysisStream {
  const { width, height } = probe.info;
  const crops = regions.map((r, k) => alignCrop(validateRect(r, width, height, `region ${k + 1}`), width, height));
  const offsets = regions.map((r, k) => ({ x: r.x - crops[k]!.x, y: r.y - crops[k]!.y, w: r.w, h: r.h }));
  const step = opts.step;
  const gridWidth = step ? Math.floor(width / step) : 0;
  const gridHeight = step ? Math.floor(height / step) : 0;
  const outputs: RawPipesPlan['outputs'] = [];
  if (step) {
    outputs.push({
      filter: `crop=${gridWidth * step}:${gridHeight * step}:0:0,scale=${gridWidth}:${gridHeight}:flags=area`,
      width: gridWidth,
      height: gridHeight,
      pixelFormat: rawPixelFormat8(probe),
    });
  }
  for (const c of crops) outputs.push({ filter: c.w === width && c.h === height ? '' : `crop=${c.w}:${c.h}:${c.x}:${c.y}`, width: c.w, height: c.h });
  if (outputs.length === 0) outputs.push({ filter: 'crop=2:2:0:0', width: 2, height: 2 });
  const plan: RawPipesPlan = { probe, outputs, expectedFrames: expectedFrameCount(probe, undefined), pixelFormat: rawPixelFormat(probe) };
  const pipeOptions: Parameters<typeof runRawPipes>[1] = {};
  if (opts.onProgress) pipeOptions.onProgress = opts.onProgress;
  if (opts.signal) pipeOptions.signal = opts.signal;
  const run = runRawPipes(plan, pipeOptions);
  const regionBitDepth = rawBitDepth(plan.pixelFormat);
  const first = step ? 1 : 0;
  async function* frames(): AsyncGenerator<AnalysisFrames, void, undefined> {
    for await (const set of run.frames) {
      yield {
        index: set.index,
        timeS: set.timeS,
        overview: step ? { index: set.index, timeS: set.timeS, width: gridWidth, height: gridHeight, data: set.buffers[0]! } : null,
        regions: crops.map((c, k): Frame => ({ index: set.index, timeS: set.timeS, width: c.w, height: c.h, data: set.buffers[first + k]!, bitDepth: regionBitDepth })),
      };
    }
  }
  return { frames: frames(), gridWidth, gridHeight, crops, offsets, regionBitDepth };
}
