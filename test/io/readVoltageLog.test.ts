import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { KerrError } from '../../src/errors.js';
import { readVoltageLog } from '../../src/io/readVoltageLog.js';
import { BENCH_CLIP_NAMES, benchClip } from '../helpers/referenceData.js';
import { benchClipTag } from '../setup/outsideSources.js';

const scratch = mkdtempSync(join(tmpdir(), 'kerrtrace-log-'));
afterAll(() => rmSync(scratch, { recursive: true, force: true }));

async function failure(path: string): Promise<KerrError> {
  try {
    await readVoltageLog(path);
  } catch (err) {
    if (err instanceof KerrError) return err;
    throw err;
  }
  throw new Error('expected readVoltageLog to throw');
}

// Outside check: the three bench clips' logs and the log description in each truth.json
// (test/reference/README.md, bench-clips: "the log's format").
describe('readVoltageLog on the bench clips (bench-clips README, truth.json voltageLog)', () => {
  for (const clip of BENCH_CLIP_NAMES) {
    it(`${clip}: rows, span, delimiter, decimal comma and peak voltage match truth.json`, { tags: [benchClipTag(clip)] }, async () => {
      const files = benchClip(clip);
      const truth = JSON.parse(readFileSync(files.truth, 'utf8')) as {
        maxVoltage_V: number;
        voltageLog: { delimiter: string; decimalComma: boolean; rows: number; span_s: number; noise_V: number; format: string };
      };
      const log = await readVoltageLog(files.volts);
      expect(log.rows).toBe(truth.voltageLog.rows);
      expect(log.duplicateTimes).toBe(0);
      expect(log.delimiter).toBe(truth.voltageLog.delimiter);
      expect(log.decimalComma).toBe(truth.voltageLog.decimalComma);
      expect(log.timeS[log.rows - 1] - log.timeS[0]).toBeCloseTo(truth.voltageLog.span_s, 9);
      expect([log.columns.time, log.columns.voltage].join(truth.voltageLog.delimiter)).toBe(truth.voltageLog.format);
      let peakV = 0;
      for (const v of log.voltageV) peakV = Math.max(peakV, Math.abs(v));
      // The log is the drive plus logger noise (noise_V): the peak lies within 5 noise sigmas of maxVoltage_V.
      expect(Math.abs(peakV - truth.maxVoltage_V)).toBeLessThan(5 * truth.voltageLog.noise_V);
      expect(log.warnings).toEqual([]);
    });
  }
});

describe('readVoltageLog edge cases', () => {
  it('throws FILE_NOT_FOUND with a hint for a missing file', async () => {
    const err = await failure(join(scratch, 'nope.csv'));
    expect(err.code).toBe('FILE_NOT_FOUND');
    expect(err.message).toContain('nope.csv');
    expect(err.hint).toBeTruthy();
  });

  it('throws BAD_ARGUMENT for a folder', async () => {
    const err = await failure(scratch);
    expect(err.code).toBe('BAD_ARGUMENT');
    expect(err.message).toContain('is a folder');
  });

  it('skips a UTF-8 byte-order mark', async () => {
    const path = join(scratch, 'bom.csv');
    writeFileSync(path, Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from('time_s,voltage_kV\r\n0,1\r\n1,2\r\n')]));
    const log = await readVoltageLog(path);
    expect(log.columns.time).toBe('time_s');
    expect(Array.from(log.voltageV)).toEqual([1000, 2000]);
  });

  it('reads a UTF-16 (little-endian, with BOM) tab-separated spreadsheet export', async () => {
    const path = join(scratch, 'utf16.txt');
    writeFileSync(path, Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('time_s\tU [kV]\ttemp [°C]\n0\t1,5\t21,5\n1\t2\t22\n', 'utf16le')]));
    const log = await readVoltageLog(path);
    expect(log.delimiter).toBe('\t');
    expect(Array.from(log.voltageV)).toEqual([1500, 2000]);
    expect(Array.from(log.temperatureC!)).toEqual([21.5, 22]);
  });

  it('falls back to Latin-1 for bytes that are not UTF-8, with a warning', async () => {
    const path = join(scratch, 'latin1.csv');
    writeFileSync(path, Buffer.from('time_s;voltage_kV;temperature [°C]\n0;1;20\n1;2;21\n', 'latin1'));
    const log = await readVoltageLog(path);
    expect(log.columns.temperature).toBe('temperature [°C]');
    expect(log.warnings[0]).toContain('Latin-1');
  });

  it('a binary file (zip signature, then bytes of every value) is refused in one short plain line: not a text CSV', async () => {
    const path = join(scratch, 'logger.csv');
    let x = 12345;
    const bytes = Buffer.from(Array.from({ length: 4096 }, () => { x = (x * 1103515245 + 12345) % 2147483648; return x % 256; }));
    writeFileSync(path, Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04]), bytes]));
    const err = await failure(path);
    expect(err.code).toBe('BAD_CSV');
    const line = err.oneLine();
    expect(line).toMatch(/logger\.csv is not a text CSV file/);
    expect(line).toMatch(/time_s,voltage_kV/);
    expect(line.length).toBeLessThan(300);
    expect(line).not.toMatch(/\\u|\\x|[\u0000-\u0008\u000e-\u001f]/); // no escaped or raw control bytes
  });

  it('names the file path in parse errors', async () => {
    const path = join(scratch, 'bad.csv');
    writeFileSync(path, 'time_s,voltage_kV\n0,1\n1,oops\n');
    const err = await failure(path);
    expect(err.code).toBe('BAD_CSV');
    expect(err.path).toBe(`${path}:3:2`);
  });
});
