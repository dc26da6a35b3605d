import { defineConfig } from 'vitest/config';
import { playwright } from '@vitest/browser-playwright';

// Storage tests against real IndexedDB in Debian's Chromium (not a fake), headless.
export default defineConfig({
  test: {
    include: ['test/store/**/*.browser.test.ts'],
    testTimeout: 60_000,
    browser: {
      enabled: true,
      headless: true,
      screenshotFailures: false,
      provider: playwright({
        launchOptions: {
          executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
          args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
        },
      }),
      instances: [{ browser: 'chromium' }],
    },
  },
});
