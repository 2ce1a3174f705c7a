/** Playing a finished log back into a growing file, row by row on the wall clock. */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { replayLog } from '../../src/live/replayLog.js';

let dir = '';
afterEach(() => { if (dir) rmSync(dir, { recursive: true, force: true }); dir = ''; });

describe('replayLog', () => {
  it('writes the header at once and each row only when its time has come, text unchanged', async () => {
    dir = mkdtempSync(join(tmpdir(), 'kerrtrace-replay-'));
    const source = join(dir, 'volts.csv');
    writeFileSync(source, 'time_s;voltage_kV\n10,0;0,0\n10,2;1,5\n10,4;3,0\n');
    const target = join(dir, 'live.csv');
    const t0 = performance.now();
    const r = replayLog(source, target, 0.1, 5);
    expect(readFileSync(target, 'utf8')).toBe('time_s;voltage_kV\n');
    expect(r.total).toBe(3);
    await r.done;
    const took = (performance.now() - t0) / 1000;
    expect(readFileSync(target, 'utf8')).toBe('time_s;voltage_kV\n10,0;0,0\n10,2;1,5\n10,4;3,0\n');
    // the last row is due 0.1 + 0.4 s after the start
    expect(took).toBeGreaterThanOrEqual(0.49);
    expect(r.written).toBe(3);
  });

  it('never writes over an existing file', () => {
    dir = mkdtempSync(join(tmpdir(), 'kerrtrace-replay-'));
    const source = join(dir, 'volts.csv');
    writeFileSync(source, 'time_s,voltage_V\n0,0\n1,10\n');
    const target = join(dir, 'live.csv');
    writeFileSync(target, 'keep me');
    expect(() => replayLog(source, target)).toThrow(/already exists/);
    expect(readFileSync(target, 'utf8')).toBe('keep me');
  });
});
