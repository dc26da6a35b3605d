// The main process's handlers of the app's own files over real files in temporary
// folders. The write is the classic atomic replacement (write a temporary file, fsync
// it, rename it over the old one, fsync the folder): POSIX rename() replaces the target
// atomically (POSIX.1-2017, rename()), and fsync() makes the data durable before the
// rename can be seen (POSIX.1-2017, fsync()). Two failures are staged on real files: a
// crash between the write and the rename (the rename never happens), and a full disk at
// the write, first by failing the write with ENOSPC after half the bytes went out, then
// on a real 1 MiB tmpfs volume where the system itself says ENOSPC (needs root, as CI
// runs; skipped with a note otherwise).
import { execFileSync } from 'node:child_process';
import * as nodeFs from 'node:fs/promises';
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { createAppFilesHandlers, sweepPartials, type AppFilesFs } from '../../electron/app-files.ts';
import { createBridgeHandlers, createBridgeRouter } from '../../electron/bridge-handlers.ts';
import { FileHandleRegistry } from '../../electron/policy/file-handles.ts';
import type { FrameIdentity } from '../../electron/policy/sender.ts';
import { PlatformError } from '../../src/platform/errors.ts';

const root = await mkdtemp(path.join(os.tmpdir(), 'fellfield-appfiles-'));
afterAll(() => rm(root, { recursive: true, force: true }));
let dir: string;
let n = 0;
beforeEach(() => {
  dir = path.join(root, `case-${n++}`, 'app-files'); // not made yet: the first write makes it
});

const text = (bytes: Uint8Array | null) => (bytes === null ? null : new TextDecoder().decode(bytes));

