import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session } from './browser.ts';
import { layerCanvasStats } from './canvasStats.ts';
import { openRasterFile } from '../test/imagery/nodeRaster.ts';
import { readSiteFile } from '../src/core/export/siteFile.ts';
import { gridOfSummary } from '../src/core/geometry/rasterGrid.ts';
import { countPixels } from '../src/core/pixels/pixelCounts.ts';
import { DEFAULT_BUFFER_M } from '../src/core/pixels/rule.ts';

// The training sheet on the demo site in Chromium: balance, baselines and folds of the
// stored field polygons, worked out by the same core as fellfield pixels and folds; and
// the pure pixels on the desk's map, counted as the core counts them from the site file.

const demo = join(import.meta.dirname, '..', 'demo');

let session: Session;
let page: Page;
const status = async () => (await page.locator('[data-testid="training-status"]').textContent())?.trim() ?? '';
const message = async () => (await page.locator('[data-testid="training-message"]').textContent())?.trim() ?? '';
const blur = () => page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());

describe('training sheet', () => {
  beforeAll(async () => {
    session = await openApp();
    page = session.page;
    await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 60_000 });
  });
  afterAll(async () => {
    await session?.close();
  });

  it('draws the pure pixels of the patch in hand on the map (Shift+P), counted as the core counts them', async () => {
    // The patch with the most pure pixels under the default rule, by core/pixels on the site file.
    const { state } = await readSiteFile(readFileSync(join(demo, 'demo.site.json'), 'utf8'), 'demo.site.json');
    const grid = gridOfSummary((await openRasterFile(join(demo, 'ms.tif'))).summary);
    const report = countPixels([...state.patches.values()].map((p) => ({ id: p.id, species: '', rings: p.geometry })), grid, { kind: 'inside', buffer: DEFAULT_BUFFER_M });
    const best = report.patches.reduce((a, b) => (b.pure > a.pure ? b : a));
    expect(best.pure).toBeGreaterThan(2);
    await page.keyboard.press('g');
    await page.keyboard.type(String(best.id));
    await page.keyboard.press('Enter');
    await expect.poll(() => page.locator('[data-testid="patch-in-hand"] .id b').textContent()).toBe(best.id);
    const panel = page.locator('[data-testid="pure-pixels-panel"]');
    await expect.poll(() => panel.locator('[data-testid="pure-count"]').textContent()).toContain(`${best.pure} pure of ${best.touched} touched`);
    const layer = page.locator('.pure-pixels-layer');
    expect(await layer.count()).toBe(0); // not shown until asked
    await blur();
    await page.keyboard.press('Shift+P');
    await expect.poll(() => panel.locator('button[aria-pressed="true"]').count()).toBe(1);
    await expect.poll(() => layerCanvasStats(page, '.pure-pixels-layer canvas').then((s) => s.opaqueShare)).toBeGreaterThan(0);
    await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 60_000 });
    await screenshot(page, 'pure-pixels-desk');
    // Another rule redraws them: centre inside keeps at least as many as wholly inside shrunk.
    const before = (await layerCanvasStats(page, '.pure-pixels-layer canvas')).opaqueShare;
    await panel.getByLabel('centre inside').check();
    await expect.poll(() => layerCanvasStats(page, '.pure-pixels-layer canvas').then((s) => s.opaqueShare)).toBeGreaterThan(before);
    await panel.getByLabel('wholly inside, shrunk by').check();
    await blur();
    await page.keyboard.press('Shift+P');
    await expect.poll(() => panel.locator('button[aria-pressed="true"]').count()).toBe(0);
    await expect.poll(() => layer.isVisible()).toBe(false);
  });

  it('shows balance, baselines and folds for the demo, and follows the scheme', async () => {
    await page.getByRole('button', { name: 'Training sheet' }).click();
    const sheet = page.getByRole('region', { name: 'Training sheet' });
    await expect.poll(() => sheet.locator('table').count(), { timeout: 60_000 }).toBe(2);
    const classes = await sheet.locator('[data-testid="balance"] tbody tr').count();
    expect(classes).toBeGreaterThanOrEqual(5);
    await expect.poll(() => sheet.locator('.baselines').innerText()).toMatch(/always calling \w+ \(\d+\.\d % of pixels right\)/);
    expect(await sheet.locator('[data-testid="folds"] tbody tr').count()).toBe(5);
    await expect.poll(() => status()).toMatch(/^Figures as of change \d+ of the site/);
    await screenshot(page, 'training-sheet');
    await sheet.getByLabel('Scheme in use').selectOption('preset:conifers');
    await expect.poll(() => sheet.locator('h2').first().innerText()).toMatch(/conifers by species, the rest as other/);
    await expect.poll(() => sheet.locator('[data-testid="balance"]').innerText()).toMatch(/\bother\b/);
  });

  it('stores a scheme with the site, names the species it leaves unmapped, and undoes and redoes it', async () => {
    const sheet = page.getByRole('region', { name: 'Training sheet' });
    await sheet.getByRole('button', { name: 'New scheme…' }).click();
    const editor = sheet.locator('[data-testid="scheme-editor"]');
    await editor.getByLabel('Scheme name').fill('Shrubs lumped');
    await editor.getByRole('button', { name: 'conifers + other' }).click();
    await expect.poll(() => editor.getByLabel('Class of ABFI').inputValue()).toBe('ABFI');
    expect(await editor.getByLabel('Class of SAIN').inputValue()).toBe('other');
    await editor.getByLabel('Class of VAFI').fill('');
    await expect.poll(() => editor.locator('[data-testid="scheme-unmapped"]').textContent()).toMatch(/^Unmapped: VAFI\./);
    await screenshot(page, 'training-scheme-editor');
    await editor.getByLabel('Scheme name').press('Enter');
    await expect.poll(() => message()).toBe('Scheme "Shrubs lumped" stored with the site (Ctrl+Z undoes it).');
    expect(await sheet.getByLabel('Scheme in use').inputValue()).toBe('stored:Shrubs lumped');
    await expect.poll(() => sheet.locator('h2').first().innerText()).toBe('Balance under “Shrubs lumped”');
    await expect.poll(() => sheet.locator('.notes').innerText()).toMatch(/scheme "Shrubs lumped" leaves species VAFI unmapped: its \d+ patch\(es\) are left out/);
    // Undo and redo from the sheet: the site's own undo stack.
    await blur();
    await page.keyboard.press('Control+z');
    await expect.poll(() => message()).toBe('Undone: the change to the schemes.');
    await expect.poll(() => sheet.getByLabel('Scheme in use').inputValue()).toBe('preset:species');
    expect(await sheet.locator('option[value="stored:Shrubs lumped"]').count()).toBe(0);
    await page.keyboard.press('Control+y');
    await expect.poll(() => message()).toBe('Redone: the change to the schemes.');
    await expect.poll(() => sheet.locator('option[value="stored:Shrubs lumped"]').count()).toBe(1);
  });

  it('keeps a gap between folds and says per fold how many patches it took', async () => {
    const sheet = page.getByRole('region', { name: 'Training sheet' });
    // The demo's folds come within about 6 m of each other: a gap of 8 m takes some patches.
    await sheet.getByLabel('Gap between folds in metres').fill('8');
    await expect.poll(() => sheet.locator('[data-testid="folds"] th').allInnerTexts(), { timeout: 30_000 }).toContain('within the gap');
    await expect.poll(() => status()).toMatch(/^Figures as of/);
    const nearest = (await sheet.locator('[data-figure="nearest"]').allInnerTexts()).filter((t) => t !== '—').map((t) => Number(t.replace(' m', '')));
    expect(nearest.length).toBeGreaterThan(0);
    for (const d of nearest) expect(d).toBeGreaterThanOrEqual(8);
    const within = (await sheet.locator('[data-figure="within-gap"]').allInnerTexts()).map(Number);
    const sum = within.reduce((a, b) => a + b, 0);
    expect(sum).toBeGreaterThan(0);
    expect(await sheet.locator('.note').nth(1).innerText()).toMatch(new RegExp(`${sum} patch\\(es\\) lie within 8 m of a patch of another fold and are left out of every fold`));
    await sheet.locator('[data-testid="folds"]').scrollIntoViewIfNeeded();
    await screenshot(page, 'training-gap');
    await sheet.getByLabel('Gap between folds in metres').fill('0');
  });

  it('follows a change made on the desk, and undoes it from the sheet', async () => {
    const sheet = page.getByRole('region', { name: 'Training sheet' });
    await sheet.getByLabel('Scheme in use').selectOption('preset:species');
    await expect.poll(() => status()).toMatch(/^Figures as of/);
    const asOf = async () => Number((await status()).match(/change (\d+)/)?.[1]);
    const totals = async () => Number((await sheet.locator('.note').first().innerText()).match(/; (\d+) patch\(es\)/)?.[1]);
    const [before, patchesBefore] = [await asOf(), await totals()];
    // Delete the patch in hand on the desk (a settled field polygon), then come back.
    await page.locator('nav button:has-text("Desk")').click();
    await expect.poll(() => page.locator('[data-testid="patch-in-hand"] .id b').textContent()).toMatch(/^F\d+$/);
    await blur();
    await page.keyboard.press('Delete');
    await expect.poll(() => page.locator('[data-testid="save-status"]').textContent()).toContain('All saved');
    await page.getByRole('button', { name: 'Training sheet' }).click();
    await expect.poll(() => asOf()).toBe(before + 1);
    expect(await totals()).toBe(patchesBefore - 1);
    await blur();
    await page.keyboard.press('Control+z');
    await expect.poll(() => message()).toBe('Undone: the last change of the site, made on another page.');
    await expect.poll(() => asOf()).toBe(before + 2);
    expect(await totals()).toBe(patchesBefore);
  });
});
