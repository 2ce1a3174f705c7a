/**
 * The block store a decoding pass fills (decodePass.ts): per frame, every block's linear luminance
 * (and R, G, B when asked), and a clip bit per block.
 *
 * Unbounded (the default, and every clip up to `maxRows` frames): one row per frame, grown as
 * frames come, exactly as the pass always stored them.
 *
 * Bounded, so that peak memory does not grow with clip length: once `maxRows` frames are stored,
 * `windowFor` is asked for a window of blocks (the beam found so far, grown to hold its rings and
 * the background box around it). From then on
 * - the window keeps every frame (its luminance, channels and clip bits): a region made of whole
 *   blocks inside it is read at the full frame rate (blockSeries, findSparks, the exposure series);
 * - every frame's sum over all blocks is kept (frame means: flashes, the exposure series);
 * - the whole grid keeps every `stride`-th frame only: when the rows are full, every other row is
 *   dropped and the stride doubles (rows stay evenly spaced in time; the maps, the beam finder and
 *   the far-dark search read these rows, with `frameOf` telling which frame each one is).
 * Memory then stays near maxRows × blocks + frames × (window blocks + 1) values.
 *
 * @example
 * const store = createBlockStore({ cells, gridWidth, gridHeight, step, capFrames: 900 });
 * store.add(f, (luma, clipped, bitOffset, rgb) => meter.measure(frame, luma, clipped, bitOffset, rgb));
 * const grid = store.finish();
 */
import type { CellBox } from '../core/regions/cellGeometry.js';
import type { GridStore } from './decodePass.js';

type Rgb = { r: Float32Array; g: Float32Array; b: Float32Array };
/** Fills one frame's blocks: luminance into `luma`, clip bits from `bitOffset` on, channels into `rgb`. */
export type MeasureBlocks = (luma: Float32Array, clipped: Uint8Array, bitOffset: number, rgb?: Rgb) => void;

export interface BlockStoreOptions {
  cells: number;
  gridWidth: number;
  gridHeight: number;
  step: number;
  /** Frames expected (the first allocation; grown when more come). */
  capFrames: number;
  channels?: boolean;
  /**
   * Keep at most this many whole-grid rows, with a full-rate window from `windowFor`; a window of
   * null means "not yet" (no beam in the rows so far): the rows keep growing and it is asked again
   * at twice as many.
   */
  bounded?: { maxRows: number; windowFor: (rows: GridStore) => CellBox | null };
}

export interface BlockStore {
  add(frameIndex: number, measure: MeasureBlocks): void;
  finish(): GridStore;
}

function grow32(a: Float32Array, size: number): Float32Array<ArrayBuffer> {
  const out = new Float32Array(size);
  out.set(a.subarray(0, Math.min(size, a.length)));
  return out;
}
function growBytes(a: Uint8Array, size: number): Uint8Array<ArrayBuffer> {
  const out = new Uint8Array(size);
  out.set(a.subarray(0, Math.min(size, a.length)));
  return out;
}
const newRgb = (size: number): Rgb => ({ r: new Float32Array(size), g: new Float32Array(size), b: new Float32Array(size) });

interface Window {
  box: CellBox;
  width: number;
  cells: number;
  data: Float32Array;
  clipped: Uint8Array;
  rgb?: Rgb;
  cap: number;
}

