/**
 * Plain sentences for the report and summary about the camera response a run used: which route
 * (the file's tags, --transfer, or a camera profile with its residual and camera), and what the
 * run's own check found (γ ± σ and the effect on B, or why it could not run).
 * Pure. Throws nothing.
 * @example cameraResponseText(result.cameraResponse).used // "camera profile phone.json (Pixel 8, fit residual 0.3 % of the light range)"
 */
import type { CameraResponseRecord } from '../result/schema.js';

export function cameraResponseText(c: CameraResponseRecord | undefined): { used: string; check: string } | null {
  if (c === undefined) return null;
  let used: string;
  if (c.route === 'profile' && c.profile) {
    const cam = Object.values(c.profile.camera).join(' ');
    used = `camera profile ${c.profile.path} (${cam ? `${cam}, ` : ''}made ${c.profile.createdAt.slice(0, 10)}, fit residual ${(c.profile.residualRms * 100).toFixed(2)} % of the light range, codes ${c.profile.codeRange[0].toFixed(0)}–${c.profile.codeRange[1].toFixed(0)})`;
  } else {
    used = `${c.transfer} transfer from ${c.route === 'option' ? 'the --transfer option' : 'the file\'s tags'}, ${c.matrix} matrix, ${c.bitDepth}-bit`;
  }
  const k = c.check;
  const check = k.checked
    ? `response check: light ∝ (linearised intensity)^γ with γ = ${k.gamma.value.toFixed(3)} ± ${k.gamma.stdErr.toFixed(3)}${k.departs ? ' (departs from 1)' : ' (consistent with 1)'}; B at that γ differs by ${(k.relativeShiftB * 100).toFixed(2)} %; camera-response uncertainty of B ${k.standardUncertainty.value.toExponential(2)} m/V²`
    : `response check not run: ${k.reason ?? 'no reason given'}`;
  return { used, check };
}
