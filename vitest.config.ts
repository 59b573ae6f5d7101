import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    // The long accuracy suite and the packed-package test have their own scripts (npm run accuracy, npm run test:package).
    exclude: ['test/accuracy/**', 'test/e2e/package.test.ts', 'node_modules/**', 'dist/**'],
    testTimeout: 120_000,
    hookTimeout: 240_000,
    pool: 'forks',
  },
});
