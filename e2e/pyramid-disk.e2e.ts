import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session } from './browser.ts';
import { layerCanvasStats } from './canvasStats.ts';
import { stripedPan } from './stripedPan.ts';

// A user's striped GeoTIFF without overviews, with a folder granted for the app's files:
// its pyramid cache is built once into packs of tiles in that folder (not in IndexedDB),
// and opened again in a new page it is read back from there without being built again.
// As in e2e/disk-copy.e2e.ts, the folder picker (a native dialog no test can answer)
// hands out a folder of the origin-private file system, the same kind of handle; the
// picker dialog itself is not exercised.

let session: Session;
let page: Page;

function copyFolderPicker() {
  (window as unknown as { showDirectoryPicker: () => Promise<FileSystemDirectoryHandle> }).showDirectoryPicker = async () =>
    (await navigator.storage.getDirectory()).getDirectoryHandle('app-files', { create: true });
}

/** The packs of tiles in the granted folder: name and last write. */
function packs(p: Page): Promise<[string, number][]> {
  return p.evaluate(async () => {
    const folder = await (await navigator.storage.getDirectory()).getDirectoryHandle('app-files');
    const found: [string, number][] = [];
    for await (const [name, handle] of folder.entries()) {
      if (name.endsWith('.pack')) found.push([name, (await (handle as FileSystemFileHandle).getFile()).lastModified]);
    }
    return found.sort();
  });
}

async function openStriped(p: Page, file: Buffer) {
  const chooser = p.waitForEvent('filechooser');
  await p.click('button:has-text("Open GeoTIFF files")');
  await (await chooser).setFiles([{ name: 'striped-pan.tif', mimeType: 'image/tiff', buffer: file }]);
  await p.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 120_000 });
}

describe('the pyramid cache of a striped file on disk', () => {
  beforeAll(async () => {
    session = await openApp({ path: '?screen=start', initScript: copyFolderPicker });
    page = session.page;
  });
  afterAll(async () => {
    await session?.close();
  });

  it('is built once into the granted folder and read back from it in a later page', async () => {
    await page.locator('[data-testid="disk-copies"] button:has-text("Choose a folder")').click();
    await expect.poll(() => page.locator('[data-testid="disk-copies"]').innerText()).toMatch(/copied to the folder "app-files"/);
    const file = stripedPan(1200);
    await openStriped(page, file);
    await screenshot(page, 'pyramid-disk-built');
    const built = await packs(page);
    // one pack per row of tiles: 5 rows at full resolution, then 3, 2 and 1, and the completion mark
    expect(built).toHaveLength(5 + 3 + 2 + 1 + 1);
    const databases = await page.evaluate(async () => (await indexedDB.databases()).map((d) => d.name));
    expect(databases).not.toContain('fellfield-pyramids');

    // A new page: a new store over the same folder, which must find the pyramid complete.
    await page.goto(new URL('?screen=start', page.url()).href);
    await expect.poll(() => page.locator('[data-testid="disk-copies"]').innerText()).toMatch(/copied to the folder "app-files"/);
    await openStriped(page, file);
    expect(await packs(page)).toEqual(built); // nothing built again: a new build would add packs numbered after these
    await screenshot(page, 'pyramid-disk-read-back');
    const stats = await layerCanvasStats(page, '.imagery-layer canvas');
    expect(stats.opaqueShare).toBeGreaterThan(0.3);
    expect(stats.lumaStdDev).toBeGreaterThan(10);
  });
});
