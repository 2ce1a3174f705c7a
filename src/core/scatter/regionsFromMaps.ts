/**
 * Regions found on the static/modulated maps, in blocks and in pixels:
 *
 * - beam core: the block with the most modulated light (the slope map's peak, which must stand
 *   at least `minPeakZ` standard errors above zero) and every 4-connected block whose slope is at
 *   least `coreFraction` (default 0.5) of that peak: for a Gaussian spot the core reaches out to
 *   about 1.18 σ.
 * - beam footprint: the same flood fill down to `footprintFraction` (default 5 %) of the peak
 *   (about 2.45 σ for a Gaussian), kept within a few core sizes of the peak.
 * - halo band ("just outside the beam"): every block outside the footprint whose centre lies
 *   within w of the centre of a footprint block, w = max(r₅₀, 2·step) px, r₅₀ = step·√(n₅₀/π) the
 *   equivalent radius of the n₅₀ core blocks (the half-peak radius). For a round beam this is
 *   the ring r₅ < r ≤ r₅ + r₅₀ around it (r₅ the 5 % radius), for any profile it follows the
 *   footprint's shape. It is where the scatter halo is seen without the modulated beam; the
 *   simulator's truth (src/sim/truth.ts) averages its planted halo over the same band.
 *   `inner` is the footprint's bounding box and `outer` the band's, for drawing.
 * - far dark: the square window of k×k blocks with the lowest mean static light, outside a
 *   keep-out box (the band's bounding box grown by one more band width).
 * - reference candidate: the k×k window outside the keep-out box that is bright (static light at
 *   least 0.03 and 4× the dark level), uniform (block-to-block relative spread ≤ 0.15), not
 *   modulated (|slope|·m-span ≤ 25 % of its static light), steady (residual RMS ≤ 25 % of its
 *   level) and unclipped (no block ever above `clipLevel`), with the best level × steadiness;
 *   null when no window qualifies. A card whose brightness drifts with the camera's exposure
 *   still qualifies: that drift is what the reference corrects.
 *
 * Window size k = clamp(round(min(gridWidth, gridHeight)/8), 2, 8) blocks, smaller when the beam
 * leaves no room. Thresholds are common practice for this kind of segmentation, chosen here, not
 * taken from a source; docs/scatter.md lists them.
 *
 * Pure. Throws KerrError BAD_REGION when no block's modulated light stands clearly above noise.
 * @example const r = regionsFromMaps(maps, { stepPx: 8 }); r.core.rect → { x: 152, y: 112, w: 24, h: 24 }
 */
import { KerrError } from '../../errors.js';
import type { Rect } from '../regions/rect.js';
import type { ModulationMaps } from './modulationMaps.js';
import { cellBoxesOverlap, cellBoxToRect, floodFill, growCellBox, type CellBox } from '../regions/cellGeometry.js';

export interface RegionsFromMapsOptions {
  stepPx: number;
  coreFraction?: number;
  footprintFraction?: number;
  /** Raw linear level at or above which a block counts as clipped (default 0.9 ≈ sRGB code 243). */
  clipLevel?: number;
  /** The slope peak must exceed this many of its standard errors (default 5). */
  minPeakZ?: number;
}

export interface MapRegion {
  cells: CellBox;
  rect: Rect;
  cellCount: number;
}

export interface ScatterRegions {
  peakCell: number;
  /** Slope at the peak block and its standard error (linear units per unit of m). */
  peakModulated: { value: number; stdErr: number };
  /** Core blocks (flood fill): mask over the grid, and their bounding box. */
  core: MapRegion & { mask: Uint8Array };
  footprint: CellBox;
  /**
   * The halo band: `mask` marks its blocks (cellCount of them), `inner` is the footprint's
   * bounding box, `outer` the band's; `widthPx` is w and `ringWidth` = ⌈w/step⌉ blocks.
   */
  halo: { mask: Uint8Array; inner: CellBox; outer: CellBox; innerRect: Rect; outerRect: Rect; cellCount: number; ringWidth: number; widthPx: number };
  keepOut: CellBox;
  dark: (MapRegion & { level: number; levelStdErr: number }) | null;
  reference: (MapRegion & { level: number; relVariation: number }) | null;
  windowSize: number;
}

