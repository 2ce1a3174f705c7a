import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { compareRuns } from '../../src/compare/compareRuns.js';
import { COMPARISON_CSV_HEADER } from '../../src/compare/comparisonCsv.js';
import { writeComparison } from '../../src/compare/writeComparison.js';
import { escapeHtml } from '../../src/report/escapeHtml.js';
import { buildRunFixture, HOSTILE } from '../fixtures/results/buildRunFixture.js';

let root: string;
beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'kerrtrace-cmp-'));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

const runs = () => [
  buildRunFixture({ label: 'before', floorFraction: 0.012 }).result,
  buildRunFixture({ label: 'after', floorFraction: 0.0046, warnings: [] }).result,
];

describe('writeComparison', () => {
  it('writes html, json, csv, summary and one plot per figure, and refuses to overwrite without force', async () => {
    const dir = join(root, 'plain');
    const c = compareRuns(runs(), ['before', 'after']);
    const { files } = await writeComparison(dir, c, { createdAt: '2025-03-15T12:00:00.000Z', toolVersion: '0.1.0' });
    for (const rel of Object.values(files)) expect(existsSync(join(dir, rel))).toBe(true);
    expect(files.kerrConstantPng).toBe('plots/compare-kerrConstant.png');
    const json = JSON.parse(readFileSync(join(dir, 'comparison.json'), 'utf8'));
    expect(json).toMatchObject({ kind: 'kerrtrace-comparison', schemaVersion: 1, createdAt: '2025-03-15T12:00:00.000Z', tool: { name: 'kerrtrace', version: '0.1.0' } });
    expect(json.verdicts).toEqual(c.verdicts);
    const page = readFileSync(join(dir, 'comparison.html'), 'utf8');
    expect(page).not.toMatch(/<script/i);
    expect(page).toContain(`content="default-src 'none'`);
    expect(page).toContain('The floor fraction fell by');
    expect(page).toContain('Nitrobenzene is poisonous');
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);

    await expect(writeComparison(dir, c)).rejects.toMatchObject({ code: 'FILE_EXISTS', message: expect.stringMatching(/already exists and would be overwritten/) });
    await expect(writeComparison(dir, c, { force: true })).resolves.toBeDefined();
  });

  it('writes a CSV with one row per figure per run and the change from the previous run', async () => {
    const dir = join(root, 'csv');
    const c = compareRuns(runs(), ['before', 'after']);
    await writeComparison(dir, c);
    const lines = readFileSync(join(dir, 'comparison.csv'), 'utf8').trim().split('\n');
    expect(lines[0]).toBe(COMPARISON_CSV_HEADER.join(','));
    expect(lines.length).toBe(1 + 2 * c.figures.length);
    const floorRows = lines.filter((l) => l.startsWith('floorFraction,'));
    const cells = floorRows[1]!.split(',');
    expect(cells.slice(0, 4)).toEqual(['floorFraction', '', 'after', '0.0046']);
    const change = c.changes.find((x) => x.key === 'floorFraction')!;
    expect(Number(cells[5])).toBe(change.change!.value);
    expect(Number(cells[9])).toBe(change.zScore);
    expect(cells[10]).toBe('fell');
    expect(floorRows[0]!.split(',')[5]).toBe(''); // no change for the first run
  });

  it('escapes hostile labels and paths in the page, the summary and the CSV', async () => {
    const dir = join(root, 'hostile');
    const label = `<script>window.__pwned=1</script>`;
    const [a, b] = runs();
    a!.warnings = [{ code: 'x', message: `msg ${HOSTILE}`, guideSection: 'sync' }];
    const c = compareRuns([a!, b!], [label, `=HYPERLINK("x") ${HOSTILE}`], { sources: [{ path: `dir/${HOSTILE}/result.json`, sha256: 'ab'.repeat(32) }, null] });
    await writeComparison(dir, c);
    const page = readFileSync(join(dir, 'comparison.html'), 'utf8');
    expect(page).not.toContain('<script>window.__pwned');
    expect(page).not.toContain('<img src=x');
    expect(page).toContain(escapeHtml(label));
    expect(page).toContain(escapeHtml(`dir/${HOSTILE}/result.json`));
    const md = readFileSync(join(dir, 'summary.md'), 'utf8');
    expect(md).not.toMatch(/<script|<img/);
    const csv = readFileSync(join(dir, 'comparison.csv'), 'utf8');
    expect(csv).toContain(`"'=HYPERLINK(""x"")`); // formula guarded and quoted (RFC 4180)
    for (const f of readdirSync(join(dir, 'plots')).filter((p) => p.endsWith('.svg'))) {
      expect(readFileSync(join(dir, 'plots', f), 'utf8')).not.toMatch(/<script|<img/);
    }
  });
});
