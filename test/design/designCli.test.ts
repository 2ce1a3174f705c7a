// Runs the real command line (node bin/kerrtrace.js); needs `npx tsc -p .` first, as `npm test` does.
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { cliEnv } from '../helpers/cliEnv.js';

const root = fileURLToPath(new URL('../..', import.meta.url));
const bin = `${root}bin/kerrtrace.js`;

function run(args: string[]): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [bin, 'design', ...args], { cwd: root, encoding: 'utf8', env: cliEnv() });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('kerrtrace design (real CLI)', () => {
  it('the compiled CLI exists (run `npx tsc -p .` first)', () => {
    expect(existsSync(`${root}dist/cli/main.js`)).toBe(true);
  });

  it('prints JSON with {value, unit} quantities and the cautions', () => {
    const r = run(['--kerr-constant', '2.4e-12', '--length-mm', '50', '--gap-mm', '5', '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout) as { kind: string; cases: Array<{ design: { halfWaveVoltage: { value: number; unit: string } } }>; cautions: unknown[] };
    expect(report.kind).toBe('kerrtrace-design');
    expect(report.cases[0]!.design.halfWaveVoltage.unit).toBe('V');
    expect(report.cases[0]!.design.halfWaveVoltage.value).toBeCloseTo(Math.sqrt(2.5e-5 / 2.4e-13), 6);
    expect(report.cautions.length).toBeGreaterThanOrEqual(4);
  });

  it('prints the human table by default', () => {
    const r = run(['--kerr-constant-cm', '2.4e-10', '--gap-mm', '10', '--target-voltage-v', '30000']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/eff\. length for V_pi\s+23\.15 mm/); // Lux worked example, ≈ 2.3 cm
    expect(r.stdout).toMatch(/Safety:/);
  });

  const bad: Array<[string, string[], RegExp]> = [
    ['negative geometry', ['--kerr-constant', '2.4e-12', '--length-mm', '-50', '--gap-mm', '5'], /expected a positive electrode length in mm for --length-mm but received "-50"/],
    ['unknown liquid', ['--liquid', 'glycerol', '--length-mm', '50', '--gap-mm', '5'], /unknown liquid "glycerol".*Known liquids: nitrobenzene, nitrotoluene, water/],
    ['missing Kerr constant', ['--length-mm', '50', '--gap-mm', '5'], /no Kerr constant was given/],
    ['malformed number', ['--kerr-constant', '2.4e-12', '--length-mm', '50', '--gap-mm', '5mm'], /for --gap-mm but received "5mm"/],
  ];
  for (const [what, args, message] of bad) {
    it(`bad input (${what}): one clear line, exit code 2, no stack trace`, () => {
      const r = run(args);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      const lines = r.stderr.trimEnd().split('\n');
      expect(lines).toHaveLength(1);
      expect(lines[0]).toMatch(/^kerrtrace: /);
      expect(lines[0]).toMatch(message);
      expect(r.stderr).not.toMatch(/\n\s+at /);
    });
  }
});
