import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session, patchCount } from './browser.ts';
import { layerCanvasStats } from './canvasStats.ts';

// A blind pass on the demo, end to end in Chromium with real IndexedDB: the desk's
// interpreter leaves a note and an unsure call, starts a species-stratified sample for
// a second interpreter, who switches in and sees only the chosen outlines, all in one
// neutral colour, with no earlier call, note or field count anywhere on the page; they
// call each patch by key, the pass ends, and the agreement sheet shows the figures this
// test works out itself from the demo's field file (the first calls) and its own keys.

const demo = join(import.meta.dirname, '..', 'demo');
const field = JSON.parse(readFileSync(join(demo, 'field.geojson'), 'utf8')) as { features: { properties: { id: string; species: string } }[] };
const roster = (JSON.parse(readFileSync(join(demo, 'roster.json'), 'utf8')) as { species: { code: string; key: string }[] }).species;
const fieldCall = new Map(field.features.map((f) => [f.properties.id, f.properties.species]));
const keyOf = new Map(roster.map((r) => [r.code, r.key]));

let session: Session | null = null;
afterAll(async () => {
  await session?.close();
});

async function mapReady(page: Page) {
  await page.waitForTimeout(150);
  await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 90_000 });
}

const inHand = (page: Page) => page.locator('[data-testid="patch-in-hand"] .id b').textContent();
const saved = (page: Page) => page.locator('[data-testid="save-status"]').textContent();
const blur = (page: Page) => page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());

const NOTE = 'NOTE-7Q: crown half in shadow';
const SAMPLE = 12;
/** The blind calls this test makes: by position in the pass's order. */
function blindCall(index: number, id: string): string {
  const first = fieldCall.get(id)!;
  if (index === 0) return "can't tell";
  if (index % 4 === 1) return roster.find((r) => r.code !== first)!.code; // a disagreement
  return first;
}

