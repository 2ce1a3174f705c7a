/**
 * A Vitest reporter that ends the run with the outside sources it checked: for every source of
 * test/setup/outsideSources.ts, how many tests carrying its tag passed, failed or were skipped in
 * this run (read from the test results, so a source whose tests did not run is reported as not
 * run, never as checked). It also prints the browser opt-out when KERRTRACE_SKIP_BROWSER=1 was used.
 * Wired in vitest.config.ts after the default reporter.
 */
import type { Reporter, TestCase, TestModule } from 'vitest/node';
import { OUTSIDE, OUTSIDE_SOURCES } from './outsideSources.js';

interface Tally {
  passed: number;
  failed: number;
  skipped: number;
}

function suiteFailed(suite: TestCase['parent']): boolean {
  for (let s: TestCase['parent'] | undefined = suite; s; s = s.type === 'suite' ? s.parent : undefined) {
    if (s.state() === 'failed') return true;
  }
  return false;
}

/** Tallies per tag over every test of the run. */
export function tallyByTag(modules: ReadonlyArray<TestModule>): Map<string, Tally> {
  const tallies = new Map<string, Tally>();
  for (const module of modules) {
    for (const test of module.children.allTests()) {
      let state: string = test.result().state;
      // A test skipped because its suite's setup failed (no browser, say) did not pass: count it failed.
      if (state === 'skipped' && suiteFailed(test.parent)) state = 'failed';
      for (const tag of test.tags) {
        const t = tallies.get(tag) ?? { passed: 0, failed: 0, skipped: 0 };
        if (state === 'passed') t.passed++;
        else if (state === 'failed') t.failed++;
        else if (state === 'skipped') t.skipped++;
        tallies.set(tag, t);
      }
    }
  }
  return tallies;
}

/** The summary lines for a run's tallies (pure, so it can be tested). */
export function summaryLines(tallies: Map<string, Tally>, env: NodeJS.ProcessEnv = process.env): string[] {
  const lines = ['', ' Outside sources in this run (docs/references.md):'];
  for (const source of OUTSIDE_SOURCES) {
    const t = tallies.get(source.name);
    const counts = t ? [`${t.passed} passed`, t.failed ? `${t.failed} failed` : '', t.skipped ? `${t.skipped} skipped` : ''].filter(Boolean).join(', ') : '';
    let mark: string;
    if (!t || t.passed + t.failed === 0) mark = 'not run';
    else if (t.failed > 0) mark = 'FAILED';
    else mark = 'checked';
    lines.push(`   ${mark.padEnd(8)} ${source.description}${counts ? ` (${counts})` : ''}`);
  }
  const browser = tallies.get(OUTSIDE.browser);
  if (env['KERRTRACE_SKIP_BROWSER'] === '1') {
    lines.push(` Browser tests skipped on request (KERRTRACE_SKIP_BROWSER=1)${browser?.skipped ? `: ${browser.skipped} tests` : ''}; unset it to run them.`);
  }
  return lines;
}

/** Test files that could not be collected (a missing outside file, say): their tests never ran. */
export function unloadedLines(modules: ReadonlyArray<TestModule>): string[] {
  const lines: string[] = [];
  for (const module of modules) {
    const first = module.errors()[0];
    if (first) lines.push(` Could not run ${module.relativeModuleId}: ${(first.message ?? String(first)).split('\n')[0]}`);
  }
  return lines;
}

export default class OutsideSourcesReporter implements Reporter {
  onTestRunEnd(testModules: ReadonlyArray<TestModule>): void {
    process.stdout.write(`${[...summaryLines(tallyByTag(testModules)), ...unloadedLines(testModules)].join('\n')}\n`);
  }
}
