import { mkdtempSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { baseUrl, openApp, screenshot, type Session, patchCount as patchCountOf } from './browser.ts';
import { layerCanvasStats } from './canvasStats.ts';
import { noFilePicker } from './filePickers.ts';
import { sceneFiles } from './sceneFiles.ts';

// A site of the user's own, end to end in Chromium with real IndexedDB and real GeoTIFF
// files: created from Start (imagery, name, a copy of the demo roster, a new profile),
// a patch drawn and tagged; then reopened from the list by picking the files again, which
// are checked by SHA-256; a changed file is refused by name, and the site still opens
// with what matched, or without imagery. A scene in longitude and latitude is refused.
// The page has no File System Access file picker here, as in browsers without it, so the
// files are picked again on every open (e2e/reopen.e2e.ts opens with the picker's handles).

const dir = mkdtempSync(join(tmpdir(), 'fellfield-sites-'));
const SIZE = 600;
let session: Session;
let page: Page;

const scene = (epsg: number, origin: [number, number], pixel: number, seed: number) => sceneFiles(SIZE, epsg, origin, pixel, seed);

const paths = { pan: join(dir, 'cirque-pan.tif'), ms: join(dir, 'cirque-ms.tif'), changed: join(dir, 'changed', 'cirque-pan.tif'), geoPan: join(dir, 'lonlat-pan.tif') };

async function mapReady() {
  await page.waitForTimeout(150);
  await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 90_000 });
}
const saved = () => page.locator('[data-testid="save-status"]').textContent();
const patchCount = () => patchCountOf(page);

async function pick(button: string, files: string[]) {
  const chooser = page.waitForEvent('filechooser');
  await page.click(button);
  await (await chooser).setFiles(files);
}

/** Starts the app afresh on the same profile (as on another day) and opens the site from the list. */
async function openFromList(name: string) {
  await page.goto(new URL('?screen=start', baseUrl()).href);
  await page.locator('[data-testid="stored-sites"] li', { hasText: name }).locator('button:has-text("Open")').click();
  await page.waitForSelector('[data-testid="imagery-request"]');
}

