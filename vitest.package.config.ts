import { defineConfig } from 'vitest/config';

// The packed-package test: npm pack, install the tarball in a temporary folder, import it from JS and TS.
export default defineConfig({
  test: {
    include: ['test/e2e/package.test.ts'],
    testTimeout: 600_000,
    hookTimeout: 600_000,
    pool: 'forks',
  },
});
