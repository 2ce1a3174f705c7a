import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { KerrError } from '../../src/errors.js';
import { parseVoltageLog } from '../../src/io/voltageLog.js';

/** Parse and return the KerrError it throws (fails the test when it does not throw one). */
function failure(text: string, file = 'volts.csv'): KerrError {
  try {
    parseVoltageLog(text, file);
  } catch (err) {
    if (err instanceof KerrError) return err;
    throw err;
  }
  throw new Error('expected parseVoltageLog to throw');
}

const arr = (a: Float64Array | null): number[] => (a === null ? [] : Array.from(a));

describe('parseVoltageLog: header spellings and units', () => {
  // Every spelling the issue lists, with the scale factor to SI it implies.
  const timeHeaders: Array<[string, number]> = [
    ['time', 1], ['t', 1], ['time_s', 1], ['seconds', 1], ['elapsed', 1], ['Time', 1], ['TIME_S', 1],
    ['time_ms', 1e-3], ['t [ms]', 1e-3], ['time (s)', 1], ['t [s]', 1], ['elapsed_ms', 1e-3], ['"time_s"', 1], ['  time  ', 1],
  ];
  const voltageHeaders: Array<[string, number]> = [
    ['voltage', 1], ['v', 1], ['volts', 1], ['hv', 1], ['u', 1], ['Voltage_V', 1], ['voltage_kV', 1e3], ['U [kV]', 1e3],
    ['hv (kV)', 1e3], ['V [kV]', 1e3], ['u_kv', 1e3], ['voltage [V]', 1], ['"HV_kV"', 1e3], ['U / kV', 1e3],
  ];
  for (const [header, scale] of timeHeaders) {
    it(`reads ${JSON.stringify(header)} as the time column (×${scale} to s)`, () => {
      const log = parseVoltageLog(`${header},voltage\n1,10\n2,20\n`, 'volts.csv');
      expect(arr(log.timeS)).toEqual([1 * scale, 2 * scale]);
      expect(log.columns.time).toBe(header.trim().replace(/"/g, ''));
    });
  }
  for (const [header, scale] of voltageHeaders) {
    it(`reads ${JSON.stringify(header)} as the voltage column (×${scale} to V)`, () => {
      const log = parseVoltageLog(`time_s,${header}\n0,1.5\n1,2\n`, 'volts.csv');
      expect(arr(log.voltageV)).toEqual([1.5 * scale, 2 * scale]);
    });
  }

  const currentHeaders: Array<[string, number]> = [
    ['current_uA', 1e-6], ['current_mA', 1e-3], ['current_A', 1], ['i [uA]', 1e-6], ['i_ua', 1e-6], ['current (nA)', 1e-9],
    ['I [µA]', 1e-6], ['current_μA', 1e-6], ['i (mA)', 1e-3],
  ];
  for (const [header, scale] of currentHeaders) {
    it(`carries ${JSON.stringify(header)} along as current in A`, () => {
      const log = parseVoltageLog(`time_s,voltage_kV,${header}\n0,1,4\n1,2,8\n`, 'volts.csv');
      expect(log.currentA).not.toBeNull();
      expect(arr(log.currentA)[0]).toBeCloseTo(4 * scale, 20);
      expect(arr(log.currentA)[1]).toBeCloseTo(8 * scale, 20);
      expect(log.columns.current).toBe(header);
    });
  }

  const temperatureHeaders: Array<[string, number, number]> = [
    // header, cell value, expected °C (K → °C: −273.15; °F → °C: (F − 32)·5/9, SI brochure / common practice)
    ['temp_C', 21.5, 21.5], ['temperature [°C]', 21.5, 21.5], ['t_c', 21.5, 21.5], ['T [°C]', 21.5, 21.5],
    ['temperature', 21.5, 21.5], ['temp (K)', 294.65, 21.5], ['temp_F', 70.7, 21.5], ['temperature (degC)', 21.5, 21.5],
  ];
  for (const [header, cell, celsius] of temperatureHeaders) {
    it(`carries ${JSON.stringify(header)} along as temperature in °C, without taking it for time`, () => {
      const log = parseVoltageLog(`time_s,voltage_kV,${header}\n0,1,${cell}\n1,2,${cell}\n`, 'volts.csv');
      expect(log.columns.time).toBe('time_s');
      expect(log.columns.temperature).toBe(header);
      expect(arr(log.temperatureC)[0]).toBeCloseTo(celsius, 9);
    });
  }

  it('takes a lone "t" as time even beside a temperature column', () => {
    const log = parseVoltageLog('t,u_kV,t_c\n0,1,20\n0.5,2,21\n', 'volts.csv');
    expect(log.columns).toEqual({ time: 't', voltage: 'u_kV', current: null, temperature: 't_c' });
    expect(arr(log.timeS)).toEqual([0, 0.5]);
    expect(arr(log.temperatureC)).toEqual([20, 21]);
  });

  it('ignores unknown columns with a warning and keeps current and temperature null when absent', () => {
    const log = parseVoltageLog('time_s,setpoint,voltage_kV\n0,5,1\n1,5,2\n', 'volts.csv');
    expect(arr(log.voltageV)).toEqual([1000, 2000]);
    expect(log.currentA).toBeNull();
    expect(log.temperatureC).toBeNull();
    expect(log.warnings.join(' ')).toContain('"setpoint"');
  });

  it('warns when the current column has no unit and reads it as amperes', () => {
    const log = parseVoltageLog('time_s,voltage_kV,current\n0,1,0.5\n1,2,0.25\n', 'volts.csv');
    expect(arr(log.currentA)).toEqual([0.5, 0.25]);
    expect(log.warnings.join(' ')).toContain('no unit');
  });
});

describe('parseVoltageLog: dialects', () => {
  it('skips a UTF-8 byte-order mark and reads CRLF line ends', () => {
    const log = parseVoltageLog('\uFEFFtime_s,voltage_V\r\n0,10\r\n0.5,20\r\n', 'volts.csv');
    expect(arr(log.timeS)).toEqual([0, 0.5]);
    expect(arr(log.voltageV)).toEqual([10, 20]);
    expect(log.columns.time).toBe('time_s');
  });

  it('detects a tab delimiter', () => {
    const log = parseVoltageLog('time_s\tvoltage_kV\n0\t1.5\n1\t2.5\n', 'volts.csv');
    expect(log.delimiter).toBe('\t');
    expect(arr(log.voltageV)).toEqual([1500, 2500]);
  });

  it('reads a semicolon log with decimal commas (the vfr bench clip\'s "t [s];U [kV]" form)', () => {
    const log = parseVoltageLog('t [s];U [kV]\n0,000;1,0495\n0,083;1,1364\n', 'volts.csv');
    expect(log.delimiter).toBe(';');
    expect(log.decimalComma).toBe(true);
    expect(arr(log.timeS)).toEqual([0, 0.083]);
    expect(arr(log.voltageV)[0]).toBeCloseTo(1049.5, 9);
    expect(arr(log.voltageV)[1]).toBeCloseTo(1136.4, 9);
  });

  it('reads decimal commas with a tab delimiter', () => {
    const log = parseVoltageLog('time_s\tvoltage_kV\n0,5\t1,25\n1,5\t2\n', 'volts.csv');
    expect(log.decimalComma).toBe(true);
    expect(arr(log.timeS)).toEqual([0.5, 1.5]);
    expect(arr(log.voltageV)).toEqual([1250, 2000]);
  });

  it('reports decimalComma false for point decimals', () => {
    const log = parseVoltageLog('time_s;voltage_kV\n0.5;1.25\n1.5;2\n', 'volts.csv');
    expect(log.delimiter).toBe(';');
    expect(log.decimalComma).toBe(false);
  });

  it('tolerates spaces and quotes around cells, trailing blank lines and a trailing delimiter', () => {
    const log = parseVoltageLog(' "time_s" , "voltage_kV" \n "0.0" , 1.5 ,\n 0.1 ,"2.5",\n\n\n', 'volts.csv');
    expect(arr(log.timeS)).toEqual([0, 0.1]);
    expect(arr(log.voltageV)).toEqual([1500, 2500]);
    expect(log.warnings).toEqual([]);
  });

  it('honours an Excel "sep=;" first line and skips # comment lines', () => {
    const log = parseVoltageLog('sep=;\n# bench log\ntime_s;voltage_kV\n0;1\n# pause\n1;2\n', 'volts.csv');
    expect(log.delimiter).toBe(';');
    expect(arr(log.voltageV)).toEqual([1000, 2000]);
  });

  it('reads ISO-8601 timestamps relative to the first row and keeps the absolute start', () => {
    const log = parseVoltageLog(
      'timestamp,voltage_kV\n2024-05-01T12:00:59.750Z,1\n2024-05-01T12:01:00.000Z,2\n2024-05-01T12:01:00.250123Z,3\n',
      'volts.csv',
    );
    expect(log.absoluteStart).toBe('2024-05-01T12:00:59.750Z');
    expect(log.columns.time).toBe('timestamp');
    expect(arr(log.timeS)[0]).toBe(0);
    expect(arr(log.timeS)[1]).toBeCloseTo(0.25, 12);
    expect(arr(log.timeS)[2]).toBeCloseTo(0.500123, 12);
  });

  it('reads date-times in a unitless "Time" column as timestamps', () => {
    const log = parseVoltageLog('Time;Voltage [kV]\n2024-05-01 12:00:00,5;1\n2024-05-01 12:00:01,0;2\n', 'volts.csv');
    expect(arr(log.timeS)).toEqual([0, 0.5]);
    expect(log.absoluteStart).toBe('2024-05-01 12:00:00,5');
    expect(log.columns.time).toBe('Time');
  });

  it('applies time-zone offsets in timestamps (12:00+02:00 is 10:00Z)', () => {
    const log = parseVoltageLog('timestamp;voltage_kV\n2024-05-01T09:59:59Z;1\n2024-05-01T12:00:01+02:00;2\n', 'volts.csv');
    expect(arr(log.timeS)).toEqual([0, 2]);
  });

  it('accepts a space between date and time and crosses midnight', () => {
    const log = parseVoltageLog('timestamp,voltage\n2024-12-31 23:59:59.5,100\n2025-01-01 00:00:00.5,200\n', 'volts.csv');
    expect(arr(log.timeS)).toEqual([0, 1]);
    expect(log.absoluteStart).toBe('2024-12-31 23:59:59.5');
  });

  it('reads a numeric timestamp column as Unix time', () => {
    const log = parseVoltageLog('timestamp_ms,voltage\n1714564800000,100\n1714564800250,200\n', 'volts.csv');
    expect(arr(log.timeS)).toEqual([0, 0.25]);
    expect(log.absoluteStart).toBe('2024-05-01T12:00:00.000Z');
  });

  it('prefers a numeric time column and still keeps the timestamp as the absolute start', () => {
    const log = parseVoltageLog('timestamp,time_s,voltage_kV\n2024-05-01T12:00:00Z,5,1\n2024-05-01T12:00:01Z,6,2\n', 'volts.csv');
    expect(arr(log.timeS)).toEqual([5, 6]);
    expect(log.absoluteStart).toBe('2024-05-01T12:00:00Z');
  });
});

describe('parseVoltageLog: number forms', () => {
  it('accepts signs, exponents, leading and trailing decimal marks', () => {
    const log = parseVoltageLog('time_s,voltage_V\n-1,+2\n.5,1e3\n2.,-2.5E-1\n', 'volts.csv');
    expect(arr(log.timeS)).toEqual([-1, 0.5, 2]);
    expect(arr(log.voltageV)).toEqual([2, 1000, -0.25]);
  });

  for (const cell of ['0x10', 'Infinity', 'NaN', '1 000', '1.234,5', '1e', '--1', '.', '1e400']) {
    it(`rejects ${JSON.stringify(cell)} as a number`, () => {
      const err = failure(`time_s;voltage_V\n0;1\n1;${cell}\n`);
      expect(err.path).toBe('volts.csv:3:2');
    });
  }
});

describe('parseVoltageLog: irregular sampling and duplicates', () => {
  it('averages rows with equal times and counts them', () => {
    const log = parseVoltageLog('time_s,voltage_V,current_uA\n0,10,1\n0.1,20,2\n0.1,40,4\n0.1,60,\n0.3,80,8\n', 'volts.csv');
    expect(arr(log.timeS)).toEqual([0, 0.1, 0.3]);
    expect(arr(log.voltageV)).toEqual([10, 40, 80]);
    expect(arr(log.currentA)[1]).toBeCloseTo(3e-6, 18); // the empty cell is left out of the mean
    expect(log.duplicateTimes).toBe(2);
    expect(log.rows).toBe(3);
    expect(log.warnings.join(' ')).toContain('2 rows repeated an earlier time');
  });

  it('keeps irregular intervals and warns about a long gap with its line', () => {
    const rows = ['time_s,voltage_V'];
    for (let i = 0; i < 20; i++) rows.push(`${(i * 0.1).toFixed(1)},${i}`);
    rows.push('9.0,99'); // line 22: after a 7.1 s gap
    const log = parseVoltageLog(`${rows.join('\n')}\n`, 'volts.csv');
    expect(log.rows).toBe(21);
    expect(log.warnings.join(' ')).toContain('ends at line 22');
  });
});

describe('parseVoltageLog: errors name the file, line and column', () => {
  it('rejects a non-numeric cell with its exact line and column', () => {
    const err = failure('time_s,voltage_kV\n0,1\n0.1,1.2\n0.2,abc\n0.3,1.4\n');
    expect(err.code).toBe('BAD_CSV');
    expect(err.message).toContain('volts.csv line 4, column 2');
    expect(err.message).toContain('"abc"');
    expect(err.path).toBe('volts.csv:4:2');
  });

  it('counts the byte-order mark line, CRLF and comment lines correctly', () => {
    const err = failure('\uFEFF# logger v2\r\ntime_s;voltage_kV\r\n0;1\r\n\r\n0,1;x\r\n');
    expect(err.path).toBe('volts.csv:5:2');
  });

  it('says when a header is repeated inside the data (line 57)', () => {
    const rows = ['time_s,voltage_kV'];
    for (let i = 0; i < 55; i++) rows.push(`${i / 10},${i / 100}`);
    rows.push('time_s,voltage_kV'); // line 57
    rows.push('5.6,0.56');
    const err = failure(`${rows.join('\n')}\n`);
    expect(err.code).toBe('BAD_CSV');
    expect(err.message).toContain('line 57 looks like a header repeated inside the data');
    expect(err.path).toBe('volts.csv:57');
  });

  it('recognises a repeated header even when spelt differently', () => {
    const err = failure('time_s,voltage_kV\n0,1\nTime [s],U [kV]\n1,2\n');
    expect(err.message).toContain('line 3 looks like a header repeated inside the data');
  });

  it('rejects times that go backwards, naming both lines', () => {
    const err = failure('time_s,voltage_kV\n0,1\n0.2,1\n0.1,1\n');
    expect(err.message).toContain('volts.csv line 4, column 1');
    expect(err.message).toContain('time goes backwards');
    expect(err.message).toContain('line 3');
  });

  it('lists the columns found and the accepted names when the time column is missing', () => {
    const err = failure('clock,voltage_kV\n0,1\n1,2\n');
    expect(err.message).toContain('no time column among "clock", "voltage_kV"');
    expect(err.hint).toContain('time_s');
    expect(err.hint).toContain('timestamp');
  });

  it('lists the columns found and the accepted names when the voltage column is missing', () => {
    const err = failure('time_s;power_W\n0;1\n1;2\n');
    expect(err.message).toContain('no voltage column among "time_s", "power_W"');
    expect(err.hint).toContain('hv');
  });

  it('needs at least 2 rows with distinct times', () => {
    expect(failure('time_s,voltage_kV\n0,1\n').message).toContain('only 1 sample');
    expect(failure('time_s,voltage_kV\n0,1\n0,2\n').message).toContain('only 1 sample');
    expect(failure('time_s,voltage_kV\n').message).toContain('only 0 samples');
  });

  it('rejects an empty file and a file without a header', () => {
    expect(failure('\n\n').message).toContain('is empty');
    expect(failure('0,1\n1,2\n').message).toContain('holds numbers, not column names');
  });

  it('rejects a unit that does not fit its column', () => {
    const err = failure('time_s,voltage_mA\n0,1\n1,2\n');
    expect(err.message).toContain('column 2');
    expect(err.message).toContain('does not fit a voltage column');
  });

  it('rejects two voltage columns', () => {
    expect(failure('time_s,voltage_kV,hv\n0,1,1\n1,2,2\n').message).toContain('two voltage columns');
  });

  it('rejects decimal commas with a comma delimiter, pointing at the row', () => {
    const err = failure('time_s,voltage_kV\n0,5,1,2\n');
    expect(err.message).toContain('line 2');
    expect(err.hint).toContain('semicolon');
  });

  it('rejects an empty voltage cell and a short row', () => {
    expect(failure('time_s,voltage_kV\n0,1\n1,\n').message).toContain('line 3, column 2');
    expect(failure('time_s,voltage_kV\n0,1\n1\n').path).toBe('volts.csv:3:2');
  });

  it('rejects timestamps that are not ISO-8601, and mixed time-zone forms', () => {
    expect(failure('timestamp,voltage\n2024-05-01T12:00:00Z,1\nyesterday,2\n').message).toContain('neither an ISO-8601 time');
    expect(failure('timestamp,voltage\n2024-05-01T12:00:00Z,1\n2024-05-01T12:00:01,2\n').message).toContain('time zone');
  });
});

// Round trip: a random log written in any supported dialect parses back to the same SI numbers.
describe('parseVoltageLog: property test over dialects', () => {
  interface Dialect {
    delimiter: ',' | ';' | '\t';
    decimalComma: boolean;
    crlf: boolean;
    bom: boolean;
    quote: boolean;
    pad: boolean;
    time: [string, number];
    voltage: [string, number];
    current: [string, number] | null;
    temperature: string | null;
  }
  const timeSpellings: Array<[string, number]> = [['time', 1], ['t', 1], ['time_s', 1], ['seconds', 1], ['elapsed', 1], ['t [ms]', 1e-3], ['time_ms', 1e-3], ['Time (s)', 1]];
  const voltageSpellings: Array<[string, number]> = [['voltage', 1], ['v', 1], ['volts', 1], ['hv', 1], ['u', 1], ['U [kV]', 1e3], ['voltage_kV', 1e3], ['HV (kV)', 1e3]];
  const currentSpellings: Array<[string, number]> = [['current_uA', 1e-6], ['current_mA', 1e-3], ['current_A', 1], ['i [uA]', 1e-6], ['i_ua', 1e-6], ['current (nA)', 1e-9]];
  const temperatureSpellings = ['temp_C', 'temperature [°C]', 't_c'];

  const dialect = fc.record<Dialect>({
    delimiter: fc.constantFrom<',' | ';' | '\t'>(',', ';', '\t'),
    decimalComma: fc.boolean(),
    crlf: fc.boolean(),
    bom: fc.boolean(),
    quote: fc.boolean(),
    pad: fc.boolean(),
    time: fc.constantFrom(...timeSpellings),
    voltage: fc.constantFrom(...voltageSpellings),
    current: fc.option(fc.constantFrom(...currentSpellings), { nil: null }),
    temperature: fc.option(fc.constantFrom(...temperatureSpellings), { nil: null }),
  });
  // Values in the displayed unit, with few enough digits that the text is exact.
  const row = fc.record({
    step: fc.integer({ min: 1, max: 5000 }), // time step in thousandths of the displayed unit
    voltage: fc.integer({ min: -200_000, max: 200_000 }), // hundredths of the displayed unit
    current: fc.integer({ min: 0, max: 99_999 }),
    temperature: fc.integer({ min: -500, max: 1500 }), // tenths of a degree
  });

  it('formats then parses back to the same numbers', () => {
    fc.assert(
      fc.property(dialect, fc.array(row, { minLength: 2, maxLength: 40 }), (d, rows) => {
        const comma = d.decimalComma && d.delimiter !== ',';
        const number = (x: number): string => {
          const text = String(x);
          return comma ? text.replace('.', ',') : text;
        };
        const cell = (text: string): string => {
          const quoted = d.quote ? `"${text}"` : text;
          return d.pad ? ` ${quoted} ` : quoted;
        };
        const headers = [d.time[0], d.voltage[0]];
        if (d.current) headers.push(d.current[0]);
        if (d.temperature) headers.push(d.temperature);
        const lines = [headers.map(cell).join(d.delimiter)];
        let timeThousandths = 0;
        const expected = { time: [] as number[], voltage: [] as number[], current: [] as number[], temperature: [] as number[] };
        for (const r of rows) {
          timeThousandths += r.step;
          const timeShown = timeThousandths / 1000;
          const voltageShown = r.voltage / 100;
          const cells = [number(timeShown), number(voltageShown)];
          expected.time.push(timeShown * d.time[1]);
          expected.voltage.push(voltageShown * d.voltage[1]);
          if (d.current) {
            cells.push(number(r.current / 10));
            expected.current.push((r.current / 10) * d.current[1]);
          }
          if (d.temperature) {
            cells.push(number(r.temperature / 10));
            expected.temperature.push(r.temperature / 10);
          }
          lines.push(cells.map(cell).join(d.delimiter));
        }
        const eol = d.crlf ? '\r\n' : '\n';
        const text = `${d.bom ? '\uFEFF' : ''}${lines.join(eol)}${eol}`;
        const log = parseVoltageLog(text, 'random.csv');
        const close = (got: number[], want: number[]): boolean => got.length === want.length && got.every((g, i) => Math.abs(g - want[i]) <= 1e-12 * Math.max(1, Math.abs(want[i])));
        expect(log.delimiter).toBe(d.delimiter);
        expect(log.rows).toBe(rows.length);
        expect(log.duplicateTimes).toBe(0);
        expect(close(arr(log.timeS), expected.time)).toBe(true);
        expect(close(arr(log.voltageV), expected.voltage)).toBe(true);
        if (d.current) expect(close(arr(log.currentA), expected.current)).toBe(true);
        else expect(log.currentA).toBeNull();
        if (d.temperature) expect(close(arr(log.temperatureC), expected.temperature)).toBe(true);
        else expect(log.temperatureC).toBeNull();
      }),
      { numRuns: 300, seed: 20240501 },
    );
  });
});
