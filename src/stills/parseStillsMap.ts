/**
 * Parses the CSV that maps each photo to the voltage it was taken at (`kerrtrace stills --volts`).
 * Pure: text in, map out.
 *
 * Format (docs/stills.md): a header line, then one row per photo. Delimiter comma, semicolon or
 * tab (detected from the header); decimal comma allowed when the delimiter is not a comma; LF or
 * CRLF; optional UTF-8 byte-order mark; fields may be quoted; blank lines are skipped. Columns,
 * names case-insensitive:
 * - the photo: `file`, `filename`, `file_name`, `photo` or `image`;
 * - the voltage: `voltage`, `v`, `volts`, `hv` or `u`, unit from a suffix or bracket as in the
 *   voltage log (`_V`, `_kV`, `(kV)`, `[kV]`, `voltage kV`), volts by default;
 * - optionally `note`/`notes`/`comment` (ignored). Any other column is an error.
 * A file listed twice with the same voltage is accepted (and counted); with different voltages
 * it is an error.
 * @throws KerrError BAD_CSV naming the file, the line and the column: missing columns (listing
 *   those found and the accepted names), unknown column, empty file name, a voltage that is not a
 *   number, a file given two different voltages, no rows.
 * @example parseStillsMap('file,voltage_kV\na.jpg,1.5\n', 'volts.csv').voltageByFile.get('a.jpg') // { voltageV: 1500, line: 2 }
 */
import { KerrError } from '../errors.js';

export interface StillsMapEntry {
  voltageV: number;
  /** 1-based line number in the CSV. */
  line: number;
}

export interface StillsMap {
  /** File name as written in the CSV → voltage. */
  voltageByFile: Map<string, StillsMapEntry>;
  rows: number;
  /** Rows that repeated a file with the same voltage. */
  duplicates: number;
  columns: { file: string; voltage: string };
  voltageUnit: 'V' | 'kV';
  delimiter: ',' | ';' | '\t';
  decimalComma: boolean;
}

const FILE_NAMES = ['file', 'filename', 'file_name', 'photo', 'image'];
const IGNORED_NAMES = ['note', 'notes', 'comment', 'comments'];
const VOLTAGE_HEADER = /^(voltage|volts|v|hv|u)(?:\s*_\s*(kv|v)|\s+(kv|v)|\s*\(\s*(kv|v)\s*\)|\s*\[\s*(kv|v)\s*\])?$/i;
const ACCEPTED = 'file (or filename, photo, image) and voltage, v, volts, hv or u with an optional unit such as voltage_kV, U [kV], hv (V)';

/** Splits one CSV line, honouring double quotes ("" inside quotes is a quote). */
function splitLine(line: string, delimiter: string): string[] {
  const cells: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i]!;
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else cell += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === delimiter) {
      cells.push(cell);
      cell = '';
    } else cell += ch;
  }
  cells.push(cell);
  return cells.map((c) => c.trim());
}

function detectDelimiter(header: string): ',' | ';' | '\t' {
  const count = (ch: string): number => header.split(ch).length - 1;
  if (count('\t') > 0) return '\t';
  if (count(';') > 0) return ';';
  return ',';
}

