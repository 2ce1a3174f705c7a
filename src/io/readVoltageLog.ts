/**
 * Read a voltage-log file from disk and parse it with `parseVoltageLog` (the accepted CSV format is
 * described there and in docs/voltage-log.md).
 *
 * Text decoding: a UTF-8 byte-order mark is skipped; a UTF-16 byte-order mark (spreadsheet
 * "Unicode text" exports) selects UTF-16; bytes that are not valid UTF-8 are read as Latin-1
 * (older Windows loggers write "°C" that way), with a warning.
 *
 * Throws KerrError FILE_NOT_FOUND (with a hint) when the path does not exist, BAD_ARGUMENT when it
 * is a folder, BAD_CSV when the file is binary (NUL bytes or more than 5 % control codes, checked
 * before parsing so the message names no escaped junk), and whatever `parseVoltageLog` throws
 * (BAD_CSV) for bad content.
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
  const binary = binaryContent(bytes);
  if (binary !== null) {
    throw new KerrError('BAD_CSV', `${path} is not a text CSV file: ${binary}`, {
      path,
      hint: 'give the log exported as CSV text, with a header such as time_s,voltage_kV',
    });
  }
  const { text, warning } = decodeText(bytes);
  const log = parseVoltageLog(text, path);
  if (warning !== null) log.warnings.unshift(`${path}: ${warning}`);
  return log;
}

/** Largest share of control bytes (other than tab, CR, LF, FF) a text file may hold. */
const MAX_CONTROL_SHARE = 0.05;

/**
 * Why the bytes look binary, or null for text: a NUL byte, or more than MAX_CONTROL_SHARE of the
 * first 64 KiB being control codes. UTF-16 with a byte-order mark (NULs between ASCII letters) is
 * text.
 */
function binaryContent(bytes: Buffer): string | null {
  if (bytes.length >= 2 && ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff))) return null;
  const head = bytes.subarray(0, 65536);
  let nul = 0;
  let control = 0;
  for (const b of head) {
    if (b === 0) nul++;
    if ((b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d && b !== 0x0c) || b === 0x7f) control++;
  }
  if (nul > 0) return `it holds NUL bytes (${nul} in the first ${head.length}), so it is binary (a spreadsheet, archive or logger file?)`;
  if (control > MAX_CONTROL_SHARE * head.length) return `${Math.round((100 * control) / head.length)} % of its first ${head.length} bytes are control codes, so it is binary (a spreadsheet, archive or logger file?)`;
  return null;
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
