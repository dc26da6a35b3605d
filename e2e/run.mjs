// Runs the end-to-end suite: vitest with the e2e config (build, demo data and the local
// server are set up in e2e/globalSetup.ts).
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';

const chromium = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
if (!existsSync(chromium)) {
  console.error(`e2e: Chromium not found at ${chromium}. Install Debian's chromium (apt-get install chromium) or set CHROMIUM_PATH.`);
  process.exit(2);
}
const result = spawnSync(process.execPath, ['node_modules/vitest/vitest.mjs', 'run', '--config', 'vitest.e2e.config.ts', ...process.argv.slice(2)], {
  stdio: 'inherit',
});
process.exit(result.status ?? 1);
