/**
 * Warning codes and exclusion reasons are one vocabulary: every code the sources write is listed
 * with its meaning in src/result/warningCode.ts or src/result/exclusionReason.ts, and every listed
 * one is documented for users in docs/analyze.md. The sources are read with the TypeScript parser
 * (test/helpers/sourceFiles.ts). Common practice, not an outside source.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { EXCLUSION_REASONS } from '../../src/result/exclusionReason.js';
import { WARNING_CODES } from '../../src/result/warningCode.js';
import { REPO_ROOT, exclusionReasonsIn, tsFilesUnder, warningCodesIn, type CodeUse } from '../helpers/sourceFiles.js';

const SOURCES = [...tsFilesUnder('src'), ...tsFilesUnder('cli')];
const shown = (u: CodeUse): string => `${u.file}:${u.line} '${u.code}'`;
const analyzeDoc = readFileSync(join(REPO_ROOT, 'docs', 'analyze.md'), 'utf8');

/** The part of docs/analyze.md under a level-2 heading, up to the next one. */
function docSection(heading: string): string {
  const start = analyzeDoc.indexOf(`\n## ${heading}\n`);
  if (start < 0) return '';
  const next = analyzeDoc.indexOf('\n## ', start + 1);
  return analyzeDoc.slice(start, next < 0 ? undefined : next);
}

describe('warning codes', () => {
  const uses = SOURCES.flatMap(warningCodesIn);

  it('finds the codes the sources write (the scan itself works)', () => {
    const codes = new Set(uses.map((u) => u.code));
    for (const known of ['clipping', 'sync-ambiguous', 'sync-at-edge', 'implausible-kerr-constant', 'probe', 'terms-cancel', 'overlay-photo']) expect(codes).toContain(known);
  });

  it('every code written in src/ or cli/ is a WarningCode', () => {
    const unknown = uses.filter((u) => !Object.hasOwn(WARNING_CODES, u.code)).map(shown);
    expect(unknown, `add these to src/result/warningCode.ts with their meaning (and to docs/analyze.md):\n${unknown.join('\n')}`).toEqual([]);
  });

  it('every WarningCode is still written somewhere (no stale entries)', () => {
    const used = new Set(uses.map((u) => u.code));
    expect(Object.keys(WARNING_CODES).filter((c) => !used.has(c))).toEqual([]);
  });

  it('docs/analyze.md documents every WarningCode under "Warnings"', () => {
    const section = docSection('Warnings');
    expect(section, 'docs/analyze.md needs a "## Warnings" section').not.toBe('');
    const missing = Object.keys(WARNING_CODES).filter((c) => !section.includes(`\`${c}\``));
    expect(missing, 'add a line for each to docs/analyze.md, "Warnings"').toEqual([]);
  });
});

describe('exclusion reasons', () => {
  // Frames are left out where a run is measured and fitted: the pipeline, the photo series and the
  // command line's stills job (elsewhere `reason` names other things, e.g. why a fit stopped).
  const uses = [...tsFilesUnder('src/pipeline'), ...tsFilesUnder('src/stills'), ...tsFilesUnder('cli')].flatMap(exclusionReasonsIn);

  it('finds the reasons the sources assign (the scan itself works)', () => {
    const reasons = new Set(uses.map((u) => u.code));
    for (const known of ['spark', 'clipped', 'open-window', 'outside-log', 'particle', 'unreadable', 'not-finite']) expect(reasons).toContain(known);
  });

  it('every reason assigned in src/pipeline, src/stills or cli/ is an ExclusionReason', () => {
    const unknown = uses.filter((u) => !Object.hasOwn(EXCLUSION_REASONS, u.code)).map(shown);
    expect(unknown, `add these to src/result/exclusionReason.ts with their meaning (and to docs/analyze.md):\n${unknown.join('\n')}`).toEqual([]);
  });

  it('docs/analyze.md documents every ExclusionReason under "Frames left out"', () => {
    const section = docSection('Frames left out');
    expect(section, 'docs/analyze.md needs a "## Frames left out" section').not.toBe('');
    const missing = Object.keys(EXCLUSION_REASONS).filter((c) => !section.includes(`\`${c}\``));
    expect(missing).toEqual([]);
  });
});
