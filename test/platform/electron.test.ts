// The Electron bridge end to end without Electron: the renderer-side ElectronPlatform
// talks to the real main-process router and handlers over real files, through an
// in-process stand-in for the preload (inProcessBridge.ts).
import { mkdtemp, mkdir, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FrameIdentity } from '../../electron/policy/sender.ts';
import { BRIDGE_GLOBAL, type BridgeApi } from '../../src/platform/channels.ts';
import { ElectronPlatform } from '../../src/platform/electron.ts';
import { PlatformError } from '../../src/platform/errors.ts';
import { choosePlatform } from '../../src/platform/index.ts';
import { BrowserPlatform } from '../../src/platform/browser.ts';
import type { FileRef } from '../../src/platform/types.ts';
import { inProcessBridge, MAIN_FRAME } from './inProcessBridge.ts';

const MAIN = MAIN_FRAME;
let tmp: string;
const pan = new Uint8Array(3000).map((_, i) => (i * 7) % 256);

function bridgeFrom(sender: FrameIdentity, pick: string[]): BridgeApi {
  return inProcessBridge({ dir: tmp, sender, pick: () => pick });
}

beforeAll(async () => {
  tmp = await mkdtemp(path.join(os.tmpdir(), 'fellfield-eplat-'));
  await mkdir(path.join(tmp, 'demo'));
  await writeFile(path.join(tmp, 'demo', 'pan.tif'), pan);
  await writeFile(path.join(tmp, 'field.geojson'), '{"type":"FeatureCollection","features":[]}');
});
afterAll(() => rm(tmp, { recursive: true, force: true }));

describe('the Electron platform', () => {
  it('opens demo files and reads their ranges', async () => {
    const p = new ElectronPlatform(bridgeFrom(MAIN, []));
    const ref = await p.openDemoFile('pan.tif');
    expect(ref).toMatchObject({ name: 'pan.tif', size: 3000 });
    expect(await p.readRange(ref, 2990, 64)).toEqual(pan.slice(2990));
  });

  it('picks files through the dialog and reads them by reference', async () => {
    const p = new ElectronPlatform(bridgeFrom(MAIN, [path.join(tmp, 'field.geojson')]));
    const [ref] = await p.pickFiles({ title: 'Field polygons', extensions: ['geojson'] });
    const bytes = await p.readRange(ref, 0, 8);
    expect(new TextDecoder().decode(bytes)).toBe('{"type":');
  });

  it('turns refusals into PlatformErrors that name the file once', async () => {
    const p = new ElectronPlatform(bridgeFrom(MAIN, []));
    const ref = await p.openDemoFile('pan.tif');
    const error = await p.readRange(ref, 5000, 1).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(PlatformError);
    expect(error).toMatchObject({ code: 'out-of-range', file: 'pan.tif' });
    expect((error as Error).message).toBe('pan.tif: offset 5000 is past the end of the file (3000 bytes)');
    const forged = await p.readRange({ id: 'forged', name: 'x', size: 10 }, 0, 1).catch((e: unknown) => e);
    expect(forged).toMatchObject({ code: 'unknown-file' });
  });

  it('is refused everything when the calls come from a foreign frame', async () => {
    const p = new ElectronPlatform(bridgeFrom({ ...MAIN, routingId: 5 }, []));
    await expect(p.openDemoFile('pan.tif')).rejects.toMatchObject({ code: 'refused' });
  });

  it('releases the caller at once when the signal fires mid-read', async () => {
    const slow: BridgeApi = { ...bridgeFrom(MAIN, []), readRange: () => new Promise(() => {}) };
    const p = new ElectronPlatform(slow);
    const controller = new AbortController();
    const read = p.readRange({ id: 'x', name: 'pan.tif', size: 3000 }, 0, 10, controller.signal);
    controller.abort();
    await expect(read).rejects.toMatchObject({ code: 'aborted', file: 'pan.tif' });
  });

  it('keeps the app files in its own folder: write, read, list, remove, and names refused before any call', async () => {
    const p = new ElectronPlatform(bridgeFrom(MAIN, []));
    expect(p.folderGrant).toBeNull();
    const files = (await p.appFiles())!;
    await files.write('demo.site.json', '{"a":1}');
    await files.write('pyr-1.tiles', new Uint8Array([5, 6, 7]));
    expect(new TextDecoder().decode((await files.read('demo.site.json'))!)).toBe('{"a":1}');
    expect(await files.read('pyr-1.tiles', { offset: 1, length: 5 })).toEqual(new Uint8Array([6, 7]));
    expect(await files.read('none.json')).toBeNull();
    expect((await files.list()).map((f) => f.name).sort()).toEqual(['demo.site.json', 'pyr-1.tiles']);
    await files.remove('pyr-1.tiles');
    expect((await files.list()).map((f) => f.name)).toEqual(['demo.site.json']);
    await expect(files.write('../x', 'x')).rejects.toMatchObject({ code: 'bad-request' });
  });

  it('finds a site\'s picked imagery again through the main process, by reference only', async () => {
    const scene = path.join(tmp, 'north-pan.tif');
    await writeFile(scene, pan);
    const bridge = bridgeFrom(MAIN, [scene]);
    const p = new ElectronPlatform(bridge);
    const [picked] = await p.pickFiles({ title: 'The imagery', extensions: ['tif'], multiple: true, remember: true });
    expect(picked.modified).toEqual(expect.any(Number));
    await p.imageryMemory.remember('site-north', [picked]);
    const [again] = await p.imageryMemory.recall('site-north');
    expect(again).toMatchObject({ name: 'north-pan.tif', state: 'ready', file: { name: 'north-pan.tif', size: 3000, modified: picked.modified } });
    expect(await p.readRange((again as { file: FileRef }).file, 0, 4)).toEqual(pan.slice(0, 4));
    expect(JSON.stringify(again)).not.toContain(tmp);
  });

  it('saves through the save dialog', async () => {
    const p = new ElectronPlatform(bridgeFrom(MAIN, []));
    expect(await p.saveFile('labels.geojson', '{}')).toBe(true);
  });
});

describe('choosing the platform', () => {
  it('uses the Electron bridge when the preload exposed it, the browser otherwise', () => {
    expect(choosePlatform({ [BRIDGE_GLOBAL]: bridgeFrom(MAIN, []) })).toBeInstanceOf(ElectronPlatform);
    expect(choosePlatform({})).toBeInstanceOf(BrowserPlatform);
    expect(choosePlatform({ [BRIDGE_GLOBAL]: 'not a bridge' })).toBeInstanceOf(BrowserPlatform);
  });
});
