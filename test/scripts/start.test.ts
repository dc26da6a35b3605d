// `npm start`'s decisions (is Electron there, is a build stale, is there a display) and
// its browser fallback, run for real as a child process against a throwaway app folder.
// Electron's package layout (path.txt naming the binary under dist/) is that of the
// electron 45.3.4 npm package (node_modules/electron/index.js).
import { spawn } from 'node:child_process';
import { mkdtemp, mkdir, rm, utimes, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { displayProblem, electronBinary, isStale } from '../../scripts/start.mjs';

let tmp: string;
beforeAll(async () => { tmp = await mkdtemp(path.join(os.tmpdir(), 'fellfield-start-')); });
afterAll(() => rm(tmp, { recursive: true, force: true }));

describe('start decisions', () => {
  it('finds the Electron binary only when path.txt names a file that exists', async () => {
    const pkg = path.join(tmp, 'electron');
    await mkdir(path.join(pkg, 'dist'), { recursive: true });
    expect(electronBinary(pkg)).toBeUndefined();
    await writeFile(path.join(pkg, 'path.txt'), 'electron');
    expect(electronBinary(pkg)).toBeUndefined();
    await writeFile(path.join(pkg, 'dist', 'electron'), '');
    expect(electronBinary(pkg)).toBe(path.join(pkg, 'dist', 'electron'));
  });

  it('rebuilds when the output is missing or older than any input', async () => {
    const src = path.join(tmp, 'src');
    await mkdir(path.join(src, 'deep'), { recursive: true });
    await writeFile(path.join(src, 'deep', 'a.ts'), '');
    const out = path.join(tmp, 'out.html');
    expect(isStale(out, [src])).toBe(true);
    await writeFile(out, '');
    const past = new Date(Date.now() - 60_000);
    await utimes(path.join(src, 'deep', 'a.ts'), past, past);
    expect(isStale(out, [src])).toBe(false);
    const future = new Date(Date.now() + 60_000);
    await utimes(path.join(src, 'deep', 'a.ts'), future, future);
    expect(isStale(out, [src])).toBe(true);
  });

  it('knows when Linux has no display for a window', () => {
    expect(displayProblem({}, 'linux')).toMatch(/no display/);
    expect(displayProblem({ DISPLAY: ':0' }, 'linux')).toBeUndefined();
    expect(displayProblem({ WAYLAND_DISPLAY: 'wayland-0' }, 'linux')).toBeUndefined();
    expect(displayProblem({}, 'darwin')).toBeUndefined();
  });
});

/** Runs start.mjs on a throwaway app folder; resolves with its output once it serves. */
async function startAndWaitForAddress(electronDir: string) {
  const dist = path.join(tmp, 'app', 'dist');
  const demo = path.join(tmp, 'app', 'demo');
  await mkdir(dist, { recursive: true });
  await mkdir(demo, { recursive: true });
  await writeFile(path.join(dist, 'index.html'), '<!doctype html><title>Fellfield</title>');
  await writeFile(path.join(demo, 'manifest.json'), '{}');
  return spawn(process.execPath, ['scripts/start.mjs', '--no-build', '--no-download', '--port', '0', '--dist', dist, '--demo', demo], {
    cwd: path.resolve(import.meta.dirname, '../..'),
    env: { ...process.env, FELLFIELD_ELECTRON_DIR: electronDir, DISPLAY: ':0' },
  });
}

describe('the browser fallback', () => {
  it('says in one line that Electron is missing, then serves the app on 127.0.0.1', async () => {
    const child = await startAndWaitForAddress(path.join(tmp, 'no-electron'));
    try {
      let out = '';
      const url = await new Promise<string>((resolve, reject) => {
        child.stdout.on('data', (chunk: Buffer) => {
          out += chunk.toString();
          const match = /served at (http:\/\/127\.0\.0\.1:\d+\/)/.exec(out);
          if (match) resolve(match[1]);
        });
        child.on('exit', (code) => reject(new Error(`start.mjs exited ${code}: ${out}`)));
      });
      const lines = out.trim().split('\n');
      expect(lines[0]).toBe("Electron's desktop binary is not available on this machine; serving Fellfield for your browser instead.");
      expect(lines).toHaveLength(2);
      const page = await fetch(url);
      expect(page.status).toBe(200);
      expect(await page.text()).toContain('<title>Fellfield</title>');
      expect((await fetch(`${url}demo/manifest.json`)).status).toBe(200);
    } finally {
      child.kill('SIGTERM');
    }
  });
});

describe('the fallback after a failed launch', () => {
  it('serves for the browser when Electron exits with an error at once', async () => {
    // A stand-in executable in the electron package layout that fails like a binary
    // missing its system libraries would.
    const pkg = path.join(tmp, 'broken-electron');
    await mkdir(path.join(pkg, 'dist'), { recursive: true });
    await writeFile(path.join(pkg, 'path.txt'), 'electron');
    await writeFile(path.join(pkg, 'dist', 'electron'), '#!/bin/sh\necho "cannot open shared object file" >&2\nexit 127\n', { mode: 0o755 });
    const child = await startAndWaitForAddress(pkg);
    try {
      let out = '';
      await new Promise<void>((resolve, reject) => {
        child.stdout.on('data', (chunk: Buffer) => {
          out += chunk.toString();
          if (/served at http:\/\/127\.0\.0\.1:\d+\//.test(out)) resolve();
        });
        child.on('exit', (code) => reject(new Error(`start.mjs exited ${code}: ${out}`)));
      });
      expect(out).toContain('The desktop window could not start (Electron exited with 127); serving Fellfield for your browser instead.');
    } finally {
      child.kill('SIGTERM');
    }
  });
});
