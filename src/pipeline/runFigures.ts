/**
 * The scatter and liquid figures of a run that need no pictures, all from its one fit and its one
 * list of exclusions: particle-event rate (found before the fit, frameExclusions), floor flicker,
 * with a baseline run the polariser-leak and scatter floors, the up/down (hysteresis) comparison
 * with its sync-offset verdict (named `compression-lag` instead in footage below
 * LAG_PRONE_BITS_PER_PIXEL), and the liquid's resistivity from the log's current column.
 * They are the same with and without maps; the maps add only the halo-to-core ratio
 * (mapProducts). The maths is in src/core/scatter; this file only wires it.
 * Throws KerrError BAD_RESULT for a baseline that is not a kerrtrace run result.
 */
import { KerrError } from '../errors.js';
import { fitKerrCurve, type KerrCurveFit } from '../core/fit/fitKerrCurve.js';
import { floorFlicker } from '../core/scatter/floorFlicker.js';
import { baselineFloor } from '../core/scatter/baselineFloor.js';
import { hysteresis as fitHysteresis, type BranchFitter } from '../core/scatter/hysteresis.js';
import { hysteresisVerdict } from '../core/scatter/hysteresisVerdict.js';
import { liquidResistivity } from '../core/scatter/resistivity.js';
import { LAG_PRONE_BITS_PER_PIXEL } from '../core/uncertainty/compressionTerm.js';
import type { Quantity } from '../quantity.js';
import type { VoltageLog } from '../io/voltageLog.js';
import type { RunResult, RunWarning } from '../result/schema.js';
import type { RunCell } from './runCell.js';

export interface RunFiguresInput {
  fit: KerrCurveFit;
  cell: RunCell;
  times: Float64Array;
  voltage: Float64Array;
  intensity: Float64Array;
  modulation: Float64Array;
  used: Uint8Array;
  particleRate: Quantity;
  floorFraction: Quantity;
  syncOffset: Quantity;
  voltageAt: (logTimesS: Float64Array) => Float64Array;
  log: VoltageLog;
  baseline?: RunResult;
  /** Bits per pixel per frame of the clip (omitted: photos), to tell codec lag from hysteresis. */
  bitsPerPixel?: number;
}

export interface RunFigures {
  scatter: NonNullable<RunResult['scatter']>;
  hysteresis?: NonNullable<RunResult['hysteresis']>;
  /** Up/down comparison details, also when it could not be made (then `note` says why). */
  hysteresisDetail: { framesUp: number; framesDown: number; framesHeld: number; note?: string } | null;
  conductivity?: NonNullable<RunResult['conductivity']>;
  warnings: RunWarning[];
}

/** Throws BAD_RESULT unless `baseline` is a kerrtrace run result (checked before any work). */
export function checkBaseline(baseline: RunResult | undefined): void {
  if (baseline !== undefined && (baseline === null || baseline.kind !== 'kerrtrace-run')) {
    throw new KerrError('BAD_RESULT', 'the baseline is not a kerrtrace run result', { path: '--baseline', hint: 'Give the result.json that `kerrtrace analyze` wrote for the baseline run' });
  }
}

