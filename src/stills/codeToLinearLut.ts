/**
 * Table from image code value to linear light (0..1, 1 = full-scale white) for 8-bit (256 codes)
 * or 16-bit (65536 codes) images: entry k = toLinear(transfer, k/maxCode), with the transfer
 * curves of src/core/camera/transfer.ts (sRGB per IEC 61966-2-1, BT.709 inverse OETF, power law,
 * linear). One table per transfer and depth, so decoding a photo is one look-up per sample.
 * Memory: 65536 × 8 bytes = 512 KiB for 16-bit. Pure.
 * @example codeToLinearLut('srgb', 255)[128] // 0.215861 (IEC 61966-2-1 check value)
 */
import { responseAt } from '../core/camera/responseTable.js';
import { toLinear } from '../core/camera/transfer.js';
import type { ResponseTable, TransferName } from '../media/types.js';

/** With `response` (a measured camera profile), entry k is the profile's light at code 255·k/maxCode instead. */
export function codeToLinearLut(transfer: TransferName, maxCode: 255 | 65535, response?: ResponseTable): Float64Array {
  const lut = new Float64Array(maxCode + 1);
  for (let code = 0; code <= maxCode; code++) lut[code] = response ? responseAt(response, (255 * code) / maxCode) : toLinear(transfer, code / maxCode);
  return lut;
}
