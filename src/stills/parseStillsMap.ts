/**
 * Parses the CSV that maps each photo to the voltage it was taken at (`kerrtrace stills --volts`).
 * Pure: text in, map out.
 *
 * Format (docs/stills.md): a header line, then one row per photo, in the one CSV dialect shared
 * with the voltage log (src/io/csv/readCsvDialect, docs/voltage-log.md "The CSV dialect"):
 * delimiter comma, semicolon or tab (detected from the header and the first rows, or set by a
 * `sep=` line); decimal comma allowed when the delimiter is not a comma; LF, CRLF or CR; optional
 * UTF-8 byte-order mark; cells may be quoted; blank lines and `#` comment lines are skipped.
 * Columns, names case-insensitive:
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
import { parseCsvNumber } from '../io/csv/parseCsvNumber.js';
import { readCsvDialect, type CsvLine } from '../io/csv/readCsvDialect.js';
import { splitCsvCells, unquoteCell, type CsvDelimiter } from '../io/csv/splitCsvCells.js';

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

export function parseStillsMap(text: string, fileName: string): StillsMap {
  const layout = readCsvDialect(text, fileName);
  if (layout.header === null) {
    throw new KerrError('BAD_CSV', `${fileName} is empty`, { path: fileName, hint: `Write a header line with the columns ${ACCEPTED}, then one row per photo` });
  }
  const { delimiter, decimalCommaAllowed: decimalComma } = layout;
  const header = mapColumns(layout.header, delimiter, fileName);
  const scale = header.voltageUnit === 'kV' ? 1000 : 1;
  const voltageByFile = new Map<string, StillsMapEntry>();
  let rows = 0;
  let duplicates = 0;
  for (const row of layout.rows) {
    const { file, voltageV } = readMapRow(row, header, delimiter, decimalComma, scale, fileName);
    rows++;
    const earlier = voltageByFile.get(file);
    if (earlier !== undefined) {
      if (earlier.voltageV === voltageV) {
        duplicates++;
        continue;
      }
      throw new KerrError('BAD_CSV', `${fileName}:${row.lineNo}: ${file} is given two different voltages, ${earlier.voltageV} V (line ${earlier.line}) and ${voltageV} V (line ${row.lineNo})`, {
        path: `${fileName}:${row.lineNo}`,
        hint: 'Keep one row per photo with the voltage it was taken at',
      });
    }
    voltageByFile.set(file, { voltageV, line: row.lineNo });
  }
  if (rows === 0) {
    throw new KerrError('BAD_CSV', `${fileName} has a header but no rows`, { path: fileName, hint: 'Add one row per photo: file name and voltage' });
  }
  return { voltageByFile, rows, duplicates, columns: { file: header.names[header.fileCol]!, voltage: header.names[header.voltageCol]! }, voltageUnit: header.voltageUnit, delimiter, decimalComma };
}

interface MapHeader {
  names: string[];
  fileCol: number;
  voltageCol: number;
  voltageUnit: 'V' | 'kV';
}

/** The file and voltage columns of the header; BAD_CSV for an unknown, repeated or missing column. */
function mapColumns(line: CsvLine, delimiter: CsvDelimiter, fileName: string): MapHeader {
  const names = splitCsvCells(line.text, delimiter).map(unquoteCell);
  let fileCol = -1;
  let voltageCol = -1;
  let voltageUnit: 'V' | 'kV' = 'V';
  for (let col = 0; col < names.length; col++) {
    const name = names[col]!;
    const lower = name.toLowerCase();
    const where = `${fileName}:${line.lineNo}:${col + 1}`;
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
    throw new KerrError('BAD_CSV', `${fileName}:${line.lineNo}: no ${missing} column among the columns found (${names.map((h) => JSON.stringify(h)).join(', ')})`, {
      path: fileName,
      hint: `Accepted columns: ${ACCEPTED}`,
    });
  }
  return { names, fileCol, voltageCol, voltageUnit };
}

/** One photo row: its file name and voltage (V); BAD_CSV for an empty name or a voltage that is not a number. */
function readMapRow(row: CsvLine, header: MapHeader, delimiter: CsvDelimiter, decimalComma: boolean, scale: number, fileName: string): { file: string; voltageV: number } {
  const cells = splitCsvCells(row.text, delimiter).map(unquoteCell);
  const file = cells[header.fileCol] ?? '';
  const voltText = cells[header.voltageCol] ?? '';
  if (file.length === 0) {
    const where = `${fileName}:${row.lineNo}:${header.fileCol + 1}`;
    throw new KerrError('BAD_CSV', `${where}: empty file name`, { path: where, hint: 'Every row needs the photo file name' });
  }
  const voltageV = parseCsvNumber(voltText, decimalComma) * scale;
  if (!Number.isFinite(voltageV)) {
    const where = `${fileName}:${row.lineNo}:${header.voltageCol + 1}`;
    throw new KerrError('BAD_CSV', `${where}: the voltage ${JSON.stringify(voltText)} for ${file} is not a number`, {
      path: where,
      hint: decimalComma ? 'Write numbers like 12.5 or 12,5' : 'Write numbers like 12.5 (with a comma delimiter the decimal separator must be a dot)',
    });
  }
  return { file, voltageV };
}
