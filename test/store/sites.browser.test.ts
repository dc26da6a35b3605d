import { describe, expect, it } from 'vitest';
import { exportBlindPackage } from '../../src/app/blind/blindFiles.ts';
import { startBlindPass } from '../../src/app/blind/blindPasses.ts';
import { receivePackageFile } from '../../src/app/blind/receivePackage.ts';
import { addPatch } from '../../src/app/site/addPatch.ts';
import { createSite } from '../../src/app/site/createSite.ts';
import { allVerified, checkSiteImagery, verifiedScenes } from '../../src/app/sites/checkImagery.ts';
import { WorkerHasher } from '../../src/app/sites/fileHash.ts';
import { openStoredSite } from '../../src/app/sites/openStoredSite.ts';
import { receivedSiteId } from '../../src/app/blind/blindFiles.ts';
import { readBlindPackage } from '../../src/core/blind/index.ts';
import { toHex } from '../../src/core/ledger/sha256.ts';
import { BrowserPlatform } from '../../src/platform/browser.ts';
import { SiteStore } from '../../src/store/SiteStore.ts';
import { listSites } from '../../src/store/siteCatalogue.ts';
import { square } from '../core/site/scenario.ts';

// Stored sites of the user's own on real IndexedDB in Chromium: the imagery check with
// the hashing worker (digests against Web Crypto's), a site opened without imagery, and
// a blind package made into a site on the answering machine, opened again, and made
// again after a crash left it half made.

let clock = Date.UTC(2026, 7, 1, 8);
const now = () => new Date((clock += 1000)).toISOString();

function bytes(size: number, seed: number): Uint8Array<ArrayBuffer> {
  const out = new Uint8Array(size);
  for (let i = 0; i < size; i++) out[i] = (i * 31 + seed * 7 + (i >> 9)) & 0xff;
  return out;
}
const webCryptoSha256 = async (data: Uint8Array) => toHex(await crypto.subtle.digest('SHA-256', data as Uint8Array<ArrayBuffer>));

async function siteWithScene() {
  const ctx = await createSite({ name: `Own site ${clock}`, epsg: 32633, interpreter: 'ana', now });
  const pan = bytes(5 * 1024 * 1024 + 77, 1), ms = bytes(1024 * 1024 + 5, 2);
  const scene = {
    id: 'scene-1', date: '2026-07-30', epsg: 32633,
    files: [{ role: 'pan', name: 'north-pan.tif', size: pan.length, sha256: await webCryptoSha256(pan) }, { role: 'ms', name: 'north-ms.tif', size: ms.length, sha256: await webCryptoSha256(ms) }],
  };
  await ctx.store.commit({ kind: 'scene.added', payload: { scene }, actor: 'ana', time: now() });
  for (let i = 0; i < 4; i++) await addPatch(ctx, square(500000 + 10 * i, 5000000, 5));
  return { ctx, pan, ms };
}

