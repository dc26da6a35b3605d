import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';

// Some reference checks read the demo site itself (its files are generated, never
// committed): make it once before the suite, as `npm run demo:data` would, so those
// checks run on a fresh clone instead of skipping.
export default function setup() {
  const root = join(import.meta.dirname, '..');
  if (existsSync(join(root, 'demo', 'manifest.json'))) return;
  execFileSync(process.execPath, [join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs'), join(root, 'src', 'cli', 'demo-data.ts'), '--quiet'], {
    cwd: root,
    stdio: 'inherit',
  });
}
