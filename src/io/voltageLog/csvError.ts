/**
 * The voltage log's one error shape: KerrError BAD_CSV whose message starts with
 * "FILE line N" or "FILE line N, column C" (1-based, every physical line counted) and whose path is
 * "FILE:N" or "FILE:N:C", with a hint saying what to do.
 * @example csvError({ file: 'log.csv', line: 4 }, 2, '"x" in the voltage column is not a number', 'correct the cell')
 *   → KerrError('BAD_CSV', 'log.csv line 4, column 2: "x" in the voltage column is not a number')
 */
import { KerrError } from '../../errors.js';

export interface Located {
  file: string;
  line: number;
}

export function csvError(at: Located, column: number | null, message: string, hint: string): KerrError {
  const where = column === null ? `${at.file} line ${at.line}` : `${at.file} line ${at.line}, column ${column}`;
  const path = column === null ? `${at.file}:${at.line}` : `${at.file}:${at.line}:${column}`;
  return new KerrError('BAD_CSV', `${where}: ${message}`, { path, hint });
}
