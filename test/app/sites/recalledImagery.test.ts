import { execFileSync } from 'node:child_process';
import { mkdtemp, mkdir, rename, rm, stat, utimes, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { allVerified, checkSiteImagery, verifiedFiles, wantedFiles } from '../../../src/app/sites/checkImagery.ts';
import { inlineHasher } from '../../../src/app/sites/fileHash.ts';
import { FingerprintsInMemory } from '../../../src/app/sites/fingerprintCache.ts';
import { checkRecalled, joinPicked } from '../../../src/app/sites/recalledImagery.ts';
import type { SceneRef } from '../../../src/core/site/index.ts';
import { ElectronPlatform } from '../../../src/platform/electron.ts';
import type { FileRef } from '../../../src/platform/types.ts';
import { inProcessBridge } from '../../platform/inProcessBridge.ts';

// Reopening a stored site on the desktop without picking its imagery: each "run" of the
// app is a new main-process registry over the same folders (the memory file persists, as
// do the fingerprints kept on this machine). Real files on disk; the expected SHA-256 of
// each is Debian coreutils' sha256sum. A file whose modification time moved is not handed
// out (POSIX.1-2017 stat(): st_mtim); picked again it is fingerprinted again.

let dir: string;
let pan: string;
let ms: string;
let scenes: SceneRef[];
const cache = new FingerprintsInMemory(); // kept across runs, as IndexedDB keeps it
const hasher = inlineHasher();
const bytesOf = (seed: number, size: number) => new Uint8Array(size).map((_, i) => (i * 131 + seed * 7) % 251);

/** One run of the desktop app; `pick` is what its open dialog answers; `reads` counts byte reads. */
function run(pick: string[] = []) {
  const platform = new ElectronPlatform(inProcessBridge({ dir, pick: () => pick }));
  const reads: string[] = [];
  const reader = { readRange: (f: FileRef, o: number, l: number, s?: AbortSignal) => { reads.push(f.name); return platform.readRange(f, o, l, s); } };
  return { platform, reads, reader, memory: platform.imageryMemory };
}

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'fellfield-reopen-'));
  await mkdir(path.join(dir, 'scenes'));
  pan = path.join(dir, 'scenes', 'north-pan.tif');
  ms = path.join(dir, 'scenes', 'north-ms.tif');
  await writeFile(pan, bytesOf(1, 3 * 1024 * 1024 + 5));
  await writeFile(ms, bytesOf(2, 700_000));
  const sum = (p: string) => execFileSync('sha256sum', [p], { encoding: 'utf8' }).split(' ')[0];
  scenes = [{ id: 'scene-1', date: '2025-08-01', epsg: 32633, files: [
    { role: 'pan', name: 'north-pan.tif', size: 3 * 1024 * 1024 + 5, sha256: sum(pan) },
    { role: 'ms', name: 'north-ms.tif', size: 700_000, sha256: sum(ms) },
  ] }];
});
afterAll(() => rm(dir, { recursive: true, force: true }));

describe('reopening a stored site with the imagery it was given before', () => {
  it('opens the next time with no pick and no reading: found where they were, checked earlier', async () => {
    const first = run([pan, ms]);
    const picked = await first.platform.pickFiles({ title: 'The imagery', extensions: ['tif'], multiple: true, remember: true });
    const check = await checkSiteImagery(first.reader, scenes, picked, { hasher, cache });
    expect(check.files.map((f) => [f.status, f.how])).toEqual([['verified', 'now'], ['verified', 'now']]);
    await first.memory.remember('site-north', verifiedFiles(check));

    const next = run();
    const again = await checkRecalled(next.reader, scenes, await next.memory.recall('site-north'), { hasher, cache });
    expect(allVerified(again)).toBe(true);
    expect(again.files.map((f) => f.how)).toEqual(['earlier', 'earlier']);
    expect(next.reads).toEqual([]);
  });

  it('names a touched file as changed, fingerprints it when it is picked again, and takes it if it is the same', async () => {
    const before = await stat(pan);
    await utimes(pan, before.atime, new Date(before.mtimeMs + 5_000));
    const next = run([pan]);
    const check = await checkRecalled(next.reader, scenes, await next.memory.recall('site-north'), { hasher, cache });
    expect(check.files.map((f) => [f.file.name, f.status])).toEqual([['north-pan.tif', 'changed'], ['north-ms.tif', 'verified']]);
    expect(check.files[0].message).toBe('north-pan.tif: changed since it was checked (its size or modification time differs); pick it to fingerprint it again');
    expect(next.reads).toEqual([]);
    expect(wantedFiles(scenes, check)).toEqual(['north-pan.tif']);
    expect(wantedFiles(scenes, null)).toEqual(['north-pan.tif', 'north-ms.tif']);

    const picked = await next.platform.pickFiles({ title: 'north-pan.tif', extensions: ['tif'], multiple: true, remember: true });
    const joined = joinPicked(check, picked);
    expect(joined.map((f) => f.name)).toEqual(['north-ms.tif', 'north-pan.tif']);
    const after = await checkSiteImagery(next.reader, scenes, joined, { hasher, cache });
    expect(after.files.map((f) => [f.status, f.how])).toEqual([['verified', 'now'], ['verified', 'earlier']]);
    expect(new Set(next.reads)).toEqual(new Set(['north-pan.tif']));
    await next.memory.remember('site-north', verifiedFiles(after));
    expect((await run().memory.recall('site-north')).map((r) => r.state)).toEqual(['ready', 'ready']);
  });

  it('refuses by name a file whose content changed on disk, and names a moved one as gone', async () => {
    const changed = bytesOf(1, 3 * 1024 * 1024 + 5);
    changed[2_000_000] ^= 0xff;
    await writeFile(pan, changed);
    await rename(ms, `${ms}.moved`);
    const next = run([pan]);
    const check = await checkRecalled(next.reader, scenes, await next.memory.recall('site-north'), { hasher, cache });
    expect(check.files.map((f) => f.status)).toEqual(['changed', 'gone']);
    expect(check.files[1].message).toBe('north-ms.tif: not found where it was picked (moved, renamed or deleted); pick it again');
    const picked = await next.platform.pickFiles({ title: 'north-pan.tif', extensions: ['tif'], multiple: true, remember: true });
    const after = await checkSiteImagery(next.reader, scenes, joinPicked(check, picked), { hasher, cache });
    expect(after.files[0]).toMatchObject({ status: 'differs', how: 'now' });
    expect(after.files[0].message).toMatch(/^north-pan\.tif: refused, its content differs from the file the site was made with \(SHA-256 [0-9a-f]{12}…, the site recorded [0-9a-f]{12}…\)$/);
    expect(verifiedFiles(after)).toEqual([]);
  });
});