function upDown(i: RunFiguresInput, warnings: RunWarning[]): Pick<RunFigures, 'hysteresis' | 'hysteresisDetail'> {
  const { fit, cell } = i;
  const fitBranch: BranchFitter = (v, y) => fitKerrCurve({
    voltageV: v, intensity: y, effectiveLengthM: cell.effectiveLengthM, gapM: cell.gapM, polariserAngleDeg: cell.polariserAngleDeg,
    staticRetardanceRad: cell.staticRetardanceRad ?? 0, openLevel: fit.amplitude.value, halfWaveGuessesV: [fit.halfWaveVoltage.value],
    onlyGivenStarts: true, // each branch lies near the full fit
    robust: false, // events are already left out; plain least squares keeps this quick
  });
  const h = fitHysteresis({ voltageV: i.voltage, intensity: i.intensity, include: i.used, timesS: i.times, fitBranch });
  let result = h.result;
  // A difference the sync offset's uncertainty alone could open is not hysteresis.
  const u = i.syncOffset.stdErr;
  if (result && u !== undefined && u > 0 && i.log.rows >= 2) {
    const diffAt = (sign: number): number => {
      const v = i.voltageAt(Float64Array.from(i.times, (t) => t - (i.syncOffset.value + sign * u)));
      const again = fitHysteresis({ voltageV: v, intensity: i.intensity, include: i.used, timesS: i.times, fitBranch });
      return again.result ? again.result.difference.value : NaN;
    };
    const verdict = hysteresisVerdict(result, diffAt(1), diffAt(-1));
    result = { up: verdict.up, down: verdict.down, difference: verdict.difference, zScore: verdict.zScore, flagged: verdict.flagged };
  }
  if (result?.flagged) {
    const rel = (100 * result.difference.value) / ((result.up.value + result.down.value) / 2);
    const differs = `the Kerr constant differs between rising and falling voltage by ${rel.toFixed(1)}% (${Math.abs(result.zScore).toFixed(1)} standard errors)`;
    const bpp = i.bitsPerPixel;
    if (bpp !== undefined && Number.isFinite(bpp) && bpp > 0 && bpp < LAG_PRONE_BITS_PER_PIXEL) {
      // a starved codec updates a dim spot late: the same signature as hysteresis, from the camera
      warnings.push({ code: 'compression-lag', message: `${differs}, in footage of only ${bpp.toPrecision(2)} bits per pixel per frame: a codec this starved lets a dim spot lag the drive, which looks the same; record at a higher bitrate or quality before blaming the liquid (the difference enters the uncertainty as the ramp-consistency term)`, guideSection: 'sweep' });
    } else {
      warnings.push({ code: 'hysteresis', message: `${differs}: the liquid may conduct (space charge) or its temperature drifted; check its purity and dryness`, guideSection: 'sweep' });
    }
  } else if (!result && h.note) {
    warnings.push({ code: 'hysteresis-not-measured', message: `up- and down-sweeps could not be compared: ${h.note}`, guideSection: 'sweep' });
  }
  return { ...(result ? { hysteresis: result } : {}), hysteresisDetail: { framesUp: h.framesUp, framesDown: h.framesDown, framesHeld: h.framesHeld, ...(h.note ? { note: h.note } : {}) } };
}

function conductivityOf(i: RunFiguresInput, warnings: RunWarning[]): RunFigures['conductivity'] {
  if (!i.log.currentA) return undefined;
  if (i.cell.electrodeHeightM === null) {
    warnings.push({ code: 'no-electrode-height', message: 'the voltage log has a current column; give --electrode-height-mm to get the liquid\'s resistivity' });
    return undefined;
  }
  const r = liquidResistivity({ voltageV: i.log.voltageV, currentA: i.log.currentA, lengthM: i.cell.lengthM, electrodeHeightM: i.cell.electrodeHeightM, gapM: i.cell.gapM });
  return { resistivity: r.resistivity, joulePower: r.joulePower, readable: r.readable, ...(r.note ? { note: r.note } : {}) };
}

export function runFigures(i: RunFiguresInput): RunFigures {
  const warnings: RunWarning[] = [];
  const scatter: RunFigures['scatter'] = {};
  if (Number.isFinite(i.particleRate.value)) scatter.particleEventRate = i.particleRate;
  if (i.baseline) {
    const split = baselineFloor(i.floorFraction, i.baseline.floorFraction);
    scatter.polariserLeakFraction = split.polariserLeakFraction;
    scatter.scatterFloorFraction = split.scatterFloorFraction;
    if (Math.abs(i.baseline.cell.polariserAngleDeg - i.cell.polariserAngleDeg) > 1) {
      warnings.push({ code: 'baseline-mismatch', message: `the baseline run had the polariser at ${i.baseline.cell.polariserAngleDeg}° but this run at ${i.cell.polariserAngleDeg}°, so their floors are not comparable` });
    }
  }
  // Flicker and the up/down fits need the modulation term, unknown when V_π is not identifiable.
  let updown: Pick<RunFigures, 'hysteresis' | 'hysteresisDetail'> = { hysteresisDetail: null };
  if (i.fit.identifiable) {
    const flicker = floorFlicker({ intensity: i.intensity, modulation: i.modulation, amplitude: i.fit.amplitude.value, include: i.used });
    if (flicker) scatter.floorFlicker = flicker.flicker;
    updown = upDown(i, warnings);
  }
  const conductivity = conductivityOf(i, warnings);
  return { scatter, ...updown, ...(conductivity ? { conductivity } : {}), warnings };
}