beforeAll(async () => {
  const good = scene(32633, [500000, 5000000], 0.5, 0);
  writeFileSync(paths.pan, good.pan);
  writeFileSync(paths.ms, good.ms);
  // The same name and size, other content: one sample changed deep in the file.
  const changed = Buffer.from(good.pan);
  changed[Math.floor(changed.length / 2)] ^= 0xff;
  const { mkdirSync } = await import('node:fs');
  mkdirSync(join(dir, 'changed'));
  writeFileSync(paths.changed, changed);
  // another time than the good file's, as a file changed later has (never the same millisecond)
  utimesSync(paths.changed, new Date(), new Date(Date.now() + 60_000));
  writeFileSync(paths.geoPan, scene(4326, [12.5, 47.3], 0.00001, 3).pan);
  session = await openApp({ path: '?screen=start', initScript: noFilePicker });
  page = session.page;
});
afterAll(async () => {
  await session?.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('a site of your own', () => {
  it('refuses imagery in longitude and latitude, saying what to do', async () => {
    await page.click('button:has-text("New site…")');
    await pick('button[aria-label="Pick the imagery"]', [paths.geoPan]);
    // The form names the site after the file once it has it; type over that name.
    await expect.poll(() => page.inputValue('input[aria-label="Site name"]')).not.toBe('');
    await page.fill('input[aria-label="Site name"]', 'Lon-lat try');
    await page.fill('input[aria-label="Scene date"]', '2025-08-01');
    await page.fill('input[aria-label="New interpreter name"]', 'Ada Field');
    await page.fill('input[aria-label="New interpreter initials"]', 'AF');
    await page.click('button:has-text("Add a profile")');
    await page.click('button:has-text("Create the site")');
    await expect.poll(() => page.locator('.start > [role="alert"], .error[role="alert"]').first().textContent(), { timeout: 60_000 })
      .toMatch(/lonlat-pan\.tif: in .*geographic CRS in degrees; patches are kept in a projected CRS in metres.*EPSG:326\d\d/);
    expect(await page.locator('[data-testid="stored-sites"]').innerText()).not.toContain('Lon-lat try');
  });

  it('creates a site from picked imagery and a copy of the demo roster, and tags a patch on it', async () => {
    await pick('button[aria-label="Pick the imagery"]', [paths.pan, paths.ms]);
    await page.fill('input[aria-label="Site name"]', 'North cirque');
    await page.locator('label:has-text("A copy of the demo")').click();
    await expect.poll(() => page.locator('[data-testid="roster-note"]').textContent()).toContain("demo's 7 species");
    await page.locator('[data-testid="new-site"]').screenshot({ path: join(import.meta.dirname, 'artifacts', 'sites-new-form.png') });
    await page.click('button:has-text("Create the site")');
    await mapReady();
    expect(await page.locator('header h1').textContent()).toBe('North cirque');
    const stats = await layerCanvasStats(page, '.imagery-layer canvas');
    expect(stats.opaqueShare).toBeGreaterThan(0.3);
    await expect.poll(saved).toContain('All saved');

    await page.keyboard.press('a');
    for (const [x, y] of [[420, 300], [520, 296], [530, 380], [430, 390], [420, 300]] as const) {
      await page.mouse.click(x, y);
      await page.waitForTimeout(120);
    }
    await expect.poll(() => page.locator('[data-testid="patch-in-hand"] .id b').textContent()).toBe('P0001');
    await page.keyboard.press('Escape');
    await page.keyboard.press('2');
    await expect.poll(() => page.locator('[data-testid="own-tag"]').textContent()).toContain('PIEX, likely');
    await expect.poll(saved).toContain('All saved');
    await screenshot(page, 'sites-new-desk');
  });

  it('reopens from the list once its files are picked again and prove the same', async () => {
    await openFromList('North cirque');
    const rows = await page.locator('[data-testid="imagery-request"] tbody tr').evaluateAll((trs) => trs.map((tr) => tr.getAttribute('data-file')));
    expect(rows).toEqual(['cirque-pan.tif', 'cirque-ms.tif']);
    await screenshot(page, 'sites-imagery-request');
    await pick('button:has-text("Pick the imagery files")', [paths.ms, paths.pan]);
    await mapReady();
    await expect.poll(patchCount).toBe(1);
    await page.keyboard.press('u'); // nothing untagged: the one patch carries its tag
    await page.keyboard.press('g');
    await page.keyboard.type('P0001');
    await page.keyboard.press('Enter');
    await expect.poll(() => page.locator('[data-testid="own-tag"]').textContent()).toContain('PIEX, likely');
  });

  it('refuses a changed file by name, and opens with what matched or without imagery', async () => {
    await openFromList('North cirque');
    await pick('button:has-text("Pick the imagery files")', [paths.changed, paths.ms]);
    const request = page.locator('[data-testid="imagery-request"]');
    await expect.poll(() => request.locator('[role="alert"]').textContent(), { timeout: 30_000 })
      .toMatch(/cirque-pan\.tif: refused, its content differs from the file the site was made with/);
    expect(await request.locator('tr[data-file="cirque-pan.tif"]').getAttribute('data-status')).toBe('differs');
    expect(await request.locator('tr[data-file="cirque-ms.tif"]').getAttribute('data-status')).toBe('verified');
    await screenshot(page, 'sites-refused-file');

    await request.locator('button:has-text("Open with the files that matched")').click();
    await mapReady();
    await expect.poll(patchCount).toBe(1);
    expect(await page.locator('.side').innerText()).toContain('Not shown: cirque-pan.tif: refused');

    await openFromList('North cirque');
    await page.locator('[data-testid="imagery-request"] button:has-text("Open without imagery")').click();
    await mapReady();
    await expect.poll(patchCount).toBe(1);
    expect(await page.locator('.side').innerText()).toContain('Opened without imagery');
    const outlines = await layerCanvasStats(page, '.stored-patches-layer canvas');
    expect(outlines.opaqueShare).toBeGreaterThan(0.0005);
    await screenshot(page, 'sites-without-imagery');
  });
});
