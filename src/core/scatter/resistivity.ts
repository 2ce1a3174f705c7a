/**
 * The liquid's resistivity from the supply log's current column. Between parallel plates of
 * length L and height h (electrode area A = L·h; the electrode length, not the optical effective
 * length) at gap d, Ohm's law gives R = V/I and
 *
 *   ρ = R·A/d = V·A/(I·d)      (ohm·m),   Joule power at the highest voltage P = V_max²/R.
 *
 * R comes from a least-squares line through all log rows with a current, I = I₀ + G·V (G = 1/R;
 * the offset I₀ absorbs the meter's zero, `withOffset`, default true) or I = G·V through the origin.
 * Standard errors: σ_G from the regression (Draper & Smith, "Applied Regression Analysis", §1.4),
 * σ_ρ = ρ·σ_G/G, σ_P = V_max²·σ_G (first order).
 *
 * Not readable (`readable: false`, with a note) when the current cannot be told from zero:
 * the slope's t = G/σ_G < 3, G ≤ 0, or the current at V_max, G·V_max, is below 3 steps of the
 * log's resolution (the smallest difference between distinct current readings). Then
 * `resistivity` holds a lower bound, A/(d·G_max) with G_max = max(G + 3σ_G, 3·step/V_max), and
 * `joulePower` the matching upper bound, V_max²·G_max; the note says so.
 *
 * The cell's charging current C·dV/dt is ignored: for a centimetre cell (C of tens of pF) swept at
 * kV/s it is tens of nA, far below the leakage of a liquid worth measuring this way.
 * Units: V, A, m in; ohm·m and W out. Pure. Throws KerrError BAD_ARGUMENT for non-positive
 * sizes and INTERNAL for arrays of different length.
 * @example liquidResistivity({ voltageV: Float64Array.of(0, 5000, 10000), currentA: Float64Array.of(0, 5e-6, 1e-5),
 *   lengthM: 0.05, electrodeHeightM: 0.01, gapM: 0.005 }).resistivity.value → 1e8 (ohm·m)
 */
import { KerrError, invalid } from '../../errors.js';
import { quantity, type Quantity } from '../../quantity.js';

export interface ResistivityInput {
  voltageV: Float64Array;
  /** Current per log row, A; NaN where the cell was empty. */
  currentA: Float64Array;
  /** Electrode length along the beam, m (not the effective optical length). */
  lengthM: number;
  electrodeHeightM: number;
  gapM: number;
  withOffset?: boolean;
}

export interface Resistivity {
  resistivity: Quantity;
  joulePower: Quantity;
  readable: boolean;
  note?: string;
  /** Fitted conductance G = 1/R (S), its standard error, the meter offset (A), t = G/σ_G. */
  conductanceS: number;
  conductanceStdErrS: number;
  offsetA: number;
  tValue: number;
  /** Smallest step between distinct current readings, A (NaN with fewer than two). */
  resolutionA: number;
  rows: number;
  maxVoltageV: number;
}

