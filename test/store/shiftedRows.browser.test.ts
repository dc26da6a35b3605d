import { describe, expect, it } from 'vitest';
import { appliedShifts } from '../../src/app/offset/appliedShifts.ts';
import { applyShift, restoreOriginals } from '../../src/app/offset/applyShift.ts';
import { addPatch } from '../../src/app/site/addPatch.ts';
import { createSite } from '../../src/app/site/createSite.ts';
import { undo } from '../../src/app/site/undo.ts';
import { canonicalJson } from '../../src/core/ledger/canonicalJson.ts';
import { defaultSettings, type OffsetEstimate } from '../../src/core/offset/index.ts';
import { emptySiteState, replay } from '../../src/core/site/index.ts';
import { SiteStore } from '../../src/store/SiteStore.ts';
import { square } from '../core/site/scenario.ts';

// A field shift kept in real IndexedDB: the moved outlines are written to the patch
// rows in the same transaction as the ledger event, so a reopened site shows them moved
// (and after an undo or a restore, back), and its rows equal the ledger replayed.

let clock = Date.UTC(2026, 7, 1, 8);
const now = () => new Date((clock += 1000)).toISOString();

/** A reliable estimate as the search reports one (only what applying reads is filled in). */
const estimate = (dx: number, dy: number): OffsetEstimate => ({
  reliable: true, reasons: [], dx, dy, candidate: [dx, dy], uncertainty: 0.04, bootstrap: null, significance: 12,
  patches: [], outliers: [], surface: { step: 0.6, half: 0, values: [1] }, settings: defaultSettings(0.3, 1.2),
});

// By id: a reopened site lists its rows in key order, not in the order they were made.
const geometries = (store: SiteStore) =>
  canonicalJson([...store.state.patches.values()].sort((a, b) => a.id.localeCompare(b.id)).map((p) => [p.id, p.geometry]));

async function reopen(store: SiteStore): Promise<SiteStore> {
  const id = store.state.site!.id;
  store.close();
  const again = await SiteStore.open(id);
  expect(replay(emptySiteState(), await again.ledger()).patches).toEqual(again.state.patches);
  expect(await again.verify()).toMatchObject({ ok: true });
  return again;
}

describe('a field shift on real IndexedDB', () => {
  it('moves the rows, undoes and restores them durably across a reopen', async () => {
    const ctx = await createSite({ name: `Shift ${clock}`, epsg: 32632, interpreter: 'ak', now });
    const ids = [];
    for (let i = 0; i < 4; i++) ids.push((await addPatch(ctx, square(i * 10, 0))).id);
    const original = geometries(ctx.store);

    await applyShift(ctx.store, estimate(0.45, -1.2), ids.slice(0, 3), { interpreter: 'ak', time: now() });
    const moved = geometries(ctx.store);
    let store = await reopen(ctx.store);
    expect(geometries(store)).toBe(moved);
    expect(store.state.patches.get(ids[0])!.geometry[0][0][0]).toEqual([0.45, -1.2]);
    expect(store.state.patches.get(ids[3])!.geometry).toEqual(square(30, 0));

    await undo({ store, interpreter: 'ak', now });
    store = await reopen(store);
    expect(geometries(store)).toBe(original);

    // Redo by applying again, then put the originals back with the restore: same bytes as before.
    await applyShift(store, estimate(0.45, -1.2), ids.slice(0, 3), { interpreter: 'ak', time: now() });
    const [, second] = [...appliedShifts(await store.ledger()).values()];
    await restoreOriginals(store, second.shiftId, { interpreter: 'ak', time: now() });
    store = await reopen(store);
    expect(geometries(store)).toBe(original);
    expect([...appliedShifts(await store.ledger()).values()].map((s) => s.direction)).toEqual(['restore', 'restore']);
    const id = store.state.site!.id;
    store.close();
    await SiteStore.remove(id);
  });
});
