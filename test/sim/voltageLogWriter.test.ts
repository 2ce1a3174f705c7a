import { describe, expect, it } from 'vitest';
import { parseScenario } from '../../src/sim/scenario.js';
import { formatVoltageLog } from '../../src/sim/voltageLogWriter.js';
import { makeRng } from '../../src/sim/rng.js';

const base = {
  cell: { kerrConstantMPerV2: 2.4e-12, lengthMm: 50, gapMm: 5 },
  drive: { points: [{ timeS: 0, voltageV: 0 }, { timeS: 10, voltageV: 10000 }] },
};

describe('voltage log text', () => {
  it('records V_drive(t_log + offset) at each log time (offset = video time − log time)', () => {
    const s = parseScenario({ ...base, logger: { sampleRateHz: 2, clockOffsetS: 1.5, durationS: 3 } }, 'a.json');
    const log = formatVoltageLog(s, makeRng(1));
    const lines = log.text.trimEnd().split('\n');
    expect(lines[0]).toBe('time_s,voltage_V');
    expect(lines[1]).toBe('0.0000,1500.0'); // log time 0 = video time 1.5 s, where the ramp is at 1500 V
    expect(lines[2]).toBe('0.5000,2000.0');
    expect(log.rows).toBe(7);
    expect(lines.length).toBe(8);
    expect(log.lastTimeS).toBeCloseTo(3, 12);
  });

  it('writes ms and kV with semicolons, decimal commas and CRLF', () => {
    const s = parseScenario(
      { ...base, logger: { sampleRateHz: 4, durationS: 1, timeUnit: 'ms', voltageUnit: 'kV', delimiter: ';', decimalComma: true, lineEnding: 'crlf' } },
      'a.json',
    );
    const text = formatVoltageLog(s, makeRng(1)).text;
    expect(text.startsWith('time_ms;voltage_kV\r\n0,0;0,0000\r\n250,0;0,2500\r\n')).toBe(true);
    expect(text.endsWith('\r\n')).toBe(true);
    expect(text.replace(/\r\n/g, '')).not.toContain('\n');
  });

  it('adds the leakage current I = V·A/(ρ·d), A = L·h, and the temperature (Ohm’s law for a slab)', () => {
    const s = parseScenario(
      {
        ...base,
        cell: { ...base.cell, resistivityOhmM: 1e8, electrodeHeightMm: 20, temperatureC: 21.5 },
        logger: { sampleRateHz: 1, durationS: 10, currentUnit: 'uA' },
      },
      'a.json',
    );
    const lines = formatVoltageLog(s, makeRng(1)).text.trimEnd().split('\n');
    expect(lines[0]).toBe('time_s,voltage_V,current_uA,temperature_C');
    // at 10 kV: I = 1e4 V · (0.05 m · 0.02 m) / (1e8 Ω·m · 0.005 m) = 2e-5 A = 20 µA
    expect(lines[11]).toBe('10.0000,10000.0,20.0000,21.50');
  });

  it('adds Gaussian voltage noise of the stated size, reproducibly', () => {
    const s = parseScenario({ ...base, drive: { points: [{ timeS: 0, voltageV: 5000 }] }, durationS: 100, logger: { sampleRateHz: 50, noiseV: 20 } }, 'a.json');
    const a = formatVoltageLog(s, makeRng(8));
    expect(formatVoltageLog(s, makeRng(8)).text).toBe(a.text);
    const volts = a.text.trimEnd().split('\n').slice(1).map((l) => Number(l.split(',')[1]));
    const mean = volts.reduce((x, y) => x + y, 0) / volts.length;
    const sd = Math.sqrt(volts.reduce((x, y) => x + (y - mean) ** 2, 0) / (volts.length - 1));
    expect(Math.abs(mean - 5000)).toBeLessThan(5 * (20 / Math.sqrt(volts.length)));
    expect(sd).toBeGreaterThan(18);
    expect(sd).toBeLessThan(22);
  });
});
