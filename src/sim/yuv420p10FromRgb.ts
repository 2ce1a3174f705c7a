/**
 * 10-bit R'G'B' code values (0..1023, interleaved, row-major) → planar Y'CbCr 4:2:0 in 10-bit
 * limited range with the BT.2020 non-constant-luminance matrix, as the simulator's HDR clips are
 * handed to the encoder (ffmpeg's own converter is bypassed so the numbers are ours):
 *   Y′ = 0.2627R′ + 0.6780G′ + 0.0593B′, Cb = (B′ − Y′)/1.8814, Cr = (R′ − Y′)/1.4746
 *   (ITU-R BT.2020-2 Table 4); Y = round(64 + 876·Y′), C = round(512 + 896·C) (Table 5).
 * Chroma is the mean of each 2×2 block's Cb and Cr (frame sides must be even).
 * Output: width·height luma samples, then Cb and Cr planes of (width/2)·(height/2) each.
 * Pure; throws nothing (the caller checks the sizes).
 * @example yuv420p10FromRgb(Uint16Array.of(1023, 1023, 1023, ...), 2, 2, out) // Y 940, Cb = Cr = 512
 */
const KR = 0.2627;
const KB = 0.0593;
const KG = 1 - KR - KB;

export function yuv420p10FromRgb(rgb: Uint16Array, width: number, height: number, out: Uint16Array): void {
  const cw = width >> 1;
  const uBase = width * height;
  const vBase = uBase + cw * (height >> 1);
  const clamp = (v: number): number => (v < 0 ? 0 : v > 1023 ? 1023 : v);
  for (let cy = 0; cy < height >> 1; cy++) {
    for (let cx = 0; cx < cw; cx++) {
      let cbSum = 0, crSum = 0;
      for (let dy = 0; dy < 2; dy++) {
        for (let dx = 0; dx < 2; dx++) {
          const x = 2 * cx + dx, y = 2 * cy + dy;
          const j = (y * width + x) * 3;
          const r = rgb[j]! / 1023, g = rgb[j + 1]! / 1023, b = rgb[j + 2]! / 1023;
          const luma = KR * r + KG * g + KB * b;
          out[y * width + x] = clamp(Math.round(64 + 876 * luma));
          cbSum += (b - luma) / (2 * (1 - KB));
          crSum += (r - luma) / (2 * (1 - KR));
        }
      }
      out[uBase + cy * cw + cx] = clamp(Math.round(512 + 896 * cbSum / 4));
      out[vBase + cy * cw + cx] = clamp(Math.round(512 + 896 * crSum / 4));
    }
  }
}
