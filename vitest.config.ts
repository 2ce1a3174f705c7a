import { defineConfig } from 'vitest/config';
import { OUTSIDE_SOURCES } from './test/setup/outsideSources.js';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    // Generous per-test limits: the suite must pass on a loaded two-core machine, where a media test
    // can take several times its quiet-machine time. A hang still ends the run.
    testTimeout: 240_000,
    hookTimeout: 600_000, // the browser test renders the whole demo in its setup (about 2 minutes on a loaded machine)
    // Media tests spawn ffmpeg; two cores, so keep file-level parallelism modest.
    maxWorkers: 2,
    // One tag per outside source (test/setup/outsideSources.ts); an undefined tag is an error.
    tags: OUTSIDE_SOURCES.map(({ name, description }) => ({ name, description })),
    // The default report, then the outside sources that were checked (and the browser opt-out).
    reporters: ['default', './test/setup/summaryReporter.ts'],
  },
});
