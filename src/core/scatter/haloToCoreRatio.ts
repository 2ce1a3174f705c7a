/**
 * Halo-to-core ratio: how bright the static scatter halo just outside the beam is, relative to
 * the beam's modulation amplitude at its core:
 *
 *   R = (mean static light in the halo annulus − far dark level) / peak of the modulated map.
 *
 * Both terms come from the per-block regression (`modulationMaps`): the annulus mean and the
 * dark level are intercepts (static light), the peak is a slope (I_amp of the brightest block).
 * Standard error by first-order propagation (the numerator N and peak P independent):
 *   σ_R = √((σ_N/P)² + (N·σ_P/P²)²),  σ_N = √(σ_annulus² + σ_dark²),
 * with σ_annulus = √(Σ se(a_c)²)/n over the n annulus blocks.
 *
 * Dimensionless. A clean liquid gives R near 0 (only polariser leak and stray light); dirt that
 * scatters light forward raises it. Returns null (nothing to report) when there is no far dark
 * region or no annulus. Pure; throws nothing.
 * @example haloToCoreRatio(maps, regions) → { value: 0.021, stdErr: 0.0004 }
 */
import { quantity, type Quantity } from '../../quantity.js';
import type { ModulationMaps } from './modulationMaps.js';
import type { ScatterRegions } from './regionsFromMaps.js';
import { cellBoxContains } from './cellGeometry.js';

export interface HaloMeasure {
  ratio: Quantity;
  /** Mean static light in the annulus and the far dark level, linear units. */
  annulusLevel: number;
  darkLevel: number;
}

export function haloToCoreRatio(maps: ModulationMaps, regions: ScatterRegions): HaloMeasure | null {
  if (!regions.dark || regions.halo.cellCount <= 0) return null;
  const { outer, inner } = regions.halo;
  let sum = 0;
  let varSum = 0;
  let n = 0;
  for (let y = outer.y0; y <= outer.y1; y++) {
    for (let x = outer.x0; x <= outer.x1; x++) {
      if (cellBoxContains(inner, x, y)) continue;
      const c = y * maps.width + x;
      sum += maps.staticMap[c]!;
      varSum += maps.staticStdErr[c]! ** 2;
      n++;
    }
  }
  if (n === 0) return null;
  const annulusLevel = sum / n;
  const numerator = annulusLevel - regions.dark.level;
  const numeratorErr = Math.hypot(Math.sqrt(varSum) / n, regions.dark.levelStdErr);
  const peak = regions.peakModulated.value;
  const peakErr = regions.peakModulated.stdErr;
  const ratio = numerator / peak;
  const ratioErr = Math.hypot(numeratorErr / peak, (numerator * peakErr) / (peak * peak));
  return { ratio: quantity(ratio, ratioErr), annulusLevel, darkLevel: regions.dark.level };
}
