/**
 * Renders a per-block map (static or modulated light) as a PNG figure: title, unit line, the map
 * upscaled by nearest neighbour so each block stays a visible square, a vertical colour bar with
 * ticks in the map's linear units, and a caption giving the block size in pixels.
 *
 * Colours: the project's sequential palette (`sequentialPalette.ts`, monotonic in lightness,
 * colour-blind and greyscale safe); the lowest value of the range is the darkest colour. Values
 * above the range take the top colour and the top tick reads "≥"; values below take the bottom
 * colour ("≤"); non-finite blocks are drawn mid-grey (#808080).
 *
 * Method: the map and the bar are rasterised to PNG, embedded as data URIs in an SVG that also
 * holds the text, and the SVG is rendered by sharp (librsvg) at one SVG unit per pixel.
 * Range: `range` when given, else [min(0, lowest value), highest value].
 *
 * Edge module (uses sharp), no file system. Throws KerrError INTERNAL when the value count is not
 * width × height, BAD_ARGUMENT for an empty or inverted range.
 * @example const fig = await renderMapPng(maps.staticMap, 160, 90, { title: 'Static light', unit: 'linear', stepPx: 12 });
 *   fig.layout.bar → { x: 1006, y: 64, w: 20, h: 540 }
 */
import sharp from 'sharp';
import { KerrError, invalid } from '../errors.js';
import { formatNumber } from '../quantity.js';
import type { Rect } from '../media/types.js';
import { escapeHtml } from '../report/escapeHtml.js';
import { paletteLut } from './sequentialPalette.js';

export interface MapFigureOptions {
  title: string;
  /** Unit line under the title, e.g. "linear units (1 = full-scale white)". */
  unit: string;
  /** Block size in video pixels, for the caption. */
  stepPx: number;
  range?: [number, number];
  /** Extra caption text after the block size. */
  note?: string;
}

export interface MapFigureLayout {
  width: number;
  height: number;
  map: Rect;
  bar: Rect;
  /** Figure pixels per block. */
  scalePx: number;
}

export interface MapFigure {
  png: Buffer;
  layout: MapFigureLayout;
  range: [number, number];
}

const FONT = 'DejaVu Sans, Liberation Sans, Arial, sans-serif';
const INK = '#1d2433';
const QUIET = '#4a5263';

/** Tick values at 1-2-5 steps covering [lo, hi] (Heckbert, "Nice numbers for graph labels", Graphics Gems, 1990). */
function niceTicks(lo: number, hi: number, wanted = 5): number[] {
  const span = hi - lo;
  const raw = span / Math.max(1, wanted - 1);
  const mag = Math.pow(10, Math.floor(Math.log10(raw)));
  const norm = raw / mag;
  const step = (norm < 1.5 ? 1 : norm < 3 ? 2 : norm < 7 ? 5 : 10) * mag;
  const ticks: number[] = [];
  for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step) ticks.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return ticks;
}

export function mapFigureLayout(gridWidth: number, gridHeight: number): MapFigureLayout {
  let scale = Math.max(1, Math.floor(960 / gridWidth));
  if (gridHeight * scale < 180) scale = Math.min(Math.max(scale, Math.ceil(180 / gridHeight)), Math.max(1, Math.floor(1400 / gridWidth)));
  const pad = 16;
  const top = pad + 30 + 20;
  const map: Rect = { x: pad, y: top, w: gridWidth * scale, h: gridHeight * scale };
  const bar: Rect = { x: map.x + map.w + 28, y: top, w: 20, h: map.h };
  const width = bar.x + bar.w + 8 + 84 + pad;
  const height = top + map.h + 30 + pad;
  return { width, height, map, bar, scalePx: scale };
}

