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

class Store implements BlockStore {
  private readonly cells: number;
  private cap: number;
  private data: Float32Array;
  private clipped: Uint8Array;
  private rgb: Rgb | undefined;
  private rows = 0;
  private frames = 0;
  /** Bounded mode, once the rows fill and a window is known. */
  private window: Window | null = null;
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

  private growWindow(w: Window, f: number): void {
    const next = Math.ceil(Math.max(f + 1, w.cap * 1.5));
    w.data = grow32(w.data, next * w.cells);
    w.clipped = growBytes(w.clipped, Math.ceil((next * w.cells) / 8));
    if (w.rgb) w.rgb = { r: grow32(w.rgb.r, next * w.cells), g: grow32(w.rgb.g, next * w.cells), b: grow32(w.rgb.b, next * w.cells) };
    w.cap = next;
  }

  /** Copies one frame's window blocks (from a row of `src` at `srcOff`, bits from `srcBit`) into the window at frame f. */
  private toWindow(f: number, src: Float32Array, srcRgb: Rgb | undefined, srcClip: Uint8Array, srcOff: number, srcBit: number): void {
    const w = this.window!;
    if (f >= w.cap) this.growWindow(w, f);
    const gridWidth = this.o.gridWidth;
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

  private sumRow(src: Float32Array, off: number): number {
    let s = 0;
    for (let c = 0; c < this.cells; c++) s += src[off + c]!;
    return s;
  }

  /** The rows are full: take the window, keep its blocks and the frame sums of the rows so far (false: no window yet). */
  private startBounding(): boolean {
    const box = this.o.bounded!.windowFor(this.view());
    if (!box) return false;
    const { cells, cap } = this;
    const width = box.x1 - box.x0 + 1;
    const wcells = width * (box.y1 - box.y0 + 1);
    this.window = { box, width, cells: wcells, data: new Float32Array(cap * wcells), clipped: new Uint8Array(Math.ceil((cap * wcells) / 8)), ...(this.rgb ? { rgb: newRgb(cap * wcells) } : {}), cap };
    this.frameOf = Int32Array.from({ length: this.rows }, (_, r) => r);
    this.frameSum = new Float64Array(cap);
    for (let r = 0; r < this.rows; r++) {
      this.toWindow(r, this.data, this.rgb, this.clipped, r * cells, r * cells);
      this.frameSum[r] = this.sumRow(this.data, r * cells);
    }
    const maxRows = this.o.bounded!.maxRows;
    while (this.rows > maxRows) this.compact();
    if (this.data.length > maxRows * cells) {
      const n = maxRows * cells;
      this.data = this.data.slice(0, n);
      this.clipped = this.clipped.slice(0, Math.ceil(n / 8));
      if (this.rgb) this.rgb = { r: this.rgb.r.slice(0, n), g: this.rgb.g.slice(0, n), b: this.rgb.b.slice(0, n) };
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
    if (this.frameSum) { const s2 = new Float64Array(this.cap); s2.set(this.frameSum); this.frameSum = s2; }
  }

  /** Room for one more row before the window is known (grows by half; rows are capped only after). */
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
    if (!this.window) {
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
    this.toWindow(f, sc.luma, sc.rgb, sc.clipped, 0, 0);
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
    const w = this.window;
    if (!w) return grid;
    const n = this.frames * w.cells;
    return {
      ...grid, totalFrames: this.frames, frameOf: this.frameOf!.slice(0, this.rows), frameSum: this.frameSum!.slice(0, this.frames),
      window: {
        box: w.box, data: w.data.subarray(0, n), clipped: w.clipped.subarray(0, Math.ceil(n / 8)),
        ...(w.rgb ? { rgb: { r: w.rgb.r.subarray(0, n), g: w.rgb.g.subarray(0, n), b: w.rgb.b.subarray(0, n) } } : {}),
      },
    };
  }
}

export function createBlockStore(o: BlockStoreOptions): BlockStore {
  return new Store(o);
}
