import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session, patchCount } from './browser.ts';
import { noFilePicker } from './filePickers.ts';

// A blind pass carried between two machines, each a Chromium profile of its own with
// real IndexedDB: machine A starts a pass on the demo and saves its package; machine B
// opens the package from Start, gives the imagery it names (checked by SHA-256), calls
// every patch by key in the blind pass and saves its answers; A imports them, and the
// agreement sheet shows the figures this test works out itself from the demo's field
// file and its own calls.

const demo = join(import.meta.dirname, '..', 'demo');
const dir = mkdtempSync(join(tmpdir(), 'fellfield-package-'));
const field = JSON.parse(readFileSync(join(demo, 'field.geojson'), 'utf8')) as { features: { properties: { id: string; species: string } }[] };
const roster = (JSON.parse(readFileSync(join(demo, 'roster.json'), 'utf8')) as { species: { code: string; key: string }[] }).species;
const fieldCall = new Map(field.features.map((f) => [f.properties.id, f.properties.species]));
const keyOf = new Map(roster.map((r) => [r.code, r.key]));
const SAMPLE = 8;
const PASS = 'blind-ben-blind-1';

let a: Session | null = null;
let b: Session | null = null;
afterAll(async () => {
  await a?.close();
  await b?.close();
  rmSync(dir, { recursive: true, force: true });
});

async function mapReady(page: Page) {
  await page.waitForTimeout(150);
  await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 90_000 });
}
const inHand = (page: Page) => page.locator('[data-testid="patch-in-hand"] .id b').textContent();
/** Saving goes to a download in these profiles (no save dialog), caught and kept here. */
async function noSaveDialog(page: Page) {
  await page.evaluate(() => { Object.defineProperty(window, 'showSaveFilePicker', { value: undefined, configurable: true }); });
}
async function download(page: Page, click: () => Promise<void>): Promise<string> {
  const waiting = page.waitForEvent('download');
  await click();
  const file = await waiting;
  const path = join(dir, file.suggestedFilename());
  await file.saveAs(path);
  return path;
}
async function pick(page: Page, click: () => Promise<void>, files: string[]) {
  const chooser = page.waitForEvent('filechooser');
  await click();
  await (await chooser).setFiles(files);
}

/** The calls machine B makes, by position in the pass's order: some agree, some do not. */
function callFor(index: number, id: string): string {
  const first = fieldCall.get(id)!;
  if (index === 0) return "can't tell";
  if (index % 3 === 1) return roster.find((r) => r.code !== first)!.code;
  return first;
}