export async function renderMapPng(values: Float32Array, width: number, height: number, options: MapFigureOptions): Promise<MapFigure> {
  if (!(width > 0 && height > 0) || values.length !== width * height) {
    throw new KerrError('INTERNAL', `a map of ${width}×${height} blocks needs ${width * height} values, not ${values.length}`);
  }
  let lo: number;
  let hi: number;
  if (options.range) {
    [lo, hi] = options.range;
  } else {
    lo = 0;
    hi = -Infinity;
    for (const v of values) if (Number.isFinite(v)) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
    if (!Number.isFinite(hi) || hi <= lo) hi = lo + 1;
  }
  if (!(Number.isFinite(lo) && Number.isFinite(hi) && hi > lo)) throw invalid('a range [low, high] with high above low', 'map range', `[${lo}, ${hi}]`);

  const lut = paletteLut();
  const layout = mapFigureLayout(width, height);
  const rgb = Buffer.alloc(width * height * 3);
  let above = false;
  let below = false;
  for (let c = 0; c < values.length; c++) {
    const v = values[c]!;
    if (!Number.isFinite(v)) { rgb[3 * c] = 128; rgb[3 * c + 1] = 128; rgb[3 * c + 2] = 128; continue; }
    if (v > hi) above = true;
    if (v < lo) below = true;
    const i = Math.min(255, Math.max(0, Math.round(((v - lo) / (hi - lo)) * 255)));
    rgb[3 * c] = lut[3 * i]!; rgb[3 * c + 1] = lut[3 * i + 1]!; rgb[3 * c + 2] = lut[3 * i + 2]!;
  }
  const mapPng = await sharp(rgb, { raw: { width, height, channels: 3 } })
    .resize(layout.map.w, layout.map.h, { kernel: 'nearest', fit: 'fill' })
    .png()
    .toBuffer();
  const { bar } = layout;
  const barRgb = Buffer.alloc(bar.w * bar.h * 3);
  for (let r = 0; r < bar.h; r++) {
    const i = Math.round((1 - r / Math.max(1, bar.h - 1)) * 255);
    for (let x = 0; x < bar.w; x++) {
      const o = 3 * (r * bar.w + x);
      barRgb[o] = lut[3 * i]!; barRgb[o + 1] = lut[3 * i + 1]!; barRgb[o + 2] = lut[3 * i + 2]!;
    }
  }
  const barPng = await sharp(barRgb, { raw: { width: bar.w, height: bar.h, channels: 3 } }).png().toBuffer();

  const ticks = niceTicks(lo, hi);
  const yOf = (v: number) => bar.y + (1 - (v - lo) / (hi - lo)) * (bar.h - 1);
  const tickSvg = ticks.map((v) => {
    const y = yOf(v).toFixed(1);
    return `<line x1="${bar.x + bar.w}" y1="${y}" x2="${bar.x + bar.w + 5}" y2="${y}" stroke="${INK}" stroke-width="1"/>`
      + `<text x="${bar.x + bar.w + 8}" y="${y}" dominant-baseline="middle" font-size="12" fill="${INK}">${escapeHtml(formatNumber(v, 3))}</text>`;
  }).join('');
  const endLabel = (v: number, sign: string, y: number) =>
    `<text x="${bar.x + bar.w + 8}" y="${y}" font-size="11" fill="${QUIET}">${sign} ${escapeHtml(formatNumber(v, 3))}</text>`;
  const ends = (above ? endLabel(hi, '≥', bar.y - 6) : '') + (below ? endLabel(lo, '≤', bar.y + bar.h + 14) : '');
  const caption = `1 block = ${options.stepPx}×${options.stepPx} video px · ${width}×${height} blocks${options.note ? ` · ${options.note}` : ''}`;
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" width="${layout.width}" height="${layout.height}" viewBox="0 0 ${layout.width} ${layout.height}" font-family="${FONT}">`
    + `<rect width="100%" height="100%" fill="#ffffff"/>`
    + `<text x="16" y="34" font-size="17" font-weight="bold" fill="${INK}">${escapeHtml(options.title)}</text>`
    + `<text x="16" y="54" font-size="12" fill="${QUIET}">${escapeHtml(options.unit)}</text>`
    + `<image x="${layout.map.x}" y="${layout.map.y}" width="${layout.map.w}" height="${layout.map.h}" xlink:href="data:image/png;base64,${mapPng.toString('base64')}"/>`
    + `<rect x="${layout.map.x - 0.5}" y="${layout.map.y - 0.5}" width="${layout.map.w + 1}" height="${layout.map.h + 1}" fill="none" stroke="#7b8494" stroke-width="1"/>`
    + `<image x="${bar.x}" y="${bar.y}" width="${bar.w}" height="${bar.h}" xlink:href="data:image/png;base64,${barPng.toString('base64')}"/>`
    + `<rect x="${bar.x - 0.5}" y="${bar.y - 0.5}" width="${bar.w + 1}" height="${bar.h + 1}" fill="none" stroke="#7b8494" stroke-width="1"/>`
    + tickSvg + ends
    + `<text x="16" y="${layout.map.y + layout.map.h + 22}" font-size="12" fill="${QUIET}">${escapeHtml(caption)}</text>`
    + `</svg>`;
  const png = await sharp(Buffer.from(svg), { density: 72 }).png().toBuffer();
  return { png, layout, range: [lo, hi] };
}
