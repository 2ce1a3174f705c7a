/**
 * Reads a voltage log that is still being written, piece by piece, with the same rules as
 * analyze's `--volts` (src/io/voltageLog.ts does all the parsing): give it text as it arrives and
 * it returns the samples of the lines completed since the last call.
 *
 * How: the header block (comments, an optional `sep=` line, the header) and the first data row are
 * kept; each batch of newly completed lines is parsed together with them, so the delimiter, decimal
 * mark, units and timestamp origin (times relative to the first row) are decided exactly as for the
 * whole file, and only samples later than the last one returned come back. A line is complete when
 * its line end has arrived; an unfinished last line waits. Memory: the kept header and one row.
 * Pure (no files, no clock).
 *
 * Throws KerrError BAD_CSV as parseVoltageLog does (line numbers count the header block, the first
 * data row and the batch), and when a new row's time is earlier than the last one returned.
 * @example const f = createLogFollower('volts.csv'); f.feed('time_s,voltage_kV\n0,0\n'); f.feed('0.1,1.5\n') // → { timeS: [0, 0.1], voltageV: [0, 1500] }
 */
import { KerrError } from '../errors.js';
import { parseVoltageLog } from '../io/voltageLog.js';

export interface LogSamples {
  timeS: Float64Array;
  voltageV: Float64Array;
}

export interface LogFollower {
  /** Add newly arrived text; returns the samples completed by it (possibly none). */
  feed(text: string): LogSamples;
  /** Samples returned so far. */
  readonly rows: number;
  /** The header block (comments, `sep=` line, header line) once it has arrived, else null. */
  readonly header: string | null;
}

const EMPTY: LogSamples = { timeS: new Float64Array(0), voltageV: new Float64Array(0) };

function isSkippable(line: string): boolean {
  return line.trim() === '' || line.trimStart().startsWith('#');
}

export function createLogFollower(fileName: string): LogFollower {
  let pending = '';
  const preamble: string[] = [];
  let headerFound = false;
  let firstData: string | null = null;
  let lastTimeS = Number.NEGATIVE_INFINITY;
  let rows = 0;

  const parseBatch = (batch: string[]): LogSamples => {
    const text = [...preamble, firstData!, ...batch].join('\n');
    const log = parseVoltageLog(text, fileName);
    const keepT: number[] = [];
    const keepV: number[] = [];
    for (let i = 0; i < log.timeS.length; i++) {
      const t = log.timeS[i]!;
      if (t > lastTimeS) {
        keepT.push(t);
        keepV.push(log.voltageV[i]!);
      } else if (i > 0 && t < lastTimeS) {
        throw new KerrError('BAD_CSV', `${fileName}: a new row's time ${t} s is earlier than the previous row's ${lastTimeS} s`, {
          path: fileName,
          hint: 'the logger must append rows in time order; start a new log file for a new run',
        });
      }
    }
    if (keepT.length > 0) lastTimeS = keepT[keepT.length - 1]!;
    rows += keepT.length;
    return { timeS: Float64Array.from(keepT), voltageV: Float64Array.from(keepV) };
  };

  return {
    get rows() {
      return rows;
    },
    get header() {
      return headerFound ? preamble.join('\n') : null;
    },
    feed(text: string): LogSamples {
      pending += text;
      // A trailing "\r" may be the first half of "\r\n": keep it until the next piece.
      const cut = pending.endsWith('\r') ? pending.length - 1 : pending.length;
      const body = pending.slice(0, cut);
      const parts = body.split(/\r\n|\n|\r/);
      pending = parts.pop()! + pending.slice(cut);
      const batch: string[] = [];
      for (const line of parts) {
        if (!headerFound) {
          preamble.push(line);
          if (!isSkippable(line) && !/^\s*sep=.\s*$/i.test(line.replace(/^\uFEFF/, ''))) headerFound = true;
          continue;
        }
        if (isSkippable(line)) continue;
        if (firstData === null) {
          firstData = line;
          continue;
        }
        batch.push(line);
      }
      // The first data row alone is parsed once a second row makes two samples.
      if (firstData === null || batch.length === 0) return EMPTY;
      return parseBatch(batch);
    },
  };
}
