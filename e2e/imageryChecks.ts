import type { Page } from 'playwright-core';

// Shared by the imagery e2e files: waiting for the map, and the percentile they work by hand.

/** Waits until every tile of the map's current view is drawn (after a moment for a change to start loading). */
export async function mapReady(page: Page, settle = 150): Promise<void> {
  await page.waitForTimeout(settle);
  await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 60_000 });
}

/** Nearest-rank percentile (Hyndman & Fan 1996, definition 1), worked here from its definition. */
export function percentileByRank(sorted: ArrayLike<number>, p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
}

/** Mean absolute difference of two equally long lists (colour signatures of the map). */
export const meanAbsDiff = (a: number[], b: number[]): number => a.reduce((sum, v, i) => sum + Math.abs(v - b[i]), 0) / a.length;

/** Single-key shortcuts wait while a form field has the focus: leave it, as a user would. */
export const blur = (page: Page): Promise<void> => page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
