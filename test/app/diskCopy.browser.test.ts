// The copy of a site on disk, in real Chromium: real IndexedDB stores (Dexie) and real
// files in a folder handle of the origin-private file system, the handle a granted folder
// gives (the browser's folder picker itself cannot be answered by a test). Each check
// stages what happens to a real store (deleted as an engine reset does, restored from an
// older backup, made anew with another history, left at a schema version this app cannot
// open) and weighs the copy against it; the expected standing follows from the hash
// chain (src/core/ledger): a copy is an earlier state of a store when the store's ledger
// holds the copy's head hash at the copy's head sequence.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { verifyChain } from '../../src/core/ledger/chain.ts';
import { addPatch } from '../../src/app/site/addPatch.ts';
import { siteFileText } from '../../src/app/site/backupSite.ts';
import type { SiteContext } from '../../src/app/site/context.ts';
import { createSite } from '../../src/app/site/createSite.ts';
import { listDiskCopies, restoreDiskCopy, worthRestoring } from '../../src/app/site/diskCopies.ts';
import { appFilesTarget, diskCopyName, DiskCopyKeeper, type KeeperStatus } from '../../src/app/site/diskCopy.ts';
import { withDiskCopy, type CopyLine } from '../../src/app/site/diskCopySession.ts';
import { restoreSite } from '../../src/app/site/restoreSite.ts';
import { tagPatch } from '../../src/app/site/tagPatch.ts';
import { importRoster } from '../../src/app/site/importRoster.ts';
import { BrowserPlatform } from '../../src/platform/browser.ts';
import { DirectoryAppFiles } from '../../src/platform/directory-files.ts';
import { SiteStore } from '../../src/store/SiteStore.ts';
import { siteDatabaseName } from '../../src/store/schema.ts';
import { square } from '../core/site/scenario.ts';

const display = { composite: 'natural', stretch: 'percentile 2-98', date: '2026-07-01' };
let clock = Date.UTC(2026, 6, 1, 8);
const now = () => new Date((clock += 1000)).toISOString();
let root: FileSystemDirectoryHandle;
let parent: FileSystemDirectoryHandle;

beforeAll(async () => {
  root = await navigator.storage.getDirectory();
  parent = await root.getDirectoryHandle(`copies-${crypto.randomUUID()}`, { create: true });
});
afterAll(async () => {
  await root.removeEntry(parent.name, { recursive: true });
});

async function folder(): Promise<DirectoryAppFiles> {
  return new DirectoryAppFiles(await parent.getDirectoryHandle(crypto.randomUUID(), { create: true }));
}

async function newSite(id = `site-${crypto.randomUUID()}`): Promise<SiteContext> {
  const ctx = await createSite({ id, name: `Copy case ${clock}`, epsg: 32632, interpreter: 'ak', now });
  await importRoster(ctx, 'roster.csv', 'code,scientific_name,common_name,group,colour,key\nPICE,Picea abies,Norway spruce,conifer,#009E73,1\n');
  return ctx;
}

async function edit(ctx: SiteContext, n: number): Promise<void> {
  for (let i = 0; i < n; i++) {
    const patch = await addPatch(ctx, square(i * 10, clock % 1000));
    await tagPatch(ctx, { patchId: patch.id, species: 'PICE', confidence: 'likely', display });
  }
}

/** Waits until the keeper's status passes `test`. */
function until(keeper: DiskCopyKeeper, test: (s: KeeperStatus) => boolean): Promise<KeeperStatus> {
  return new Promise((resolve) => {
    const stop = keeper.subscribe((s) => {
      if (test(s)) {
        queueMicrotask(() => stop());
        resolve(s);
      }
    });
  });
}

const read = async (files: DirectoryAppFiles, name: string) => new TextDecoder().decode((await files.read(name))!);

