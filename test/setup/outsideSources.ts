/**
 * The outside sources the suite checks kerrtrace against, one Vitest tag each (docs/references.md
 * lists them with their values). A test that checks against one of them carries its tag
 * (`describe('…', { tags: [OUTSIDE.nist] }, …)`); Vitest refuses a tag that is not defined here, and
 * the run's summary (test/setup/summaryReporter.ts) names each source with how many of its tests
 * passed, failed or were skipped in that run, so a green run says which outside checks really ran.
 */
export interface OutsideSource {
  /** The tag the tests carry. */
  name: string;
  /** What the source is, for the summary. */
  description: string;
}

export const OUTSIDE = {
  nist: 'nist-strd',
  greenRamps: 'bench-clip:green_ramps',
  whiteSteps: 'bench-clip:white_steps_reference_card',
  vfr: 'bench-clip:vfr_past_halfwave',
  srgb: 'iec-61966-2-1',
  bt709: 'itu-r-bt709',
  sharp: 'sharp-decoder',
  jimp: 'jimp-decoder',
  ffprobe: 'ffprobe-timestamps',
  simpleStatistics: 'simple-statistics',
  workedExamples: 'optics-worked-examples',
  publishedTables: 'published-tables',
  gum: 'jcgm-100-gum',
  browser: 'browser',
} as const;

/** The bench clip tag for a clip name (test/reference/bench-clips/<name>). */
export function benchClipTag(name: 'green_ramps' | 'white_steps_reference_card' | 'vfr_past_halfwave'): string {
  return `bench-clip:${name}`;
}

export const OUTSIDE_SOURCES: OutsideSource[] = [
  { name: OUTSIDE.nist, description: 'NIST StRD nonlinear regression, 16 certified data sets (least-squares fitter)' },
  { name: OUTSIDE.greenRamps, description: 'outside bench clip green_ramps (independent renderer, known truth)' },
  { name: OUTSIDE.whiteSteps, description: 'outside bench clip white_steps_reference_card (independent renderer, known truth)' },
  { name: OUTSIDE.vfr, description: 'outside bench clip vfr_past_halfwave (independent renderer, known truth)' },
  { name: OUTSIDE.srgb, description: 'IEC 61966-2-1 sRGB transfer check values' },
  { name: OUTSIDE.bt709, description: 'ITU-R BT.709-6 transfer and Y\'CbCr matrix' },
  { name: OUTSIDE.sharp, description: 'sharp (libvips) as an independent image decoder' },
  { name: OUTSIDE.jimp, description: 'jimp as an independent image decoder' },
  { name: OUTSIDE.ffprobe, description: 'ffprobe per-frame timestamps and stream facts' },
  { name: OUTSIDE.simpleStatistics, description: 'simple-statistics regression and t-test' },
  { name: OUTSIDE.workedExamples, description: 'optics worked examples: Malus\'s law, Jones matrices, Lux half-wave example, Irodov quarter-wave problem' },
  { name: OUTSIDE.publishedTables, description: 'published Kerr constants and CODATA permittivity (docs/references.md)' },
  { name: OUTSIDE.gum, description: 'JCGM 100:2008 (GUM) propagation and rounding rules' },
  { name: OUTSIDE.browser, description: 'a real browser opening the HTML reports (Chromium)' },
];
