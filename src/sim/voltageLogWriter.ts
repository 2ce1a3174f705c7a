/**
 * The simulated high-voltage logger: the text of volts.csv.
 *
 * Sample k is taken at log time t_log = startS + k/sampleRateHz (k = 0 … ⌊durationS·rate⌋) and
 * records the drive at the same instant in video time, V_drive(t_log + offset) (offset = video time
 * − log time), plus Gaussian noise of noiseV. Optional columns: leakage current from the liquid's
 * resistivity, I = V·A/(ρ·d) with electrode area A = L·h (Ohm's law for a parallel-plate slab),
 * plus noise; the liquid temperature in °C, plus noise.
 * Format: header row (optional), the chosen delimiter, decimal point or comma, LF or CRLF.
 * Columns: time_s | time_ms, voltage_V | voltage_kV, current_A | current_mA | current_uA, temperature_C.
 * Pure (the RNG is passed in). Throws nothing.
 * @example formatVoltageLog(scenario, rng).text.split('\n')[0] === 'time_s,voltage_V'
 */
import { driveVoltageV } from './drive.js';
import type { Rng } from './rng.js';
import type { Scenario } from './scenario.js';

export interface VoltageLogText {
  text: string;
  rows: number;
  columns: string[];
  /** Log times of the first and last rows, s (log clock). */
  firstTimeS: number;
  lastTimeS: number;
}

const CURRENT_SCALE: Record<'A' | 'mA' | 'uA', { factor: number; decimals: number }> = {
  A: { factor: 1, decimals: 10 },
  mA: { factor: 1e3, decimals: 7 },
  uA: { factor: 1e6, decimals: 4 },
};

export function formatVoltageLog(scenario: Scenario, rng: Rng): VoltageLogText {
  const { logger, cell, drive } = scenario;
  const fast = logger.sampleRateHz > 1000;
  const timeDecimals = logger.timeUnit === 's' ? (fast ? 6 : 4) : fast ? 3 : 1;
  const voltDecimals = logger.voltageUnit === 'V' ? 1 : 4;
  const hasCurrent = cell.resistivityOhmM !== null && cell.electrodeHeightM !== null;
  const hasTemperature = cell.temperatureC !== null;
  const columns = [`time_${logger.timeUnit}`, `voltage_${logger.voltageUnit}`];
  if (hasCurrent) columns.push(`current_${logger.currentUnit}`);
  if (hasTemperature) columns.push('temperature_C');

  const num = (x: number, decimals: number): string => {
    let s = x.toFixed(decimals);
    if (/^-0(\.0*)?$/.test(s)) s = s.slice(1); // no "-0.0"
    return logger.decimalComma ? s.replace('.', ',') : s;
  };
  const areaM2 = hasCurrent ? cell.lengthM * cell.electrodeHeightM! : 0;
  const current = CURRENT_SCALE[logger.currentUnit];
  const count = Math.floor(logger.durationS * logger.sampleRateHz + 1e-9) + 1;
  const lines: string[] = [];
  if (logger.header) lines.push(columns.join(logger.delimiter));
  for (let k = 0; k < count; k++) {
    const logTimeS = logger.startS + k / logger.sampleRateHz;
    const trueV = driveVoltageV(drive, logTimeS + logger.clockOffsetS);
    const loggedV = trueV + (logger.noiseV > 0 ? logger.noiseV * rng.normal() : 0);
    const cells = [
      num(logger.timeUnit === 's' ? logTimeS : logTimeS * 1e3, timeDecimals),
      num(logger.voltageUnit === 'V' ? loggedV : loggedV / 1e3, voltDecimals),
    ];
    if (hasCurrent) {
      const currentA = (trueV * areaM2) / (cell.resistivityOhmM! * cell.gapM) + (logger.currentNoiseA > 0 ? logger.currentNoiseA * rng.normal() : 0);
      cells.push(num(currentA * current.factor, current.decimals));
    }
    if (hasTemperature) {
      cells.push(num(cell.temperatureC! + (logger.temperatureNoiseC > 0 ? logger.temperatureNoiseC * rng.normal() : 0), 2));
    }
    lines.push(cells.join(logger.delimiter));
  }
  const eol = logger.lineEnding === 'crlf' ? '\r\n' : '\n';
  return {
    text: lines.join(eol) + eol,
    rows: count,
    columns,
    firstTimeS: logger.startS,
    lastTimeS: logger.startS + (count - 1) / logger.sampleRateHz,
  };
}