describe('the keeper of the copy on disk', () => {
  it('writes a missing copy at once, then follows the store, and closing writes the last changes', async () => {
    const files = await folder();
    const ctx = await newSite();
    const keeper = new DiskCopyKeeper(ctx.store, appFilesTarget(files), { quietMs: 60_000, maxDelayMs: 120_000 });
    await until(keeper, (s) => s.written?.seq === ctx.store.state.head.seq);
    expect(await read(files, diskCopyName(ctx.store.state.site!.id))).toBe(await siteFileText(ctx.store));
    await edit(ctx, 3);
    expect(keeper.upToDate).toBe(false); // the quiet interval has not passed
    await keeper.close();
    expect(await read(files, diskCopyName(ctx.store.state.site!.id))).toBe(await siteFileText(ctx.store));
    ctx.store.close();
  });

  it('sets a copy of another history aside instead of overwriting it', async () => {
    const files = await folder();
    const first = await newSite();
    const id = first.store.state.site!.id;
    await edit(first, 2);
    const keeper = new DiskCopyKeeper(first.store, appFilesTarget(files), { quietMs: 10 });
    await until(keeper, (s) => s.written?.seq === first.store.state.head.seq);
    await keeper.close();
    const good = await read(files, diskCopyName(id));
    first.store.close();
    await SiteStore.remove(id); // the engine reset the store; the site is then made anew

    const again = await newSite(id);
    const stamp = new Date(Date.UTC(2026, 6, 2, 9, 30, 5));
    const second = new DiskCopyKeeper(again.store, appFilesTarget(files), { quietMs: 10, now: () => stamp });
    await new Promise((r) => setTimeout(r, 200));
    expect(await read(files, diskCopyName(id))).toBe(good); // nothing written over it at start
    await edit(again, 1);
    const status = await until(second, (s) => s.written?.seq === again.store.state.head.seq);
    expect(status.setAside).toBe(`${id}.site.aside-20260702T093005Z.json`);
    expect(await read(files, status.setAside!)).toBe(good);
    expect(await read(files, diskCopyName(id))).toBe(await siteFileText(again.store));
    await second.close();
    again.store.close();
    await SiteStore.remove(id);
  });

  it('reports a write that fails and keeps trying with the next change', async () => {
    const files = await folder();
    const ctx = await newSite();
    let refuse = true;
    const target = appFilesTarget(files);
    const keeper = new DiskCopyKeeper(ctx.store, { ...target, write: (n, t) => (refuse ? Promise.reject(new Error(`${n}: not written: the disk is full`)) : target.write(n, t)) }, { quietMs: 10 });
    expect((await until(keeper, (s) => s.error !== null)).error!.message).toMatch(/the disk is full/);
    refuse = false;
    await edit(ctx, 1);
    const status = await until(keeper, (s) => s.error === null && s.written?.seq === ctx.store.state.head.seq);
    expect(status.written!.at).not.toBeNull();
    await keeper.close();
    ctx.store.close();
  });
});

