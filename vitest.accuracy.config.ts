import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/accuracy/**/*.test.ts'],
    testTimeout: 3_600_000,
    hookTimeout: 3_600_000,
    pool: 'forks',
  },
});
