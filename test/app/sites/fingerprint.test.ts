import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkedNote, checkSiteImagery } from '../../../src/app/sites/checkImagery.ts';
import { inlineHasher } from '../../../src/app/sites/fileHash.ts';
import { fingerprint } from '../../../src/app/sites/fingerprint.ts';
import { fingerprintKey, FingerprintsInMemory } from '../../../src/app/sites/fingerprintCache.ts';
import { openFileRange, type FileRange } from '../../../src/cli/readFileRange.ts';
import type { SceneRef } from '../../../src/core/site/index.ts';
import type { FileRef } from '../../../src/platform/types.ts';

// The fingerprint cache over real files on disk: a file's SHA-256 is taken once, against
// Debian coreutils' sha256sum over the same file, and then, while its name, size and
// modification time are the same, it is not read again; another time or size reads it again.

const dir = mkdtempSync(join(tmpdir(), 'fellfield-prints-'));
const files = new Map<string, FileRange>();
const reads: string[] = [];
/** Reads real files by id (their path), and notes each read. */
const reader = {
  readRange: (file: FileRef, offset: number, length: number) => {
    reads.push(file.name);
    return files.get(file.id)!.read(offset, length);
  },
};
const sha256sum = (path: string) => execFileSync('sha256sum', [path], { encoding: 'utf8' }).split(' ')[0];
let pan: FileRef;
let ms: FileRef;
let other: FileRef; // another file of pan's name and size

async function add(name: string, folder: string, bytes: Uint8Array, modified?: number): Promise<FileRef> {
  const path = join(dir, folder, name);
  execFileSync('mkdir', ['-p', join(dir, folder)]);
  writeFileSync(path, bytes);
  files.set(path, await openFileRange(path));
  return { id: path, name, size: bytes.length, ...(modified === undefined ? {} : { modified }) };
}

