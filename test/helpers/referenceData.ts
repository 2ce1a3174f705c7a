/**
 * Where the outside reference data lives inside the repository (test/reference/, provenance in
 * test/reference/README.md and docs/references.md). A missing file is a failure with a message
 * that says what is missing and how to get it back, never a silent skip.
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const REFERENCE_DIR = fileURLToPath(new URL('../reference/', import.meta.url));
export const NIST_STRD_DIR = join(REFERENCE_DIR, 'nist-strd');
export const BENCH_CLIPS_DIR = join(REFERENCE_DIR, 'bench-clips');
export const BENCH_CLIP_NAMES = ['green_ramps', 'white_steps_reference_card', 'vfr_past_halfwave'] as const;
export type BenchClipName = (typeof BENCH_CLIP_NAMES)[number];

/** The path, after checking it exists; throws one line naming the file and how to restore it. */
export function referenceFile(...parts: string[]): string {
  const p = join(REFERENCE_DIR, ...parts);
  if (!existsSync(p)) {
    throw new Error(
      `outside reference data missing: test/reference/${parts.join('/')} (it is part of the repository; restore it with: git checkout -- test/reference)`,
    );
  }
  return p;
}

/** The folder of one outside bench clip (clip.mp4, volts.csv, truth.json). */
export function benchClip(name: BenchClipName): { dir: string; clip: string; volts: string; truth: string } {
  const dir = referenceFile('bench-clips', name);
  return {
    dir,
    clip: referenceFile('bench-clips', name, 'clip.mp4'),
    volts: referenceFile('bench-clips', name, 'volts.csv'),
    truth: referenceFile('bench-clips', name, 'truth.json'),
  };
}

const REPO_DIR = fileURLToPath(new URL('../../', import.meta.url));

/**
 * A file of test-media/ (the project's own rendered clips), after checking it exists; throws one
 * line saying how to get it back, so a missing clip fails the test instead of skipping it.
 */
export function testMediaFile(...parts: string[]): string {
  const p = join(REPO_DIR, 'test-media', ...parts);
  if (!existsSync(p)) {
    throw new Error(
      `test media missing: test-media/${parts.join('/')} (it is part of the repository; restore it with: git checkout -- test-media, or re-render it with: npm run media)`,
    );
  }
  return p;
}
