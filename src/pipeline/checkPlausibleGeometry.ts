/**
 * Refuses cell dimensions no liquid Kerr cell has, before any decoding: a length or gap typed in
 * the wrong unit (metres or micrometres for millimetres) would otherwise give a Kerr constant
 * wrong by many orders of magnitude with a tight error bar. Accepted: length 1 mm to 2 m, gap
 * 0.05 mm to 100 mm (this tool's bounds; bench cells are centimetres long with millimetre gaps).
 * Throws KerrError BAD_ARGUMENT naming the option.
 * @example checkPlausibleGeometry(40, 4) // passes; checkPlausibleGeometry(1e9, 4) throws
 */
import { invalid } from '../errors.js';

export function checkPlausibleGeometry(lengthMm: number, gapMm: number): void {
  if (!(lengthMm >= 1 && lengthMm <= 2000)) throw invalid('an electrode length from 1 to 2000 mm', '--length-mm', lengthMm, 'Give the length in millimetres');
  if (!(gapMm >= 0.05 && gapMm <= 100)) throw invalid('an electrode gap from 0.05 to 100 mm', '--gap-mm', gapMm, 'Give the gap in millimetres');
}
