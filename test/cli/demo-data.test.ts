import { execFile } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, describe, expect, it } from 'vitest';
import { writeDemoSite } from '../../src/cli/demo-data.ts';

// `npm run demo:data` as a user runs it: progress lines, files renamed into place, and
// one clear line with exit code 2 on bad options or an unwritable folder.

const run = promisify(execFile);
const repo = resolve(import.meta.dirname, '../..');
const tsx = join(repo, 'node_modules/.bin/tsx');
const script = join(repo, 'src/cli/demo-data.ts');
const work = mkdtempSync(join(tmpdir(), 'fellfield-demo-cli-'));

afterAll(() => rmSync(work, { recursive: true, force: true }));

async function demoData(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run(tsx, [script, ...args], { cwd: repo });
    return { code: 0, stdout, stderr };
  } catch (error) {
    const e = error as { code: number; stdout: string; stderr: string };
    return { code: e.code, stdout: e.stdout, stderr: e.stderr };
  }
}

describe('demo:data', () => {
  it('writes every file of a small site, with progress, and leaves no partial files', async () => {
    const out = join(work, 'site');
    const result = await demoData(['--out', out, '--seed', '3', '--size', '256']);
    expect(result.code).toBe(0);
    expect(result.stdout).toMatch(/rendering late/);
    expect(result.stdout).toMatch(/wrote pan\.tif/);
    const written = readdirSync(out);
    expect(written).toEqual(expect.arrayContaining(['field.geojson', 'manifest.json', 'ms-late.tif', 'ms.tif', 'pan-late.tif', 'pan.tif', 'roster.json', 'truth.json']));
    expect(written.filter((name) => name.includes('.partial'))).toEqual([]);
    expect(JSON.parse(readFileSync(join(out, 'truth.json'), 'utf8')).seed).toBe(3);

    // One thread (the fallback when workers cannot start) writes the very same bytes.
    const single = join(work, 'single');
    await writeDemoSite({ out: single, seed: 3, size: 256, parallel: false });
    for (const name of readdirSync(out)) {
      expect(readFileSync(join(single, name)).equals(readFileSync(join(out, name))), name).toBe(true);
    }
  }, 120_000);

  it.each([
    [['--seed', 'abc'], /--seed must be a whole number/],
    [['--seed', '-4'], /--seed/],
    [['--size', '30'], /--size must be a whole number from 64/],
    [['--size', '258'], /--size must be a multiple of 4/],
    [['--colour', 'red'], /Unknown option '--colour'/],
  ])('refuses %j with one line and exit code 2', async (args, message) => {
    const result = await demoData([...args, '--out', join(work, 'never')]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(message);
    expect(result.stderr.trim().split('\n')).toHaveLength(1);
    expect(result.stderr).not.toMatch(/\n\s+at /); // no stack trace
    expect(existsSync(join(work, 'never'))).toBe(false);
  }, 60_000);

  it('names the folder it cannot create', async () => {
    const blocker = join(work, 'a-file');
    writeFileSync(blocker, 'not a folder');
    const result = await demoData(['--out', join(blocker, 'site'), '--size', '64']);
    expect(result.code).toBe(2);
    expect(result.stderr).toContain(join(blocker, 'site'));
    expect(result.stderr.trim().split('\n')).toHaveLength(1);
  }, 60_000);
});
