import { describe, expect, it } from 'vitest';
import { createSite } from '../../src/app/site/createSite.ts';
import { undo } from '../../src/app/site/undo.ts';
import { deleteScheme, saveScheme } from '../../src/app/training/schemeEdits.ts';
import { emptySiteState, replay } from '../../src/core/site/index.ts';
import { SiteStore } from '../../src/store/SiteStore.ts';

// The site's named schemes kept in real IndexedDB: stored, edited and deleted through the
// Training sheet's use cases, undone and redone on the site's undo stack, and the same
// after the site is closed and opened again (and equal to the ledger replayed).

let clock = Date.UTC(2026, 7, 2, 8);
const now = () => new Date((clock += 1000)).toISOString();
const names = (store: SiteStore) => store.state.schemes.map((s) => s.name);

async function reopen(store: SiteStore): Promise<SiteStore> {
  const id = store.state.site!.id;
  store.close();
  const again = await SiteStore.open(id);
  expect(replay(emptySiteState(), await again.ledger()).schemes).toEqual(again.state.schemes);
  return again;
}

describe('schemes on real IndexedDB', () => {
  it('stores, undoes, redoes and deletes schemes durably across a reopen', async () => {
    const ctx = await createSite({ name: `Schemes ${clock}`, epsg: 32632, interpreter: 'ak', now });
    const who = () => ({ interpreter: 'ak', time: now() });
    await saveScheme(ctx.store, { name: 'Conifers apart', classOf: { PICE: 'PICE', ALVI: 'other' } }, null, who());
    await saveScheme(ctx.store, { name: 'Alder against the rest', classOf: { PICE: 'not ALVI', ALVI: 'ALVI' } }, null, who());
    let store = await reopen(ctx.store);
    expect(names(store)).toEqual(['Conifers apart', 'Alder against the rest']);

    await undo({ store, interpreter: 'ak', now });
    store = await reopen(store);
    expect(names(store)).toEqual(['Conifers apart']);
    await store.redo('ak', now());
    await deleteScheme(store, 'Conifers apart', who());
    store = await reopen(store);
    expect(names(store)).toEqual(['Alder against the rest']);
    expect(store.state.schemes[0].classOf).toEqual({ PICE: 'not ALVI', ALVI: 'ALVI' });
    expect(await store.verify()).toMatchObject({ ok: true });
    const id = store.state.site!.id;
    store.close();
    await SiteStore.remove(id);
  });
});
