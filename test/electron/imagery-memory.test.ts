// The desktop app's imagery memory over real files in temporary folders, through the
// real router, handlers, registry and sender check (only the open dialog stands for the
// user's choice). A kept file is handed out again only while stat (POSIX.1-2017, stat():
// st_size and st_mtim) gives the size and modification time it had when it was picked:
// moving it (rename()), appending to it, or only setting its time (utimensat(), as
// `touch` does) each stop it. The memory file is replaced by the app files' atomic write
// (temporary file, fsync, rename(); POSIX.1-2017 rename() replaces atomically).
import * as nodeFs from 'node:fs/promises';
import { appendFile, mkdir, mkdtemp, readdir, readFile, rename, rm, stat, utimes, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { sweepPartials, type AppFilesFs } from '../../electron/app-files.ts';
import { createBridgeHandlers, createBridgeRouter } from '../../electron/bridge-handlers.ts';
import { createImageryMemoryHandlers, MEMORY_FILE } from '../../electron/imagery-memory.ts';
import { FileHandleRegistry } from '../../electron/policy/file-handles.ts';
import { parseRecallImagery, parseRememberImagery } from '../../electron/policy/payloads.ts';
import type { FrameIdentity } from '../../electron/policy/sender.ts';
import type { FileRef, RecalledFile } from '../../src/platform/types.ts';

const MAIN: FrameIdentity = { url: 'app://fellfield/index.html', processId: 4, routingId: 1 };
const OTHER: FrameIdentity = { url: 'app://fellfield/index.html', processId: 4, routingId: 7 };
const root = await mkdtemp(path.join(os.tmpdir(), 'fellfield-memory-'));
afterAll(() => rm(root, { recursive: true, force: true }));

let n = 0;
let dir: string; // the case's folder: imagery, the app files, the memory
beforeEach(async () => {
  dir = path.join(root, `case-${n++}`);
  await mkdir(path.join(dir, 'scenes'), { recursive: true });
});

const bytesOf = (seed: number, size: number) => new Uint8Array(size).map((_, i) => (i * 31 + seed) % 256);

/** A desktop app over the case's folder: the bridge as the renderer reaches it, and its pick dialog's answer. */
function desktop(registry = new FileHandleRegistry()) {
  const dialog = { next: [] as string[] };
  const logs: string[] = [];
  const handlers = createBridgeHandlers({
    registry,
    demoDir: path.join(dir, 'demo'),
    appFilesDir: path.join(dir, 'app-files'),
    imageryMemoryDir: path.join(dir, 'imagery-memory'),
    showOpenDialog: async () => dialog.next,
    showSaveDialog: async () => undefined,
    log: (m) => logs.push(m),
  });
  const route = createBridgeRouter({ handlers, mainFrame: () => MAIN, log: (m) => logs.push(m) });
  // What crosses IPC is structured-cloned (HTML Standard), as Electron does.
  const call = async (key: Parameters<typeof route>[0], payload: unknown, from: FrameIdentity = MAIN) => structuredClone(await route(key, from, structuredClone(payload)));
  return {
    dialog, logs, registry, call,
    async pick(paths: string[]): Promise<FileRef[]> {
      dialog.next = paths;
      const result = await call('pickFiles', { title: 'The imagery', extensions: ['tif'], multiple: true });
      if (!result.ok) throw new Error(result.error.message);
      return result.value as FileRef[];
    },
    async remember(siteId: string, files: FileRef[]) {
      return call('rememberImagery', { siteId, ids: files.map((f) => f.id) });
    },
    async recall(siteId: string): Promise<RecalledFile[]> {
      const result = await call('recallImagery', { siteId });
      if (!result.ok) throw new Error(result.error.message);
      return result.value as RecalledFile[];
    },
  };
}

async function scenes(...names: string[]): Promise<string[]> {
  return Promise.all(names.map(async (name, i) => {
    const file = path.join(dir, 'scenes', name);
    await writeFile(file, bytesOf(i, 4000 + i));
    return file;
  }));
}

describe('the imagery memory of the desktop app', () => {
  it('hands a site its picked files again, in a later run, as new references that read the same bytes', async () => {
    const [pan, ms] = await scenes('north-pan.tif', 'north-ms.tif');
    const first = desktop();
    const picked = await first.pick([pan, ms]);
    expect(picked.map((f) => [f.name, f.size])).toEqual([['north-pan.tif', 4000], ['north-ms.tif', 4001]]);
    // the modification time the system gives, rounded to the millisecond (Node's fs.Stats.mtimeMs)
    expect(picked[0].modified).toBe(Math.round((await stat(pan)).mtimeMs));
    expect(await first.remember('site-north', picked)).toEqual({ ok: true, value: null });

    // The next run of the app: a new registry, so no id of the first run reads anything.
    const later = desktop();
    const recalled = await later.recall('site-north');
    expect(recalled.map((r) => [r.name, r.state])).toEqual([['north-pan.tif', 'ready'], ['north-ms.tif', 'ready']]);
    const ref = (recalled[0] as Extract<RecalledFile, { state: 'ready' }>).file;
    expect(ref).toMatchObject({ name: 'north-pan.tif', size: 4000, modified: picked[0].modified });
    expect(ref.id).not.toBe(picked[0].id);
    const read = await later.call('readRange', { id: ref.id, offset: 3990, length: 100 });
    expect(read).toEqual({ ok: true, value: bytesOf(0, 4000).slice(3990) });
    expect(await later.call('readRange', { id: picked[0].id, offset: 0, length: 1 })).toMatchObject({ ok: false, error: { code: 'unknown-file' } });
    expect(await later.recall('site-other')).toEqual([]);
  });

  it('does not hand out a file that was moved, resized or only touched; the unchanged one still is', async () => {
    const [moved, resized, touched, kept] = await scenes('a-pan.tif', 'a-ms.tif', 'b-pan.tif', 'b-ms.tif');
    const app = desktop();
    await app.remember('site-a', await app.pick([moved, resized, touched, kept]));
    await rename(moved, path.join(dir, 'scenes', 'elsewhere.tif'));
    await appendFile(resized, new Uint8Array([1]));
    const before = await stat(touched);
    await utimes(touched, before.atime, new Date(before.mtimeMs + 60_000)); // same bytes, a new time
    const recalled = await desktop().recall('site-a');
    expect(recalled).toEqual([
      { name: 'a-pan.tif', state: 'missing' },
      { name: 'a-ms.tif', state: 'changed' },
      { name: 'b-pan.tif', state: 'changed' },
      { name: 'b-ms.tif', state: 'ready', file: expect.objectContaining({ name: 'b-ms.tif', size: 4003 }) },
    ]);
    // A file put back where it was, with its old time, is the same file again.
    await rename(path.join(dir, 'scenes', 'elsewhere.tif'), moved);
    expect((await desktop().recall('site-a'))[0]).toMatchObject({ name: 'a-pan.tif', state: 'ready' });
  });

  it('keeps what the file was when it was picked, not what it became before it was remembered', async () => {
    const [pan] = await scenes('c-pan.tif');
    const app = desktop();
    const picked = await app.pick([pan]);
    await appendFile(pan, new Uint8Array([9])); // changed after the pick (and the check), before it is remembered
    await app.remember('site-c', picked);
    expect(await desktop().recall('site-c')).toEqual([{ name: 'c-pan.tif', state: 'changed' }]);
  });

  it('never lets a path cross the bridge: answers carry names and ids, requests name ids only', async () => {
    const [pan, ms] = await scenes('d-pan.tif', 'd-ms.tif');
    const app = desktop();
    await app.remember('site-d', await app.pick([pan, ms]));
    await appendFile(ms, new Uint8Array([1]));
    const answer = JSON.stringify(await app.call('recallImagery', { siteId: 'site-d' }));
    expect(answer).not.toContain(dir);
    expect(answer).not.toMatch(/[/\\]/);
    // The memory file holds the paths, so it is not among the app files the renderer may read.
    expect(await readdir(path.join(dir, 'imagery-memory'))).toEqual([MEMORY_FILE]);
    expect(await readFile(path.join(dir, 'imagery-memory', MEMORY_FILE), 'utf8')).toContain(pan);
    expect(await app.call('appFileRead', { name: MEMORY_FILE })).toEqual({ ok: true, value: null });
    expect(await app.call('appFileList', {})).toEqual({ ok: true, value: [] });
    // A path (or anything not handed out) given as an id is an unknown file; a path field is refused.
    expect(await app.call('rememberImagery', { siteId: 'site-d', ids: [pan] })).toMatchObject({ ok: false, error: { code: 'unknown-file' } });
    expect(await app.call('rememberImagery', { siteId: 'site-d', paths: [pan] })).toMatchObject({ ok: false, error: { code: 'bad-request' } });
    expect((await app.recall('site-d')).map((r) => r.state)).toEqual(['ready', 'changed']); // unchanged by the refusals
  });

  it('remembers only files the user picked, for calls from the app window', async () => {
    await mkdir(path.join(dir, 'demo'));
    await writeFile(path.join(dir, 'demo', 'pan.tif'), bytesOf(3, 64));
    const app = desktop();
    const demo = await app.call('openDemoFile', { name: 'pan.tif' });
    expect(demo.ok).toBe(true);
    expect(await app.remember('site-e', [(demo as { value: FileRef }).value])).toMatchObject({ ok: false, error: { code: 'bad-request', message: 'only files the user picked are remembered', file: 'pan.tif' } });
    const [pan] = await scenes('e-pan.tif');
    const picked = await app.pick([pan]);
    expect(await app.call('rememberImagery', { siteId: 'site-e', ids: [picked[0].id] }, OTHER)).toMatchObject({ ok: false, error: { code: 'refused' } });
    expect(await app.call('recallImagery', { siteId: 'site-e' }, OTHER)).toMatchObject({ ok: false, error: { code: 'refused' } });
    expect(await app.recall('site-e')).toEqual([]);
  });

  it('replaces a site\'s files on each remember, forgets on an empty list, and keeps other sites', async () => {
    const [a, b, c] = await scenes('f-pan.tif', 'f-ms.tif', 'g-pan.tif');
    const app = desktop();
    const [fa, fb, fc] = await app.pick([a, b, c]);
    await app.remember('site-f', [fa, fb]);
    await app.remember('site-g', [fc]);
    await app.remember('site-f', [fb]);
    expect((await app.recall('site-f')).map((r) => r.name)).toEqual(['f-ms.tif']);
    await app.remember('site-f', []);
    expect(await app.recall('site-f')).toEqual([]);
    expect((await app.recall('site-g')).map((r) => r.name)).toEqual(['g-pan.tif']);
  });

  it('writes the memory atomically: a write cut short leaves the memory before it, swept at the next start', async () => {
    const [a, b] = await scenes('h-pan.tif', 'h-ms.tif');
    const registry = new FileHandleRegistry();
    const app = desktop(registry);
    const [fa, fb] = await app.pick([a, b]);
    await app.remember('site-h', [fa]);
    const memoryDir = path.join(dir, 'imagery-memory');
    const before = await readFile(path.join(memoryDir, MEMORY_FILE), 'utf8');
    // The process "dies" at the rename: the new memory is flushed to a temporary file, never renamed.
    let reachedRename!: () => void;
    const atRename = new Promise<void>((resolve) => (reachedRename = resolve));
    const dying: AppFilesFs = { ...nodeFs, rename: () => { reachedRename(); return new Promise<void>(() => {}); } };
    void createImageryMemoryHandlers(memoryDir, registry, { fs: dying }).rememberImagery({ siteId: 'site-h', ids: [fa.id, fb.id] });
    await atRename;
    expect(await readFile(path.join(memoryDir, MEMORY_FILE), 'utf8')).toBe(before);
    const partial = (await readdir(memoryDir)).filter((f) => f !== MEMORY_FILE);
    expect(partial).toHaveLength(1);
    expect(partial[0]).toMatch(/^\.sites\.json\.[0-9a-f]+\.partial$/);
    expect(await readFile(path.join(memoryDir, partial[0]), 'utf8')).toContain(b);
    expect(await sweepPartials(memoryDir)).toEqual(partial);
    expect((await desktop().recall('site-h')).map((r) => r.name)).toEqual(['h-pan.tif']);
  });

  it('reads a damaged memory as empty, says so in the log, and starts it afresh', async () => {
    const [a] = await scenes('i-pan.tif');
    await mkdir(path.join(dir, 'imagery-memory'));
    await writeFile(path.join(dir, 'imagery-memory', MEMORY_FILE), '{"format":"fellfield-imagery-memory","version":1,"sites":{"site-i":{"at":1,"files":[{"path":"relative/x.tif","size":1,"mtimeMs":1}]}}');
    const app = desktop();
    expect(await app.recall('site-i')).toEqual([]);
    expect(app.logs.join('\n')).toMatch(/sites\.json in .* is damaged/);
    await app.remember('site-i', await app.pick([a]));
    expect((await desktop().recall('site-i')).map((r) => r.state)).toEqual(['ready']);
    // an entry that is not an absolute path is dropped on reading, the rest kept
    const doc = JSON.parse(await readFile(path.join(dir, 'imagery-memory', MEMORY_FILE), 'utf8'));
    doc.sites['site-j'] = { at: 2, files: [{ path: 'relative/x.tif', size: 1, mtimeMs: 1 }] };
    await writeFile(path.join(dir, 'imagery-memory', MEMORY_FILE), JSON.stringify(doc));
    expect(await desktop().recall('site-j')).toEqual([]);
    expect(await desktop().recall('site-i')).toHaveLength(1);
  });
});

describe('the imagery memory payloads', () => {
  it('takes a site id and file ids, and refuses anything else with the field at fault', () => {
    expect(parseRememberImagery({ siteId: 'site-4f1c', ids: ['a', 'b'] })).toEqual({ siteId: 'site-4f1c', ids: ['a', 'b'] });
    expect(parseRecallImagery({ siteId: 'blind-pkg-0123456789abcdef' })).toEqual({ siteId: 'blind-pkg-0123456789abcdef' });
    for (const bad of [null, [], 'site', { siteId: '' }, { siteId: 'two words' }, { siteId: 'x'.repeat(201) }, { siteId: 3 }]) {
      expect(() => parseRecallImagery(bad), JSON.stringify(bad)).toThrow(/imagery to recall/);
    }
    for (const bad of [{ siteId: 's' }, { siteId: 's', ids: 'a' }, { siteId: 's', ids: [3] }, { siteId: 's', ids: [''] }, { siteId: 's', ids: Array(65).fill('a') }]) {
      expect(() => parseRememberImagery(bad), JSON.stringify(bad)).toThrow(/imagery to remember/);
    }
  });
});
