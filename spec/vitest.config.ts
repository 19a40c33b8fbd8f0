import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

const root = fileURLToPath(new URL('..', import.meta.url));

/**
 * Node-side tests: the shared engine, the API (against the real PostgreSQL the test command
 * starts) and the scripts. The Angular unit tests run through `ng test` instead.
 */
export default defineConfig({
  root,
  resolve: {
    alias: { '@shared': fileURLToPath(new URL('../shared', import.meta.url)) },
  },
  test: {
    include: ['spec/shared/**/*.spec.ts', 'spec/api/**/*.spec.ts', 'spec/scripts/**/*.spec.ts'],
    environment: 'node',
    globalSetup: ['spec/support/global-setup.ts'],
    // API specs share one database; running files one after another keeps truncation simple.
    fileParallelism: false,
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
