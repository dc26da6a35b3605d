import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session } from './browser.ts';

// Settling disagreements on the demo by keyboard, in Chromium with real IndexedDB. The
// disagreements are seeded through the app itself: a blind second look by another
// interpreter on the desk, some calls differing from the field file's. A third person
// then settles each on the Rulings page without the mouse — accept A, accept B, and a
// species overruling both, which asks for a reason — and the agreement sheet says what
// the rulings made of the differing calls while the export's preview shows the open
// disagreements gone.

const demo = join(import.meta.dirname, '..', 'demo');
const field = JSON.parse(readFileSync(join(demo, 'field.geojson'), 'utf8')) as { features: { properties: { id: string; species: string } }[] };
const roster = (JSON.parse(readFileSync(join(demo, 'roster.json'), 'utf8')) as { species: { code: string; key: string }[] }).species;
const fieldCall = new Map(field.features.map((f) => [f.properties.id, f.properties.species]));
const keyOf = new Map(roster.map((r) => [r.code, r.key]));
const other = (code: string, not: string[] = []) => roster.find((r) => r.code !== code && !not.includes(r.code))!.code;

let session: Session | null = null;
afterAll(async () => {
  await session?.close();
});

async function mapReady(page: Page, testid = 'map') {
  await page.waitForTimeout(150);
  await page.waitForSelector(`[data-testid="${testid}"][data-ready="true"]`, { timeout: 90_000 });
}
const inHand = (page: Page) => page.locator('[data-testid="patch-in-hand"] .id b').textContent();
const saved = (page: Page) => page.locator('[data-testid="save-status"]').textContent();
const blur = (page: Page) => page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
const rulingPatch = async (page: Page) => (await page.locator('[data-testid="ruling-patch"]').textContent())?.match(/Patch (\S+)/)?.[1] ?? null;
const progress = async (page: Page) => {
  const text = (await page.locator('[data-testid="rulings-progress"]').textContent()) ?? '';
  const m = text.match(/(\d+) settled · (\d+) open/);
  return m ? { settled: Number(m[1]), open: Number(m[2]) } : null;
};

async function openDisagreementsInExport(page: Page): Promise<{ open: number; out: number }> {
  await page.locator('nav button:has-text("Export")').click();
  await page.locator('select[aria-label="Open disagreements"]').selectOption('leave-out');
  await expect.poll(() => page.locator('[data-testid="export-count"]').count(), { timeout: 30_000 }).toBe(1);
  await page.waitForTimeout(300);
  const text = (await page.locator('.preview').textContent()) ?? '';
  return { open: Number(text.match(/(\d+) left out: open disagreement/)?.[1] ?? 0), out: Number(await page.locator('[data-testid="export-count"]').textContent()) };
}

const SAMPLE = 8;
/** What the second look calls, by position in its order: 0 can't tell, 1 and 5 another species. */
function secondCall(index: number, id: string): string {
  const first = fieldCall.get(id)!;
  if (index === 0) return "can't tell";
  if (index === 1 || index === 5) return other(first);
  return first;
}

