// A site's imagery found again in a browser, in real Chromium with real IndexedDB. The
// user's file picker (showOpenFilePicker, WICG File System Access) is a native dialog no
// test can answer; files of the origin-private file system (navigator.storage.getDirectory(),
// WHATWG File System Standard) hand out the same FileSystemFileHandle, so they stand in
// for picked files here, and the code from the handle on is the one picked files take.
// What is not exercised: the picker dialog itself, and the browser's prompt for leave to
// read a file again (handles of the origin-private file system always have leave).
// The standard's File.lastModified and size say whether a file changed since it was picked.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BrowserPlatform, type OpenFilePicker } from '../../src/platform/browser.ts';
import { HANDLE_DATABASE } from '../../src/platform/handle-memory.ts';
import type { FileRef, RecalledFile } from '../../src/platform/types.ts';

let root: FileSystemDirectoryHandle;
let folder: FileSystemDirectoryHandle;
const bytesOf = (seed: number, size: number) => new Uint8Array(size).map((_, i) => (i * 13 + seed) % 256);

async function put(name: string, bytes: Uint8Array): Promise<FileSystemFileHandle> {
  const handle = await folder.getFileHandle(name, { create: true });
  const writable = await handle.createWritable();
  await writable.write(bytes as Uint8Array<ArrayBuffer>);
  await writable.close();
  return handle;
}

/** A picker that answers with the given handles, and says what it was asked. */
function picker(answer: () => Promise<FileSystemFileHandle[]>) {
  const asked: Parameters<OpenFilePicker>[0][] = [];
  const pick: OpenFilePicker = (options) => {
    asked.push(options);
    return answer();
  };
  return { pick, asked };
}

const ready = (r: RecalledFile) => (r.state === 'ready' ? r.file : null);

beforeAll(async () => {
  root = await navigator.storage.getDirectory();
  folder = await root.getDirectoryHandle(`picked-${crypto.randomUUID()}`, { create: true });
});
afterAll(async () => {
  await root.removeEntry(folder.name, { recursive: true });
  await new Promise((resolve) => { const r = indexedDB.deleteDatabase(HANDLE_DATABASE); r.onsuccess = r.onerror = resolve; });
});

describe('the imagery handles of a site in a browser', () => {
  it('picks through the file picker, keeps the handles, and reads the same files in a later page', async () => {
    const pan = await put('north-pan.tif', bytesOf(1, 5000));
    const ms = await put('north-ms.tif', bytesOf(2, 1300));
    const chooser = picker(async () => [pan, ms]);
    const first = new BrowserPlatform({ filePicker: chooser.pick });
    const picked = await first.pickFiles({ title: 'The imagery', extensions: ['tif', 'tiff'], multiple: true, remember: true });
    expect(chooser.asked).toEqual([{ id: 'fellfield-imagery', multiple: true, types: [{ description: 'The imagery', accept: { 'image/tiff': ['.tif', '.tiff'] } }] }]);
    expect(picked.map((f) => [f.name, f.size, f.modified])).toEqual([
      ['north-pan.tif', 5000, (await pan.getFile()).lastModified],
      ['north-ms.tif', 1300, (await ms.getFile()).lastModified],
    ]);
    await first.imageryMemory!.remember('site-north', picked);

    // A later page: a new platform, whose memory reads the handles back from IndexedDB.
    const later = new BrowserPlatform({ filePicker: picker(async () => []).pick });
    const recalled = await later.imageryMemory!.recall('site-north', { ask: true });
    expect(recalled.map((r) => [r.name, r.state])).toEqual([['north-pan.tif', 'ready'], ['north-ms.tif', 'ready']]);
    const again = ready(recalled[0])!;
    expect(again).toMatchObject({ name: 'north-pan.tif', size: 5000, modified: picked[0].modified });
    expect(await later.readRange(again, 4990, 100)).toEqual(bytesOf(1, 5000).slice(4990));
    expect(await later.imageryMemory!.recall('site-none')).toEqual([]);
  });

  it('does not hand out a file rewritten or removed since it was picked; the unchanged one still is', async () => {
    const rewritten = await put('a-pan.tif', bytesOf(3, 2000));
    const removed = await put('a-ms.tif', bytesOf(4, 500));
    const kept = await put('b-pan.tif', bytesOf(5, 700));
    const platform = new BrowserPlatform({ filePicker: async () => [rewritten, removed, kept] });
    await platform.imageryMemory!.remember('site-a', await platform.pickFiles({ title: 'x', extensions: ['tif'], multiple: true, remember: true }));
    await new Promise((resolve) => setTimeout(resolve, 20)); // a later millisecond for the rewrite
    const changed = bytesOf(3, 2000);
    changed[1000] ^= 0xff; // the same size, one byte other
    await put('a-pan.tif', changed);
    await folder.removeEntry('a-ms.tif');
    const recalled = await new BrowserPlatform({ filePicker: async () => [] }).imageryMemory!.recall('site-a');
    expect(recalled.map((r) => [r.name, r.state])).toEqual([['a-pan.tif', 'changed'], ['a-ms.tif', 'missing'], ['b-pan.tif', 'ready']]);
  });

  it('keeps only files picked through handles, forgets a site given none, and takes a cancelled picker as no files', async () => {
    const pan = await put('c-pan.tif', bytesOf(6, 300));
    const platform = new BrowserPlatform({ filePicker: async () => [pan] });
    const [withHandle] = await platform.pickFiles({ title: 'x', extensions: ['tif'], remember: true });
    const dropped: FileRef = platform.adoptFile(new File([bytesOf(7, 10)], 'c-ms.tif'));
    await platform.imageryMemory!.remember('site-c', [withHandle, dropped]);
    expect((await platform.imageryMemory!.recall('site-c')).map((r) => r.name)).toEqual(['c-pan.tif']);
    await platform.imageryMemory!.remember('site-c', [dropped]);
    expect(await platform.imageryMemory!.recall('site-c')).toEqual([]);

    const cancelled = new BrowserPlatform({ filePicker: async () => { throw new DOMException('The user aborted a request.', 'AbortError'); } });
    expect(await cancelled.pickFiles({ title: 'x', extensions: ['tif'], remember: true })).toEqual([]);
    const failing = new BrowserPlatform({ filePicker: async () => { throw new DOMException('Must be handling a user gesture to show a file picker.', 'SecurityError'); } });
    await expect(failing.pickFiles({ title: 'x', extensions: ['tif'], remember: true })).rejects.toThrow('could not open the file picker (Must be handling a user gesture to show a file picker.)');
  });
});
