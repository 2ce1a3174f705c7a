/**
 * The uncertainty budget of one analysed run: the statistical term from the fit (correlated
 * residuals accounted for), the sync term by refitting V_π with the voltage read at the sync
 * offset ± its standard uncertainty (a central difference: u_r,sync = |V_π(+) − V_π(−)|/(2·V_π)),
 * the voltage calibration and geometry from the user's accuracy and tolerances (rectangular
 * limits, u = a/√3), the camera-response term when the caller has one, and the compression term
 * from the clip's bits per pixel (core/uncertainty/compressionTerm). Combined by
 * kerrUncertaintyBudget (GUM). Pure apart from calling the fit.
 */
import { fitKerrCurve, type KerrCurveFit, type KerrCurveInput } from '../core/fit/fitKerrCurve.js';
import { hysteresis } from '../core/scatter/hysteresis.js';
import { compressionRelB, COMPRESSION_B_REL_AT_ONE_BPP } from '../core/uncertainty/compressionTerm.js';
import { kerrUncertaintyBudget, rectangularRelative, type UncertaintyBudget } from '../core/uncertainty/uncertaintyBudget.js';

export interface RunUncertaintyInput {
  fit: KerrCurveFit;
  /** The fit's inputs for the frames used (in time order), without voltages. */
  fitInput: Omit<KerrCurveInput, 'voltageV'>;
  /** Voltage of the used frames at a given sync offset (s). */
  voltageAtOffset: (offsetS: number) => Float64Array;
  offsetS: number;
  /** Standard uncertainty of the sync offset, s; undefined when it was given by the user. */
  offsetStdErrS: number | undefined;
  /** Logger accuracy, ± percent of reading (limits). */
  voltsAccuracyPercent: number;
  gapM: number;
  gapToleranceM: number;
  /** Length the fit used (effective length when given) and its tolerance. */
  lengthM: number;
  lengthToleranceM: number;
  /**
   * The open level the amplitude was held at (fitInput.openLevel) and its standard uncertainty
   * (undefined: not given, the term is 0); omitted when no open level was used.
   */
  openLevel?: { stdErr: number | undefined; note: string };
  /** Relative standard uncertainty the camera response puts on B, when known. */
  cameraResponseRel?: number;
  /** Where the camera-response term comes from (default: the run's response check). */
  cameraResponseNote?: string;
  /** Bits per pixel per frame of the clip, for the compression term (omitted or NaN: not a video, no term). */
  bitsPerPixel?: number;
  /** Every frame (time order) for the rising/falling comparison; omitted: no ramp term. */
  frames?: { voltageV: Float64Array; intensity: Float64Array; include: Uint8Array; timesS: Float64Array };
}

/**
 * Relative systematic on V_π from rising and falling ramps disagreeing beyond their statistics:
 * each branch fitted with the amplitude held at the full fit's (core/scatter/hysteresis), then
 * √max(0, (ΔV_π/2)² − (σ_ΔV_π/2)²)/V_π.
 */
function rampConsistency(i: RunUncertaintyInput): { rel: number; note: string } {
  const fr = i.frames;
  if (!fr) return { rel: 0, note: 'rising and falling ramps not compared' };
  const vpi = i.fit.halfWaveVoltage.value;
  const { voltageSigmaV: _perFrame, intensity: _used, ...base } = i.fitInput;
  const h = hysteresis({
    ...fr,
    fitBranch: (v, y) => fitKerrCurve({
      ...base, voltageV: v, intensity: y, openLevel: i.fit.amplitude.value,
      halfWaveGuessesV: [vpi], onlyGivenStarts: true, robust: false,
    }),
  });
  if (!h.halfWaveUp || !h.halfWaveDown) return { rel: 0, note: `rising and falling ramps not compared: ${h.note ?? 'too few frames on one of them'}` };
  const half = (h.halfWaveUp.value - h.halfWaveDown.value) / 2;
  const sHalf = Math.hypot(h.halfWaveUp.stdErr ?? 0, h.halfWaveDown.stdErr ?? 0) / 2;
  const rel = Math.sqrt(Math.max(0, half * half - sHalf * sHalf)) / vpi;
  return { rel, note: `V_π from rising ramps ${h.halfWaveUp.value.toFixed(0)} V, falling ${h.halfWaveDown.value.toFixed(0)} V: the excess of their half-difference over its statistics` };
}