/**
 * Blocks outside `mask` whose centre is within `widthBlocks` (block units, Euclidean between
 * block centres) of a block of `mask`: the mask's outer band. Only the mask's edge blocks (those
 * with a 4-neighbour outside it) can be nearest, so only they are searched.
 */
function bandAround(mask: Uint8Array, box: CellBox, w: number, h: number, widthBlocks: number): { mask: Uint8Array; box: CellBox; count: number } {
  const edge: number[] = [];
  for (let y = box.y0; y <= box.y1; y++) {
    for (let x = box.x0; x <= box.x1; x++) {
      const c = y * w + x;
      if (!mask[c]) continue;
      if (x === 0 || x === w - 1 || y === 0 || y === h - 1 || !mask[c - 1] || !mask[c + 1] || !mask[c - w] || !mask[c + w]) edge.push(x, y);
    }
  }
  const out = new Uint8Array(w * h);
  const reach = Math.ceil(widthBlocks);
  const limit = widthBlocks * widthBlocks + 1e-9;
  const outBox: CellBox = { x0: w, y0: h, x1: -1, y1: -1 };
  let count = 0;
  for (let y = Math.max(0, box.y0 - reach); y <= Math.min(h - 1, box.y1 + reach); y++) {
    for (let x = Math.max(0, box.x0 - reach); x <= Math.min(w - 1, box.x1 + reach); x++) {
      const c = y * w + x;
      if (mask[c]) continue;
      let near = false;
      for (let k = 0; k < edge.length && !near; k += 2) {
        const dx = x - edge[k]!;
        const dy = y - edge[k + 1]!;
        near = dx * dx + dy * dy <= limit;
      }
      if (!near) continue;
      out[c] = 1;
      count++;
      outBox.x0 = Math.min(outBox.x0, x); outBox.x1 = Math.max(outBox.x1, x);
      outBox.y0 = Math.min(outBox.y0, y); outBox.y1 = Math.max(outBox.y1, y);
    }
  }
  return { mask: out, box: outBox, count };
}

/** Summed-area table over a w×h map: sum over any box in O(1). */
function integral(w: number, h: number, value: (c: number) => number): Float64Array {
  const t = new Float64Array((w + 1) * (h + 1));
  for (let y = 0; y < h; y++) {
    let row = 0;
    for (let x = 0; x < w; x++) {
      row += value(y * w + x);
      t[(y + 1) * (w + 1) + x + 1] = t[y * (w + 1) + x + 1]! + row;
    }
  }
  return t;
}

function boxSum(t: Float64Array, w: number, b: CellBox): number {
  const W = w + 1;
  return t[(b.y1 + 1) * W + b.x1 + 1]! - t[b.y0 * W + b.x1 + 1]! - t[(b.y1 + 1) * W + b.x0]! + t[b.y0 * W + b.x0]!;
}

