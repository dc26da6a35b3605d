// The app's own files in a browser, in real Chromium. The folder the user grants comes
// from the browser's folder picker, which a test cannot answer; the origin-private file
// system (navigator.storage.getDirectory(), WHATWG File System Standard) hands out the
// same FileSystemDirectoryHandle, so the code path from the handle on is the one a
// granted folder takes. The picker itself is not exercised here.
//
// Atomic replacement rests on the standard's rule that a writable stream's changes reach
// the file only when the stream is closed; the checks below hold Chromium to it, then
// stage a full disk at the write (the stream refuses with QuotaExceededError after half
// the data) and find the old content whole.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BrowserPlatform } from '../../src/platform/browser.ts';
import { DirectoryAppFiles } from '../../src/platform/directory-files.ts';
import { BrowserFolderGrant } from '../../src/platform/folder-grant.ts';
import { PlatformError } from '../../src/platform/errors.ts';

let root: FileSystemDirectoryHandle;
let folder: FileSystemDirectoryHandle;
const text = (bytes: Uint8Array | null) => (bytes === null ? null : new TextDecoder().decode(bytes));

beforeAll(async () => {
  root = await navigator.storage.getDirectory();
  folder = await root.getDirectoryHandle(`app-files-${crypto.randomUUID()}`, { create: true });
});
afterAll(async () => {
  await root.removeEntry(folder.name, { recursive: true });
  await new Promise((resolve) => { const r = indexedDB.deleteDatabase('fellfield-app-folder'); r.onsuccess = r.onerror = resolve; });
});

describe('the app files in a folder handle', () => {
  it('writes, reads whole and by range, lists and removes files by plain name', async () => {
    const files = new DirectoryAppFiles(await folder.getDirectoryHandle('a', { create: true }));
    expect(files.where).toBe('the folder "a"');
    expect(await files.list()).toEqual([]);
    await files.write('demo.site.json', '{"head":1}');
    await files.write('pyr-1.tiles', new Uint8Array([0, 1, 2, 3, 4, 5, 6, 7]));
    expect(text(await files.read('demo.site.json'))).toBe('{"head":1}');
    expect(await files.read('pyr-1.tiles', { offset: 6, length: 10 })).toEqual(new Uint8Array([6, 7]));
    expect(await files.read('missing.json')).toBeNull();
    const listed = await files.list();
    expect(listed.map((f) => [f.name, f.size]).sort()).toEqual([['demo.site.json', 10], ['pyr-1.tiles', 8]]);
    await files.remove('pyr-1.tiles');
    await files.remove('pyr-1.tiles');
    expect((await files.list()).map((f) => f.name)).toEqual(['demo.site.json']);
    await expect(files.write('../escape.json', 'x')).rejects.toMatchObject({ code: 'bad-request' });
  });

  it('shows the old content until a write is closed (the rule the atomic replacement rests on)', async () => {
    const dir = await folder.getDirectoryHandle('b', { create: true });
    const files = new DirectoryAppFiles(dir);
    await files.write('demo.site.json', 'the copy before');
    const writable = await (await dir.getFileHandle('demo.site.json')).createWritable();
    await writable.write('the copy after');
    expect(text(await files.read('demo.site.json'))).toBe('the copy before');
    await writable.abort();
    expect(text(await files.read('demo.site.json'))).toBe('the copy before');
    expect((await files.list()).map((f) => f.name)).toEqual(['demo.site.json']); // no swap file listed
  });

  it('reports a full disk at the write in one line and keeps the old content', async () => {
    const dir = await folder.getDirectoryHandle('c', { create: true });
    await new DirectoryAppFiles(dir).write('demo.site.json', 'the copy before');
    const full = new DirectoryAppFiles(fillingUp(dir), 'the folder "c"');
    const error = await full.write('demo.site.json', 'the copy after, which does not fit').catch((e: unknown) => e);
    expect(error).toBeInstanceOf(PlatformError);
    expect((error as Error).message).toBe('demo.site.json: not written: the disk is full (the version written before is kept); free some disk space');
    expect(text(await new DirectoryAppFiles(dir).read('demo.site.json'))).toBe('the copy before');
    // a new file that could not be written is not left behind empty
    await expect(full.write('other.site.json', 'x'.repeat(100))).rejects.toMatchObject({ code: 'full' });
    expect((await new DirectoryAppFiles(dir).list()).map((f) => f.name)).toEqual(['demo.site.json']);
  });
});

describe('the folder grant', () => {
  it('has no folder until one is chosen, keeps the choice for the next visit, and ignores a cancelled picker', async () => {
    const chosen = await folder.getDirectoryHandle('granted', { create: true });
    let answer: () => Promise<FileSystemDirectoryHandle> = async () => { throw new DOMException('The user aborted a request.', 'AbortError'); };
    const platform = new BrowserPlatform({ directoryPicker: () => answer() });
    expect(await platform.folderGrant!.state()).toEqual({ state: 'none' });
    expect(await platform.appFiles()).toBeNull();
    expect(await platform.folderGrant!.choose()).toEqual({ state: 'none' }); // cancelled
    answer = async () => chosen;
    expect(await platform.folderGrant!.choose()).toEqual({ state: 'ready', name: 'granted' });
    const files = (await platform.appFiles())!;
    expect(files.where).toBe('the folder "granted"');
    await files.write('demo.site.json', 'kept');

    // The next visit: a new platform finds the handle in IndexedDB, without a picker.
    const next = new BrowserFolderGrant(async () => { throw new Error('the picker must not open'); });
    expect(await next.state()).toEqual({ state: 'ready', name: 'granted' });
    expect(text(await (await next.files())!.read('demo.site.json'))).toBe('kept');
    answer = async () => { throw new DOMException('The user aborted a request.', 'AbortError'); };
    expect(await platform.folderGrant!.choose()).toEqual({ state: 'ready', name: 'granted' }); // a cancel keeps the folder
  });
});

/** The folder, whose writable streams refuse with QuotaExceededError once half the data is written. */
function fillingUp(dir: FileSystemDirectoryHandle): FileSystemDirectoryHandle {
  const wrapFile = (file: FileSystemFileHandle) => new Proxy(file, {
    get(target, key) {
      if (key === 'createWritable') {
        return async () => {
          const stream = await target.createWritable();
          return new Proxy(stream, {
            get(s, k) {
              if (k === 'write') {
                return async (data: string) => {
                  await s.write(data.slice(0, data.length >> 1));
                  throw new DOMException('The operation failed because it would cause the application to exceed its storage quota.', 'QuotaExceededError');
                };
              }
              const value = Reflect.get(s, k);
              return typeof value === 'function' ? value.bind(s) : value;
            },
          });
        };
      }
      const value = Reflect.get(target, key);
      return typeof value === 'function' ? value.bind(target) : value;
    },
  });
  return new Proxy(dir, {
    get(target, key) {
      if (key === 'getFileHandle') return async (name: string, options?: FileSystemGetFileOptions) => wrapFile(await target.getFileHandle(name, options));
      const value = Reflect.get(target, key);
      return typeof value === 'function' ? value.bind(target) : value;
    },
  });
}
