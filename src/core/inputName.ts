/**
 * The user's inputs as the core names them in its errors, gate failures and warnings, when it asks
 * the user to give or check one ("give the beam region"). The core never names a command-line
 * option: it carries these names as data (`KerrError.inputs`, `RunWarning.inputs`,
 * `RunGateFailure.inputs`) and the command line turns them into its option names
 * (`cli/flagNames.ts`), so wording and options can change apart.
 *
 * - beamRegion, darkRegion, referenceRegion: the measured rectangles (beam, closed-shutter dark,
 *   constant reference card), x,y,w,h in pixels
 * - gap, length, electrodeHeight: the cell's electrode gap, electrode length and height
 * - polariserAngle: the polariser's angle to the field
 * - syncOffset: the time offset between the clip and the voltage log
 * - openLevel: a recorded open (analyser-parallel) level, from a window, a clip or a number
 * - baseline: the result of a baseline run (filled with the pure solvent, or the empty cell)
 * - transfer, cameraProfile: how code values become light (a named curve, a measured profile)
 * - analyserAngles: the analyser angles of a calibration recording
 * @example new KerrError('NOT_IDENTIFIABLE', 'no beam found', { hint: 'Give the beam region', inputs: ['beamRegion'] })
 */
export type InputName =
  | 'beamRegion'
  | 'darkRegion'
  | 'referenceRegion'
  | 'gap'
  | 'length'
  | 'electrodeHeight'
  | 'polariserAngle'
  | 'syncOffset'
  | 'openLevel'
  | 'baseline'
  | 'transfer'
  | 'cameraProfile'
  | 'analyserAngles';
