import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import type { TestProject } from 'vitest/node';
import { build } from 'vite';

const root = join(import.meta.dirname, '..');

declare module 'vitest' {
  export interface ProvidedContext {
    appUrl: string;
  }
}

/** Builds the renderer, makes sure the demo site exists, and serves both on 127.0.0.1. */
export default async function setup(project: TestProject) {
  if (!existsSync(join(root, 'demo', 'manifest.json'))) {
    execFileSync(process.execPath, [join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs'), join(root, 'src', 'cli', 'demo-data.ts')], {
      cwd: root,
      stdio: 'inherit',
    });
  }
  await build({ root, logLevel: 'warn' });
  const { startServer } = await import(join(root, 'scripts', 'serve.mjs'));
  const server = await startServer({ port: 0, root: join(root, 'dist'), demoDir: join(root, 'demo') });
  project.provide('appUrl', server.url);
  return async () => {
    await server.close();
  };
}
