/**
 * Reads the voltage a photo was taken at from its file name, so a folder of stills needs no
 * separate mapping file. Accepted: a number directly followed by a unit, anywhere in the name
 * (extension ignored, case ignored):
 * - unit `V`, `kV`, `volt(s)` or `kilovolt(s)`, with or without one space before it;
 * - decimal point or decimal comma (`12.5kV`, `3,2kV`); no thousands separators;
 * - the number must not continue a longer number and the unit must not run on into letters or
 *   digits (so `4V5` and `5Vx` are not read; `step07_12.5kV` reads 12.5 kV, not 07).
 * Examples: `step07_12.5kV.jpg` → 12500 V, `0450V.png` → 450 V, `3,2kV.tif` → 3200 V,
 * `IMG_0001 8 kV.jpeg` → 8000 V. Polarity is not read (the Kerr effect depends on V²).
 * Returns null when the name holds no voltage. Pure.
 * @throws KerrError BAD_ARGUMENT when the name holds two different voltages (ambiguous).
 * @example voltageFromFileName('step07_12.5kV.jpg') // 12500
 */
import { KerrError } from '../errors.js';

const VOLTAGE_IN_NAME = /(?<![\d.,])(\d+(?:[.,]\d+)?) ?(kilovolts?|kv|volts?|v)(?![\p{L}\d])/giu;

/** The name without its last extension. */
function stem(fileName: string): string {
  const base = fileName.split(/[\\/]/).pop() ?? fileName;
  const dot = base.lastIndexOf('.');
  return dot > 0 ? base.slice(0, dot) : base;
}

export function voltageFromFileName(fileName: string): number | null {
  const found: number[] = [];
  for (const m of stem(fileName).matchAll(VOLTAGE_IN_NAME)) {
    const value = Number(m[1]!.replace(',', '.'));
    const unit = m[2]!.toLowerCase();
    const scale = unit.startsWith('k') ? 1000 : 1;
    const volts = Math.round(value * scale * 1e9) / 1e9; // 12.5 * 1000 without binary noise
    if (!found.includes(volts)) found.push(volts);
  }
  if (found.length === 0) return null;
  if (found.length > 1) {
    throw new KerrError('BAD_ARGUMENT', `the file name ${fileName} holds more than one voltage (${found.map((v) => `${v} V`).join(', ')})`, {
      path: fileName,
      hint: 'Rename the photo so it holds one voltage, or give the voltages in a CSV with --volts',
    });
  }
  return found[0]!;
}
