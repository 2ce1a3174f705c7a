/**
 * Read a voltage-log file from disk and parse it with `parseVoltageLog` (the accepted CSV format is
 * described there and in docs/voltage-log.md).
 *
 * Text decoding: a UTF-8 byte-order mark is skipped; a UTF-16 byte-order mark (spreadsheet
 * "Unicode text" exports) selects UTF-16; bytes that are not valid UTF-8 are read as Latin-1
 * (older Windows loggers write "°C" that way), with a warning.
 *
 * Throws KerrError FILE_NOT_FOUND (with a hint) when the path does not exist, BAD_ARGUMENT when it
 * is a folder, and whatever `parseVoltageLog` throws (BAD_CSV) for bad content.
 *
 * @example const log = await readVoltageLog('run1/volts.csv'); log.voltageV[0] // V
 */
import { readFile, stat } from 'node:fs/promises';
import { KerrError } from '../errors.js';
import { parseVoltageLog, type VoltageLog } from './voltageLog.js';
import { missingPathText } from './missingPathText.js';

export async function readVoltageLog(path: string): Promise<VoltageLog> {
  let bytes: Buffer;
  try {
    const info = await stat(path);
    if (info.isDirectory()) {
      throw new KerrError('BAD_ARGUMENT', `expected a voltage-log CSV file but ${path} is a folder`, {
        path,
        hint: 'give the CSV file inside it, e.g. volts.csv',
      });
    }
    bytes = await readFile(path);
  } catch (err) {
    if (err instanceof KerrError) throw err;
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'ENOENT' || code === 'ENOTDIR' || code === 'ELOOP') {
      throw new KerrError('FILE_NOT_FOUND', missingPathText(path, `voltage log ${path} not found`), {
        path,
        hint: 'check the path; export the supply log as CSV with a header such as time_s,voltage_kV',
      });
    }
    throw new KerrError('FILE_NOT_FOUND', `cannot read voltage log ${path} (${code ?? String(err)})`, {
      path,
      hint: 'check that the file exists and that you may read it',
    });
  }
  const { text, warning } = decodeText(bytes);
  const log = parseVoltageLog(text, path);
  if (warning !== null) log.warnings.unshift(`${path}: ${warning}`);
  return log;
}

function decodeText(bytes: Buffer): { text: string; warning: string | null } {
  if (bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) {
    return { text: new TextDecoder('utf-8').decode(bytes.subarray(3)), warning: null };
  }
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe) {
    return { text: new TextDecoder('utf-16le').decode(bytes.subarray(2)), warning: null };
  }
  if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) {
    return { text: new TextDecoder('utf-16be').decode(bytes.subarray(2)), warning: null };
  }
  try {
    return { text: new TextDecoder('utf-8', { fatal: true }).decode(bytes), warning: null };
  } catch {
    return { text: new TextDecoder('latin1').decode(bytes), warning: 'not valid UTF-8; read as Latin-1' };
  }
}
