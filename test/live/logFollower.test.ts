/**
 * The incremental log reader must give exactly what parseVoltageLog (analyze's --volts) gives for
 * the whole file, however the text is cut into pieces as it arrives.
 */
import { describe, expect, it } from 'vitest';
import { createLogFollower } from '../../src/live/logFollower.js';
import { parseVoltageLog } from '../../src/io/voltageLog.js';

function feedInPieces(text: string, cuts: number[]): { t: number[]; v: number[] } {
  const f = createLogFollower('volts.csv');
  const t: number[] = [];
  const v: number[] = [];
  let at = 0;
  for (const c of [...cuts, text.length]) {
    const s = f.feed(text.slice(at, c));
    t.push(...s.timeS);
    v.push(...s.voltageV);
    at = c;
  }
  return { t, v };
}

const LOGS: Record<string, string> = {
  'comma, s and kV': '# bench 2\ntime_s,voltage_kV\n0,0\n0.1,1.5\n0.2,3.25\n0.3,4\n0.45,2.5\n',
  'semicolon, decimal comma, ms, CRLF': 'sep=;\r\nt [ms];U [kV]\r\n0;0,0\r\n100;1,5\r\n200;3,25\r\n300;4,0\r\n',
  'tab with current and a comment row': 'time\tvoltage\tcurrent_uA\n0\t0\t0.1\n0.5\t100\t0.2\n# pause\n1.0\t250\t0.3\n1.5\t400\t0.4\n',
  'ISO timestamps': 'timestamp,voltage_V\n2024-05-01T10:00:00.0Z,0\n2024-05-01T10:00:00.5Z,1000\n2024-05-01T10:00:01.0Z,2000\n2024-05-01T10:00:01.5Z,2500\n',
};

describe('createLogFollower', () => {
  for (const [name, text] of Object.entries(LOGS)) {
    it(`reads a growing ${name} log exactly as the whole-file parser does, for every way of cutting it`, () => {
      const whole = parseVoltageLog(text, 'volts.csv');
      for (let a = 0; a <= text.length; a += 3) {
        for (const b of [a + 1, a + 7, a + 19]) {
          const got = feedInPieces(text, [a, Math.min(b, text.length)]);
          expect(got.t).toEqual(Array.from(whole.timeS));
          expect(got.v).toEqual(Array.from(whole.voltageV));
        }
      }
      // one byte at a time
      const single = feedInPieces(text, Array.from({ length: text.length }, (_, i) => i));
      expect(single.t).toEqual(Array.from(whole.timeS));
    });
  }

  it('waits for an unfinished last line', () => {
    const f = createLogFollower('volts.csv');
    expect(f.feed('time_s,voltage_V\n0,0\n0.1,10').timeS.length).toBe(0);
    const s = f.feed('0\n');
    expect(Array.from(s.voltageV)).toEqual([0, 100]);
    expect(f.rows).toBe(2);
    expect(f.header).toBe('time_s,voltage_V');
  });

  it('reports bad rows and rows that go back in time with the file name', () => {
    const f = createLogFollower('volts.csv');
    f.feed('time_s,voltage_V\n0,0\n1,10\n2,20\n');
    expect(() => f.feed('1.5,30\n')).toThrow(/volts\.csv.*earlier/);
    const g = createLogFollower('volts.csv');
    g.feed('time_s,voltage_V\n0,0\n1,10\n');
    expect(() => g.feed('2,abc\n')).toThrow(/volts\.csv/);
  });

  it('keeps only the header and one row, not the whole log', () => {
    const f = createLogFollower('volts.csv');
    f.feed('time_s,voltage_V\n');
    let n = 0;
    for (let k = 0; k < 5000; k++) n += f.feed(`${k / 10},${k}\n`).timeS.length;
    expect(n).toBe(5000);
    expect(f.rows).toBe(5000);
  });
});