describe('the app files of the desktop app', () => {
  it('writes, reads whole and by range, lists and removes files by plain name', async () => {
    const h = createAppFilesHandlers(dir);
    expect(await h.appFileList({})).toEqual([]); // no folder yet is an empty list
    await h.appFileWrite({ name: 'demo.site.json', data: '{"head":1}' });
    await h.appFileWrite({ name: 'pyr-1.tiles', data: new Uint8Array([0, 1, 2, 3, 4, 5, 6, 7]) });
    expect(text(await h.appFileRead({ name: 'demo.site.json' }))).toBe('{"head":1}');
    expect(await h.appFileRead({ name: 'pyr-1.tiles', offset: 6, length: 10 })).toEqual(new Uint8Array([6, 7]));
    expect(await h.appFileRead({ name: 'missing.json' })).toBeNull();
    expect(await h.appFileRead({ name: 'missing.json', offset: 0, length: 1 })).toBeNull();
    const listed = await h.appFileList({});
    expect(listed.map((f) => [f.name, f.size]).sort()).toEqual([['demo.site.json', 10], ['pyr-1.tiles', 8]]);
    expect(Math.abs(listed[0].modified - Date.now())).toBeLessThan(60_000);
    await h.appFileRemove({ name: 'pyr-1.tiles' });
    await h.appFileRemove({ name: 'pyr-1.tiles' }); // gone already: no error
    expect((await h.appFileList({})).map((f) => f.name)).toEqual(['demo.site.json']);
  });

  it('replaces a file whole and leaves no temporary file behind', async () => {
    const h = createAppFilesHandlers(dir);
    await h.appFileWrite({ name: 'demo.site.json', data: 'old copy' });
    await h.appFileWrite({ name: 'demo.site.json', data: 'the new copy, longer' });
    expect(await readFile(path.join(dir, 'demo.site.json'), 'utf8')).toBe('the new copy, longer');
    expect(await readdir(dir)).toEqual(['demo.site.json']);
  });

  it('lists only files of valid names: not folders, temporary files or strangers', async () => {
    const h = createAppFilesHandlers(dir);
    await h.appFileWrite({ name: 'a.json', data: 'a' });
    await nodeFs.mkdir(path.join(dir, 'sub'));
    await writeFile(path.join(dir, '.a.json.0011.partial'), 'half');
    await writeFile(path.join(dir, 'with space.txt'), 'x');
    expect((await h.appFileList({})).map((f) => f.name)).toEqual(['a.json']);
  });

  it('keeps the old file whole when the process dies between the write and the rename', async () => {
    await createAppFilesHandlers(dir).appFileWrite({ name: 'demo.site.json', data: 'the copy before' });
    let reachedRename!: () => void;
    const atRename = new Promise<void>((resolve) => (reachedRename = resolve));
    // The process "dies" at the rename: the call never returns and nothing after it runs.
    const dying: AppFilesFs = { ...nodeFs, rename: () => { reachedRename(); return new Promise<void>(() => {}); } };
    void createAppFilesHandlers(dir, dying).appFileWrite({ name: 'demo.site.json', data: 'the copy after' });
    await atRename;
    expect(await readFile(path.join(dir, 'demo.site.json'), 'utf8')).toBe('the copy before');
    const left = (await readdir(dir)).filter((f) => f !== 'demo.site.json');
    expect(left).toHaveLength(1);
    expect(left[0]).toMatch(/^\.demo\.site\.json\.[0-9a-f]+\.partial$/);
    expect(await readFile(path.join(dir, left[0]), 'utf8')).toBe('the copy after'); // flushed, but never renamed

    // The next start sweeps the unfinished write away; the old copy is what is read.
    expect(await sweepPartials(dir)).toEqual(left);
    expect(await readdir(dir)).toEqual(['demo.site.json']);
    expect(text(await createAppFilesHandlers(dir).appFileRead({ name: 'demo.site.json' }))).toBe('the copy before');
  });

  it('reports a full disk at the write in one line and keeps the old file as it was', async () => {
    await createAppFilesHandlers(dir).appFileWrite({ name: 'demo.site.json', data: 'the copy before' });
    const full: AppFilesFs = {
      ...nodeFs,
      open: (async (file: string, flags: string) => {
        const handle = await nodeFs.open(file, flags);
        if (!file.endsWith('.partial')) return handle;
        // Half of the bytes reach the disk, then the system refuses the rest.
        return new Proxy(handle, {
          get(target, key) {
            if (key === 'writeFile') {
              return async (data: string) => {
                await target.write(data.slice(0, data.length >> 1));
                throw Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC', errno: -28, syscall: 'write' });
              };
            }
            const value = Reflect.get(target, key);
            return typeof value === 'function' ? value.bind(target) : value;
          },
        });
      }) as AppFilesFs['open'],
    };
    const error = await createAppFilesHandlers(dir, full).appFileWrite({ name: 'demo.site.json', data: 'the copy after, which does not fit' }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(PlatformError);
    expect(error).toMatchObject({ code: 'full', file: 'demo.site.json' });
    expect((error as Error).message).toBe('demo.site.json: not written: the disk is full (the version written before is kept); free some disk space');
    expect(await readFile(path.join(dir, 'demo.site.json'), 'utf8')).toBe('the copy before');
    expect(await readdir(dir)).toEqual(['demo.site.json']); // the half-written temporary file is removed
  });

  it('crosses the bridge as data: a full disk is a "full" failure naming the file, a bad name a refusal', async () => {
    const MAIN: FrameIdentity = { url: 'app://fellfield/index.html', processId: 3, routingId: 1 };
    const handlers = createBridgeHandlers({
      registry: new FileHandleRegistry(), demoDir: undefined, appFilesDir: dir, imageryMemoryDir: path.join(dir, '..', 'imagery-memory'),
      showOpenDialog: async () => [], showSaveDialog: async () => undefined,
    });
    const route = createBridgeRouter({ handlers, mainFrame: () => MAIN });
    expect(await route('appFileWrite', MAIN, { name: 'a.json', data: 'x' })).toEqual({ ok: true, value: null });
    expect(await route('appFileRead', MAIN, { name: 'a.json' })).toEqual({ ok: true, value: new TextEncoder().encode('x') });
    expect(await route('appFileWrite', MAIN, { name: '../escape.json', data: 'x' })).toMatchObject({ ok: false, error: { code: 'bad-request' } });
    expect(await route('appFileRemove', { ...MAIN, routingId: 4 }, { name: 'a.json' })).toMatchObject({ ok: false, error: { code: 'refused' } });
    expect(await route('appFileList', MAIN, {})).toMatchObject({ ok: true, value: [{ name: 'a.json', size: 1 }] });
    expect((await readdir(path.dirname(dir))).sort()).toEqual(['app-files']); // nothing escaped the folder
  });
});

// A real full disk: a 1 MiB tmpfs. The old copy (600 KiB) fits; its replacement (900 KiB)
// cannot be written beside it, so the system itself reports ENOSPC at the write.
const small = path.join(root, 'small');
function mountSmall(): boolean {
  try {
    execFileSync('mkdir', ['-p', small]);
    execFileSync('mount', ['-t', 'tmpfs', '-o', 'size=1m', 'tmpfs', small], { stdio: 'pipe' });
    return true;
  } catch (error) {
    console.warn(`real full-disk check skipped: cannot mount a small tmpfs (${(error as Error).message.split('\n')[0]}); it needs root`);
    return false;
  }
}

describe('a real full disk', () => {
  const mounted = mountSmall();
  afterAll(() => {
    if (mounted) execFileSync('umount', ['-l', small]);
  });

  it.skipIf(!mounted)('fails the replacement with "full" and keeps the copy before it', async () => {
    const h = createAppFilesHandlers(path.join(small, 'app-files'));
    const before = new Uint8Array(600 * 1024).fill(7);
    await h.appFileWrite({ name: 'demo.site.json', data: before });
    const error = await h.appFileWrite({ name: 'demo.site.json', data: new Uint8Array(900 * 1024).fill(9) }).catch((e: unknown) => e);
    expect(error).toMatchObject({ code: 'full', file: 'demo.site.json' });
    expect(await h.appFileRead({ name: 'demo.site.json' })).toEqual(before);
    expect(await readdir(path.join(small, 'app-files'))).toEqual(['demo.site.json']);
  });
});
