/**
 * The block store a decoding pass fills (decodePass.ts): per frame, every block's linear luminance
 * (and R, G, B when asked), and a clip bit per block.
 *
 * Unbounded (the default, and every clip up to `maxRows` frames): one row per frame, grown as
 * frames come, exactly as the pass always stored them.
 *
 * Bounded, so that peak memory does not grow with clip length: once `maxRows` frames are stored,
 * `boxesFor` is asked for the boxes of blocks the analysis will read at every frame (the beam found
 * so far and its rings, the spark and keep-out boxes: fullRateBoxes.ts). From then on
 * - each of those boxes keeps, at every frame, its sum of luminance (and of R, G, B) and its count
 *   of clipped blocks: a region made of one of them is read at the full frame rate (blockSeries,
 *   findSparks, the exposure series) with the numbers the unbounded store gives;
 * - every frame's sum over all blocks is kept (frame means: flashes, the exposure series);
 * - the whole grid keeps every `stride`-th frame only: when the rows are full, every other row is
 *   dropped and the stride doubles (rows stay evenly spaced in time; the maps, the beam finder and
 *   the far-dark search read these rows, with `frameOf` telling which frame each one is).
 * Memory then stays near maxRows × blocks values plus a few numbers per frame and box.
 *
 * @example
 * const store = createBlockStore({ cells, gridWidth, gridHeight, step, capFrames: 900 });
 * store.add(f, (luma, clipped, bitOffset, rgb) => meter.measure(frame, luma, clipped, bitOffset, rgb));
 * const grid = store.finish();
 */
import type { CellBox } from '../core/regions/cellGeometry.js';
import type { GridStore, TrackedBoxes } from './decodePass.js';

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
   * Keep at most this many whole-grid rows, with per-frame sums of the boxes `boxesFor` names;
   * null means "not yet" (no beam in the rows so far): the rows keep growing and it is asked again
   * at twice as many.
   */
  bounded?: { maxRows: number; boxesFor: (rows: GridStore) => readonly CellBox[] | null };
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
function grow64(a: Float64Array, size: number): Float64Array<ArrayBuffer> {
  const out = new Float64Array(size);
  out.set(a.subarray(0, Math.min(size, a.length)));
  return out;
}
const newRgb = (size: number): Rgb => ({ r: new Float32Array(size), g: new Float32Array(size), b: new Float32Array(size) });

/** Per-frame sums of the tracked boxes: box k of frame f at [f·boxes + k]. */
interface Tracked {
  boxes: readonly CellBox[];
  luma: Float64Array;
  rgb: { r: Float64Array; g: Float64Array; b: Float64Array } | undefined;
  clippedBlocks: Float64Array;
}

class Store implements BlockStore {
  private readonly cells: number;
  private cap: number;
  private data: Float32Array;
  private clipped: Uint8Array;
  private rgb: Rgb | undefined;
  private rows = 0;
  private frames = 0;
  /** Bounded mode, once the rows fill and the boxes are known. */
  private tracked: Tracked | null = null;
  private nextTry: number;
  private stride = 1;
  private frameOf: Int32Array | null = null;
  private frameSum: Float64Array | null = null;
  private readonly scratch: { luma: Float32Array; clipped: Uint8Array; rgb: Rgb | undefined };

  constructor(private readonly o: BlockStoreOptions) {
    this.cells = o.cells;
    this.cap = Math.max(16, o.capFrames);
    // a bounded store starts at its row cap, not at the clip's length
    const n = (o.bounded ? Math.min(this.cap, o.bounded.maxRows) : this.cap) * this.cells;
    this.data = new Float32Array(n);
    this.clipped = new Uint8Array(Math.ceil(n / 8));
    this.rgb = o.channels ? newRgb(n) : undefined;
    this.nextTry = o.bounded?.maxRows ?? Infinity;
    this.scratch = { luma: new Float32Array(this.cells), clipped: new Uint8Array(Math.ceil(this.cells / 8)), rgb: o.channels ? newRgb(this.cells) : undefined };
  }

  private view(): GridStore {
    const { rows, cells, rgb } = this;
    return {
      data: this.data.subarray(0, rows * cells), frames: rows, gridWidth: this.o.gridWidth, gridHeight: this.o.gridHeight, step: this.o.step,
      clipped: this.clipped.subarray(0, Math.ceil((rows * cells) / 8)),
      ...(rgb ? { rgb: { r: rgb.r.subarray(0, rows * cells), g: rgb.g.subarray(0, rows * cells), b: rgb.b.subarray(0, rows * cells) } } : {}),
    };
  }

