#!/usr/bin/env node
// Builds electron/ to dist-electron/: main.js (ESM, as package.json "type" says) and
// preload.cjs (one self-contained CommonJS file, as a sandboxed preload must be).
// Type checks are separate: `tsc --noEmit -p electron/tsconfig.json` (npm run typecheck).
import { builtinModules } from 'node:module';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { build } from 'vite';

const repo = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const external = ['electron', /^node:/, ...builtinModules];

async function bundle(entry, format, fileName, emptyOutDir) {
  await build({
    configFile: false,
    root: repo,
    logLevel: 'warn',
    build: {
      ssr: path.join(repo, entry),
      outDir: path.join(repo, 'dist-electron'),
      emptyOutDir,
      target: 'node20',
      minify: false,
      sourcemap: true,
      rollupOptions: {
        external,
        output: { format, entryFileNames: fileName },
      },
    },
    ssr: { noExternal: true, external: ['electron'] },
  });
}

export async function buildElectron() {
  await bundle('electron/main.ts', 'es', 'main.js', true);
  await bundle('electron/preload.ts', 'cjs', 'preload.cjs', false);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  await buildElectron();
  console.log('built dist-electron/main.js and dist-electron/preload.cjs');
}
