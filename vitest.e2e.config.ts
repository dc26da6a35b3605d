import { defineConfig } from 'vitest/config';

// End-to-end tests: the real renderer, built by Vite, served on 127.0.0.1, driven in
// Debian's Chromium through playwright-core.
export default defineConfig({
  test: {
    include: ['e2e/**/*.e2e.ts'],
    environment: 'node',
    globalSetup: ['e2e/globalSetup.ts'],
    testTimeout: 180_000,
    hookTimeout: 300_000,
    fileParallelism: false,
    pool: 'forks',
  },
});
