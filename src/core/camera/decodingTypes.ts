/**
 * The words of camera decoding: how code values become linear light (range expansion, YUV
 * matrix, transfer inversion or a measured response table). Pure types, owned by the core;
 * `src/media/types.ts` re-exports them for the edges.
 *
 * Sources: ITU-R BT.709 / BT.601 / BT.2020 (matrices, limited range 16–235), IEC 61966-2-1
 * (sRGB), ITU-R BT.2100 (HLG, PQ); see `transfer.ts` and `yuvToLinear.ts` for the formulas.
 */

/** A transfer curve the decoder inverts; `gamma:2.2` is a plain power law with that exponent. */
export type TransferName = 'srgb' | 'bt709' | 'linear' | 'hlg' | 'pq' | `gamma:${number}`;
/** Code range: limited (Y 16–235, C 16–240 at 8 bit) or full (0–255). */
export type ColourRange = 'limited' | 'full';
/** The YUV → R'G'B' matrix (Kr, Kb of BT.709, BT.601 or BT.2020 non-constant luminance). */
export type YuvMatrix = 'bt709' | 'bt601' | 'bt2020';

/**
 * A camera response as a monotone table: R'G'B' code value (0..255 scale, after range expansion and
 * matrix) → relative linear light. Linear between entries, extended linearly beyond the ends.
 */
export interface ResponseTable {
  code: number[];
  linear: number[];
}

/** How code values become linear light: range expansion, YUV matrix, transfer inversion. */
export interface CameraDecoding {
  range: ColourRange;
  matrix: YuvMatrix;
  transfer: TransferName;
  /** A code value (0-255, after range expansion, any R/G/B channel) at or above this counts as clipped. */
  clipCode: number;
  /**
   * A measured camera response (from a camera profile, see src/core/camera/responseTable.ts): when
   * present it replaces the transfer curve; `transfer` then only records what the tags said.
   */
  response?: ResponseTable;
}

/**
 * The stream tags decoding is chosen from (ffprobe's names: color_transfer, color_space,
 * color_range; `height` in displayed pixels picks the HD or SD matrix when untagged).
 * A probed video description satisfies it as is.
 */
export interface DecodingMetadata {
  colourTransfer: string;
  colourMatrix: string;
  colourRange: ColourRange | 'unknown';
  height: number;
}
