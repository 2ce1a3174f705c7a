/**
 * Plays a finished voltage log back into a new file as if a logger were writing it now: the
 * header block at once, then each data row when its time (plus `offsetS`) has passed on the wall
 * clock since `start()`. Used by `kerrtrace watch --demo` and the tests, so that the live view
 * follows a growing file exactly as at the bench. Rows keep their text unchanged.
 * Edge module (files, timers). Refuses to write over an existing file (KerrError FILE_EXISTS).
 */
import { openSync, writeSync, closeSync, readFileSync } from 'node:fs';
import { KerrError } from '../errors.js';
import { parseVoltageLog } from '../io/voltageLog.js';

export interface LogReplay {
  /** Rows written so far. */
  readonly written: number;
  readonly total: number;
  stop(): void;
  /** Resolves when every row has been written (or stop() was called). */
  done: Promise<void>;
}

export function replayLog(sourceCsv: string, targetCsv: string, offsetS = 0, tickMs = 50): LogReplay {
  const text = readFileSync(sourceCsv, 'utf8');
  const log = parseVoltageLog(text, sourceCsv);
  const lines = text.split(/\r\n|\n|\r/);
  const header: string[] = [];
  const rows: string[] = [];
  let seenHeader = false;
  for (const line of lines) {
    const skip = line.trim() === '' || line.trimStart().startsWith('#') || /^\s*sep=.\s*$/i.test(line);
    if (!seenHeader) { header.push(line); if (!skip) seenHeader = true; continue; }
    if (!skip) rows.push(line);
  }
  if (rows.length !== log.timeS.length) {
    throw new KerrError('BAD_CSV', `${sourceCsv} repeats row times, so it cannot be played back row by row`, { path: sourceCsv });
  }
  let fd: number;
  try {
    fd = openSync(targetCsv, 'wx');
  } catch {
    throw new KerrError('FILE_EXISTS', `${targetCsv} already exists`, { path: targetCsv, hint: 'Play the log into a new file' });
  }
  writeSync(fd, `${header.join('\n')}\n`);
  const t0 = performance.now();
  let next = 0;
  let open = true;
  let finish: () => void = () => undefined;
  const done = new Promise<void>((r) => { finish = r; });
  const close = (): void => {
    if (!open) return;
    open = false;
    clearInterval(timer);
    closeSync(fd);
    finish();
  };
  const timer = setInterval(() => {
    const elapsedS = (performance.now() - t0) / 1000;
    let chunk = '';
    while (next < rows.length && log.timeS[next]! - log.timeS[0]! + offsetS <= elapsedS) chunk += `${rows[next++]}\n`;
    if (chunk) writeSync(fd, chunk);
    if (next >= rows.length) close();
  }, tickMs);
  timer.unref();
  return {
    get written() { return next; },
    total: rows.length,
    stop: close,
    done,
  };
}
