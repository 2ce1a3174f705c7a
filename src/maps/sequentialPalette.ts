/**
 * The sequential palette of the scatter maps ("dusk-to-straw", designed for this project): a
 * straight ramp in OKLab lightness from L = 0.20 (deep blue-violet) to L = 0.96 (pale straw),
 * with the hue turning from 280° through crimson and amber to 95°, and a chroma arch that is
 * zero-free but small at both ends (so the darkest and lightest entries stay in gamut and print
 * as near-greys). Because lightness alone is monotonic, the map reads correctly in greyscale
 * print and for every common form of colour-vision deficiency (which change hue perception, not
 * lightness).
 *
 * Colour science: OKLab → linear sRGB by B. Ottosson, "A perceptual color space for image
 * processing" (2020); linear → sRGB code values by IEC 61966-2-1. Colours outside the sRGB gamut
 * lose chroma (bisection on C at fixed L and hue), never lightness.
 *
 * `paletteLut()` returns 256 RGB triplets (Uint8Array of 768), index 0 = lowest value.
 * Pure; throws nothing.
 * @example paletteColour(0) → [29, 16, 57]-ish (dark blue-violet); paletteColour(1) → pale straw
 */

function oklabToLinearSrgb(l: number, a: number, b: number): [number, number, number] {
  const l1 = l + 0.3963377774 * a + 0.2158037573 * b;
  const m1 = l - 0.1055613458 * a - 0.0638541728 * b;
  const s1 = l - 0.0894841775 * a - 1.291485548 * b;
  const l3 = l1 * l1 * l1;
  const m3 = m1 * m1 * m1;
  const s3 = s1 * s1 * s1;
  return [
    4.0767416621 * l3 - 3.3077115913 * m3 + 0.2309699292 * s3,
    -1.2684380046 * l3 + 2.6097574011 * m3 - 0.3413193965 * s3,
    -0.0041960863 * l3 - 0.7034186147 * m3 + 1.707614701 * s3,
  ];
}

function encodeSrgb(linear: number): number {
  const c = Math.min(1, Math.max(0, linear));
  const v = c <= 0.0031308 ? 12.92 * c : 1.055 * Math.pow(c, 1 / 2.4) - 0.055;
  return Math.round(v * 255);
}

function inGamut(rgb: [number, number, number]): boolean {
  return rgb.every((c) => c >= -1e-6 && c <= 1 + 1e-6);
}

/** Palette colour at t ∈ [0, 1] (clamped), as sRGB code values 0–255. */
export function paletteColour(t: number): [number, number, number] {
  const u = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0));
  const lightness = 0.2 + 0.76 * u;
  const hueRad = ((280 + 175 * u) * Math.PI) / 180;
  const wantedChroma = 0.035 + 0.13 * Math.sin(Math.PI * u) ** 0.9;
  let chroma = wantedChroma;
  let rgb = oklabToLinearSrgb(lightness, chroma * Math.cos(hueRad), chroma * Math.sin(hueRad));
  if (!inGamut(rgb)) {
    let lo = 0;
    let hi = wantedChroma;
    for (let k = 0; k < 30; k++) {
      const mid = (lo + hi) / 2;
      if (inGamut(oklabToLinearSrgb(lightness, mid * Math.cos(hueRad), mid * Math.sin(hueRad)))) lo = mid;
      else hi = mid;
    }
    chroma = lo;
    rgb = oklabToLinearSrgb(lightness, chroma * Math.cos(hueRad), chroma * Math.sin(hueRad));
  }
  return [encodeSrgb(rgb[0]), encodeSrgb(rgb[1]), encodeSrgb(rgb[2])];
}

let cached: Uint8Array | null = null;

/** 256 palette entries, RGB interleaved. */
export function paletteLut(): Uint8Array {
  if (cached) return cached;
  const lut = new Uint8Array(256 * 3);
  for (let i = 0; i < 256; i++) {
    const [r, g, b] = paletteColour(i / 255);
    lut[3 * i] = r;
    lut[3 * i + 1] = g;
    lut[3 * i + 2] = b;
  }
  cached = lut;
  return lut;
}