beforeAll(async () => {
  const bytes = new Uint8Array(5 * 1024 * 1024 + 77).map((_, i) => (i * 2654435761) >>> 24);
  pan = await add('north-pan.tif', 'a', bytes, 1_717_000_000_000);
  ms = await add('north-ms.tif', 'a', bytes.slice(0, 300_001), 1_717_000_000_500);
  const changed = bytes.slice();
  changed[changed.length >> 1] ^= 0xff;
  other = await add('north-pan.tif', 'b', changed, 1_717_000_900_000);
});
afterAll(async () => {
  for (const f of files.values()) await f.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('fingerprints checked before', () => {
  it('keys a file by name, size and modification time, and not at all without a time', () => {
    expect(fingerprintKey({ name: 'a.tif', size: 10, modified: 5 })).not.toBe(fingerprintKey({ name: 'a.tif', size: 10, modified: 6 }));
    expect(fingerprintKey({ name: 'a.tif', size: 10, modified: 5 })).not.toBe(fingerprintKey({ name: 'a.tif', size: 11, modified: 5 }));
    expect(fingerprintKey({ name: 'a.tif', size: 10, modified: 5 })).not.toBe(fingerprintKey({ name: 'b.tif', size: 10, modified: 5 }));
    expect(fingerprintKey({ name: 'a.tif', size: 10 })).toBeNull();
  });

  it('hashes a file once, then takes it from the cache while its name, size and time are the same', async () => {
    const cache = new FingerprintsInMemory();
    const progress: string[] = [];
    reads.length = 0;
    const first = await fingerprint(reader, [pan, ms], { hasher: inlineHasher(), cache, onProgress: (p) => progress.push(p.label) });
    expect(first).toEqual([{ sha256: sha256sum(pan.id), how: 'now' }, { sha256: sha256sum(ms.id), how: 'now' }]);
    expect(reads.length).toBeGreaterThan(1);
    expect(progress).toContain('Fingerprinting north-pan.tif (SHA-256)');

    reads.length = 0;
    progress.length = 0;
    const again = await fingerprint(reader, [{ ...pan, id: 'another-ref' }, ms], { hasher: inlineHasher(), cache, onProgress: (p) => progress.push(p.label) });
    expect(again).toEqual([{ sha256: sha256sum(pan.id), how: 'earlier' }, { sha256: sha256sum(ms.id), how: 'earlier' }]);
    expect(reads).toEqual([]);
    expect(progress).toEqual([]);

    // touched (a new time): read and hashed again; without a time: never taken from the cache
    const touched = await fingerprint(reader, [{ ...pan, modified: pan.modified! + 1 }, { ...ms, modified: undefined }], { hasher: inlineHasher(), cache });
    expect(touched.map((f) => f.how)).toEqual(['now', 'now']);
    expect(new Set(reads)).toEqual(new Set(['north-pan.tif', 'north-ms.tif']));
  });

  it('cancels between pieces of the files it hashes', async () => {
    const abort = new AbortController();
    const done = fingerprint(reader, [pan], { hasher: inlineHasher(), cache: new FingerprintsInMemory(), signal: abort.signal, onProgress: (p) => { if (p.fraction! > 0) abort.abort(); } });
    await expect(done).rejects.toThrow(/north-pan\.tif: the check was cancelled/);
  });
});

describe('checking a stored site\'s files with the cache', () => {
  const scenes = (): SceneRef[] => [{
    id: 'scene-1', date: '2025-08-01', epsg: 32633,
    files: [{ role: 'pan', name: 'north-pan.tif', size: pan.size, sha256: sha256sum(pan.id) }, { role: 'ms', name: 'north-ms.tif', size: ms.size, sha256: sha256sum(ms.id) }],
  }];

  it('says which file was checked earlier and unchanged since, and which was fingerprinted now', async () => {
    const cache = new FingerprintsInMemory();
    await fingerprint(reader, [pan], { hasher: inlineHasher(), cache });
    reads.length = 0;
    const check = await checkSiteImagery(reader, scenes(), [ms, pan], { hasher: inlineHasher(), cache });
    expect(check.files.map((f) => [f.file.name, f.status, f.how])).toEqual([['north-pan.tif', 'verified', 'earlier'], ['north-ms.tif', 'verified', 'now']]);
    expect(new Set(reads)).toEqual(new Set(['north-ms.tif']));
    expect(check.files[0].message).toMatch(/^north-pan\.tif: the same file, checked earlier and unchanged since \(SHA-256 [0-9a-f]{12}…\)$/);
    expect(check.files[1].message).toMatch(/^north-ms\.tif: the same file, fingerprinted now \(SHA-256 [0-9a-f]{12}…\)$/);
    expect(checkedNote(check)).toBe("The imagery is the site's own (SHA-256): north-pan.tif checked earlier and unchanged since; north-ms.tif fingerprinted now.");
    const later = await checkSiteImagery(reader, scenes(), [ms, pan], { hasher: inlineHasher(), cache });
    expect(checkedNote(later)).toBe("The imagery is the site's own (SHA-256): north-pan.tif and north-ms.tif checked earlier and unchanged since.");
  });

  it('fingerprints a file of the same name and size but another time, and refuses it by name when it differs', async () => {
    const cache = new FingerprintsInMemory();
    await fingerprint(reader, [pan, ms], { hasher: inlineHasher(), cache });
    reads.length = 0;
    const check = await checkSiteImagery(reader, scenes(), [other, ms], { hasher: inlineHasher(), cache });
    expect(check.files.map((f) => [f.file.name, f.status, f.how])).toEqual([['north-pan.tif', 'differs', 'now'], ['north-ms.tif', 'verified', 'earlier']]);
    expect(reads.every((r) => r === 'north-pan.tif') && reads.length > 0).toBe(true);
    expect(check.files[0].message).toBe(`north-pan.tif: refused, its content differs from the file the site was made with (SHA-256 ${sha256sum(other.id).slice(0, 12)}…, the site recorded ${sha256sum(pan.id).slice(0, 12)}…)`);
    // Unchanged since, the differing file is known for what it is without being read again.
    reads.length = 0;
    const again = await checkSiteImagery(reader, scenes(), [other], { hasher: inlineHasher(), cache });
    expect(again.files[0]).toMatchObject({ status: 'differs', how: 'earlier' });
    expect(reads).toEqual([]);
  });
});
