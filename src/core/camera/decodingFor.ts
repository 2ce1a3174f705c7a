/**
 * Chooses how to decode a video's code values to linear light from its stream metadata, with
 * the user's overrides taking precedence. Every guess made for missing metadata comes back as a
 * note (a warning to show the user), never silently; a tag that names an encoding we cannot
 * decode faithfully is refused (KerrError UNSUPPORTED_ENCODING), never decoded as something else.
 *
 * Rules (ffprobe's names on the left):
 * - transfer (color_transfer): iec61966-2-1 → srgb; bt709, smpte170m, bt470bg (as ffprobe
 *   tags BT.601), bt2020-10, bt2020-12 (the BT.709 curve, ITU-R BT.2020 Table 4), bt1361e and
 *   iec61966-2-4 (the BT.709 curve in the positive range) → bt709; arib-std-b67 → hlg (ITU-R
 *   BT.2100 HLG); smpte2084 → pq (SMPTE ST 2084); linear → linear; gamma22 → gamma:2.2;
 *   gamma28 → gamma:2.8; unknown (untagged) → srgb with a note (phones and webcams encode
 *   sRGB-like curves; common practice); any other tag (log, log_sqrt, smpte240m, smpte428...)
 *   → refused unless the user gives a transfer or a measured response. PQ comes with a note: its
 *   peak (10000 cd/m²) lies far above a camera's full scale, so the clip code cannot flag clipping.
 * - matrix (color_space): bt709 → bt709; smpte170m, bt470bg, fcc → bt601; bt2020nc → bt2020
 *   (non-constant luminance, Kr = 0.2627, Kb = 0.0593); unknown → bt709 for frames 720 lines or
 *   taller, bt601 below (common practice for HD versus SD), with a note; others (bt2020c constant
 *   luminance, ycgco, gbr, smpte240m, ictcp) → refused.
 * - range (color_range, or a yuvj pixel format): limited or full; unknown → limited with a note.
 * - clipCode: 250 unless overridden (8-bit code at or above which a channel counts as clipped).
 *
 * Pure: reads only the metadata passed in.
 * @throws KerrError UNSUPPORTED_ENCODING for a tagged transfer or matrix outside the lists above.
 * @example decodingFor({ colourTransfer: 'arib-std-b67', colourMatrix: 'bt2020nc', colourRange: 'limited', height: 1080 })
 *   // { range: 'limited', matrix: 'bt2020', transfer: 'hlg', clipCode: 250, notes: [] }
 */
import { KerrError } from '../../errors.js';
import type { CameraDecoding, DecodingMetadata, TransferName, YuvMatrix } from './decodingTypes.js';

export const DEFAULT_CLIP_CODE = 250;

/** The decoding itself plus the reasons for any guess (usable wherever a CameraDecoding is). */
export interface DecodingChoice extends CameraDecoding {
  /** One sentence per guess worth telling the user about. */
  notes: string[];
}


const TRANSFER_FROM_TAG: Record<string, TransferName> = {
  'iec61966-2-1': 'srgb',
  bt709: 'bt709',
  smpte170m: 'bt709',
  bt470bg: 'bt709',
  'bt2020-10': 'bt709',
  'bt2020-12': 'bt709',
  bt1361e: 'bt709',
  'iec61966-2-4': 'bt709',
  'arib-std-b67': 'hlg',
  smpte2084: 'pq',
  linear: 'linear',
  gamma22: 'gamma:2.2',
  gamma28: 'gamma:2.8',
};

const MATRIX_FROM_TAG: Record<string, YuvMatrix> = {
  bt709: 'bt709',
  smpte170m: 'bt601',
  bt470bg: 'bt601',
  fcc: 'bt601',
  bt2020nc: 'bt2020',
};

/** Tags that mean "not said" rather than "something else". */
const UNTAGGED = new Set(['unknown', 'unspecified', 'reserved', '']);

/**
 * How the caller names the two ways past a refused encoding in notes and hints (plain words by
 * default; the refusal also lists them as inputs `transfer` and `cameraProfile`).
 */
export interface DecodingEscapes {
  /** Default "the transfer curve". */
  transferOption?: string;
  /** Default "a camera profile". */
  profileOption?: string;
}

export function decodingFor(info: DecodingMetadata, overrides: Partial<CameraDecoding> = {}, escapes: DecodingEscapes = {}): DecodingChoice {
  const notes: string[] = [];
  const transferOption = escapes.transferOption ?? 'the transfer curve';
  const profileOption = escapes.profileOption ?? 'a camera profile';

  let transfer: TransferName;
  if (overrides.transfer !== undefined) {
    transfer = overrides.transfer;
  } else {
    const tagged = TRANSFER_FROM_TAG[info.colourTransfer];
    if (tagged !== undefined) {
      transfer = tagged;
    } else if (UNTAGGED.has(info.colourTransfer)) {
      transfer = 'srgb';
      notes.push(`the video does not say its transfer function (color_transfer ${info.colourTransfer}); assuming srgb. Give ${transferOption} if your camera uses another curve`);
    } else if (overrides.response !== undefined) {
      transfer = 'linear'; // the measured response replaces the curve; the tag is only recorded
      notes.push(`the video's transfer (color_transfer ${info.colourTransfer}) is not one kerrtrace decodes; the measured camera response is used instead`);
    } else {
      throw new KerrError('UNSUPPORTED_ENCODING', `the video's transfer function (color_transfer ${info.colourTransfer}) is not one kerrtrace can decode`, {
        hint: `Record with HDR and log modes off (see docs/camera-response.md), or give ${profileOption} from a calibration recording, or ${transferOption} if you know it`,
        inputs: ['cameraProfile', 'transfer'],
        details: { colourTransfer: info.colourTransfer },
      });
    }
  }

  let matrix: YuvMatrix;
  if (overrides.matrix !== undefined) {
    matrix = overrides.matrix;
  } else {
    const tagged = MATRIX_FROM_TAG[info.colourMatrix];
    if (tagged !== undefined) {
      matrix = tagged;
    } else if (UNTAGGED.has(info.colourMatrix)) {
      matrix = info.height >= 720 ? 'bt709' : 'bt601';
      notes.push(`the video does not say its colour matrix (color_space ${info.colourMatrix}); assuming ${matrix} for a ${info.height}-line frame`);
    } else {
      throw new KerrError('UNSUPPORTED_ENCODING', `the video's colour matrix (color_space ${info.colourMatrix}) is not one kerrtrace can decode`, {
        hint: 'Record in the camera\'s standard video mode (BT.709, BT.601 or BT.2020 non-constant luminance), or convert the clip with ffmpeg first',
        details: { colourMatrix: info.colourMatrix },
      });
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
  if (transfer === 'pq' && overrides.response === undefined) {
    notes.push('the video uses PQ (SMPTE ST 2084), display light: the camera\'s full scale usually sits well below the PQ peak, so clipped highlights cannot be recognised from the code values; keep the spot well below clipping');
  }
  const choice: DecodingChoice = { range, matrix, transfer, clipCode, notes };
  if (overrides.response !== undefined) choice.response = overrides.response;
  return choice;
}
