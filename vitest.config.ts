import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    testTimeout: 120_000,
    hookTimeout: 300_000,
    // Media tests spawn ffmpeg; two cores, so keep file-level parallelism modest.
    maxWorkers: 2,
  },
});
