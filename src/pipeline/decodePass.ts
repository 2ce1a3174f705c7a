/**
 * One decoding pass over a clip, shared by analyze (measureClip) and trace: ONE ffmpeg decode that
 * delivers, frame by frame, a full-resolution crop of each region and, when asked, a block overview
 * of the whole picture (src/media/analysisStream). Returns frame times, per-region colour means
 * (region meter: linear R, G, B, Rec. 709 luminance, clipped fraction) and the block store.
 *
 * - Regions nested inside the next one (beam ⊂ rings) share one crop and are measured as disjoint
 *   pieces (core/regions/nestedPieces), so every pixel is colour-decoded once; the outer pieces may
 *   be read every `ringRowStride`-th row (slowly varying background; default 1, every row).
 * - The block overview is 16-bit 4:4:4 (mean Y′, Cb, Cr per block), colour-decoded per block by
 *   src/measure/blockMeter into linear luminance (the grid the maps, flashes and beam finder read),
 *   a clipped-block bit set, and the three channels when `channels` is asked for; a region made of
 *   whole blocks is then measured from the store without a second pass (blockSeries.ts).
 * - Stream timing remarks (`notes`) are returned for the run's warnings.
 * Memory: one row per frame is frames × blocks × 4 bytes (×4 with channels) plus frames × blocks / 8
 * bytes of clip bits; with `bounded` the store keeps at most maxRows rows and per-frame sums of
 * a few boxes (blockStore.ts), so a long clip costs little more than a short one.
 * @throws the stream's errors (TRUNCATED_MEDIA, FFMPEG_FAILED, FFMPEG_MISSING, BAD_REGION).
 * @example
 * const p = await decodePass(probe, decoding, { regions: [roi], overviewStep: 12 });
 * p.regions[0].luma[10]; p.grid?.data[10 * cells + c];
 */
import type { ProbeResult } from '../media/probe.js';
import { openAnalysisStream } from '../media/analysisStream.js';
import type { CameraDecoding, Frame, Rect } from '../media/types.js';
import { createRegionMeter, emptyMeasurement } from '../measure/regionMeter.js';
import { createBlockMeter } from '../measure/blockMeter.js';
import { isNestedChain, nestedPieces } from '../core/regions/nestedPieces.js';
import type { CellBox } from '../core/regions/cellGeometry.js';
import { createBlockStore } from './blockStore.js';

/** Per-block linear luminance of every frame, with the block geometry. */
export interface GridStore {
  /** frames × cells, frame-major: data[f·cells + gy·gridWidth + gx], linear luminance (0..1). */
  data: Float32Array;
  frames: number;
  gridWidth: number;
  gridHeight: number;
  /** Block size in pixels (0 when no overview was read). */
  step: number;
  /** Bit f·cells + c is set when block c of frame f is clipped (see blockMeter); always set by decodePass. */
  clipped?: Uint8Array;
  /** Linear R, G, B per block, laid out like `data`, when channels were asked for. */
  rgb?: { r: Float32Array; g: Float32Array; b: Float32Array };
  /**
   * A bounded store (blockStore.ts) keeps whole-grid rows for some frames only: `frameOf[row]` is
   * the clip frame of each row, `totalFrames` the clip's frames, `frameSum` every frame's sum over
   * all blocks, and `tracked` every frame's sums over the boxes read at full rate. Absent: one row
   * per frame.
   */
  frameOf?: Int32Array;
  totalFrames?: number;
  frameSum?: Float64Array;
  tracked?: TrackedBoxes;
}

/**
 * Per-frame sums over boxes of blocks (a bounded store's full-rate part): box k of frame f at
 * index f·boxes.length + k; luminance and channel sums of the blocks' linear values, and the
 * count of clipped blocks.
 */
export interface TrackedBoxes {
  boxes: readonly CellBox[];
  luma: Float64Array;
  rgb?: { r: Float64Array; g: Float64Array; b: Float64Array };
  clippedBlocks: Float64Array;
}

/** Per-frame means of one region: linear luminance, the three channels, and the clipped fraction. */
export interface RegionSeries {
  luma: Float64Array;
  r: Float64Array;
  g: Float64Array;
  b: Float64Array;
  clipped: Float64Array;
}

export interface DecodePassOptions {
  regions: readonly Rect[];
  /** Block size of the overview in pixels; omit for regions only. */
  overviewStep?: number;
  /** Store R, G, B per block too (4× the store). */
  channels?: boolean;
  /** Bound the store (blockStore.ts): at most maxRows whole-grid rows, every frame's sums of the boxes named. */
  bounded?: { maxRows: number; boxesFor: (rows: GridStore) => readonly CellBox[] | null };
  /** Row stride of the outer pieces of nested regions (default 1). */
  ringRowStride?: number;
  maxFrames?: number;
  onProgress?: (done: number, total: number) => void;
  signal?: AbortSignal;
}

export interface DecodePassOutput {
  times: Float64Array;
  frames: number;
  /** One series per region, in the order given. */
  regions: RegionSeries[];
  /** The block store (frames × cells), when an overview step was given. */
  grid?: GridStore;
  /** The aligned crops ffmpeg delivered, one per group of nested regions. */
  crops: Rect[];
  /** Timing remarks of the stream (e.g. more frames than timestamps). */
  notes: string[];
}