describe('settling disagreements on the Rulings page', () => {
  const calls = new Map<string, string>();
  const order: string[] = [];
  let before = { open: 0, out: 0 };

  it('seeds disagreements with a blind second look made on the desk', async () => {
    session = await openApp();
    const { page } = session;
    await mapReady(page);
    const panel = page.locator('[data-testid="blind-panel"]');
    await panel.locator('select[aria-label="Which patches"]').selectOption('sample');
    await panel.locator('input[aria-label="Sample size"]').fill(String(SAMPLE));
    await panel.locator('input[aria-label="Sample seed"]').fill('5');
    await panel.locator('input[aria-label="Second interpreter"]').fill('Ben Blind');
    await panel.locator('button:has-text("Start blind pass")').click();
    await expect.poll(() => panel.locator('[role="status"]').textContent()).toMatch(/Blind pass blind-ben-blind-1 for Ben Blind/);
    await panel.locator('input[aria-label="New interpreter name"]').fill('Ben Blind');
    await panel.locator('input[aria-label="New interpreter initials"]').fill('BB');
    await panel.locator('button:has-text("Add")').click();
    await expect.poll(() => page.locator('[data-testid="blind-mine"]').count()).toBe(1);
    await blur(page);
    for (let i = 0; i < SAMPLE; i++) {
      await page.keyboard.press('u');
      await expect.poll(() => inHand(page)).toMatch(/^F\d+$/);
      const id = (await inHand(page))!;
      const call = secondCall(i, id);
      calls.set(id, call);
      order.push(id);
      await page.keyboard.press(call === "can't tell" ? 'z' : keyOf.get(call)!);
      await expect.poll(() => page.locator('[data-testid="own-tag"]').textContent()).toContain(call);
    }
    await expect.poll(() => saved(page)).toContain('All saved');
    await page.locator('[data-testid="blind-panel"] button:has-text("End the pass")').click();
    await expect.poll(() => page.locator('[data-testid="blind-mine"]').count()).toBe(0);
    // The person ruling is a third interpreter.
    await panel.locator('input[aria-label="New interpreter name"]').fill('Cleo Ruler');
    await panel.locator('input[aria-label="New interpreter initials"]').fill('CR');
    await panel.locator('button:has-text("Add")').click();
    await page.locator('select[aria-label="Interpreter at the desk"]').selectOption('Cleo Ruler');
    await expect.poll(() => page.locator('select[aria-label="Interpreter at the desk"]').inputValue()).toBe('Cleo Ruler');
    before = await openDisagreementsInExport(page);
    expect(before.open).toBeGreaterThanOrEqual(3);
  });

  it('settles the seeded disagreements by keyboard alone', async () => {
    const { page } = session!;
    await page.locator('nav button:has-text("Rulings")').click();
    await expect.poll(() => progress(page)).not.toBeNull();
    const start = (await progress(page))!;
    expect(start.open).toBeGreaterThanOrEqual(3);
    await blur(page);
    await mapReady(page, 'ruling-map');
    const seeded = { accA: order[1], accB: order[5], cantTell: order[0] };
    // Each call of the patch in hand is revealed: the field file's and Ben's with its confidence.
    const pending = new Set(Object.values(seeded));
    for (let step = 0; step < start.open * 2 + 4 && pending.size; step++) {
      const id = await rulingPatch(page);
      if (id && pending.has(id)) {
        const hand = await page.locator('[data-testid="ruling-hand"]').innerText();
        expect(hand).toContain('Ben Blind');
        expect(hand).toContain(calls.get(id)!);
        if (id === seeded.accA) await page.keyboard.press('Shift+A');
        else if (id === seeded.accB) await page.keyboard.press('Shift+B');
        else {
          // Neither "can't tell" nor the field's species: overruling both asks for a reason.
          const species = other(fieldCall.get(id)!, ["can't tell"]);
          await page.keyboard.press(keyOf.get(species)!);
          await expect.poll(() => page.locator('[data-testid="ruling-message"]').textContent()).toMatch(/overrides every call: write the reason/);
          await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('data-testid'))).toBe('ruling-reason');
          await page.keyboard.type('crowns read on the second date');
          await page.keyboard.press('Enter');
        }
        await expect.poll(() => page.locator('[data-testid="ruling-message"]').textContent()).toMatch(new RegExp(`Patch ${id}: .*\\(ruling-\\d+\\)`));
        pending.delete(id);
        await blur(page);
        continue;
      }
      await page.keyboard.press('ArrowDown');
      await page.waitForTimeout(50);
    }
    expect([...pending]).toEqual([]);
    await expect.poll(() => progress(page)).toEqual({ settled: start.settled + 3, open: start.open - 3 });
    // The settled list shows each ruling with its reason.
    await page.locator('[data-testid="filter-status"]').selectOption('settled');
    await expect.poll(() => page.locator('[data-testid="rulings-queue"] li button').count()).toBe(start.settled + 3);
    await page.locator(`[data-testid="rulings-queue"] button[data-patch="${seeded.cantTell}"]`).click();
    await expect.poll(() => page.locator('[data-testid="ruling-history"]').textContent()).toContain('crowns read on the second date');
    await expect.poll(() => page.locator('[data-testid="ruling-consensus"]').getAttribute('data-status')).toBe('ruled');
    await mapReady(page, 'ruling-map');
    await screenshot(page, 'rulings-settled');
  });

  it('shows the patch in hand beside the median spectra of the species its calls name', async () => {
    const { page } = session!;
    await page.locator('[data-testid="filter-status"]').selectOption('all');
    // A patch called ABFI (the demo's commonest species with pure pixels under the default rule).
    // Held by its patch id, as the list may reorder once a patch is in hand.
    const patchId = await page.locator('[data-testid="rulings-queue"] li button', { hasText: 'ABFI' }).first().getAttribute('data-patch');
    const item = page.locator(`[data-testid="rulings-queue"] li button[data-patch="${patchId}"]`);
    await item.click();
    await expect.poll(() => page.locator('[data-testid="ruling-patch"]').textContent()).toContain(`Patch ${patchId}`);
    // The species its calls name, and the one a ruling settled it on.
    const calls = ((await item.locator('.calls').textContent()) ?? '').split(' / ');
    const settledOn = (await page.locator('[data-testid="ruling-consensus"]').getAttribute('data-species')) ?? '';
    const named = [...new Set([...calls, settledOn])].filter((s) => roster.some((r) => r.code === s)).sort();
    const lines = page.locator('[data-testid="species-references"] li');
    await expect.poll(() => lines.evaluateAll((els) => els.map((e) => e.getAttribute('data-species')!).sort())).toEqual(named);
    const abfi = page.locator('[data-testid="species-references"] li[data-species="ABFI"]');
    await expect.poll(() => abfi.getAttribute('data-drawn'), { timeout: 60_000 }).toBe('true');
    expect(await abfi.textContent()).toMatch(/ABFI .*median of its settled patches\s*\d+ pure px in \d+ of \d+ settled patch/);
    // Drawn: the patch solid, each species dashed, each over its shaded interval.
    const panel = page.locator('[data-testid="ruling-hand"] [data-testid="spectrum-panel"]');
    const svg = panel.locator('svg');
    await expect.poll(() => svg.locator('polyline:not([stroke-dasharray])').count()).toBe(1);
    expect(await svg.locator('polyline[stroke-dasharray]').count()).toBeGreaterThanOrEqual(1);
    await panel.scrollIntoViewIfNeeded();
    await screenshot(page, 'rulings-spectra');
    await page.locator('[data-testid="filter-status"]').selectOption('open');
  });

  it('lets the agreement sheet and the export reflect the rulings', async () => {
    const { page } = session!;
    // The sheet compares the field crew's pass with Ben's blind one by default, and says
    // what the three rulings made of their three differing calls.
    await page.locator('nav button:has-text("Agreement sheet")').click();
    const settled = page.locator('[data-testid="settled-figures"]');
    await expect.poll(() => settled.locator('[data-figure="settled"]').textContent()).toBe('3 of 3');
    expect(await settled.locator('[data-figure="open"]').textContent()).toBe('0');
    expect(await settled.locator('[data-figure="settled-why"]').textContent()).toMatch(/^Of the 3 patches the two passes called differently, 3 are settled \(.+\) and 0 are still open/);
    const rows = settled.locator('[data-testid="against-settled"] tbody tr');
    expect(await rows.count()).toBe(2);
    expect(await rows.nth(1).getAttribute('data-pass')).toBe('blind-ben-blind-1');
    // Ben called 8 patches, all settled now; his calls match where the rulings took them.
    expect(await rows.nth(1).locator('td').first().textContent()).toBe(String(SAMPLE));
    await settled.scrollIntoViewIfNeeded();
    await screenshot(page, 'agreement-after-rulings');
    const after = await openDisagreementsInExport(page);
    expect(after.open).toBe(before.open - 3);
    expect(after.out).toBe(before.out + 3);
  });

  it('takes a patch to the desk to cut it, and comes back to the same place in the queue', async () => {
    const { page } = session!;
    await page.locator('nav button:has-text("Rulings")').click();
    await page.locator('[data-testid="filter-status"]').selectOption('all');
    const listed = page.locator('[data-testid="rulings-queue"] li button');
    const before = await listed.count();
    const target = (await listed.nth(1).getAttribute('data-patch'))!;
    await listed.nth(1).click();
    await expect.poll(() => rulingPatch(page)).toBe(target);
    await blur(page);
    await page.keyboard.press('g');
    // The desk opens with the patch in hand, centred, and says how to come back.
    await expect.poll(() => page.locator('[data-testid="desk-errand"]').textContent()).toContain(`Patch ${target} came from the rulings`);
    await expect.poll(() => inHand(page)).toBe(target);
    await mapReady(page);
    await screenshot(page, 'rulings-errand-desk');
    const patchCount = async () => Number((await page.locator('.patch-panel > p.detail').last().textContent())?.match(/(\d+) patches/)?.[1]);
    const count = await patchCount();
    const box = (await page.locator('[data-testid="map"]').boundingBox())!;
    const cx = box.x + box.width / 2, cy = box.y + box.height / 2;
    await page.keyboard.press('l');
    await page.mouse.click(cx - 300, cy);
    await page.waitForTimeout(150);
    await page.mouse.dblclick(cx + 300, cy + 3);
    await expect.poll(() => patchCount()).toBe(count + 1);
    await expect.poll(() => saved(page)).toContain('All saved');
    await page.keyboard.press('Escape');
    await page.keyboard.press('Shift+G');
    // Back on the Rulings page: the same filter, the same patch in hand, and the cut-off
    // piece (it carries the same calls) waiting in the queue as a disagreement of its own.
    await expect.poll(() => rulingPatch(page)).toBe(target);
    expect(await page.locator('[data-testid="filter-status"]').inputValue()).toBe('all');
    await expect.poll(() => listed.count()).toBe(before + 1);
    expect(await page.locator('[data-testid="desk-errand"]').count()).toBe(0);
    await mapReady(page, 'ruling-map');
    await screenshot(page, 'rulings-back-from-desk');
  });

  it('two windows ruling on one patch: the second is refused and told to reopen, the first stands', async () => {
    const { page, context } = session!;
    const message = (p: Page) => p.locator('[data-testid="ruling-message"]').textContent();
    const target = order[1];
    await page.locator('nav button:has-text("Rulings")').click();
    await page.locator('[data-testid="filter-status"]').selectOption('settled');
    await page.locator(`[data-testid="rulings-queue"] button[data-patch="${target}"]`).click();
    await page.locator('[data-testid="ruling-reason"]').fill('look again on the second date');
    await blur(page);
    await page.keyboard.press('Shift+R');
    await expect.poll(() => message(page)).toMatch(/reopened; it stays in the history/);

    // A second window of the same profile opens the site and shows the reopened patch.
    const other = await context.newPage();
    await other.goto(page.url());
    await other.locator('nav button:has-text("Rulings")').click();
    await other.locator(`[data-testid="rulings-queue"] button[data-patch="${target}"]`).click();
    await blur(other);
    await expect.poll(() => rulingPatch(other)).toBe(target);

    await page.keyboard.press('Shift+A');
    await expect.poll(() => message(page)).toMatch(new RegExp(`Patch ${target}: accept the call of pass field`));
    await other.keyboard.press('Shift+B');
    await expect.poll(() => message(other)).toMatch(/changed in another window .*nothing was recorded here\. Reopen the site/);

    // Reopened, the second window sees the first window's ruling and the whole history.
    await other.reload();
    await other.locator('nav button:has-text("Rulings")').click();
    await other.locator('[data-testid="filter-status"]').selectOption('all');
    await other.locator(`[data-testid="rulings-queue"] button[data-patch="${target}"]`).click();
    await expect.poll(() => other.locator('[data-testid="ruling-consensus"]').textContent()).toContain(`ruled: ${fieldCall.get(target)}`);
    expect(await other.locator('[data-testid="ruling-history"] li').count()).toBe(2);
    expect(await other.locator('[data-testid="ruling-history"]').textContent()).toContain('reopened by Cleo Ruler');
    await other.close();
  });
});