  /**
   * The tracked boxes' sums of frame f, from a row of `src` at `srcOff` (clip bits from `srcBit`),
   * summed rows then columns as blockSeries sums an unbounded store (the same numbers).
   */
  private track(f: number, src: Float32Array, srcRgb: Rgb | undefined, srcClip: Uint8Array, srcOff: number, srcBit: number): void {
    const t = this.tracked!;
    const gw = this.o.gridWidth;
    const nb = t.boxes.length;
    for (let k = 0; k < nb; k++) {
      const b = t.boxes[k]!;
      let s = 0, r = 0, g = 0, bl = 0, clip = 0;
      for (let y = b.y0; y <= b.y1; y++) {
        const row = srcOff + y * gw;
        for (let x = b.x0; x <= b.x1; x++) s += src[row + x]!;
      }
      if (srcRgb) {
        for (let y = b.y0; y <= b.y1; y++) {
          const row = srcOff + y * gw;
          for (let x = b.x0; x <= b.x1; x++) { r += srcRgb.r[row + x]!; g += srcRgb.g[row + x]!; bl += srcRgb.b[row + x]!; }
        }
      }
      for (let y = b.y0; y <= b.y1; y++) {
        for (let x = b.x0; x <= b.x1; x++) {
          const bit = srcBit + y * gw + x;
          clip += (srcClip[bit >> 3]! >> (bit & 7)) & 1;
        }
      }
      const i = f * nb + k;
      t.luma[i] = s;
      t.clippedBlocks[i] = clip;
      if (t.rgb) { t.rgb.r[i] = r; t.rgb.g[i] = g; t.rgb.b[i] = bl; }
    }
  }

  private sumRow(src: Float32Array, off: number): number {
    let s = 0;
    for (let c = 0; c < this.cells; c++) s += src[off + c]!;
    return s;
  }

  /** The rows are full: take the boxes, sum them and the frames over the rows so far (false: no boxes yet). */
  private startBounding(): boolean {
    const boxes = this.o.bounded!.boxesFor(this.view());
    if (!boxes) return false;
    const { cells, cap } = this;
    const n = cap * boxes.length;
    this.tracked = { boxes: boxes.map((b) => ({ ...b })), luma: new Float64Array(n), clippedBlocks: new Float64Array(n), rgb: this.rgb ? { r: new Float64Array(n), g: new Float64Array(n), b: new Float64Array(n) } : undefined };
    this.frameOf = Int32Array.from({ length: this.rows }, (_, r) => r);
    this.frameSum = new Float64Array(cap);
    for (let r = 0; r < this.rows; r++) {
      this.track(r, this.data, this.rgb, this.clipped, r * cells, r * cells);
      this.frameSum[r] = this.sumRow(this.data, r * cells);
    }
    const maxRows = this.o.bounded!.maxRows;
    while (this.rows > maxRows) this.compact();
    if (this.data.length > maxRows * cells) {
      const m = maxRows * cells;
      this.data = this.data.slice(0, m);
      this.clipped = this.clipped.slice(0, Math.ceil(m / 8));
      if (this.rgb) this.rgb = { r: this.rgb.r.slice(0, m), g: this.rgb.g.slice(0, m), b: this.rgb.b.slice(0, m) };
    }
    return true;
  }

  /** Keeps every other row (those at multiples of twice the stride); the stride doubles. */
  private compact(): void {
    const { cells, rgb, frameOf } = this;
    let kept = 0;
    const bits = new Uint8Array(this.clipped.length);
    for (let r = 0; r < this.rows; r++) {
      if (frameOf![r]! % (2 * this.stride) !== 0) continue;
      this.data.copyWithin(kept * cells, r * cells, (r + 1) * cells);
      if (rgb) for (const ch of [rgb.r, rgb.g, rgb.b]) ch.copyWithin(kept * cells, r * cells, (r + 1) * cells);
      for (let c = 0; c < cells; c++) {
        const from = r * cells + c, to = kept * cells + c;
        if ((this.clipped[from >> 3]! >> (from & 7)) & 1) bits[to >> 3] |= 1 << (to & 7);
      }
      frameOf![kept] = frameOf![r]!;
      kept++;
    }
    this.clipped = bits;
    this.rows = kept;
    this.stride *= 2;
  }