const SERIES_KEYS = ['luma', 'r', 'g', 'b', 'clipped'] as const;

export function newSeries(cap: number): RegionSeries {
  return { luma: new Float64Array(cap), r: new Float64Array(cap), g: new Float64Array(cap), b: new Float64Array(cap), clipped: new Float64Array(cap) };
}

function resizeSeries(s: RegionSeries, size: number): RegionSeries {
  const out = newSeries(size);
  for (const k of SERIES_KEYS) out[k].set(s[k].subarray(0, Math.min(size, s[k].length)));
  return out;
}

/** Regions in runs where each lies inside the next (beam ⊂ rings): each run shares one crop. */
function nestedGroups(regions: readonly Rect[]): number[][] {
  const groups: number[][] = [];
  for (let r = 0; r < regions.length; r++) {
    const last = groups[groups.length - 1];
    if (last && isNestedChain([regions[last[last.length - 1]!]!, regions[r]!])) last.push(r);
    else groups.push([r]);
  }
  return groups;
}

interface GroupPlan {
  members: number[];
  ringOf: number[];
  pieces: Rect[];
  meter: ReturnType<typeof createRegionMeter>;
  counts: number[];
  parts: ReturnType<typeof emptyMeasurement>[];
}

/** The disjoint pieces of one nested group inside its crop, with their meter (rings every `ringStride`-th row). */
function groupPlan(g: number[], regions: readonly Rect[], crop: Rect, decoding: CameraDecoding, ringStride: number, bitDepth: number): GroupPlan {
  const local = g.map((r) => ({ ...regions[r]!, x: regions[r]!.x - crop.x, y: regions[r]!.y - crop.y }));
  const { pieces, ringOf } = nestedPieces(local);
  const strides = ringOf.map((m) => (m > 0 ? ringStride : 1));
  return {
    members: g, ringOf, pieces, meter: createRegionMeter(crop.w, crop.h, pieces, decoding, strides, bitDepth),
    counts: g.map((r) => regions[r]!.w * regions[r]!.h), parts: pieces.map(emptyMeasurement),
  };
}

/** One frame of one group: each member's mean as the area-weighted sum of its pieces. */
function measureGroup(plan: GroupPlan, frame: Frame, series: RegionSeries[], n: number, acc: Float64Array): void {
  const parts = plan.meter.measureInto(frame, plan.parts); // filled in place, no per-frame objects
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

export async function decodePass(probe: ProbeResult, decoding: CameraDecoding, o: DecodePassOptions): Promise<DecodePassOutput> {
  const info = probe.info;
  const regions = o.regions;
  const step = o.overviewStep;
  const groups = nestedGroups(regions);
  const outerOf = groups.map((g) => regions[g[g.length - 1]!]!);
  const stream = openAnalysisStream(probe, outerOf, {
    ...(step ? { step, overview: { kind: 'yuv16' as const, range: decoding.range } } : {}),
    ...(o.maxFrames !== undefined ? { maxFrames: o.maxFrames } : {}),
    ...(o.onProgress ? { onProgress: o.onProgress } : {}),
    ...(o.signal ? { signal: o.signal } : {}),
  });
  const gw = stream.gridWidth;
  const gh = stream.gridHeight;
  const cells = gw * gh;
  let cap = Math.max(16, Math.min(o.maxFrames ?? Infinity, probe.expectedFrames, info.frameCount > 0 ? info.frameCount : Infinity) + 8);
  if (!Number.isFinite(cap)) cap = 1024;
  let times = new Float64Array(cap);
  const store = step ? createBlockStore({ cells, gridWidth: gw, gridHeight: gh, step, capFrames: cap, ...(o.channels ? { channels: true } : {}), ...(o.bounded ? { bounded: o.bounded } : {}) }) : null;
  let series = regions.map(() => newSeries(cap));
  const ringStride = o.ringRowStride ?? 1;
  const plans = groups.map((g, k) => groupPlan(g, regions, stream.crops[k]!, decoding, ringStride, stream.regionBitDepth));
  const acc = new Float64Array(5);
  const blocks = step ? createBlockMeter(gw, gh, decoding, info.bitDepth > 8 ? info.bitDepth : 8) : null;
  let n = 0;
  const growTo = (next: number): void => {
    const t2 = new Float64Array(next); t2.set(times); times = t2;
    series = series.map((x) => resizeSeries(x, next));
    cap = next;
  };
  for await (const frame of stream.frames) {
    if (n >= cap) growTo(Math.ceil(cap * 1.5));
    times[n] = frame.timeS;
    if (blocks && store && frame.overview) {
      const overview = frame.overview;
      store.add(n, (luma, clip, bitOffset, rgb) => blocks.measure(overview, luma, clip, bitOffset, rgb));
    }
    for (let k = 0; k < plans.length; k++) measureGroup(plans[k]!, frame.regions[k]!, series, n, acc);
    n++;
  }
  const out: DecodePassOutput = {
    times: times.slice(0, n),
    frames: n,
    regions: series.map((x) => resizeSeries(x, n)),
    crops: stream.crops,
    notes: [...stream.notes],
  };
  if (store) out.grid = store.finish();
  return out;
}
