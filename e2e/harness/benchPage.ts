// Timings taken inside Chromium for bench/store.bench.ts: one durable edit with 10,000
// patches in the site, and a 10,000-polygon GeoJSON import, each beside its floor
// (a bare strict Dexie write of the same rows) measured on the same page.
import Dexie from 'dexie';
import { tagKey, type Patch } from '../../src/core/site/index.ts';
import { createSite } from '../../src/app/site/createSite.ts';
import { importFieldPolygons, previewFieldImport } from '../../src/app/site/importFieldPolygons.ts';
import { importRoster } from '../../src/app/site/importRoster.ts';
import { tagPatch } from '../../src/app/site/tagPatch.ts';
import { editPatchGeometry } from '../../src/app/site/editPatchGeometry.ts';
import { SiteStore } from '../../src/store/SiteStore.ts';

declare global {
  interface Window {
    storeBench: typeof bench;
  }
}

const display = { composite: 'natural', stretch: 'percentile 2-98', date: '2026-07-01' };
const roster = 'code,scientific_name,common_name,group,colour,key\nPICE,Picea abies,Norway spruce,conifer,#009E73,1\nALVI,Alnus viridis,Green alder,broadleaf shrub,#E69F00,2\n';
let tick = Date.UTC(2026, 6, 1);
const now = () => new Date((tick += 1000)).toISOString();

class Floor extends Dexie {
  rows!: Dexie.Table<{ id: string }, string>;
  constructor(name: string) {
    super(name, { chromeTransactionDurability: 'strict' });
    this.version(1).stores({ rows: '&id' });
  }
}

const bench = {
  /** Import timings: ours (read, check, reproject, map, one ledger event) and the floor (parse + bulk put). */
  async importOnce(text: string): Promise<{ ours: number; floor: number; patches: number }> {
    const ctx = await createSite({ name: 'Import bench', epsg: 32632, interpreter: 'ak', now });
    await importRoster(ctx, 'roster.csv', roster);
    const bytes = new TextEncoder().encode(text);
    const t0 = performance.now();
    const preview = await previewFieldImport(ctx, 'field.geojson', bytes);
    await importFieldPolygons(ctx, preview, { mapping: preview.proposeFor('species'), leaveUnmappedUntagged: true });
    const ours = performance.now() - t0;
    const patches = ctx.store.state.patches.size;
    const id = ctx.store.state.site!.id;
    ctx.store.close();
    await SiteStore.remove(id);

    const floorDb = new Floor(`floor-${Math.random()}`);
    await floorDb.open();
    const t1 = performance.now();
    const doc = JSON.parse(new TextDecoder().decode(bytes)) as { features: { properties: object; geometry: object }[] };
    await floorDb.rows.bulkPut(doc.features.map((f, i) => ({ id: `f${i}`, ...f })));
    const floor = performance.now() - t1;
    await floorDb.delete();
    return { ours, floor, patches };
  },

  /** Edit timings with the file's patches in the site: alternate tag and vertex edits, each awaited until durable. */
  async edits(text: string, runs: number): Promise<{ ours: number[]; floor: number[]; patches: number }> {
    const ctx = await createSite({ name: 'Edit bench', epsg: 32632, interpreter: 'ak', now });
    await importRoster(ctx, 'roster.csv', roster);
    const preview = await previewFieldImport(ctx, 'field.geojson', new TextEncoder().encode(text));
    await importFieldPolygons(ctx, preview, { mapping: null });
    const ids = [...ctx.store.state.patches.keys()];
    const ours: number[] = [];
    for (let i = 0; i < runs; i++) {
      const id = ids[(i * 7919) % ids.length];
      const t0 = performance.now();
      if (i % 2 === 0) await tagPatch(ctx, { patchId: id, species: i % 4 ? 'PICE' : 'ALVI', confidence: 'likely', display });
      else {
        const patch: Patch = ctx.store.state.patches.get(id)!;
        const ring = patch.geometry[0][0].map(([x, y], k) => (k === 1 ? [x + 0.1, y] : [x, y]) as [number, number]);
        await editPatchGeometry(ctx, id, [[ring, ...patch.geometry[0].slice(1)], ...patch.geometry.slice(1)]);
      }
      ours.push(performance.now() - t0);
    }
    const patches = ctx.store.state.patches.size;
    const site = ctx.store.state.site!.id;
    ctx.store.close();
    await SiteStore.remove(site);

    const floorDb = new Floor(`floor-${Math.random()}`);
    await floorDb.open();
    const floor: number[] = [];
    for (let i = 0; i < runs; i++) {
      const t0 = performance.now();
      await floorDb.rows.put({ id: tagKey(`p${i % 100}`, 'pass'), ...display });
      floor.push(performance.now() - t0);
    }
    await floorDb.delete();
    return { ours, floor, patches };
  },
};

window.storeBench = bench;