describe('a blind pass on the demo', () => {
  const calls = new Map<string, string>();

  it('leaves an earlier call with a note, then starts a stratified sample for a second interpreter', async () => {
    session = await openApp();
    const { page } = session;
    await mapReady(page);
    await expect.poll(() => patchCount(page), { timeout: 30_000 }).toBe(225);
    const before = await layerCanvasStats(page, '.stored-patches-layer canvas');
    expect(before.distinctHues).toBeGreaterThanOrEqual(3); // species colours on the desk

    // The first interpreter's own call on a patch: unsure, with a note.
    await page.keyboard.press('u');
    await expect.poll(() => inHand(page)).toMatch(/^F\d+$/);
    await page.keyboard.press(keyOf.get('PIEX')!);
    await page.keyboard.press('k');
    await page.locator('input[aria-label="Note"]').fill(NOTE);
    await page.keyboard.press('Enter');
    await expect.poll(() => saved(page)).toContain('All saved');
    expect(await page.locator('body').innerText()).toContain('field crew'); // earlier calls are shown on the desk

    const panel = page.locator('[data-testid="blind-panel"]');
    await panel.locator('select[aria-label="Which patches"]').selectOption('sample');
    await panel.locator('input[aria-label="Sample size"]').fill(String(SAMPLE));
    await panel.locator('input[aria-label="Sample seed"]').fill('3');
    await panel.locator('input[aria-label="Second interpreter"]').fill('Ben Blind');
    await panel.scrollIntoViewIfNeeded();
    await screenshot(page, 'blind-pass-start');
    await panel.locator('button:has-text("Start blind pass")').click();
    await expect.poll(() => panel.locator('[role="status"]').textContent()).toMatch(new RegExp(`Blind pass blind-ben-blind-1 for Ben Blind: ${SAMPLE} patches: a sample stratified by species, seed 3`));
  });

  it('shows the second interpreter no earlier call, note or colour anywhere', async () => {
    const { page } = session!;
    const panel = page.locator('[data-testid="blind-panel"]');
    await panel.locator('input[aria-label="New interpreter name"]').fill('Ben Blind');
    await panel.locator('input[aria-label="New interpreter initials"]').fill('BB');
    await panel.locator('button:has-text("Add")').click();
    await expect.poll(() => page.locator('[data-testid="blind-mine"]').count()).toBe(1);
    await expect.poll(() => patchCount(page)).toBe(SAMPLE);
    expect(await page.locator('[data-testid="blind-progress"]').textContent()).toBe(`0 of ${SAMPLE} called`);
    await blur(page);
    // Out from the patch in hand, so the screenshot shows outlines of the pass around it.
    for (let i = 0; i < 2; i++) {
      await page.click('.ol-zoom-out');
      await page.waitForTimeout(300);
    }
    await mapReady(page);

    const text = await page.locator('body').innerText();
    for (const leak of [NOTE, 'field crew', 'Interpreter A', 'Field polygons', 'GPS survey', 'field polygon, feature']) expect(text).not.toContain(leak);
    // Every outline in one neutral colour: no saturated pixel of any hue on the patch layer.
    const stats = await layerCanvasStats(page, '.stored-patches-layer canvas');
    expect(stats.opaqueShare).toBeGreaterThan(0.0002);
    expect(stats.distinctHues).toBe(0);
    await screenshot(page, 'blind-pass-neutral');

    // Paused, the keys do not call; resumed, they do again.
    await page.locator('[data-testid="blind-mine"] button:has-text("Pause")').click();
    // The pause is a ledger event: the panel says so once it is durable.
    await expect.poll(() => page.locator('[data-testid="blind-mine"]').innerText()).toContain('· paused');
    await blur(page);
    await page.keyboard.press('u');
    await expect.poll(() => inHand(page)).toMatch(/^F\d+$/);
    await page.keyboard.press(roster[0].key);
    await expect.poll(() => page.locator('.patch-panel .notice').textContent()).toContain('The blind pass is paused');
    expect(await page.locator('[data-testid="own-tag"]').textContent()).toContain('No call of yours');
    await page.locator('[data-testid="blind-mine"] button:has-text("Resume")').click();
    await expect.poll(() => page.locator('[data-testid="blind-mine"]').innerText()).not.toContain('· paused');
    await blur(page);
    await page.keyboard.press('Escape'); // let go of the patch: the walk below starts from the pass's first

    // Walk the pass in its own order and check each patch in hand shows no earlier call.
    for (let i = 0; i < SAMPLE; i++) {
      await page.keyboard.press('u');
      await expect.poll(() => inHand(page)).toMatch(/^F\d+$/);
      const id = (await inHand(page))!;
      expect(calls.has(id)).toBe(false);
      const hand = await page.locator('[data-testid="patch-in-hand"]').innerText();
      expect(hand).toContain('No call of yours in this pass yet');
      expect(hand).not.toContain(NOTE);
      expect(await page.locator('[data-testid="patch-in-hand"] .others').count()).toBe(0);
      expect(await page.locator('input[aria-label="Note"]').inputValue()).toBe('');
      const call = blindCall(i, id);
      calls.set(id, call);
      await page.keyboard.press(call === "can't tell" ? 'z' : keyOf.get(call)!);
      await expect.poll(() => page.locator('[data-testid="own-tag"]').textContent()).toContain(`${call}, likely`);
    }
    await expect.poll(() => saved(page)).toContain('All saved');
    expect(await page.locator('[data-testid="blind-progress"]').textContent()).toBe(`${SAMPLE} of ${SAMPLE} called`);
    await mapReady(page);
    await screenshot(page, 'blind-pass-called');
    // The blind answers are offered beside the species, "not vegetation" is not.
    const classes = await page.locator('[data-testid="patch-in-hand"] .species .reserved').allTextContents();
    expect(classes).toEqual(['mixed', 'unknown', "can't tell"]);
  });

  it('shows on the agreement sheet the figures worked out here', async () => {
    const { page } = session!;
    // The sheet stays shut while the pass runs.
    await page.locator('nav button:has-text("Agreement sheet")').click();
    await expect.poll(() => page.locator('[data-testid="agreement-sheet"] [role="alert"]').textContent()).toContain('is in blind pass blind-ben-blind-1');
    await page.locator('nav button:has-text("Desk")').click();
    await page.locator('[data-testid="blind-panel"] button:has-text("End the pass")').click();
    await expect.poll(() => page.locator('[data-testid="blind-mine"]').count()).toBe(0);
    await expect.poll(() => patchCount(page)).toBe(225);

    // Cohen (1960) worked here from the field file's species and this test's own calls.
    const ids = [...calls.keys()];
    const n = ids.length;
    const classes = [...new Set(ids.flatMap((id) => [fieldCall.get(id)!, calls.get(id)!]))];
    const agree = ids.filter((id) => fieldCall.get(id) === calls.get(id)).length;
    const po = agree / n;
    const pe = classes.reduce((s, c) => s + (ids.filter((id) => fieldCall.get(id) === c).length / n) * (ids.filter((id) => calls.get(id) === c).length / n), 0);
    const kappa = (po - pe) / (1 - pe);
    const pabak = (classes.length * po - 1) / (classes.length - 1); // Byrt, Bishop & Carlin (1993), k classes

    await page.locator('nav button:has-text("Agreement sheet")').click();
    const sheet = page.locator('[data-testid="agreement-sheet"]');
    await expect.poll(() => sheet.locator('select[aria-label="Second pass"]').inputValue()).toBe('blind-ben-blind-1');
    expect(await sheet.locator('select[aria-label="First pass"]').inputValue()).toBe('field');
    await expect.poll(() => sheet.locator('h2').first().textContent()).toBe(`${n} patches called in both`);
    const figure = (name: string) => sheet.locator(`[data-figure="${name}"]`).textContent();
    expect(await figure('observed')).toBe(po.toFixed(3));
    expect(await figure('expected')).toBe(pe.toFixed(3));
    expect(await figure('kappa')).toBe(kappa.toFixed(3));
    expect(await figure('pabak')).toBe(pabak.toFixed(3));
    // One cell of the matrix: the "can't tell" call against its field species.
    const first = ids[0];
    expect(await sheet.locator(`[data-cell="${fieldCall.get(first)}|can't tell"]`).first().textContent()).toMatch(/^1/);
    // Every figure has its sentence.
    expect(await sheet.locator('.figures .why').count()).toBe(6);
    await screenshot(page, 'blind-agreement-sheet');
  });
});
