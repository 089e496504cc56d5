import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    // Physics references run real 2-D propagations on planner-chosen grids: seconds, not ms.
    testTimeout: 120_000,
    hookTimeout: 120_000,
    pool: 'forks',
  },
});
