import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Download, Page } from 'playwright-core';
import initSqlJs from 'sql.js';
import { afterAll, describe, expect, it } from 'vitest';
import { importExport } from '../src/core/export/readExport.ts';
import { openApp, screenshot, type Session } from './browser.ts';

// The Export page on the stored demo: the preview counts the patches that go out, the
// export is saved through the platform bridge (browser downloads here, as the save
// picker is a system dialog), and the saved files verify on import and read in GDAL.

const out = mkdtempSync(join(tmpdir(), 'fellfield-export-e2e-'));
let session: Session | null = null;

afterAll(async () => {
  await session?.close();
  rmSync(out, { recursive: true, force: true });
});

/** Clicks export and keeps the three downloads, by suggested name. */
async function exportAndSave(page: Page, folder: string): Promise<Record<string, string>> {
  const downloads: Download[] = [];
  const listener = (d: Download) => downloads.push(d);
  page.on('download', listener);
  await page.click('button:has-text("Export and save")');
  await expect.poll(() => downloads.length, { timeout: 60_000 }).toBe(3);
  await expect.poll(() => page.locator('.outcome').textContent(), { timeout: 30_000 }).toMatch(/^Saved \d+ patch\(es\)/);
  page.off('download', listener);
  const paths: Record<string, string> = {};
  for (const d of downloads) {
    const path = join(folder, d.suggestedFilename());
    await d.saveAs(path);
    paths[d.suggestedFilename()] = path;
  }
  return paths;
}

async function verified(paths: Record<string, string>, data: string) {
  const SQL = await initSqlJs();
  return importExport({
    data: { name: data, bytes: readFileSync(paths[data]) },
    history: { name: 'labels.site.json', text: readFileSync(paths['labels.site.json'], 'utf8') },
    provenance: { name: 'labels.prov.json', text: readFileSync(paths['labels.prov.json'], 'utf8') },
  }, SQL);
}

describe('the Export page', () => {
  it('previews the demo\'s settled patches with their provenance and cautions', async () => {
    // No save picker: the bridge falls back to downloads, which the test can catch.
    session = await openApp();
    const { page } = session;
    await page.waitForSelector('nav button:has-text("Export")', { timeout: 150_000 });
    // An own property shadows the prototype's picker, so the bridge sees none.
    await page.evaluate(() => { Object.defineProperty(window, 'showSaveFilePicker', { value: undefined, configurable: true }); });
    await page.click('nav button:has-text("Export")');
    await expect.poll(() => page.locator('[data-testid="export-count"]').textContent(), { timeout: 60_000 }).toBe('225');
    const preview = await page.locator('.preview').textContent();
    expect(preview).toMatch(/History: event \d+, head [0-9a-f]{12}…/);
    expect(preview).toMatch(/pan\.tif [0-9a-f]{12}…/);
    expect(preview).toMatch(/Verify in the field before any management decision/);
    await screenshot(page, 'export-page');
  });

  it('saves a GeoJSON export whose history verifies and that GDAL reads', async () => {
    const { page } = session!;
    const paths = await exportAndSave(page, join(out, 'geojson'));
    expect(Object.keys(paths).sort()).toEqual(['labels.geojson', 'labels.prov.json', 'labels.site.json']);
    const site = await verified(paths, 'labels.geojson');
    expect(site.state.patches.size).toBe(225);
    const info = spawnSync('ogrinfo', ['-so', '-al', paths['labels.geojson']], { encoding: 'utf8' });
    expect(info.stdout).toMatch(/Feature Count: 225\n/);
    expect(info.stdout).toMatch(/Geometry: Multi Polygon/);
  });

  it('saves a GeoPackage in the scene CRS, made by the asm.js SQLite, that verifies against the wasm one', async () => {
    const { page } = session!;
    await page.check('input[value="gpkg"]');
    await page.selectOption('select[aria-label="Scheme"]', 'groups');
    await expect.poll(() => page.locator('[data-testid="export-count"]').textContent()).toBe('225');
    const paths = await exportAndSave(page, join(out, 'gpkg'));
    // Import rebuilds the GeoPackage with the wasm SQLite in Node: the same bytes or it fails.
    const site = await verified(paths, 'labels.gpkg');
    expect(site.options.scheme?.name).toBe('groups');
    const info = spawnSync('ogrinfo', ['-so', paths['labels.gpkg'], 'patches'], { encoding: 'utf8' });
    expect(info.stdout).toMatch(/Feature Count: 225\n/);
    expect(info.stdout).toMatch(/ID\["EPSG",32608\]\]\s*Data axis/);
  });

  it('offers a scheme stored on the Training sheet, and exports the classes it gives', async () => {
    const { page } = session!;
    await page.click('nav button:has-text("Training sheet")');
    const sheet = page.getByRole('region', { name: 'Training sheet' });
    await sheet.getByRole('button', { name: 'New scheme…' }).click();
    const editor = sheet.locator('[data-testid="scheme-editor"]');
    await editor.getByLabel('Scheme name').fill('Birch apart');
    await editor.getByLabel('Target species of the preset').selectOption('BEFA');
    await editor.getByRole('button', { name: 'one species against the rest:' }).click();
    await editor.getByLabel('Scheme name').press('Enter');
    await expect.poll(() => page.locator('[data-testid="training-message"]').textContent()).toMatch(/Scheme "Birch apart" stored with the site/);

    await page.click('nav button:has-text("Export")');
    await page.check('input[value="geojson"]');
    const options = await page.locator('select[aria-label="Scheme"] option').allInnerTexts();
    expect(options[0]).toBe('Birch apart: stored with the site');
    await page.selectOption('select[aria-label="Scheme"]', 'Birch apart');
    await expect.poll(() => page.locator('[data-testid="export-count"]').textContent()).toBe('225');
    const paths = await exportAndSave(page, join(out, 'stored-scheme'));
    const site = await verified(paths, 'labels.geojson');
    expect(site.options.scheme).toEqual({ name: 'Birch apart', classOf: { ABFI: 'not BEFA', PIEX: 'not BEFA', PISI: 'not BEFA', SAIN: 'not BEFA', BEFA: 'BEFA', VAFI: 'not BEFA', RHPE: 'not BEFA' } });
    expect(site.state.schemes.map((s) => s.name)).toEqual(['Birch apart']);
    const classes = new Set((JSON.parse(readFileSync(paths['labels.geojson'], 'utf8')) as { features: { properties: { class: string } }[] }).features.map((f) => f.properties.class));
    expect([...classes].sort()).toEqual(['BEFA', 'not BEFA']);
  });
});