export function runUncertainty(i: RunUncertaintyInput): { kerrConstant: UncertaintyBudget; halfWaveVoltage: UncertaintyBudget } {
  const vpi = i.fit.halfWaveVoltage.value;
  const statisticalRel = (i.fit.halfWaveVoltage.stdErr ?? NaN) / vpi;
  let syncRel = 0;
  let syncNote = 'sync offset given by the user (--offset-s): no sync term';
  if (i.offsetStdErrS !== undefined && i.offsetStdErrS > 0) {
    const at = (sign: number): number => {
      const v = i.voltageAtOffset(i.offsetS + sign * i.offsetStdErrS!);
      const keep: number[] = [];
      for (let k = 0; k < v.length; k++) if (Number.isFinite(v[k]!)) keep.push(k);
      if (keep.length < 10) return NaN;
      const pick = (a: Float64Array | undefined) => (a ? Float64Array.from(keep, (k) => a[k]!) : undefined);
      const sigma = pick(i.fitInput.voltageSigmaV);
      const f = fitKerrCurve({
        ...i.fitInput, voltageV: Float64Array.from(keep, (k) => v[k]!), intensity: pick(i.fitInput.intensity)!,
        ...(sigma ? { voltageSigmaV: sigma } : {}),
        halfWaveGuessesV: [vpi], onlyGivenStarts: true,
      });
      return f.halfWaveVoltage.value;
    };
    const plus = at(1);
    const minus = at(-1);
    syncRel = Number.isFinite(plus) && Number.isFinite(minus) ? Math.abs(plus - minus) / (2 * vpi) : NaN;
    syncNote = `V_π refitted at the sync offset ± ${(i.offsetStdErrS * 1000).toFixed(1)} ms`;
  }
  let openRel = 0;
  let openNote: string | undefined;
  const level = i.fitInput.openLevel;
  if (i.openLevel && level !== undefined) {
    const u = i.openLevel.stdErr;
    if (u !== undefined && u > 0) {
      // V_π refitted with the amplitude held at the open level ± u: half the spread
      const v = i.voltageAtOffset(i.offsetS);
      const keep: number[] = [];
      for (let k = 0; k < v.length; k++) if (Number.isFinite(v[k]!)) keep.push(k);
      const pick = (x: Float64Array | undefined) => (x ? Float64Array.from(keep, (k) => x[k]!) : undefined);
      const sigma = pick(i.fitInput.voltageSigmaV);
      const at = (sign: number): number => (keep.length < 10 ? NaN : fitKerrCurve({
        ...i.fitInput, voltageV: pick(v)!, intensity: pick(i.fitInput.intensity)!,
        ...(sigma ? { voltageSigmaV: sigma } : {}),
        openLevel: level + sign * u, halfWaveGuessesV: [vpi], onlyGivenStarts: true,
      }).halfWaveVoltage.value);
      const plus = at(1);
      const minus = level - u > 0 ? at(-1) : vpi;
      const span = level - u > 0 ? 2 : 1;
      openRel = Number.isFinite(plus) && Number.isFinite(minus) ? Math.abs(plus - minus) / (span * vpi) : NaN;
      openNote = `V_π refitted with the open level ± ${u.toPrecision(2)} (${i.openLevel.note})`;
    } else {
      openNote = `open level uncertainty not given (${i.openLevel.note})`;
    }
  }
  const voltageCalibrationRel = rectangularRelative(i.voltsAccuracyPercent, 100);
  const ramp = rampConsistency(i);
  return kerrUncertaintyBudget({
    kerrConstant: i.fit.kerrConstant.value, halfWaveVoltageV: vpi, statisticalRel,
    syncRel, syncNote, rampRel: ramp.rel, rampNote: ramp.note,
    voltageCalibrationRel,
    ...(openNote !== undefined ? { openLevelRel: openRel, openLevelNote: openNote } : {}),
    voltageCalibrationNote: i.voltsAccuracyPercent > 0 ? `logger accuracy ±${i.voltsAccuracyPercent} % of reading (rectangular, /√3)` : 'logger accuracy given as 0',
    gapRel: rectangularRelative(i.gapToleranceM, i.gapM),
    gapNote: i.gapToleranceM > 0 ? `gap ±${(i.gapToleranceM * 1000).toPrecision(3)} mm (rectangular, /√3)` : 'no gap tolerance given (--gap-mm D±T)',
    lengthRel: rectangularRelative(i.lengthToleranceM, i.lengthM),
    lengthNote: i.lengthToleranceM > 0 ? `length ±${(i.lengthToleranceM * 1000).toPrecision(3)} mm (rectangular, /√3)` : 'no length tolerance given (--length-mm L±T)',
    ...(i.cameraResponseRel !== undefined ? { cameraResponseRel: i.cameraResponseRel, cameraResponseNote: i.cameraResponseNote ?? 'camera response check' } : {}),
    ...(i.bitsPerPixel !== undefined && Number.isFinite(i.bitsPerPixel) && i.bitsPerPixel > 0
      ? { compressionRel: compressionRelB(i.bitsPerPixel), compressionNote: `lossy video coding at ${i.bitsPerPixel.toPrecision(2)} bits per pixel per frame: ${(COMPRESSION_B_REL_AT_ONE_BPP * 100).toPrecision(1)} % of B / √(bits per pixel) (Type B, from the coverage study)` }
      : {}),
  });
}