describe('stored sites of the user', () => {
  it('checks picked imagery by name, size and SHA-256 in the hashing worker', async () => {
    const { ctx, pan, ms } = await siteWithScene();
    const platform = new BrowserPlatform();
    const changed = ms.slice();
    changed[changed.length >> 1] ^= 1;
    const hasher = new WorkerHasher();
    try {
      const scenes = [...ctx.store.state.scenes.values()];
      const good = await checkSiteImagery(platform, scenes, [platform.adoptFile(new Blob([ms]), 'north-ms.tif'), platform.adoptFile(new Blob([pan]), 'north-pan.tif')], { hasher });
      expect(allVerified(good)).toBe(true);
      expect(verifiedScenes(good)).toEqual([{ date: '2026-07-30', files: [expect.objectContaining({ name: 'north-pan.tif' }), expect.objectContaining({ name: 'north-ms.tif' })] }]);

      const fractions: number[] = [];
      const bad = await checkSiteImagery(platform, scenes, [platform.adoptFile(new Blob([pan]), 'north-pan.tif'), platform.adoptFile(new Blob([changed]), 'north-ms.tif'), platform.adoptFile(new Blob(['x']), 'notes.txt')], {
        hasher, onProgress: (p) => fractions.push(p.fraction ?? 0),
      });
      expect(bad.files.map((f) => f.status)).toEqual(['verified', 'differs']);
      expect(bad.files[1].message).toMatch(/^north-ms\.tif: refused, its content differs/);
      expect(bad.unused.map((f) => f.name)).toEqual(['notes.txt']);
      expect(fractions.at(-1)).toBe(1);
      expect(verifiedScenes(bad)[0].files.map((f) => f.name)).toEqual(['north-pan.tif']);

      const missing = await checkSiteImagery(platform, scenes, [platform.adoptFile(new Blob([pan]), 'north-pan.tif')], { hasher });
      expect(missing.files[1]).toMatchObject({ status: 'missing', message: 'north-ms.tif: not picked' });

      // Cancelled between pieces: nothing is reported as checked.
      const abort = new AbortController();
      abort.abort();
      await expect(checkSiteImagery(platform, scenes, [platform.adoptFile(new Blob([pan]), 'north-pan.tif')], { hasher, signal: abort.signal })).rejects.toThrow(/cancelled/);
    } finally {
      hasher.dispose();
      ctx.store.close();
    }
  });

  it('opens a stored site without imagery on a map spanning its patches, saying so', async () => {
    const { ctx } = await siteWithScene();
    const id = ctx.store.state.site!.id;
    ctx.store.close();
    const store = await SiteStore.open(id);
    const site = await openStoredSite(new BrowserPlatform(), store, null);
    try {
      expect(site.store).toBe(store);
      expect(site.scenes).toEqual([{ date: '2026-07-30', pan: null, ms: null }]);
      const [x0, y0, x1, y1] = site.extent;
      expect(x0).toBeLessThan(500000);
      expect(x1).toBeGreaterThan(500035);
      expect(y0).toBeLessThan(5000000);
      expect(y1).toBeGreaterThan(5000005);
      expect(site.notes?.[0]).toMatch(/^Opened without imagery: .*north-pan\.tif, north-ms\.tif/);
      expect(site.crsName).toBe('WGS 84 / UTM zone 33N');
    } finally {
      site.dispose();
    }
  });

  it('makes a received blind package into a site once, opens it again, and remakes one a crash cut short', async () => {
    const { ctx } = await siteWithScene();
    const ids = [...ctx.store.state.patches.keys()].slice(0, 3);
    const { pass } = await startBlindPass(ctx.store, { kind: 'picked', patchIds: ids }, { interpreter: 'ben', by: 'ana', time: now() });
    let text = '';
    await exportBlindPackage(ctx.store.state, pass.id, async (_name, data) => ((text = data), true), { interpreter: 'ana', time: now() });
    ctx.store.close();

    const first = await receivePackageFile('for-ben.json', text, now);
    expect(first.fresh).toBe(true);
    expect([...first.store.state.patches.keys()].sort()).toEqual([...ids].sort());
    expect(first.store.state.passes.get(pass.id)).toMatchObject({ interpreter: 'ben', blind: true, endedAt: null });
    expect(first.store.state.tags.size).toBe(0);
    expect((await listSites()).some((s) => s.id === first.store.state.site!.id)).toBe(true);
    first.store.close();

    const again = await receivePackageFile('for-ben.json', text, now);
    expect(again.fresh).toBe(false);
    expect(again.store.state.head).toEqual(first.store.state.head);
    again.store.close();

    // A crash right after the site was created: only its first event is there.
    const pkg = await readBlindPackage('for-ben.json', text);
    await SiteStore.remove(receivedSiteId(pkg));
    const half = await SiteStore.create({ id: receivedSiteId(pkg), name: 'half', epsg: pkg.epsg, createdAt: now() }, 'ben');
    half.close();
    const remade = await receivePackageFile('for-ben.json', text, now);
    expect(remade.fresh).toBe(true);
    expect(remade.store.state.passes.has(pass.id)).toBe(true);
    expect(remade.store.state.patches.size).toBe(3);
    remade.store.close();

    await expect(receivePackageFile('changed.json', text.replace('"ben"', '"eve"'), now)).rejects.toThrow(/^changed\.json: /);
  });
});
