import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    // Physics references run real 2-D propagations on planner-chosen grids: seconds, not ms.
    testTimeout: 120_000,
    hookTimeout: 120_000,
    pool: 'forks',
    // Two files at a time on the 2-core machines the suite runs on (vitest would take one: cores
    // less one). Most files spend much of their time starting, importing or waiting on a child
    // process, so two overlap well: measured on a clean clone, 380 s against 504 s, all passing.
    maxWorkers: 2,
  },
});
