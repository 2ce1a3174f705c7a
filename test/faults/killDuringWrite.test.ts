/**
 * Kills `compare` and `analyze --force` at many points of the write and of the replace (SIGKILL
 * and SIGTERM) and checks, after every kill, the output policy's promise (src/io/outputDir.ts):
 * either the earlier complete result or the new complete result is at the path, or a named
 * backup that the next run restores; no input is ever touched; the next run removes what the
 * killed one left behind. Kill points are the announced steps of the test-only hook
 * KERRTRACE_TEST_STEP_DELAY_MS (every step of the replace is hit), seeded random times, and,
 * without any hook, the moment a large earlier result starts to disappear.
 * Kills that land before the process ends are counted: at least 52 (38 compare, 14 analyze), in
 * about 4 minutes on two busy cores.
 */
import { cpSync, existsSync, mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { seededRandom } from '../helpers/random.js';
import {
  FIXTURE_RESULTS, MEDIA, completeComparisonLabel, completeRunLabel, hashTree, kerrtrace, leftovers, runAndKill,
} from './faultHelpers.js';

const STEP_MS = '20';
const env = { KERRTRACE_TEST_STEP_DELAY_MS: STEP_MS };

/** Steps of the compare write and replace (as announced by the hook) the kills aim at. */
const COMPARE_STEPS = [
  'staged', 'wrote plots/compare-kerrConstant.svg', 'wrote plots/compare-floorFraction.png', 'wrote comparison.json',
  'wrote summary.md', 'wrote comparison.html', 'moved old aside', 'moved new in', 'deleted old comparison.csv',
  'deleted old comparison.json', 'deleted old plots', 'deleted old summary.md',
];
const ANALYZE_STEPS = ['staged', 'wrote trace.csv', 'wrote result.json', 'moved old aside', 'moved new in', 'deleted old result.json', 'deleted old trace.csv'];

let kills = 0;

/**
 * After a kill: the path holds one complete result whose label is `before` or `attempted`, or it
 * is missing and the next run (`nextRun`) restores the backup to `before`. Returns the label now there.
 */
function checkAfterKill(dir: string, before: string, attempted: string, labelOf: (d: string) => string, nextRun: () => void): string {
  if (!existsSync(dir)) {
    expect(leftovers(dir).some((e) => e.includes('.backup-')), `nothing at ${dir} and no backup: ${leftovers(dir).join(', ')}`).toBe(true);
    nextRun();
    expect(existsSync(dir), 'the next run restores the backup').toBe(true);
    expect(labelOf(dir)).toBe(before);
    return before;
  }
  const label = labelOf(dir);
  expect([before, attempted]).toContain(label);
  return label;
}

describe('kill at any moment of writing or replacing', () => {
  it('compare: 38 kills that land (KILL and TERM) at every step and at random times lose no result and touch no input', async () => {
    const work = mkdtempSync(join(tmpdir(), 'kt-kill-cmp-'));
    const inputs = join(work, 'runs');
    mkdirSync(inputs);
    cpSync(join(FIXTURE_RESULTS, 'before'), join(inputs, 'before'), { recursive: true });
    cpSync(join(FIXTURE_RESULTS, 'after'), join(inputs, 'after'), { recursive: true });
    const inputHashes = hashTree(inputs);
    const out = join(work, 'cmp');
    const args = (label: string) => ['compare', join(inputs, 'before'), join(inputs, 'after'), '--out', out, '--force', '--label', `${label}-a`, '--label', `${label}-b`];
    const first = kerrtrace(args('v0'));
    expect(first.code, first.stderr).toBe(0);
    let current = completeComparisonLabel(out);
    const random = seededRandom(20261202);
    const landed = kills;
    for (let i = 1; kills - landed < 38 && i <= 60; i++) {
      const signal: NodeJS.Signals = i % 3 === 0 ? 'SIGTERM' : 'SIGKILL';
      const byStep = i <= 2 * COMPARE_STEPS.length;
      const plan = byStep
        ? { atStep: COMPARE_STEPS[i % COMPARE_STEPS.length]!, jitterMs: Math.floor(random() * Number(STEP_MS)), signal, env }
        : { afterMs: 150 + Math.floor(random() * 1800), signal, env };
      const r = await runAndKill(args(`v${i}`), plan);
      if (r.killed) kills++;
      if (signal === 'SIGTERM' && r.killed) expect(r.stderr).not.toMatch(/\n\s+at /);
      current = checkAfterKill(out, current, `v${i}-a+v${i}-b`, completeComparisonLabel, () => {
        const next = kerrtrace(['compare', join(inputs, 'before'), join(inputs, 'after'), '--out', out]);
        expect(next.stderr).toMatch(/restored the earlier result/);
      });
      expect(hashTree(inputs)).toEqual(inputHashes);
    }
    // The next run that writes there cleans up whatever the killed runs left.
    const last = kerrtrace(args('final'));
    expect(last.code, last.stderr).toBe(0);
    expect(completeComparisonLabel(out)).toBe('final-a+final-b');
    expect(leftovers(out)).toEqual([]);
    expect(hashTree(inputs)).toEqual(inputHashes);
  }, 600_000);

  it('compare --force over a large earlier result: kills the moment the earlier result starts to go (no hook needed)', async () => {
    // The earlier result gets 4000 extra files in plots/, so deleting it takes a while; the kill
    // lands as soon as any of its files disappears, wherever that happens in the replace.
    const work = mkdtempSync(join(tmpdir(), 'kt-kill-big-'));
    const runs = [join(FIXTURE_RESULTS, 'before'), join(FIXTURE_RESULTS, 'after')];
    const out = join(work, 'cmp');
    const args = (label: string) => ['compare', ...runs, '--out', out, '--force', '--label', `${label}-a`, '--label', `${label}-b`];
    const first = kerrtrace(args('v0'));
    expect(first.code, first.stderr).toBe(0);
    let current = completeComparisonLabel(out);
    let landed = 0;
    for (let i = 1; i <= 8; i++) {
      if (!existsSync(join(out, 'plots', 'bulk-0000.txt'))) for (let k = 0; k < 4000; k++) writeFileSync(join(out, 'plots', `bulk-${String(k).padStart(4, '0')}.txt`), 'x');
      const watched = [join(out, '.kerrtrace-output'), join(out, 'comparison.json'), join(out, 'comparison.html'), join(out, 'plots', 'bulk-0000.txt'), join(out, 'plots', 'bulk-3999.txt')];
      const r = await runAndKill(args(`v${i}`), { whenGone: watched, signal: i % 2 === 0 ? 'SIGTERM' : 'SIGKILL' });
      if (r.killed) landed++;
      current = checkAfterKill(out, current, `v${i}-a+v${i}-b`, completeComparisonLabel, () => {
        const next = kerrtrace(['compare', ...runs, '--out', out]);
        expect(next.stderr).toMatch(/restored the earlier result/);
      });
    }
    // With the policy the earlier result leaves the path by one rename and is deleted aside, so
    // fewer kills land than against the old delete-then-rename (which lost the result at once).
    expect(landed).toBeGreaterThanOrEqual(2);
    kills += landed;
    const last = kerrtrace(args('final'));
    expect(last.code, last.stderr).toBe(0);
    expect(leftovers(out)).toEqual([]);
  }, 600_000);

  it('analyze --force: 14 kills that land at every step of the replace and at random times lose no result and touch no input', async () => {
    const work = mkdtempSync(join(tmpdir(), 'kt-kill-an-'));
    const inputs = join(work, 'bench');
    cpSync(join(MEDIA, 'sparks-halo', 'run'), inputs, { recursive: true });
    const inputHashes = hashTree(inputs);
    const out = join(work, 'run.kerrtrace');
    const args = (label: string) => [
      'analyze', join(inputs, 'clip.mp4'), '--volts', join(inputs, 'volts.csv'), '--length-mm', '45', '--gap-mm', '4.5',
      '--out', out, '--force', '--quiet', '--no-report', '--no-maps', '--label', label,
    ];
    const first = kerrtrace(args('v0'));
    expect(first.code, first.stderr).toBe(0);
    let current = completeRunLabel(out);
    const random = seededRandom(11);
    const landed = kills;
    for (let i = 1; kills - landed < 14 && i <= 24; i++) {
      const signal: NodeJS.Signals = i % 4 === 0 ? 'SIGTERM' : 'SIGKILL';
      const plan = i <= ANALYZE_STEPS.length
        ? { atStep: ANALYZE_STEPS[i - 1]!, jitterMs: Math.floor(random() * Number(STEP_MS)), signal, env }
        : { afterMs: 300 + Math.floor(random() * 2200), signal, env };
      const r = await runAndKill(args(`v${i}`), plan);
      if (r.killed) kills++;
      current = checkAfterKill(out, current, `v${i}`, completeRunLabel, () => {
        const next = kerrtrace(args('ignored').filter((a) => a !== '--force'));
        expect(next.stderr).toMatch(/restored the earlier result/);
      });
      expect(hashTree(inputs)).toEqual(inputHashes);
    }
    const last = kerrtrace(args('final'));
    expect(last.code, last.stderr).toBe(0);
    expect(completeRunLabel(out)).toBe('final');
    expect(leftovers(out)).toEqual([]);
    expect(kills, 'kills that landed before the process ended').toBeGreaterThanOrEqual(50);
  }, 600_000);
});
