/**
 * The settings of a stills run as the command line hands them to runStills (mm and percent as
 * typed; runStills converts to SI once), their checks that need no photo, and the list of the
 * run's inputs (the output folder may be none of them). Kept apart from runStills so the command
 * line can check them before the image and report libraries load.
 * Pure. @throws KerrError BAD_ARGUMENT (checkStillsOptions) naming the option at fault.
 * @example checkStillsOptions({ folder: 'run1', lengthMm: 50, effectiveLengthMm: 40, ... }) // throws: effective length below the length
 */
import { KerrError, invalid } from '../errors.js';
import type { Rect, TransferName } from '../media/types.js';

export interface RunStillsOptions {
  folder: string;
  voltsPath?: string;
  lengthMm: number;
  /** ± limit of the electrode length, mm (rectangular, u = T/√3). */
  lengthToleranceMm?: number;
  gapMm: number;
  gapToleranceMm?: number;
  effectiveLengthMm: number;
  polariserAngleDeg: number;
  staticRetardanceRad?: number;
  roi?: Rect;
  darkRoi?: Rect;
  referenceRoi?: Rect;
  transfer?: TransferName;
  cameraProfilePath?: string;
  openLevel?: number;
  /** ± limit of a given open level (same units; rectangular, u = T/√3). */
  openLevelTolerance?: number;
  openPhotoPath?: string;
  /** Voltage meter accuracy, ± percent of reading (default 1). */
  voltsAccuracyPercent?: number;
  label: string;
  robust: boolean;
  outDir: string;
  force: boolean;
  report: boolean;
  /** The options as typed, recorded in result.options. */
  asGiven: Record<string, unknown>;
}

/** Settings that can be checked before any photo is read. */
export function checkStillsOptions(o: RunStillsOptions): void {
  if (o.effectiveLengthMm < o.lengthMm) throw invalid(`an effective length at least the electrode length (${o.lengthMm} mm)`, '--effective-length-mm', o.effectiveLengthMm, 'Fringe fields only lengthen the cell');
  if (o.openLevel !== undefined && o.openPhotoPath !== undefined) throw new KerrError('BAD_ARGUMENT', 'give at most one of --open-level and --open-photo', { path: '--open-photo', hint: 'They are two ways to give the same open level' });
  if (o.transfer !== undefined && o.cameraProfilePath !== undefined) throw new KerrError('BAD_ARGUMENT', 'give --transfer or --camera-profile, not both', { path: '--camera-profile', hint: 'A camera profile replaces the transfer curve' });
  if (o.voltsAccuracyPercent !== undefined && !(o.voltsAccuracyPercent >= 0 && o.voltsAccuracyPercent < 50)) throw invalid('a voltage meter accuracy from 0 to 50 percent of reading', '--volts-accuracy', o.voltsAccuracyPercent);
  if (o.lengthToleranceMm !== undefined && !(o.lengthToleranceMm < o.lengthMm)) throw invalid(`a length tolerance from 0 to below the length (${o.lengthMm} mm)`, '--length-mm', o.lengthToleranceMm);
  if (o.gapToleranceMm !== undefined && !(o.gapToleranceMm < o.gapMm)) throw invalid(`a gap tolerance from 0 to below the gap (${o.gapMm} mm)`, '--gap-mm', o.gapToleranceMm);
  if (o.openLevelTolerance !== undefined && !(o.openLevelTolerance < (o.openLevel ?? Infinity))) throw invalid('a tolerance from 0 to below the open level', '--open-level', o.openLevelTolerance);
}

/** Every input of the run (the output folder may be none of them). */
export function stillsInputs(o: RunStillsOptions): string[] {
  return [o.folder, ...(o.voltsPath !== undefined ? [o.voltsPath] : []), ...(o.openPhotoPath !== undefined ? [o.openPhotoPath] : [])];
}

