import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashFile, inlineHasher } from '../../../src/app/sites/fileHash.ts';
import { openFileRange, type FileRange } from '../../../src/cli/readFileRange.ts';
import type { FileRef } from '../../../src/platform/types.ts';

// The imagery fingerprint, read by byte ranges from a real file on disk, against
// coreutils' sha256sum (Debian) over the same file.

const dir = mkdtempSync(join(tmpdir(), 'fellfield-hash-'));
const path = join(dir, 'scene.bin');
let file: FileRange;
const ref: FileRef = { id: 'scene', name: 'scene.bin', size: 0 };
const reader = { readRange: (_: FileRef, offset: number, length: number) => file.read(offset, length) };

beforeAll(async () => {
  const bytes = new Uint8Array(9 * 1024 * 1024 + 333);
  for (let i = 0; i < bytes.length; i++) bytes[i] = (i * 2654435761) >>> 24;
  writeFileSync(path, bytes);
  file = await openFileRange(path);
  ref.size = file.size;
});
afterAll(() => file?.close());

describe('hashFile', () => {
  it('gives the digest sha256sum gives, whatever the piece size, and reports progress to the last byte', async () => {
    const expected = execFileSync('sha256sum', [path], { encoding: 'utf8' }).split(' ')[0];
    const seen: number[] = [];
    expect(await hashFile(reader, ref, inlineHasher(), { onBytes: (n) => seen.push(n) })).toBe(expected);
    expect(seen.at(-1)).toBe(ref.size);
    expect(seen).toEqual([...seen].sort((a, b) => a - b));
    expect(await hashFile(reader, ref, inlineHasher(), { pieceBytes: 1_000_003 })).toBe(expected);
  });

  it('stops when cancelled between pieces', async () => {
    const abort = new AbortController();
    const done = hashFile(reader, ref, inlineHasher(), { signal: abort.signal, pieceBytes: 1024 * 1024, onBytes: () => abort.abort() });
    await expect(done).rejects.toThrow('scene.bin: the check was cancelled');
  });

  it('refuses a file that is shorter than when it was picked', async () => {
    await expect(hashFile(reader, { ...ref, size: ref.size + 10 }, inlineHasher())).rejects.toThrow(/^scene\.bin: changed while it was read/);
  });
});
