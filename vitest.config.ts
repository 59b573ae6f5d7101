import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    // The long accuracy suite and the packed-package test have their own scripts (npm run accuracy, npm run test:package).
    exclude: ['test/accuracy/**', 'test/e2e/package.test.ts', 'node_modules/**', 'dist/**'],
    testTimeout: 120_000,
    hookTimeout: 240_000,
    pool: 'forks',
    // Two files at a time: vitest's default on a 2-core machine is one (cores − 1), which leaves a core idle
    // while a file runs single-threaded work (unit tests, the CLI starting, --jobs 1 measuring).
    maxWorkers: 2,
  },
});