  /** Room for frame f in the per-frame arrays (capacity grows by half). */
  private ensureCap(f: number): void {
    if (f < this.cap) return;
    this.cap = Math.ceil(Math.max(f + 1, this.cap * 1.5));
    if (this.frameSum) this.frameSum = grow64(this.frameSum, this.cap);
    const t = this.tracked;
    if (t) {
      const n = this.cap * t.boxes.length;
      t.luma = grow64(t.luma, n);
      t.clippedBlocks = grow64(t.clippedBlocks, n);
      if (t.rgb) t.rgb = { r: grow64(t.rgb.r, n), g: grow64(t.rgb.g, n), b: grow64(t.rgb.b, n) };
    }
  }

  /** Room for one more row before the boxes are known (grows by half; rows are capped only after). */
  private ensureRowRoom(): void {
    const { cells } = this;
    if ((this.rows + 1) * cells <= this.data.length) return;
    const n = Math.ceil(Math.max(this.rows + 1, (this.data.length / cells) * 1.5)) * cells;
    this.data = grow32(this.data, n);
    this.clipped = growBytes(this.clipped, Math.ceil(n / 8));
    if (this.rgb) this.rgb = { r: grow32(this.rgb.r, n), g: grow32(this.rgb.g, n), b: grow32(this.rgb.b, n) };
  }

  add(f: number, measure: MeasureBlocks): void {
    this.frames = Math.max(this.frames, f + 1);
    this.ensureCap(f);
    const { cells } = this;
    if (!this.tracked) {
      // every frame its own row, measured in place (the unbounded store, bit for bit)
      this.ensureRowRoom();
      const lo = this.rows * cells, hi = lo + cells;
      const rgb = this.rgb;
      measure(this.data.subarray(lo, hi), this.clipped, lo, rgb ? { r: rgb.r.subarray(lo, hi), g: rgb.g.subarray(lo, hi), b: rgb.b.subarray(lo, hi) } : undefined);
      this.rows++;
      if (this.rows >= this.nextTry && !this.startBounding()) this.nextTry *= 2;
      return;
    }
    const sc = this.scratch;
    sc.clipped.fill(0);
    measure(sc.luma, sc.clipped, 0, sc.rgb);
    this.track(f, sc.luma, sc.rgb, sc.clipped, 0, 0);
    this.frameSum![f] = this.sumRow(sc.luma, 0);
    if (f % this.stride !== 0) return;
    if (this.rows >= this.o.bounded!.maxRows) this.compact();
    if (f % this.stride !== 0) return;
    this.storeRow(f);
  }

  /** The scratch frame becomes the next row. */
  private storeRow(f: number): void {
    const { cells, rgb } = this;
    const sc = this.scratch;
    const lo = this.rows * cells;
    this.data.set(sc.luma, lo);
    if (rgb && sc.rgb) { rgb.r.set(sc.rgb.r, lo); rgb.g.set(sc.rgb.g, lo); rgb.b.set(sc.rgb.b, lo); }
    for (let c = 0; c < cells; c++) if ((sc.clipped[c >> 3]! >> (c & 7)) & 1) { const bit = lo + c; this.clipped[bit >> 3] |= 1 << (bit & 7); }
    this.frameOf![this.rows] = f;
    this.rows++;
  }

  finish(): GridStore {
    const grid = this.view();
    const t = this.tracked;
    if (!t) return grid;
    const n = this.frames * t.boxes.length;
    const tracked: TrackedBoxes = {
      boxes: t.boxes, luma: t.luma.slice(0, n), clippedBlocks: t.clippedBlocks.slice(0, n),
      ...(t.rgb ? { rgb: { r: t.rgb.r.slice(0, n), g: t.rgb.g.slice(0, n), b: t.rgb.b.slice(0, n) } } : {}),
    };
    return { ...grid, totalFrames: this.frames, frameOf: this.frameOf!.slice(0, this.rows), frameSum: this.frameSum!.slice(0, this.frames), tracked };
  }
}

export function createBlockStore(o: BlockStoreOptions): BlockStore {
  return new Store(o);
}
