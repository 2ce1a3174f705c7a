import { describe, expect, it } from 'vitest';
import { summaryText } from '../../cli/summaryText.js';
import { formatQuantity } from '../../src/quantity.js';
import { buildRunFixture } from '../fixtures/results/buildRunFixture.js';
import { stillsRunFixture } from '../report/stillsFixture.js';

const lines = (text: string): string[] => text.trimEnd().split('\n');
/** The value column of the line whose name is `name`. */
const valueOf = (text: string, name: string): string | undefined => lines(text).find((l) => l.startsWith(`  ${name} `))?.slice(23);

describe('summaryText', () => {
  it('for a video run: the headline figures, the sync offset and the frames used, values in one column', () => {
    const { result } = buildRunFixture({ label: 'cell A' });
    const text = summaryText(result, 'out/run.kerrtrace');
    expect(lines(text)[0]).toBe('kerrtrace: cell A');
    expect(valueOf(text, 'Kerr constant B')).toBe(formatQuantity(result.kerrConstant));
    expect(valueOf(text, 'half-wave voltage')).toBe(formatQuantity(result.halfWaveVoltage));
    expect(valueOf(text, 'sync offset')).toBe(formatQuantity(result.syncOffset));
    const left = Object.entries(result.frames.excluded).map(([k, n]) => `${n} ${k}`).join(', ');
    expect(valueOf(text, 'frames used')).toBe(`${result.frames.used} of ${result.frames.total} (left out: ${left})`);
    expect(text).toContain(`  warning: ${result.warnings[0]!.message}\n`);
    expect(text.endsWith('  files: out/run.kerrtrace\n')).toBe(true);
    // every name/value line puts its value in column 24
    for (const l of lines(text).slice(1, 7)) expect(l).toMatch(/^ {2}\S.{20}\S/);
  });

  it('names the options of the inputs a warning or a failed gate asks for (cli/flagNames.ts)', () => {
    const { result } = buildRunFixture();
    result.warnings = [{ code: 'implausible-kerr-constant', message: 'B is far outside the table; check the cell\'s length and gap', inputs: ['length', 'gap'] }];
    result.validity = { valid: false, failures: [{ gate: 'sync-ambiguous', message: 'two offsets fit; give the sync offset', inputs: ['syncOffset'] }] };
    const text = summaryText(result, 'd');
    expect(text).toContain("  warning: B is far outside the table; check the cell's length and gap (--length-mm; --gap-mm)\n");
    expect(text).toContain('  NOT VALID (sync-ambiguous): two offsets fit; give the sync offset (--offset-s)\n');
  });

  it('marks an offset given with --offset-s', () => {
    const { result } = buildRunFixture();
    result.sync.manual = true;
    expect(valueOf(summaryText(result, 'd'), 'sync offset')).toBe(`${formatQuantity(result.syncOffset)} (given)`);
  });

  it('for a photo series: no offset (no clock to synchronise) and photos, not frames', () => {
    const { result, trace } = stillsRunFixture('photo-index');
    const text = summaryText(result, 'photos.kerrtrace');
    expect(valueOf(text, 'sync offset')).toBe('none: each photo carries its voltage (no clock to synchronise)');
    const clipped = trace.filter((r) => !r.used).length;
    expect(valueOf(text, 'photos used')).toBe(`${trace.length - clipped} of ${trace.length} (left out: ${clipped} clipped)`);
    expect(text).not.toMatch(/frames?\b|video/i);
  });

  it('prints no number for B or V_π when they cannot be told apart from brightness', () => {
    const { result } = buildRunFixture({ identifiable: false, maxVoltageV: 4000 });
    const text = summaryText(result, 'd');
    expect(valueOf(text, 'Kerr constant B')).toBe('not identifiable from this sweep (see warnings)');
    expect(text).not.toContain('half-wave voltage');
  });

  it('adds the per-channel values with their note, the note indented under the values', () => {
    const { result } = buildRunFixture();
    result.channels = { r: { value: 2.2e-12, unit: 'm/V^2' }, g: { value: 2.4e-12, unit: 'm/V^2' }, b: { value: 2.6e-12, unit: 'm/V^2' }, note: 'band averages' };
    const text = summaryText(result, 'd');
    expect(valueOf(text, 'B by channel')).toBe('R 2.20e-12 m/V^2, G 2.40e-12 m/V^2, B 2.60e-12 m/V^2');
    expect(text).toContain(`\n${' '.repeat(23)}(band averages)\n`);
  });
});
