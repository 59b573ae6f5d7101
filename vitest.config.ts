import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    exclude: ['test/accuracy/**', 'node_modules/**', 'dist/**'],
    testTimeout: 120_000,
    hookTimeout: 240_000,
    pool: 'forks',
  },
});
