/**
 * Test photos for the stills reader: a linear scene (ambient background, a uniform beam disc, a
 * grey-card patch), scaled by exposure, plus an unscaled black level, sRGB-encoded
 * (IEC 61966-2-1) to 8-bit and written with sharp, optionally with EXIF exposure tags.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';

export const W = 160;
export const H = 120;
/** Regions of the scene (inside the beam disc, a dark corner, the grey card). */
export const BEAM_ROI = { x: 65, y: 45, w: 30, h: 30 };
export const DARK_ROI = { x: 120, y: 90, w: 30, h: 20 };
export const CARD_ROI = { x: 10, y: 10, w: 30, h: 30 };

export interface SceneSpec {
  beam: number; // linear radiance of the beam disc
  ambient?: number; // background radiance (default 0.02)
  card?: number; // grey card radiance (default 0.18)
  exposure?: number; // scales all radiance (default 1)
  black?: number; // added after exposure, not scaled (default 0)
  noise?: number; // uniform noise amplitude in linear units, deterministic (default 0)
  width?: number;
  height?: number;
}

export function srgbEncode(linear: number): number {
  const l = Math.min(1, Math.max(0, linear));
  return l <= 0.0031308 ? 12.92 * l : 1.055 * Math.pow(l, 1 / 2.4) - 0.055;
}

/** Linear camera signal per pixel (one channel; the scene is grey). */
export function renderLinear(spec: SceneSpec): Float64Array {
  const width = spec.width ?? W, height = spec.height ?? H;
  const out = new Float64Array(width * height);
  let seed = 12345;
  const rand = (): number => {
    seed = (seed * 1103515245 + 12345) % 2147483648;
    return seed / 2147483648 - 0.5;
  };
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      let radiance = spec.ambient ?? 0.02;
      if ((x - 80) ** 2 + (y - 60) ** 2 <= 28 * 28) radiance += spec.beam;
      if (x >= CARD_ROI.x && x < CARD_ROI.x + CARD_ROI.w && y >= CARD_ROI.y && y < CARD_ROI.y + CARD_ROI.h) radiance = spec.card ?? 0.18;
      out[y * width + x] = radiance * (spec.exposure ?? 1) + (spec.black ?? 0) + (spec.noise ?? 0) * rand();
    }
  }
  return out;
}

export function encodeSrgb8(linear: Float64Array): Buffer {
  const buf = Buffer.alloc(linear.length * 3);
  for (let i = 0; i < linear.length; i++) {
    const code = Math.round(255 * srgbEncode(linear[i]!));
    buf[3 * i] = code;
    buf[3 * i + 1] = code;
    buf[3 * i + 2] = code;
  }
  return buf;
}

export interface ExifSpec {
  exposureTime?: string; // e.g. "1/100"
  iso?: string;
  fNumber?: string;
  dateTimeOriginal?: string; // "YYYY:MM:DD HH:MM:SS"
  subSecTimeOriginal?: string;
}

export async function writeJpeg(path: string, spec: SceneSpec, exif?: ExifSpec): Promise<void> {
  const width = spec.width ?? W, height = spec.height ?? H;
  let img = sharp(encodeSrgb8(renderLinear(spec)), { raw: { width, height, channels: 3 } }).jpeg({ quality: 95, chromaSubsampling: '4:4:4' });
  if (exif) {
    const ifd2: Record<string, string> = {};
    if (exif.exposureTime) ifd2.ExposureTime = exif.exposureTime;
    if (exif.iso) ifd2.ISOSpeedRatings = exif.iso;
    if (exif.fNumber) ifd2.FNumber = exif.fNumber;
    if (exif.dateTimeOriginal) ifd2.DateTimeOriginal = exif.dateTimeOriginal;
    if (exif.subSecTimeOriginal) ifd2.SubSecTimeOriginal = exif.subSecTimeOriginal;
    img = img.withExif({ IFD0: { Make: 'kerrtrace-test' }, IFD2: ifd2 });
  }
  await img.toFile(path);
}

export async function writePng8(path: string, spec: SceneSpec): Promise<void> {
  const width = spec.width ?? W, height = spec.height ?? H;
  await sharp(encodeSrgb8(renderLinear(spec)), { raw: { width, height, channels: 3 } }).png().toFile(path);
}

/** 16-bit RGB TIFF (deflate, so it stays 16-bit) holding the given codes, or 16-bit PNG. */
export async function write16(path: string, codes: Uint16Array, width: number, height: number, format: 'tiff' | 'png'): Promise<void> {
  const img = sharp(codes, { raw: { width, height, channels: 3 } }).toColourspace('rgb16');
  await (format === 'tiff' ? img.tiff({ compression: 'deflate' }) : img.png()).toFile(path);
}

export function tempFolder(): { dir: string; cleanup: () => void } {
  const dir = mkdtempSync(join(tmpdir(), 'kerrtrace-stills-'));
  return { dir, cleanup: () => rmSync(dir, { recursive: true, force: true }) };
}