export function parseStillsMap(text: string, fileName: string): StillsMap {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const lines = body.split(/\r?\n/);
  const headerIndex = lines.findIndex((l) => l.trim().length > 0);
  if (headerIndex < 0) {
    throw new KerrError('BAD_CSV', `${fileName} is empty`, { path: fileName, hint: `Write a header line with the columns ${ACCEPTED}, then one row per photo` });
  }
  const delimiter = detectDelimiter(lines[headerIndex]!);
  const decimalComma = delimiter !== ',';
  const header = splitLine(lines[headerIndex]!, delimiter);
  let fileCol = -1;
  let voltageCol = -1;
  let voltageUnit: 'V' | 'kV' = 'V';
  for (let col = 0; col < header.length; col++) {
    const name = header[col]!.trim();
    const lower = name.toLowerCase();
    const where = `${fileName}:${headerIndex + 1}:${col + 1}`;
    const volt = VOLTAGE_HEADER.exec(name);
    if (FILE_NAMES.includes(lower)) {
      if (fileCol >= 0) throw new KerrError('BAD_CSV', `${where}: a second file column "${name}"`, { path: where, hint: 'Keep one column of photo file names' });
      fileCol = col;
    } else if (volt) {
      if (voltageCol >= 0) throw new KerrError('BAD_CSV', `${where}: a second voltage column "${name}"`, { path: where, hint: 'Keep one voltage column' });
      voltageCol = col;
      const unit = (volt[2] ?? volt[3] ?? volt[4] ?? volt[5] ?? 'v').toLowerCase();
      voltageUnit = unit === 'kv' ? 'kV' : 'V';
    } else if (!IGNORED_NAMES.includes(lower)) {
      throw new KerrError('BAD_CSV', `${where}: unknown column "${name}"`, {
        path: where,
        hint: `Accepted columns: ${ACCEPTED}; a note column is allowed`,
      });
    }
  }
  if (fileCol < 0 || voltageCol < 0) {
    const missing = fileCol < 0 ? 'file' : 'voltage';
    throw new KerrError('BAD_CSV', `${fileName}:${headerIndex + 1}: no ${missing} column among the columns found (${header.map((h) => JSON.stringify(h)).join(', ')})`, {
      path: fileName,
      hint: `Accepted columns: ${ACCEPTED}`,
    });
  }

  const scale = voltageUnit === 'kV' ? 1000 : 1;
  const voltageByFile = new Map<string, StillsMapEntry>();
  let rows = 0;
  let duplicates = 0;
  for (let i = headerIndex + 1; i < lines.length; i++) {
    const line = lines[i]!;
    if (line.trim().length === 0) continue;
    const lineNo = i + 1;
    const cells = splitLine(line, delimiter);
    const file = cells[fileCol] ?? '';
    const voltText = cells[voltageCol] ?? '';
    if (file.length === 0) {
      throw new KerrError('BAD_CSV', `${fileName}:${lineNo}:${fileCol + 1}: empty file name`, { path: `${fileName}:${lineNo}:${fileCol + 1}`, hint: 'Every row needs the photo file name' });
    }
    const numberText = decimalComma ? voltText.replace(',', '.') : voltText;
    const value = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(numberText) ? Number(numberText) * scale : NaN;
    if (!Number.isFinite(value)) {
      const where = `${fileName}:${lineNo}:${voltageCol + 1}`;
      throw new KerrError('BAD_CSV', `${where}: the voltage ${JSON.stringify(voltText)} for ${file} is not a number`, {
        path: where,
        hint: decimalComma ? 'Write numbers like 12.5 or 12,5' : 'Write numbers like 12.5 (with a comma delimiter the decimal separator must be a dot)',
      });
    }
    rows++;
    const earlier = voltageByFile.get(file);
    if (earlier !== undefined) {
      if (earlier.voltageV === value) {
        duplicates++;
        continue;
      }
      throw new KerrError('BAD_CSV', `${fileName}:${lineNo}: ${file} is given two different voltages, ${earlier.voltageV} V (line ${earlier.line}) and ${value} V (line ${lineNo})`, {
        path: `${fileName}:${lineNo}`,
        hint: 'Keep one row per photo with the voltage it was taken at',
      });
    }
    voltageByFile.set(file, { voltageV: value, line: lineNo });
  }
  if (rows === 0) {
    throw new KerrError('BAD_CSV', `${fileName} has a header but no rows`, { path: fileName, hint: 'Add one row per photo: file name and voltage' });
  }
  return { voltageByFile, rows, duplicates, columns: { file: header[fileCol]!, voltage: header[voltageCol]! }, voltageUnit, delimiter, decimalComma };
}