describe('the copies weighed against their stores, and restored', () => {
  it('offers the copy of a site missing from storage and brings every change back, the chain verified', async () => {
    const files = await folder();
    const ctx = await newSite();
    const id = ctx.store.state.site!.id;
    await edit(ctx, 4);
    const keeper = new DiskCopyKeeper(ctx.store, appFilesTarget(files), { quietMs: 10 });
    await keeper.close();
    const ledger = (await ctx.store.ledger()).map((e) => [e.seq, e.hash]);
    const text = await siteFileText(ctx.store);
    expect((await listDiskCopies(files))[0].standing).toBe('current');
    ctx.store.close();
    await SiteStore.remove(id);

    const [entry] = await listDiskCopies(files);
    expect(entry).toMatchObject({ file: `${id}.site.json`, siteId: id, standing: 'missing', asideAt: null, problem: null });
    expect(entry.holds).toMatchObject({ siteName: ctx.store.name, patches: 4, tags: 4, passes: 1, rulings: 0, changes: ledger.length });
    expect(worthRestoring(entry)).toBe(true);
    const restored = await restoreDiskCopy(files, entry);
    expect(restored).toEqual({ name: ctx.store.name, patches: 4, changes: ledger.length, keptAs: null });
    const reopened = await SiteStore.open(id);
    expect((await reopened.ledger()).map((e) => [e.seq, e.hash])).toEqual(ledger);
    expect((await verifyChain(await reopened.ledger())).ok).toBe(true);
    expect(await siteFileText(reopened)).toBe(text);
    reopened.close();
    expect((await listDiskCopies(files))[0].standing).toBe('current');
    await SiteStore.remove(id);
  });

  it('tells a store behind its copy (restored from an older backup) and one of another history, and keeps the replaced one', async () => {
    const files = await folder();
    const ctx = await newSite();
    const id = ctx.store.state.site!.id;
    await edit(ctx, 1);
    const older = await siteFileText(ctx.store);
    await edit(ctx, 2);
    await new DiskCopyKeeper(ctx.store, appFilesTarget(files), { quietMs: 10 }).close();
    const full = ctx.store.state.head.seq;
    ctx.store.close();
    (await restoreSite('older.json', older, { replace: true })).close();
    const [behind] = await listDiskCopies(files);
    expect(behind).toMatchObject({ standing: 'behind', storedChanges: JSON.parse(older).head.seq });
    expect(behind.holds!.changes).toBe(full);

    await SiteStore.remove(id);
    const other = await newSite(id); // the same id, another history
    const otherText = await siteFileText(other.store);
    other.store.close();
    const [different] = await listDiskCopies(files);
    expect(different.standing).toBe('different');
    const restored = await restoreDiskCopy(files, different, new Date(Date.UTC(2026, 6, 3, 7, 0, 0)));
    expect(restored.keptAs).toBe(`${id}.site.aside-20260703T070000Z.json`);
    expect(await read(files, restored.keptAs!)).toBe(otherText);
    const entries = await listDiskCopies(files);
    expect(entries.find((e) => e.file === `${id}.site.json`)!.standing).toBe('current');
    expect(entries.find((e) => e.file === restored.keptAs)).toMatchObject({ asideAt: '2026-07-03T07:00:00Z', standing: 'different' });
    await SiteStore.remove(id);
  });

  it('replaces a store that cannot be read (a database without the site tables, at a version this app never made)', async () => {
    const files = await folder();
    const ctx = await newSite();
    const id = ctx.store.state.site!.id;
    await edit(ctx, 2);
    await new DiskCopyKeeper(ctx.store, appFilesTarget(files), { quietMs: 10 }).close();
    const text = await siteFileText(ctx.store);
    ctx.store.close();
    await SiteStore.remove(id);
    await new Promise<void>((resolve, reject) => {
      const open = indexedDB.open(siteDatabaseName(id), 990);
      open.onsuccess = () => (open.result.close(), resolve());
      open.onerror = () => reject(open.error);
    });
    const [entry] = await listDiskCopies(files);
    expect(entry.standing).toBe('unreadable');
    // Dexie 4 opens a database of a higher version than it declares, then finds no tables
    expect(entry.storeProblem).toMatch(/^NotFoundError: .*object stores was not found/);
    await restoreDiskCopy(files, entry);
    const reopened = await SiteStore.open(id);
    expect(await siteFileText(reopened)).toBe(text);
    reopened.close();
    await SiteStore.remove(id);
  });

  it('lists a damaged copy with the problem, never offering it for restoring', async () => {
    const files = await folder();
    await files.write('site-x.site.json', '{"format":"fellfield-site","head":');
    const [entry] = await listDiskCopies(files);
    expect(entry.problem).toMatch(/^site-x\.site\.json: cannot be read/);
    expect(worthRestoring(entry)).toBe(false);
  });
});

describe('the copy of an open site', () => {
  it('is kept once the user grants a folder, and says when it was written', async () => {
    const granted = await parent.getDirectoryHandle(`granted-${crypto.randomUUID()}`, { create: true });
    const platform = new BrowserPlatform({ directoryPicker: async () => granted });
    const ctx = await newSite();
    let closed = false;
    const site = await withDiskCopy(platform, { store: ctx.store, dispose: () => (closed = true) } as never, { quietMs: 10 });
    const lines: CopyLine[] = [];
    site.diskCopy!.subscribe((l) => lines.push(l));
    await expect.poll(() => lines.at(-1)).toEqual({ kind: 'none', folder: { state: 'none' } });
    await site.diskCopy!.chooseFolder();
    await expect.poll(() => lines.at(-1)).toMatchObject({ kind: 'kept', where: `the folder "${granted.name}"`, written: { behind: 0 }, error: null });
    await edit(ctx, 1);
    await expect.poll(() => lines.at(-1)).toMatchObject({ kind: 'kept', written: { behind: 0 } });
    expect(lines.some((l) => l.kind === 'kept' && (l.written?.behind ?? 0) > 0)).toBe(true);
    site.dispose();
    expect(closed).toBe(true);
    const text = await new DirectoryAppFiles(granted).read(diskCopyName(ctx.store.state.site!.id));
    expect(new TextDecoder().decode(text!)).toBe(await siteFileText(ctx.store));
    ctx.store.close();
    await new Promise((resolve) => { const r = indexedDB.deleteDatabase('fellfield-app-folder'); r.onsuccess = r.onerror = resolve; });
  });
});