export function createBlockStore(o: BlockStoreOptions): BlockStore {
  const { cells, gridWidth } = o;
  let cap = Math.max(16, o.capFrames);
  // bounded mode, once the rows fill and a window is known
  let window: Window | null = null;
  // rows are capped at maxRows once the window is known; until then they grow with the frames
  const rowCap = (): number => (o.bounded && window ? o.bounded.maxRows : cap);
  let nextTry = o.bounded?.maxRows ?? Infinity;
  let data = new Float32Array(rowCap() * cells);
  let clipped = new Uint8Array(Math.ceil((rowCap() * cells) / 8));
  let rgb = o.channels ? newRgb(rowCap() * cells) : undefined;
  let rows = 0;
  let frames = 0;
  let stride = 1;
  let frameOf: Int32Array | null = null;
  let frameSum: Float64Array | null = null;
  const scratch = { luma: new Float32Array(cells), clipped: new Uint8Array(Math.ceil(cells / 8)), rgb: o.channels ? newRgb(cells) : undefined };

  const view = (): GridStore => ({
    data: data.subarray(0, rows * cells), frames: rows, gridWidth, gridHeight: o.gridHeight, step: o.step,
    clipped: clipped.subarray(0, Math.ceil((rows * cells) / 8)),
    ...(rgb ? { rgb: { r: rgb.r.subarray(0, rows * cells), g: rgb.g.subarray(0, rows * cells), b: rgb.b.subarray(0, rows * cells) } } : {}),
  });

  /** Copies one frame's window blocks (from a row of `src` at `srcOff`, bits from `srcBit`) into the window at frame f. */
  function toWindow(f: number, src: Float32Array, srcRgb: Rgb | undefined, srcClip: Uint8Array, srcOff: number, srcBit: number): void {
    const w = window!;
    if (f >= w.cap) {
      const next = Math.ceil(Math.max(f + 1, w.cap * 1.5));
      w.data = grow32(w.data, next * w.cells);
      w.clipped = growBytes(w.clipped, Math.ceil((next * w.cells) / 8));
      if (w.rgb) w.rgb = { r: grow32(w.rgb.r, next * w.cells), g: grow32(w.rgb.g, next * w.cells), b: grow32(w.rgb.b, next * w.cells) };
      w.cap = next;
    }
    let k = f * w.cells;
    for (let y = w.box.y0; y <= w.box.y1; y++) {
      for (let x = w.box.x0; x <= w.box.x1; x++, k++) {
        const c = y * gridWidth + x;
        w.data[k] = src[srcOff + c]!;
        if (w.rgb && srcRgb) { w.rgb.r[k] = srcRgb.r[srcOff + c]!; w.rgb.g[k] = srcRgb.g[srcOff + c]!; w.rgb.b[k] = srcRgb.b[srcOff + c]!; }
        const bit = srcBit + c;
        if ((srcClip[bit >> 3]! >> (bit & 7)) & 1) w.clipped[k >> 3] |= 1 << (k & 7);
      }
    }
  }

  function sumRow(src: Float32Array, off: number): number {
    let s = 0;
    for (let c = 0; c < cells; c++) s += src[off + c]!;
    return s;
  }

  /** The rows are full: take the window, keep its blocks and the frame sums of the rows so far (false: no window yet). */
  function startBounding(): boolean {
    const box = o.bounded!.windowFor(view());
    if (!box) return false;
    const width = box.x1 - box.x0 + 1;
    const wcells = width * (box.y1 - box.y0 + 1);
    window = { box, width, cells: wcells, data: new Float32Array(cap * wcells), clipped: new Uint8Array(Math.ceil((cap * wcells) / 8)), ...(rgb ? { rgb: newRgb(cap * wcells) } : {}), cap };
    frameOf = Int32Array.from({ length: rows }, (_, r) => r);
    frameSum = new Float64Array(cap);
    for (let r = 0; r < rows; r++) {
      toWindow(r, data, rgb, clipped, r * cells, r * cells);
      frameSum[r] = sumRow(data, r * cells);
    }
    const maxRows = o.bounded!.maxRows;
    while (rows > maxRows) compact();
    if (data.length > maxRows * cells) {
      data = data.slice(0, maxRows * cells);
      clipped = clipped.slice(0, Math.ceil((maxRows * cells) / 8));
      if (rgb) rgb = { r: rgb.r.slice(0, maxRows * cells), g: rgb.g.slice(0, maxRows * cells), b: rgb.b.slice(0, maxRows * cells) };
    }
    return true;
  }

  /** Keeps every other row (those at multiples of twice the stride); the stride doubles. */
  function compact(): void {
    let kept = 0;
    const bits = new Uint8Array(clipped.length);
    for (let r = 0; r < rows; r++) {
      if (frameOf![r]! % (2 * stride) !== 0) continue;
      data.copyWithin(kept * cells, r * cells, (r + 1) * cells);
      if (rgb) for (const ch of [rgb.r, rgb.g, rgb.b]) ch.copyWithin(kept * cells, r * cells, (r + 1) * cells);
      for (let c = 0; c < cells; c++) {
        const from = r * cells + c, to = kept * cells + c;
        if ((clipped[from >> 3]! >> (from & 7)) & 1) bits[to >> 3] |= 1 << (to & 7);
      }
      frameOf![kept] = frameOf![r]!;
      kept++;
    }
    clipped = bits;
    rows = kept;
    stride *= 2;
  }

  function add(f: number, measure: MeasureBlocks): void {
    frames = Math.max(frames, f + 1);
    if (f >= cap) {
      cap = Math.ceil(Math.max(f + 1, cap * 1.5));
      if (frameSum) { const s2 = new Float64Array(cap); s2.set(frameSum); frameSum = s2; }
      const rc = rowCap();
      if (rc * cells > data.length) {
        data = grow32(data, rc * cells);
        clipped = growBytes(clipped, Math.ceil((rc * cells) / 8));
        if (rgb) rgb = { r: grow32(rgb.r, rc * cells), g: grow32(rgb.g, rc * cells), b: grow32(rgb.b, rc * cells) };
      }
    }
    if (!window) {
      // every frame its own row, measured in place (the unbounded store, bit for bit)
      const lo = rows * cells, hi = lo + cells;
      measure(data.subarray(lo, hi), clipped, lo, rgb ? { r: rgb.r.subarray(lo, hi), g: rgb.g.subarray(lo, hi), b: rgb.b.subarray(lo, hi) } : undefined);
      rows++;
      if (rows >= nextTry && !startBounding()) nextTry *= 2;
      return;
    }
    scratch.clipped.fill(0);
    measure(scratch.luma, scratch.clipped, 0, scratch.rgb);
    toWindow(f, scratch.luma, scratch.rgb, scratch.clipped, 0, 0);
    frameSum![f] = sumRow(scratch.luma, 0);
    if (f % stride !== 0) return;
    if (rows >= o.bounded!.maxRows) compact();
    if (f % stride !== 0) return;
    const lo = rows * cells;
    data.set(scratch.luma, lo);
    if (rgb && scratch.rgb) { rgb.r.set(scratch.rgb.r, lo); rgb.g.set(scratch.rgb.g, lo); rgb.b.set(scratch.rgb.b, lo); }
    for (let c = 0; c < cells; c++) if ((scratch.clipped[c >> 3]! >> (c & 7)) & 1) { const bit = lo + c; clipped[bit >> 3] |= 1 << (bit & 7); }
    frameOf![rows] = f;
    rows++;
  }

  function finish(): GridStore {
    const grid = view();
    if (!window) return grid;
    const w = window;
    return {
      ...grid, totalFrames: frames, frameOf: frameOf!.slice(0, rows), frameSum: frameSum!.slice(0, frames),
      window: {
        box: w.box, data: w.data.subarray(0, frames * w.cells), clipped: w.clipped.subarray(0, Math.ceil((frames * w.cells) / 8)),
        ...(w.rgb ? { rgb: { r: w.rgb.r.subarray(0, frames * w.cells), g: w.rgb.g.subarray(0, frames * w.cells), b: w.rgb.b.subarray(0, frames * w.cells) } } : {}),
      },
    };
  }
  return { add, finish };
}