describe('a blind package between two machines', () => {
  let packagePath = '';
  let answersPath = '';
  const calls = new Map<string, string>();

  it('machine A starts a blind pass on the demo and saves its package', async () => {
    a = await openApp();
    const { page } = a;
    await mapReady(page);
    await expect.poll(() => patchCount(page), { timeout: 30_000 }).toBe(225);
    await noSaveDialog(page);
    const panel = page.locator('[data-testid="blind-panel"]');
    await panel.locator('select[aria-label="Which patches"]').selectOption('sample');
    await panel.locator('input[aria-label="Sample size"]').fill(String(SAMPLE));
    await panel.locator('input[aria-label="Sample seed"]').fill('5');
    await panel.locator('input[aria-label="Second interpreter"]').fill('Ben Blind');
    await panel.locator('button:has-text("Start blind pass")').click();
    await expect.poll(() => panel.locator('[role="status"]').textContent()).toContain(`Blind pass ${PASS} for Ben Blind`);
    packagePath = await download(page, () => panel.locator('[data-testid="blind-others"] button:has-text("Save package")').click());
    expect(packagePath).toMatch(new RegExp(`${PASS}\\.blind-package\\.json$`));
    const pkg = JSON.parse(readFileSync(packagePath, 'utf8'));
    expect(pkg.patches).toHaveLength(SAMPLE);
    expect(JSON.stringify(pkg)).not.toContain('"species"'); // no call travels with it
  });

  it('machine B opens the package, gives the imagery it names, and calls every patch blind', async () => {
    b = await openApp({ path: '?screen=start', initScript: noFilePicker }); // the imagery is picked through a file input
    const { page } = b;
    await noSaveDialog(page);
    await pick(page, () => page.click('button:has-text("Open a blind package")'), [packagePath]);
    const request = page.locator('[data-testid="imagery-request"]');
    await expect.poll(() => request.locator('.intro').textContent()).toContain(`${SAMPLE} patches of Quarrow Basin (fictional) for Ben Blind`);
    expect(await page.locator('[data-testid="stored-sites"]').innerText()).toContain('Blind look for Ben Blind');
    await screenshot(page, 'package-imagery-request');
    await pick(page, () => request.locator('button:has-text("Pick the imagery files")').click(), ['pan.tif', 'ms.tif', 'pan-late.tif', 'ms-late.tif'].map((f) => join(demo, f)));
    await mapReady(page);
    await expect.poll(() => page.locator('[data-testid="blind-progress"]').textContent(), { timeout: 60_000 }).toBe(`0 of ${SAMPLE} called`);
    expect(await page.locator('select[aria-label="Interpreter at the desk"]').inputValue()).toBe('Ben Blind');
    expect(await patchCount(page)).toBe(SAMPLE);

    await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
    for (let i = 0; i < SAMPLE; i++) {
      await page.keyboard.press('u');
      await expect.poll(() => inHand(page)).toMatch(/^F\d+$/);
      const id = (await inHand(page))!;
      expect(calls.has(id)).toBe(false);
      const call = callFor(i, id);
      calls.set(id, call);
      await page.keyboard.press(call === "can't tell" ? 'z' : keyOf.get(call)!);
      await expect.poll(() => page.locator('[data-testid="own-tag"]').textContent()).toContain(`${call}, likely`);
    }
    await expect.poll(() => page.locator('[data-testid="save-status"]').textContent()).toContain('All saved');
    expect(await page.locator('[data-testid="blind-progress"]').textContent()).toBe(`${SAMPLE} of ${SAMPLE} called`);
    // Nothing on B's screen names who sent the outlines or how they were first called.
    const text = await page.locator('body').innerText();
    for (const leak of ['Interpreter A', 'field crew', 'field polygon, feature']) expect(text).not.toContain(leak);
    await screenshot(page, 'package-called');
    answersPath = await download(page, () => page.locator('[data-testid="blind-mine"] button:has-text("Save my answers")').click());
    expect(answersPath).toMatch(new RegExp(`${PASS}\\.answers\\.json$`));
  });

  it('machine A imports the answers and the agreement sheet shows the pass', async () => {
    const { page } = a!;
    const panel = page.locator('[data-testid="blind-panel"]');
    await pick(page, () => panel.locator('button:has-text("Import answers")').click(), [answersPath]);
    await expect.poll(() => panel.locator('[role="status"]').textContent()).toContain(`${SAMPLE} answers recorded in ${PASS}`);

    // Cohen (1960), worked here from the field file's species and machine B's calls.
    const ids = [...calls.keys()];
    const n = ids.length;
    const classes = [...new Set(ids.flatMap((id) => [fieldCall.get(id)!, calls.get(id)!]))];
    const po = ids.filter((id) => fieldCall.get(id) === calls.get(id)).length / n;
    const pe = classes.reduce((s, c) => s + (ids.filter((id) => fieldCall.get(id) === c).length / n) * (ids.filter((id) => calls.get(id) === c).length / n), 0);
    const kappa = (po - pe) / (1 - pe);

    await page.locator('nav button:has-text("Agreement sheet")').click();
    const sheet = page.locator('[data-testid="agreement-sheet"]');
    await sheet.locator('select[aria-label="First pass"]').selectOption('field');
    await sheet.locator('select[aria-label="Second pass"]').selectOption(PASS);
    await expect.poll(() => sheet.locator('h2').first().textContent()).toBe(`${n} patches called in both`);
    expect(await sheet.locator('[data-figure="observed"]').textContent()).toBe(po.toFixed(3));
    expect(await sheet.locator('[data-figure="kappa"]').textContent()).toBe(kappa.toFixed(3));
    await screenshot(page, 'package-agreement-sheet');

    // The pass is ended by the import: it is no longer listed among the open ones.
    await page.locator('nav button:has-text("Desk")').click();
    expect(await panel.innerText()).not.toContain(`${PASS} · Ben Blind`);
  });
});