export function regionsFromMaps(maps: ModulationMaps, options: RegionsFromMapsOptions): ScatterRegions {
  const { width: w, height: h, staticMap, modulatedMap, staticStdErr, modulatedStdErr, residualStd, maxLevel } = maps;
  const step = options.stepPx;
  const coreFraction = options.coreFraction ?? 0.5;
  const footprintFraction = options.footprintFraction ?? 0.05;
  const clipLevel = options.clipLevel ?? 0.9;
  const minPeakZ = options.minPeakZ ?? 5;
  const cells = w * h;

  let peak = -1;
  for (let c = 0; c < cells; c++) {
    const v = modulatedMap[c]!;
    if (Number.isFinite(v) && (peak < 0 || v > modulatedMap[peak]!)) peak = c;
  }
  const peakValue = peak >= 0 ? modulatedMap[peak]! : NaN;
  const peakErr = peak >= 0 ? modulatedStdErr[peak]! : NaN;
  if (!(peakValue > 0) || !(peakValue > minPeakZ * (Number.isFinite(peakErr) ? peakErr : Infinity))) {
    throw new KerrError('BAD_REGION', 'no part of the modulated-light map stands clearly above noise, so the beam core could not be found on the maps', {
      hint: 'Check that the beam is in view and the sweep opens the shutter, or give the beam region to measure one you choose',
      inputs: ['beamRegion'],
    });
  }

  const core = floodFill(modulatedMap, w, h, peak, coreFraction * peakValue, null);
  const coreHalf = Math.max(1, Math.ceil(Math.max(core.box.x1 - core.box.x0 + 1, core.box.y1 - core.box.y0 + 1) / 2));
  const footprintBounds = growCellBox(core.box, Math.max(2, 3 * coreHalf), w, h);
  const foot = floodFill(modulatedMap, w, h, peak, footprintFraction * peakValue, footprintBounds);
  const footprint = foot.box;
  const bandWidthPx = Math.max(step * Math.sqrt(core.count / Math.PI), 2 * step);
  const band = bandAround(foot.mask, footprint, w, h, bandWidthPx / step);
  const ringWidth = Math.ceil(bandWidthPx / step);
  const haloInner = footprint;
  const haloOuter = band.count > 0 ? band.box : growCellBox(haloInner, ringWidth, w, h);
  const keepOut = growCellBox(haloOuter, ringWidth, w, h);

  const staticSum = integral(w, h, (c) => staticMap[c]!);
  const staticSq = integral(w, h, (c) => staticMap[c]! * staticMap[c]!);
  const staticVar = integral(w, h, (c) => staticStdErr[c]! * staticStdErr[c]!);
  const slopeSum = integral(w, h, (c) => modulatedMap[c]!);
  const residSum = integral(w, h, (c) => residualStd[c]!);
  const clipped = integral(w, h, (c) => (maxLevel[c]! >= clipLevel ? 1 : 0));

  // Windows outside the keep-out box: the largest k that leaves at least one.
  let k = Math.min(8, Math.max(2, Math.round(Math.min(w, h) / 8)));
  const windows = (size: number): CellBox[] => {
    const out: CellBox[] = [];
    for (let y = 0; y + size <= h; y++) {
      for (let x = 0; x + size <= w; x++) {
        const b = { x0: x, y0: y, x1: x + size - 1, y1: y + size - 1 };
        if (!cellBoxesOverlap(b, keepOut)) out.push(b);
      }
    }
    return out;
  };
  let candidates = windows(k);
  while (candidates.length === 0 && k > 1) candidates = windows(--k);

  let dark: ScatterRegions['dark'] = null;
  let reference: ScatterRegions['reference'] = null;
  if (candidates.length > 0) {
    const area = k * k;
    let best: CellBox | null = null;
    let bestMean = Infinity;
    for (const b of candidates) {
      const mean = boxSum(staticSum, w, b) / area;
      if (mean < bestMean) { bestMean = mean; best = b; }
    }
    if (best) {
      dark = { cells: best, rect: cellBoxToRect(best, step), cellCount: area, level: bestMean, levelStdErr: Math.sqrt(Math.max(0, boxSum(staticVar, w, best))) / area };
    }
    const darkLevel = dark ? dark.level : 0;
    const span = maps.modulationSpan;
    let bestScore = -Infinity;
    for (const b of candidates) {
      if (boxSum(clipped, w, b) > 0) continue;
      const level = boxSum(staticSum, w, b) / area;
      if (!(level >= 0.03) || !(level >= 4 * darkLevel)) continue;
      const spread = Math.sqrt(Math.max(0, boxSum(staticSq, w, b) / area - level * level)) / level;
      if (!(spread <= 0.15)) continue;
      const slope = boxSum(slopeSum, w, b) / area;
      if (!(Math.abs(slope) * span <= 0.25 * level)) continue;
      const relVariation = boxSum(residSum, w, b) / area / level;
      if (!(relVariation <= 0.25)) continue;
      const score = level * (1 - relVariation);
      if (score > bestScore) {
        bestScore = score;
        reference = { cells: b, rect: cellBoxToRect(b, step), cellCount: area, level, relVariation };
      }
    }
  }

  return {
    peakCell: peak,
    peakModulated: { value: peakValue, stdErr: peakErr },
    core: { cells: core.box, rect: cellBoxToRect(core.box, step), cellCount: core.count, mask: core.mask },
    footprint,
    halo: {
      mask: band.mask,
      inner: haloInner,
      outer: haloOuter,
      innerRect: cellBoxToRect(haloInner, step),
      outerRect: cellBoxToRect(haloOuter, step),
      cellCount: band.count,
      ringWidth,
      widthPx: bandWidthPx,
    },
    keepOut,
    dark,
    reference,
    windowSize: k,
  };
}
