/** Follows a real file on disk that grows, is cut short and is replaced. */
import { appendFileSync, mkdtempSync, rmSync, writeFileSync, renameSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { followFile } from '../../src/live/followFile.js';

let dir = '';
afterEach(() => { if (dir) rmSync(dir, { recursive: true, force: true }); dir = ''; });

describe('followFile', () => {
  it('hands over only the new text of a growing file, keeps UTF-8 characters whole, and starts over when the file is replaced', async () => {
    dir = mkdtempSync(join(tmpdir(), 'kerrtrace-follow-'));
    const path = join(dir, 'volts.csv');
    let text = '';
    let restarts = 0;
    const problems: (string | null)[] = [];
    const f = followFile(path, { onText: (t) => { text += t; }, onRestart: () => { restarts++; text = ''; }, onProblem: (p) => problems.push(p) }, 10_000);
    await f.poll();
    expect(problems[0]).toMatch(/waiting for .*volts\.csv/);
    writeFileSync(path, 'time_s,voltage_V\n0,0\n');
    await f.poll();
    expect(text).toBe('time_s,voltage_V\n0,0\n');
    // "µ" is two bytes in UTF-8: write its bytes in two pieces
    const micro = Buffer.from('# 5 µA\n', 'utf8');
    appendFileSync(path, micro.subarray(0, 5));
    await f.poll();
    appendFileSync(path, micro.subarray(5));
    await f.poll();
    expect(text).toBe('time_s,voltage_V\n0,0\n# 5 µA\n');
    appendFileSync(path, '0.1,10\n');
    await f.poll();
    expect(text.endsWith('0.1,10\n')).toBe(true);
    // the logger starts a new file under the same name
    const fresh = join(dir, 'new.csv');
    writeFileSync(fresh, 'time_s,voltage_V\n5,5\n');
    renameSync(fresh, path);
    await f.poll();
    expect(restarts).toBe(1);
    expect(text).toBe('time_s,voltage_V\n5,5\n');
    // cut short in place
    writeFileSync(path, 'time_s,voltage_V\n');
    await f.poll();
    expect(restarts).toBe(2);
    f.stop();
  });
});
