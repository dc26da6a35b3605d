// The main-process bridge handlers over real files in a temporary folder. The dialogs
// stand for the user's choice and are the only thing replaced; the registry, the reads,
// the demo lookup and the sender check are the real ones. Range semantics follow
// Blob.slice (W3C File API: a range running past the end is cut at the end).
import { mkdtemp, mkdir, readFile, rm, symlink, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { createBridgeHandlers, createBridgeRouter, type BridgeDependencies } from '../../electron/bridge-handlers.ts';
import { FileHandleRegistry } from '../../electron/policy/file-handles.ts';
import type { FrameIdentity } from '../../electron/policy/sender.ts';
import { MAX_RANGE_BYTES } from '../../src/platform/channels.ts';

const MAIN: FrameIdentity = { url: 'app://fellfield/index.html', processId: 3, routingId: 1 };

let tmp: string;
let scenePath: string;
let demoDir: string;
const scene = new Uint8Array(5000).map((_, i) => (i * 31 + 7) % 256);

beforeAll(async () => {
  tmp = await mkdtemp(path.join(os.tmpdir(), 'fellfield-bridge-'));
  scenePath = path.join(tmp, 'picked', 'scene.tif');
  await mkdir(path.dirname(scenePath), { recursive: true });
  await writeFile(scenePath, scene);
  await writeFile(path.join(tmp, 'unpicked.txt'), 'private');
  demoDir = path.join(tmp, 'demo');
  await mkdir(path.join(demoDir, 'late'), { recursive: true });
  await writeFile(path.join(demoDir, 'manifest.json'), '{"files":["pan.tif"]}');
  await writeFile(path.join(demoDir, 'late', 'ms.tif'), new Uint8Array(64));
  await symlink(path.join(tmp, 'unpicked.txt'), path.join(demoDir, 'linked.txt'));
});
afterAll(() => rm(tmp, { recursive: true, force: true }));

interface Harness {
  route: ReturnType<typeof createBridgeRouter>;
  registry: FileHandleRegistry;
  dialogs: { opened: number; nextPick: string[]; nextSave: string | undefined };
  logs: string[];
}

function harness(overrides: Partial<BridgeDependencies> = {}): Harness {
  const registry = new FileHandleRegistry();
  const dialogs = { opened: 0, nextPick: [] as string[], nextSave: undefined as string | undefined };
  const logs: string[] = [];
  const handlers = createBridgeHandlers({
    registry,
    demoDir,
    appFilesDir: path.join(tmp, 'app-files'),
    imageryMemoryDir: path.join(tmp, 'imagery-memory'),
    showOpenDialog: async () => { dialogs.opened++; return dialogs.nextPick; },
    showSaveDialog: async () => { dialogs.opened++; return dialogs.nextSave; },
    ...overrides,
  });
  const route = createBridgeRouter({ handlers, mainFrame: () => MAIN, log: (m) => logs.push(m) });
  return { route, registry, dialogs, logs };
}

async function pickScene(h: Harness) {
  h.dialogs.nextPick = [scenePath];
  const result = await h.route('pickFiles', MAIN, { title: 'Open a scene', extensions: ['tif'] });
  if (!result.ok) throw new Error(result.error.message);
  return result.value[0];
}

describe('picking and reading', () => {
  let h: Harness;
  beforeEach(() => { h = harness(); });

  it('hands out an opaque reference, never the path', async () => {
    const ref = await pickScene(h);
    expect(ref.name).toBe('scene.tif');
    expect(ref.size).toBe(5000);
    expect(ref.id).toMatch(/^[0-9a-f-]{36}$/);
    expect(JSON.stringify(ref)).not.toContain(tmp);
  });

  it('returns [] when the dialog is cancelled', async () => {
    h.dialogs.nextPick = [];
    expect(await h.route('pickFiles', MAIN, { title: 'Open', extensions: [] })).toEqual({ ok: true, value: [] });
  });

  it('reads the exact bytes of a range of a picked file', async () => {
    const ref = await pickScene(h);
    const result = await h.route('readRange', MAIN, { id: ref.id, offset: 1000, length: 16 });
    expect(result).toEqual({ ok: true, value: scene.slice(1000, 1016) });
  });

  it('cuts a range that runs past the end at the end of the file', async () => {
    const ref = await pickScene(h);
    const result = await h.route('readRange', MAIN, { id: ref.id, offset: 4990, length: 100 });
    expect(result.ok && result.value).toEqual(scene.slice(4990));
  });

  it('refuses a range that starts past the end of the file', async () => {
    const ref = await pickScene(h);
    for (const offset of [5000, 5001, 1e9]) {
      const result = await h.route('readRange', MAIN, { id: ref.id, offset, length: 10 });
      expect(result, String(offset)).toMatchObject({ ok: false, error: { code: 'out-of-range', file: 'scene.tif' } });
    }
  });

  it('refuses negative, fractional, non-numeric and oversized ranges', async () => {
    const ref = await pickScene(h);
    for (const [offset, length] of [[-1, 10], [0.5, 10], [0, -3], [0, Number.NaN], [0, MAX_RANGE_BYTES + 1]]) {
      const result = await h.route('readRange', MAIN, { id: ref.id, offset, length });
      expect(result, `${offset},${length}`).toMatchObject({ ok: false, error: { code: 'bad-request' } });
    }
    expect(await h.route('readRange', MAIN, { id: ref.id, offset: '0', length: 1 })).toMatchObject({ ok: false, error: { code: 'bad-request' } });
  });

  it('refuses a reference that was never handed out, and a raw path in its place', async () => {
    await pickScene(h);
    for (const id of ['00000000-0000-4000-8000-000000000000', path.join(tmp, 'unpicked.txt'), scenePath, '../unpicked.txt']) {
      const result = await h.route('readRange', MAIN, { id, offset: 0, length: 4 });
      expect(result, id).toMatchObject({ ok: false, error: { code: 'unknown-file' } });
    }
  });

  it('forgets every reference when the registry is cleared (window closed)', async () => {
    const ref = await pickScene(h);
    h.registry.clear();
    expect(await h.route('readRange', MAIN, { id: ref.id, offset: 0, length: 4 })).toMatchObject({ ok: false, error: { code: 'unknown-file' } });
  });

  it('reports a picked file that has since been deleted as not found', async () => {
    const doomed = path.join(tmp, 'doomed.bin');
    await writeFile(doomed, 'x');
    h.dialogs.nextPick = [doomed];
    const picked = await h.route('pickFiles', MAIN, { title: 'Open', extensions: [] });
    await rm(doomed);
    const ref = picked.ok ? picked.value[0] : undefined;
    expect(await h.route('readRange', MAIN, { id: ref?.id, offset: 0, length: 1 })).toMatchObject({ ok: false, error: { code: 'not-found', file: 'doomed.bin' } });
  });

  it('validates pick options before showing a dialog', async () => {
    for (const options of [null, 'x', { title: 3, extensions: [] }, { title: 'a', extensions: ['../x'] }, { title: 'a', extensions: 'tif' }, { title: 'a', extensions: [], multiple: 'yes' }]) {
      expect(await h.route('pickFiles', MAIN, options), JSON.stringify(options)).toMatchObject({ ok: false, error: { code: 'bad-request' } });
    }
    expect(h.dialogs.opened).toBe(0);
  });

  it('keeps only the first file when several were not asked for', async () => {
    h.dialogs.nextPick = [scenePath, path.join(tmp, 'unpicked.txt')];
    const result = await h.route('pickFiles', MAIN, { title: 'Open', extensions: [] });
    expect(result.ok && result.value.map((r) => r.name)).toEqual(['scene.tif']);
  });
});

describe('the sender check on every channel', () => {
  const foreign: Array<[string, FrameIdentity | null]> = [
    ['a subframe', { ...MAIN, routingId: 9 }],
    ['another renderer process', { ...MAIN, processId: 8 }],
    ['a frame at another origin', { ...MAIN, url: 'app://fellfield.evil/index.html' }],
    ['a destroyed frame', null],
  ];

  it.each(foreign)('refuses %s before running any handler', async (_label, sender) => {
    const h = harness();
    const ref = await pickScene(h);
    const opened = h.dialogs.opened;
    const calls = [
      h.route('pickFiles', sender, { title: 'Open', extensions: [] }),
      h.route('readRange', sender, { id: ref.id, offset: 0, length: 4 }),
      h.route('saveFile', sender, { suggestedName: 'a.txt', data: 'x' }),
      h.route('openDemoFile', sender, { name: 'manifest.json' }),
    ];
    for (const result of await Promise.all(calls)) expect(result).toMatchObject({ ok: false, error: { code: 'refused' } });
    expect(h.dialogs.opened).toBe(opened);
    expect(h.logs.length).toBe(4);
  });

  it('refuses everything once the window is closed', async () => {
    const handlers = createBridgeHandlers({ registry: new FileHandleRegistry(), demoDir, appFilesDir: path.join(tmp, 'app-files'), imageryMemoryDir: path.join(tmp, 'imagery-memory'), showOpenDialog: async () => [], showSaveDialog: async () => undefined });
    const route = createBridgeRouter({ handlers, mainFrame: () => undefined });
    expect(await route('openDemoFile', MAIN, { name: 'manifest.json' })).toMatchObject({ ok: false, error: { code: 'refused' } });
  });
});

describe('demo files', () => {
  it('opens demo files by name, including one level of folders', async () => {
    const h = harness();
    const manifest = await h.route('openDemoFile', MAIN, { name: 'manifest.json' });
    expect(manifest).toMatchObject({ ok: true, value: { name: 'manifest.json', size: 21 } });
    const text = manifest.ok ? await h.route('readRange', MAIN, { id: manifest.value.id, offset: 0, length: 21 }) : undefined;
    expect(text?.ok && new TextDecoder().decode(text.value)).toBe('{"files":["pan.tif"]}');
    expect(await h.route('openDemoFile', MAIN, { name: 'late/ms.tif' })).toMatchObject({ ok: true, value: { name: 'ms.tif', size: 64 } });
  });

  it('refuses names that are paths or climb out of the folder', async () => {
    const h = harness();
    for (const name of ['../unpicked.txt', '/etc/passwd', 'late/../manifest.json', '..', '.', 'late\\ms.tif', '%2e%2e/unpicked.txt', '', 'a//b', 'late/']) {
      expect(await h.route('openDemoFile', MAIN, { name }), name).toMatchObject({ ok: false, error: { code: 'bad-request' } });
    }
  });

  it('does not follow links out of the demo folder, and says when a file is missing', async () => {
    const h = harness();
    expect(await h.route('openDemoFile', MAIN, { name: 'linked.txt' })).toMatchObject({ ok: false, error: { code: 'not-found' } });
    expect(await h.route('openDemoFile', MAIN, { name: 'pan.tif' })).toMatchObject({ ok: false, error: { code: 'not-found', file: 'pan.tif' } });
  });

  it('says so when there is no demo folder at all', async () => {
    const h = harness({ demoDir: undefined });
    const result = await h.route('openDemoFile', MAIN, { name: 'manifest.json' });
    expect(result).toMatchObject({ ok: false, error: { code: 'not-found' } });
    expect(!result.ok && result.error.message).toMatch(/npm run demo:data/);
  });
});

describe('saving', () => {
  it('writes bytes or text where the user chose, and reports a cancel as false', async () => {
    const h = harness();
    h.dialogs.nextSave = path.join(tmp, 'out.geojson');
    expect(await h.route('saveFile', MAIN, { suggestedName: 'patches.geojson', data: '{"type":"FeatureCollection"}' })).toEqual({ ok: true, value: true });
    expect(await readFile(path.join(tmp, 'out.geojson'), 'utf8')).toBe('{"type":"FeatureCollection"}');
    h.dialogs.nextSave = path.join(tmp, 'out.bin');
    expect(await h.route('saveFile', MAIN, { suggestedName: 'chips.bin', data: new Uint8Array([1, 2, 3]) })).toEqual({ ok: true, value: true });
    expect([...(await readFile(path.join(tmp, 'out.bin')))]).toEqual([1, 2, 3]);
    h.dialogs.nextSave = undefined;
    expect(await h.route('saveFile', MAIN, { suggestedName: 'x.txt', data: 'x' })).toEqual({ ok: true, value: false });
  });

  it('refuses suggested names with folders and data of the wrong kind', async () => {
    const h = harness();
    for (const request of [{ suggestedName: '../x.txt', data: 'x' }, { suggestedName: '/tmp/x', data: 'x' }, { suggestedName: 'x', data: 5 }, { suggestedName: '', data: 'x' }]) {
      expect(await h.route('saveFile', MAIN, request), JSON.stringify(request)).toMatchObject({ ok: false, error: { code: 'bad-request' } });
    }
    expect(h.dialogs.opened).toBe(0);
  });

  it('reports a write that fails with the file name and no stack trace', async () => {
    const h = harness();
    h.dialogs.nextSave = path.join(tmp, 'no-such-folder', 'x.txt');
    const result = await h.route('saveFile', MAIN, { suggestedName: 'x.txt', data: 'x' });
    expect(result).toMatchObject({ ok: false, error: { code: 'io', file: 'x.txt' } });
    expect(!result.ok && result.error.message).not.toMatch(/\n\s+at /);
  });
});

describe('unexpected failures', () => {
  it('become a plain io failure with the cause logged, not thrown across IPC', async () => {
    const h = harness({ showOpenDialog: async () => { throw new Error('dialog crashed'); } });
    const result = await h.route('pickFiles', MAIN, { title: 'Open', extensions: [] });
    expect(result).toEqual({ ok: false, error: { code: 'io', message: 'the file could not be read or written' } });
    expect(h.logs.join('\n')).toMatch(/dialog crashed/);
  });
});