export function liquidResistivity(input: ResistivityInput): Resistivity {
  const { voltageV, currentA, lengthM, electrodeHeightM, gapM } = input;
  if (currentA.length !== voltageV.length) throw new KerrError('INTERNAL', 'voltage and current columns must have one entry per log row');
  if (!(lengthM > 0)) throw invalid('a positive electrode length in m', 'lengthM', lengthM);
  if (!(electrodeHeightM > 0)) {
    throw new KerrError('BAD_ARGUMENT', `expected a positive electrode height but received ${electrodeHeightM * 1e3} mm`, { path: 'electrodeHeight', inputs: ['electrodeHeight'] });
  }
  if (!(gapM > 0)) throw invalid('a positive gap in m', 'gapM', gapM);
  const withOffset = input.withOffset ?? true;
  const areaM2 = lengthM * electrodeHeightM;

  const rowsV: number[] = [];
  const rowsI: number[] = [];
  for (let i = 0; i < voltageV.length; i++) {
    if (Number.isFinite(voltageV[i]!) && Number.isFinite(currentA[i]!)) { rowsV.push(voltageV[i]!); rowsI.push(currentA[i]!); }
  }
  const n = rowsV.length;
  const maxVoltageV = rowsV.reduce((m, v) => Math.max(m, Math.abs(v)), 0);
  const distinct = Array.from(new Set(rowsI)).sort((a, b) => a - b);
  let resolutionA = NaN;
  for (let k = 1; k < distinct.length; k++) {
    const step = distinct[k]! - distinct[k - 1]!;
    if (step > 0 && !(step >= resolutionA)) resolutionA = step;
  }

  let g = NaN, gErr = NaN, offset = 0;
  const p = withOffset ? 2 : 1;
  if (n > p + 1) {
    if (withOffset) {
      const vm = rowsV.reduce((s, v) => s + v, 0) / n;
      const im = rowsI.reduce((s, v) => s + v, 0) / n;
      let svv = 0, svi = 0;
      for (let k = 0; k < n; k++) { svv += (rowsV[k]! - vm) ** 2; svi += (rowsV[k]! - vm) * (rowsI[k]! - im); }
      if (svv > 0) {
        g = svi / svv;
        offset = im - g * vm;
        let rss = 0;
        for (let k = 0; k < n; k++) rss += (rowsI[k]! - offset - g * rowsV[k]!) ** 2;
        gErr = Math.sqrt(rss / (n - 2) / svv);
      }
    } else {
      let svv = 0, svi = 0;
      for (let k = 0; k < n; k++) { svv += rowsV[k]! ** 2; svi += rowsV[k]! * rowsI[k]!; }
      if (svv > 0) {
        g = svi / svv;
        let rss = 0;
        for (let k = 0; k < n; k++) rss += (rowsI[k]! - g * rowsV[k]!) ** 2;
        gErr = Math.sqrt(rss / (n - 1) / svv);
      }
    }
  }
  const t = gErr > 0 ? g / gErr : g > 0 ? Infinity : NaN;
  const resolutionFloor = Number.isFinite(resolutionA) ? 3 * resolutionA : 0;
  const base = { conductanceS: g, conductanceStdErrS: gErr, offsetA: offset, tValue: t, resolutionA, rows: n, maxVoltageV };

  const reasons: string[] = [];
  if (!Number.isFinite(g) || maxVoltageV === 0) reasons.push(n <= p + 1 ? `only ${n} log rows have a current` : 'the voltage does not vary in the rows with a current');
  else {
    if (!(g > 0)) reasons.push('the current does not rise with the voltage');
    else if (!(t >= 3)) reasons.push(`the current's rise with voltage is not significant (t = ${t.toFixed(1)} < 3)`);
    if (distinct.length < 2) reasons.push('the current column never changes');
    else if (g * maxVoltageV < resolutionFloor) reasons.push(`the current at ${formatSi(maxVoltageV, 'V')} is below 3 steps of the log's resolution (${formatSi(resolutionA, 'A')})`);
  }
  if (reasons.length === 0) {
    const rho = areaM2 / (gapM * g);
    return {
      ...base,
      resistivity: quantity(rho, (rho * gErr) / g, 'ohm m'),
      joulePower: quantity(maxVoltageV * maxVoltageV * g, maxVoltageV * maxVoltageV * gErr, 'W'),
      readable: true,
    };
  }
  const gMax = Math.max(Number.isFinite(g) && Number.isFinite(gErr) ? Math.max(g, 0) + 3 * gErr : 0, maxVoltageV > 0 ? resolutionFloor / maxVoltageV : 0);
  const rhoMin = gMax > 0 ? areaM2 / (gapM * gMax) : Infinity;
  const powerMax = maxVoltageV * maxVoltageV * gMax;
  const bound = Number.isFinite(rhoMin) ? `; the resistivity is at least ${formatSi(rhoMin, 'ohm m')} and the Joule power at most ${formatSi(powerMax, 'W')}` : '';
  return {
    ...base,
    resistivity: quantity(rhoMin, undefined, 'ohm m'),
    joulePower: quantity(powerMax, undefined, 'W'),
    readable: false,
    note: `the current is too small to read: ${reasons.join('; ')}${bound}`,
  };
}

function formatSi(x: number, unit: string): string {
  return `${Number(x.toPrecision(3)).toString()} ${unit}`;
}
