import { defineConfig } from 'vitest/config';
import { playwright } from '@vitest/browser-playwright';
import { join } from 'node:path';

// Storage tests against real IndexedDB in Debian's Chromium (not a fake), headless, in a
// fresh on-disk profile: an in-memory (incognito) profile would ignore quota overrides.
export default defineConfig({
  test: {
    include: ['test/store/**/*.browser.test.ts', 'test/platform/**/*.browser.test.ts', 'test/imagery/**/*.browser.test.ts', 'test/app/**/*.browser.test.ts'],
    testTimeout: 60_000,
    fileParallelism: false,
    browser: {
      enabled: true,
      headless: true,
      screenshotFailures: false,
      provider: playwright({
        persistentContext: join('node_modules', '.cache', 'fellfield-store-tests'),
        launchOptions: {
          executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
          args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
        },
      }),
      instances: [{ browser: 'chromium' }],
    },
  },
});
