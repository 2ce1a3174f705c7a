/**
 * Chooses how to decode a video's code values to linear light from its stream metadata, with
 * the user's overrides taking precedence. Every guess made for missing or unsupported metadata
 * comes back as a note (a warning to show the user), never silently.
 *
 * Rules (ffprobe's names on the left):
 * - transfer (color_transfer): iec61966-2-1 → srgb; bt709, smpte170m, bt470bg (as ffprobe
 *   tags BT.601), bt2020-10, bt2020-12 → bt709 (the same curve, ITU-R BT.2020 Table 4);
 *   linear → linear; gamma22 → gamma:2.2; gamma28 → gamma:2.8; anything else or unknown → srgb
 *   with a note (phones and webcams encode sRGB-like curves; common practice).
 * - matrix (color_space): bt709 → bt709; smpte170m, bt470bg, fcc → bt601; unknown → bt709 for
 *   frames 720 lines or taller, bt601 below (common practice for HD versus SD), with a note.
 * - range (color_range, or a yuvj pixel format): limited or full; unknown → limited with a note.
 * - clipCode: 250 unless overridden (8-bit code at or above which a channel counts as clipped).
 *
 * Pure: reads only the metadata passed in.
 * @throws nothing; overrides are assumed already validated (see parseTransfer).
 * @example decodingFor({ colourTransfer: 'bt709', colourMatrix: 'bt709', colourRange: 'limited', height: 1080 })
 *   // { range: 'limited', matrix: 'bt709', transfer: 'bt709', clipCode: 250, notes: [] }
 */
import type { CameraDecoding, TransferName, VideoInfo, YuvMatrix } from '../../media/types.js';

export const DEFAULT_CLIP_CODE = 250;

/** The decoding itself plus the reasons for any guess (usable wherever a CameraDecoding is). */
export interface DecodingChoice extends CameraDecoding {
  /** One sentence per guess worth telling the user about. */
  notes: string[];
}

export type DecodingMetadata = Pick<VideoInfo, 'colourTransfer' | 'colourMatrix' | 'colourRange' | 'height'>;

const TRANSFER_FROM_TAG: Record<string, TransferName> = {
  'iec61966-2-1': 'srgb',
  bt709: 'bt709',
  smpte170m: 'bt709',
  bt470bg: 'bt709',
  'bt2020-10': 'bt709',
  'bt2020-12': 'bt709',
  linear: 'linear',
  gamma22: 'gamma:2.2',
  gamma28: 'gamma:2.8',
};

const MATRIX_FROM_TAG: Record<string, YuvMatrix> = {
  bt709: 'bt709',
  smpte170m: 'bt601',
  bt470bg: 'bt601',
  fcc: 'bt601',
};

const HDR_TRANSFERS = new Set(['smpte2084', 'arib-std-b67']);

export function decodingFor(info: DecodingMetadata, overrides: Partial<CameraDecoding> = {}): DecodingChoice {
  const notes: string[] = [];

  let transfer: TransferName;
  if (overrides.transfer !== undefined) {
    transfer = overrides.transfer;
  } else {
    const tagged = TRANSFER_FROM_TAG[info.colourTransfer];
    if (tagged !== undefined) {
      transfer = tagged;
    } else {
      transfer = 'srgb';
      notes.push(HDR_TRANSFERS.has(info.colourTransfer)
        ? `the video uses an HDR transfer (${info.colourTransfer}) that is not supported; decoding as srgb. Record in SDR, or pass --transfer`
        : `the video does not say its transfer function (color_transfer ${info.colourTransfer}); assuming srgb. Pass --transfer if your camera uses another curve`);
    }
  }

  let matrix: YuvMatrix;
  if (overrides.matrix !== undefined) {
    matrix = overrides.matrix;
  } else {
    const tagged = MATRIX_FROM_TAG[info.colourMatrix];
    if (tagged !== undefined) {
      matrix = tagged;
    } else {
      matrix = info.height >= 720 ? 'bt709' : 'bt601';
      notes.push(`the video does not say its colour matrix (color_space ${info.colourMatrix}); assuming ${matrix} for a ${info.height}-line frame`);
    }
  }

  let range: CameraDecoding['range'];
  if (overrides.range !== undefined) {
    range = overrides.range;
  } else if (info.colourRange === 'unknown') {
    range = 'limited';
    notes.push('the video does not say its colour range; assuming limited (16-235), the usual for video');
  } else {
    range = info.colourRange;
  }

  const clipCode = overrides.clipCode ?? DEFAULT_CLIP_CODE;
  return { range, matrix, transfer, clipCode, notes };
}
