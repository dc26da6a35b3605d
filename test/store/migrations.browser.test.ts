import Dexie from 'dexie';
import { describe, expect, it } from 'vitest';
import { verifyChain } from '../../src/core/ledger/chain.ts';
import { emptySiteState, replay, type LedgerEvent } from '../../src/core/site/index.ts';
import { SCHEMA_V1, SCHEMA_VERSION, siteDatabaseName } from '../../src/store/schema.ts';
import { SiteStore } from '../../src/store/SiteStore.ts';
import v1 from './fixtures/site-schema-v1.json';

// A database of each older schema version (fixtures/, made by make-schema-v1.ts) is
// written with that version's own table layout, then opened by today's store.

async function writeOldDatabase(name: string, version: number, stores: Record<string, string>, tables: Record<string, unknown[]>) {
  const old = new Dexie(name);
  old.version(version).stores(stores);
  await old.open();
  await old.transaction('rw', old.tables, async () => {
    for (const [table, rows] of Object.entries(tables)) await old.table(table).bulkAdd(rows);
  });
  old.close();
}

describe('schema migrations', () => {
  it('knows every version it upgrades from', () => {
    expect(SCHEMA_VERSION).toBe(2); // a new version needs a fixture and a case here
  });

  it('upgrades a version 1 site: same state, chain intact, patch rows measured', async () => {
    const site = v1.tables.meta.find((m) => m.key === 'site')!.value as { id: string };
    const siteId = `${site.id}-${Date.now()}`;
    const name = siteDatabaseName(siteId);
    await writeOldDatabase(name, 1, SCHEMA_V1, v1.tables as unknown as Record<string, unknown[]>);

    const store = await SiteStore.open(siteId);
    const ledger = v1.tables.ledger as unknown as LedgerEvent[];
    expect(store.state).toEqual(replay(emptySiteState(), ledger));
    expect(await store.verify()).toMatchObject({ ok: true, length: ledger.length });
    store.close();

    const raw = new Dexie(name);
    await raw.open();
    expect(raw.verno).toBe(2);
    const rows = await raw.table('patches').toArray();
    expect(rows).toHaveLength(4);
    // p2 was reshaped to a 6 m square at x 20..26 in the fixture's ledger
    const p2 = rows.find((r) => r.id === 'p2');
    expect(p2.area).toBeCloseTo(36, 9);
    expect(p2.extent).toEqual([20, 0, 26, 6]);
    expect(await raw.table('patches').where('area').above(20).count()).toBe(1);
    raw.close();

    // and it goes on working: undo the newest change after the upgrade
    const again = await SiteStore.open(siteId);
    await again.undo('ak', '2026-07-02T08:00:00.000Z');
    expect(again.state.patches.has('p3')).toBe(true);
    expect(await verifyChain(await again.ledger())).toMatchObject({ ok: true });
    again.close();
    await SiteStore.remove(siteId);
  });
});
