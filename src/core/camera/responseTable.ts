/**
 * A measured camera response as a monotone table from R'G'B' code value (0..255 scale, after range
 * expansion and matrix, as the region meter reports codes) to relative linear light, and its
 * look-up table in the layout of `transferLut` so it can stand in for a transfer curve.
 *
 * Between entries the response is linear in the code; beyond the first and last entries it is
 * extended along the end segments (a profile measured over codes 20..240 still decodes 10 or 250,
 * with the extrapolation named in the run's warnings by the caller). Only affine properties of
 * the light matter to the Kerr fit (the surround is subtracted and the amplitude fitted), so the
 * table's scale and offset are free; by convention profiles store 0 at their lowest code and 1 at
 * their highest.
 *
 * Pure. @throws KerrError BAD_PROFILE when the table has fewer than 3 entries, codes that do not
 * increase, light that decreases, or non-finite numbers.
 * @example responseAt({ code: [0, 128, 255], linear: [0, 0.2, 1] }, 64) // 0.1
 */
import { KerrError } from '../../errors.js';
import type { ResponseTable } from './decodingTypes.js';

/** Checks a table's shape; returns it. */
export function checkResponseTable(table: ResponseTable, where = 'the camera profile'): ResponseTable {
  const { code, linear } = table;
  const bad = (why: string): KerrError => new KerrError('BAD_PROFILE', `${where} has an unusable response table: ${why}`, {
    hint: 'Make the profile again with `kerrtrace calibrate-camera`',
  });
  if (!Array.isArray(code) || !Array.isArray(linear) || code.length !== linear.length) throw bad('code and linear lists of the same length are needed');
  if (code.length < 3) throw bad(`only ${code.length} entries`);
  for (let k = 0; k < code.length; k++) {
    if (!Number.isFinite(code[k]) || !Number.isFinite(linear[k])) throw bad(`entry ${k + 1} is not a number`);
    if (k > 0 && !(code[k]! > code[k - 1]!)) throw bad(`codes must increase (entry ${k + 1})`);
    if (k > 0 && linear[k]! < linear[k - 1]!) throw bad(`light must not decrease as the code grows (entry ${k + 1})`);
  }
  if (!(linear[linear.length - 1]! > linear[0]!)) throw bad('the light does not change over the table');
  return table;
}

/** Relative linear light at a (fractional) code value: linear in between, extended beyond the ends. */
export function responseAt(table: ResponseTable, codeValue: number): number {
  const { code, linear } = table;
  const n = code.length;
  let k: number;
  if (codeValue <= code[0]!) k = 0;
  else if (codeValue >= code[n - 1]!) k = n - 2;
  else {
    let lo = 0, hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (code[mid]! <= codeValue) lo = mid; else hi = mid;
    }
    k = lo;
  }
  const slope = (linear[k + 1]! - linear[k]!) / (code[k + 1]! - code[k]!);
  return linear[k]! + slope * (codeValue - code[k]!);
}

/** Table in the layout of transferLut(·, perCode): entry j is the response at code j/perCode, plus a guard entry. */
export function responseLut(table: ResponseTable, perCode = 1): Float64Array {
  const top = 255 * perCode;
  const lut = new Float64Array(top + 2);
  for (let j = 0; j <= top; j++) lut[j] = responseAt(table, j / perCode);
  lut[top + 1] = lut[top]!;
  return lut;
}
