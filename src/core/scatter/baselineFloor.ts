/**
 * Splits a run's floor into polariser leak and scatter with a baseline run: a recording of the
 * same polarisers without the cell (or with a clean reference liquid), analysed the same way.
 *
 *   polariser leak fraction = F_baseline            (floorFraction of the baseline run)
 *   scatter floor fraction  = F_run − F_baseline,   σ = √(σ_run² + σ_baseline²)
 *
 * Both are fractions of the modulation amplitude I_amp (dimensionless), so the two runs may use
 * different exposures. The difference can come out slightly negative within its error when the
 * liquid adds nothing. Pure. Throws KerrError BAD_RESULT (path and input `baseline`) when the baseline's
 * floor fraction is missing or not a finite number.
 * @example baselineFloor(quantity(0.012, 0.001), quantity(0.004, 0.0005))
 *   → { polariserLeakFraction: 0.004 ± 0.0005, scatterFloorFraction: 0.008 ± 0.0011 }
 */
import { KerrError } from '../../errors.js';
import { quantity, type Quantity } from '../../quantity.js';

export interface BaselineFloor {
  polariserLeakFraction: Quantity;
  scatterFloorFraction: Quantity;
}

export function baselineFloor(runFloorFraction: Quantity, baselineFloorFraction: Quantity | undefined): BaselineFloor {
  if (!baselineFloorFraction || !Number.isFinite(baselineFloorFraction.value)) {
    throw new KerrError('BAD_RESULT', `the baseline result has no usable floor fraction (${baselineFloorFraction ? String(baselineFloorFraction.value) : 'missing'})`, {
      path: 'baseline',
      hint: 'Give the result.json of a baseline run that kerrtrace analysed completely',
      inputs: ['baseline'],
    });
  }
  const runErr = runFloorFraction.stdErr;
  const baseErr = baselineFloorFraction.stdErr;
  const diffErr = runErr !== undefined && baseErr !== undefined ? Math.hypot(runErr, baseErr) : undefined;
  return {
    polariserLeakFraction: quantity(baselineFloorFraction.value, baseErr),
    scatterFloorFraction: quantity(runFloorFraction.value - baselineFloorFraction.value, diffErr),
  };
}
