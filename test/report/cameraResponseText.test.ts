import { describe, expect, it } from 'vitest';
import { cameraResponseText } from '../../src/report/cameraResponseText.js';
import type { CameraResponseRecord } from '../../src/result/schema.js';

const check: CameraResponseRecord['check'] = {
  checked: true, reason: null, gamma: { value: 0.66, stdErr: 0.036 },
  kerrConstantAtGamma: { value: 2.41e-12, stdErr: 1e-14, unit: 'm/V^2' }, relativeShiftB: 0.1,
  standardUncertainty: { value: 2.2e-13, unit: 'm/V^2' }, departs: true,
};

describe('cameraResponseText', () => {
  it('names the profile, its camera and residual when a profile was used', () => {
    const t = cameraResponseText({ route: 'profile', transfer: 'bt709', matrix: 'bt709', bitDepth: 8, check,
      profile: { path: 'phone.json', createdAt: '2026-12-02T12:00:00Z', camera: { Make: 'Acme', Model: 'P1' }, residualRms: 0.003, codeRange: [16, 200] } });
    expect(t?.used).toMatch(/camera profile phone\.json \(Acme P1, made 2026-12-02, fit residual 0\.30 %/);
    expect(t?.check).toMatch(/γ = 0\.660 ± 0\.036 \(departs from 1\)/);
  });

  it('says the tags were used, and why a check did not run', () => {
    const t = cameraResponseText({ route: 'tags', transfer: 'hlg', matrix: 'bt2020', bitDepth: 10, check: { ...check, checked: false, reason: 'the sweep reaches 40 %' } });
    expect(t?.used).toBe("hlg transfer from the file's tags, bt2020 matrix, 10-bit");
    expect(t?.check).toBe('response check not run: the sweep reaches 40 %');
    expect(cameraResponseText(undefined)).toBeNull();
  });
});
