/** The gates before a number is printed (issue 12): each one fires on its own case and a clean run passes. */
import { describe, expect, it } from 'vitest';
import { runGates, type GateInput } from '../../../src/core/gates/runGates.js';
import { frameNoise } from '../../../src/core/gates/frameNoise.js';

const clean: GateInput = {
  kerrConstant: 2.2e-12, kerrConstantStdErr: 2e-14, halfWaveVoltageV: 9800, halfWaveStdErrV: 40, converged: true, fitReason: 'xtol',
  identifiable: true, maxVoltageOverHalfWave: 1.1, residualRms: 0.002, signalAmplitude: 0.3, frameNoise: 0.001, syncAmbiguous: false, bitsPerPixel: 0.5,
  plausibleRangeMPerV2: [4.4e-14, 2.4e-12],
};

describe('runGates', () => {
  it('passes a clean run', () => {
    expect(runGates(clean)).toEqual({ failures: [], warnings: [] });
  });
  it('fails NaN figures, a fit that did not converge, a low sweep, a log from another recording, an ambiguous sync and starved compression', () => {
    const gate = (g: Partial<GateInput>) => runGates({ ...clean, ...g }).failures.map((f) => f.gate);
    expect(gate({ kerrConstant: NaN })).toContain('figures-finite');
    expect(gate({ converged: false, fitReason: 'max-iterations' })).toContain('fit-not-converged');
    expect(gate({ identifiable: false, maxVoltageOverHalfWave: 0.2 })).toContain('not-identifiable');
    expect(gate({ residualRms: 0.011 })).toContain('residual-excess'); // 11× the frame noise (issue 12), 3.7 % of the signal
    expect(gate({ residualRms: 0.005 })).not.toContain('residual-excess'); // 5× the frame noise but 1.7 % of the signal
    expect(gate({ syncAmbiguous: true })).toContain('sync-ambiguous');
    expect(gate({ bitsPerPixel: 0.01 })).toContain('compression-starved');
    expect(gate({ explainedShare: 0.08 })).toContain('weak-signal'); // a region on empty background (issue 12)
    expect(gate({ explainedShare: 0.95 })).not.toContain('weak-signal');
    expect(gate({ explainedShare: NaN })).not.toContain('weak-signal'); // no variation: other gates speak
  });
  it('warns (without failing) when B is more than 10× outside the liquid table', () => {
    const r = runGates({ ...clean, kerrConstant: 2.2e-6 }); // kV read as V gives B 10⁶× too large
    expect(r.failures).toEqual([]);
    expect(r.warnings.map((w) => w.code)).toEqual(['implausible-kerr-constant']);
  });
  it('names what to give or check as inputs, not as command-line options (cli/flagNames.ts adds those)', () => {
    const inputsOf = (g: Partial<GateInput>, gate: string) => runGates({ ...clean, ...g }).failures.find((f) => f.gate === gate)?.inputs;
    expect(inputsOf({ syncAmbiguous: true }, 'sync-ambiguous')).toEqual(['syncOffset']);
    expect(inputsOf({ identifiable: false, maxVoltageOverHalfWave: 0.2 }, 'not-identifiable')).toEqual(['openLevel']);
    expect(inputsOf({ ampVpiCorrelation: 0.999, relStdErrB: 0.5 }, 'weak-reach')).toEqual(['openLevel']);
    expect(runGates({ ...clean, kerrConstant: 2.2e-6 }).warnings[0]!.inputs).toEqual(['length', 'gap']);
    expect(runGates({ ...clean, converged: false }).failures[0]!.inputs).toBeUndefined();
  });
  it('frameNoise recovers the standard deviation of white noise on a ramp (σ·√6 rule, within 5 %)', () => {
    let s = 12345;
    const rnd = () => { s = (s * 1103515245 + 12345) % 2147483648; return s / 2147483648; };
    const x = Float64Array.from({ length: 20000 }, (_v, k) => 0.001 * k + 0.01 * Math.sqrt(-2 * Math.log(rnd() + 1e-12)) * Math.cos(2 * Math.PI * rnd()));
    expect(frameNoise(x)).toBeGreaterThan(0.0095);
    expect(frameNoise(x)).toBeLessThan(0.0105);
  });
});
