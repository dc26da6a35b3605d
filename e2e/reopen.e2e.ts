import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { artifactsDir, baseUrl, openApp, screenshot, type Session } from './browser.ts';
import { layerCanvasStats } from './canvasStats.ts';
import { handlesThroughFileInput } from './filePickers.ts';
import { sceneFiles } from './sceneFiles.ts';

// Reopening a site of the user's own without picking its imagery, in Chromium with the
// File System Access API: the imagery is picked through showOpenFilePicker when the site
// is made, its handles are kept in IndexedDB, and opening the site from the list on a
// later visit goes straight to the desk, no file picked, the files checked earlier and
// unchanged since (File.lastModified and size, WICG File System Access / W3C File API).
// A file changed on disk between opens is caught by its time, and picked again it is
// fingerprinted and refused by name when its content differs (SHA-256, as the site
// recorded it). The picker's dialog cannot be answered by a test: see e2e/filePickers.ts
// for the stand-in that hands out handles of the origin-private file system.

const dir = mkdtempSync(join(tmpdir(), 'fellfield-reopen-'));
const paths = { pan: join(dir, 'ridge-pan.tif'), ms: join(dir, 'ridge-ms.tif'), changed: join(dir, 'changed', 'ridge-pan.tif') };
let changedBytes: Buffer;
let session: Session;
let page: Page;
let chooserOpened = 0;

async function mapReady() {
  await page.waitForTimeout(150);
  await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 90_000 });
}

async function pick(click: () => Promise<void>, files: string[]) {
  const chooser = page.waitForEvent('filechooser');
  await click();
  await (await chooser).setFiles(files);
}

/** A later visit: the app loaded afresh on the same profile, the site opened from the list. */
async function openFromList(name: string) {
  await page.goto(new URL('?screen=start', baseUrl()).href);
  await page.locator('[data-testid="stored-sites"] li', { hasText: name }).locator('button:has-text("Open")').click();
}

beforeAll(async () => {
  const scene = sceneFiles(600, 32633, [600000, 5100000], 0.5, 11);
  writeFileSync(paths.pan, scene.pan);
  writeFileSync(paths.ms, scene.ms);
  changedBytes = Buffer.from(scene.pan);
  changedBytes[changedBytes.length >> 1] ^= 0xff; // the same name and size, one byte other
  mkdirSync(join(dir, 'changed'));
  writeFileSync(paths.changed, changedBytes);
  session = await openApp({ path: '?screen=start', initScript: handlesThroughFileInput });
  page = session.page;
  page.on('filechooser', () => chooserOpened++);
});
afterAll(async () => {
  await session?.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('reopening a site with the imagery picked for it before', () => {
  it('makes a site of picked imagery', async () => {
    await page.click('button:has-text("New site…")');
    await pick(() => page.click('button[aria-label="Pick the imagery"]'), [paths.pan, paths.ms]);
    // The form names the site after the files once it has them; type over that name.
    await expect.poll(() => page.inputValue('input[aria-label="Site name"]')).toBe('ridge');
    await page.fill('input[aria-label="Site name"]', 'South ridge');
    await page.fill('input[aria-label="Scene date"]', '2025-07-20');
    await page.fill('input[aria-label="New interpreter name"]', 'Cora Ridge');
    await page.fill('input[aria-label="New interpreter initials"]', 'CR');
    await page.click('button:has-text("Add a profile")');
    await page.click('button:has-text("Create the site")');
    await mapReady();
    expect(await page.locator('header h1').textContent()).toBe('South ridge');
    // the handles the picker gave are kept for the site
    const kept = await page.evaluate(() => new Promise<number>((resolve, reject) => {
      const open = indexedDB.open('fellfield-imagery-handles');
      open.onerror = () => reject(open.error);
      open.onsuccess = () => {
        const count = open.result.transaction('sites').objectStore('sites').count();
        count.onsuccess = () => { open.result.close(); resolve(count.result); };
      };
    }));
    expect(kept).toBe(1);
  });

  it('opens it from the list on a later visit straight onto the desk, with no file picked', async () => {
    const before = chooserOpened;
    await openFromList('South ridge');
    await mapReady();
    expect(chooserOpened).toBe(before);
    expect(await page.locator('[data-testid="imagery-request"]').count()).toBe(0);
    expect(await page.locator('header h1').textContent()).toBe('South ridge');
    expect(await page.locator('[data-testid="imagery-fact"]').textContent())
      .toBe("The imagery is the site's own (SHA-256): ridge-pan.tif and ridge-ms.tif checked earlier and unchanged since.");
    const stats = await layerCanvasStats(page, '.imagery-layer canvas');
    expect(stats.opaqueShare).toBeGreaterThan(0.3);
    await screenshot(page, 'reopen-straight-to-desk');
    await page.locator('[data-testid="imagery-fact"]').scrollIntoViewIfNeeded();
    await screenshot(page, 'reopen-desk-says-how');
  });

  it('catches a file changed on disk between opens, and refuses it by name once fingerprinted', async () => {
    // The kept file is changed where it is: the same size, one byte other, a later time.
    await page.waitForTimeout(20);
    await page.evaluate(async (bytes) => {
      const folder = await (await navigator.storage.getDirectory()).getDirectoryHandle('picked');
      const writable = await (await folder.getFileHandle('ridge-pan.tif')).createWritable();
      await writable.write(new Uint8Array(bytes));
      await writable.close();
    }, [...changedBytes]);
    await openFromList('South ridge');
    const request = page.locator('[data-testid="imagery-request"]');
    await request.waitFor();
    await expect.poll(() => request.locator('tr[data-file="ridge-pan.tif"]').getAttribute('data-status')).toBe('changed');
    expect(await request.locator('tr[data-file="ridge-ms.tif"]').getAttribute('data-status')).toBe('verified');
    expect(await request.locator('tr[data-file="ridge-ms.tif"] .status').textContent()).toBe('the same: checked earlier, unchanged since');
    expect(await request.locator('[role="alert"]').textContent())
      .toContain('ridge-pan.tif: changed since it was checked (its size or modification time differs); pick it to fingerprint it again');
    await request.screenshot({ path: join(artifactsDir, 'reopen-file-changed.png') });

    await pick(() => request.locator('button:has-text("Pick ridge-pan.tif…")').click(), [paths.changed]);
    await expect.poll(() => request.locator('tr[data-file="ridge-pan.tif"]').getAttribute('data-status'), { timeout: 30_000 }).toBe('differs');
    expect(await request.locator('[role="alert"]').textContent()).toMatch(/ridge-pan\.tif: refused, its content differs from the file the site was made with/);
    expect(await page.locator('[data-testid="map"]').count()).toBe(0); // still on Start
    await request.screenshot({ path: join(artifactsDir, 'reopen-file-refused.png') });
  });

  it('takes the right file when it is picked, fingerprinted now, and finds it again on the next visit', async () => {
    const request = page.locator('[data-testid="imagery-request"]');
    await pick(() => request.locator('button:has-text("Pick ridge-pan.tif…")').click(), [paths.pan]);
    await mapReady();
    expect(await page.locator('[data-testid="imagery-fact"]').textContent())
      .toBe("The imagery is the site's own (SHA-256): ridge-ms.tif checked earlier and unchanged since; ridge-pan.tif fingerprinted now.");
    await screenshot(page, 'reopen-picked-again');
    const before = chooserOpened;
    await openFromList('South ridge');
    await mapReady();
    expect(chooserOpened).toBe(before);
    expect(await page.locator('[data-testid="imagery-fact"]').textContent()).toContain('ridge-pan.tif and ridge-ms.tif checked earlier and unchanged since');
  });
});
