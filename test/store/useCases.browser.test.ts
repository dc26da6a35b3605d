import { describe, expect, it } from 'vitest';
import fieldGeoJson from '../reference/fixtures/imports/field-lonlat.geojson?raw';
import noPrjUrl from '../reference/fixtures/imports/field-noprj.zip?url';
import { ImportError } from '../../src/core/imports/index.ts';
import { tagKey } from '../../src/core/site/index.ts';
import { siteFileText as exportHistoryText } from '../../src/core/export/siteFile.ts';
import { SiteStore } from '../../src/store/SiteStore.ts';
import { addPatch } from '../../src/app/site/addPatch.ts';
import { backupSite, siteFileText } from '../../src/app/site/backupSite.ts';
import type { SiteContext } from '../../src/app/site/context.ts';
import { createSite } from '../../src/app/site/createSite.ts';
import { deletePatch } from '../../src/app/site/deletePatch.ts';
import { DiskCopyKeeper, restoreFromDiskCopy, type CopyTarget } from '../../src/app/site/diskCopy.ts';
import { editPatchGeometry } from '../../src/app/site/editPatchGeometry.ts';
import { importFieldPolygons, previewFieldImport } from '../../src/app/site/importFieldPolygons.ts';
import { importRoster } from '../../src/app/site/importRoster.ts';
import { redo } from '../../src/app/site/redo.ts';
import { restoreSite } from '../../src/app/site/restoreSite.ts';
import { tagPatch } from '../../src/app/site/tagPatch.ts';
import { undo } from '../../src/app/site/undo.ts';
import { square } from '../core/site/scenario.ts';

const display = { composite: 'natural', stretch: 'percentile 2-98', date: '2026-07-01' };
const rosterCsv = 'code,scientific_name,common_name,group,colour,key\nPICE,Picea abies,Norway spruce,conifer,#009E73,1\nALVI,Alnus viridis,Green alder,broadleaf shrub,#E69F00,2\n';

let clock = Date.UTC(2026, 6, 1, 8);
const now = () => new Date((clock += 1000)).toISOString();

async function newSite(): Promise<SiteContext> {
  const ctx = await createSite({ name: `Use case ${clock}`, epsg: 32632, interpreter: 'ak', now });
  await importRoster(ctx, 'roster.csv', rosterCsv);
  return ctx;
}

function snapshot(store: SiteStore) {
  const s = store.state;
  return { patches: s.patches, tags: s.tags, imports: s.imports, references: s.references, roster: s.roster };
}

describe('site use cases on real IndexedDB', () => {
  it('draw, tag, reshape, delete, undo, redo, reopen: state as expected', async () => {
    const ctx = await newSite();
    const a = await addPatch(ctx, square(0, 0));
    const b = await addPatch(ctx, square(10, 0));
    await tagPatch(ctx, { patchId: a.id, species: 'PICE', confidence: 'sure', display });
    await tagPatch(ctx, { patchId: a.id, species: 'ALVI', confidence: 'unsure', note: 'shadow', display });
    await editPatchGeometry(ctx, b.id, square(10, 0, 8));
    await deletePatch(ctx, a.id);
    expect(ctx.store.state.patches.has(a.id)).toBe(false);
    await undo(ctx); // the deletion: patch and its tag come back
    const pass = [...ctx.store.state.passes.values()][0];
    expect(ctx.store.state.tags.get(tagKey(a.id, pass.id))).toMatchObject({ species: 'ALVI', confidence: 'unsure', note: 'shadow', display });
    await undo(ctx); // the reshape
    expect(ctx.store.state.patches.get(b.id)!.geometry).toEqual(square(10, 0));
    await undo(ctx); // the second tag
    expect(ctx.store.state.tags.get(tagKey(a.id, pass.id))?.species).toBe('PICE');
    await redo(ctx);
    expect(ctx.store.state.tags.get(tagKey(a.id, pass.id))?.species).toBe('ALVI');
    const id = ctx.store.state.site!.id;
    const before = snapshot(ctx.store);
    ctx.store.close();
    const again = await SiteStore.open(id);
    expect(snapshot(again)).toEqual(before);
    expect(await again.verify()).toMatchObject({ ok: true });
    again.close();
    await SiteStore.remove(id);
  });

  it('refuses tags that the roster does not know, changing nothing', async () => {
    const ctx = await newSite();
    const a = await addPatch(ctx, square(0, 0));
    const head = ctx.store.state.head;
    await expect(tagPatch(ctx, { patchId: a.id, species: 'LADE', confidence: 'sure', display })).rejects.toThrow('"LADE" is neither a roster code nor a reserved class');
    await expect(tagPatch(ctx, { patchId: 'nope', species: 'PICE', confidence: 'sure', display })).rejects.toThrow(/no patch nope/);
    await expect(addPatch(ctx, [[[[0, 0], [1, 0], [1, 1], [0, 1]]]])).rejects.toThrow(/not closed/);
    expect(ctx.store.state.head).toEqual(head);
    await tagPatch(ctx, { patchId: a.id, species: 'not vegetation', confidence: 'likely', display });
    ctx.store.close();
    await SiteStore.remove(ctx.store.state.site!.id);
  });

  it('imports field polygons in one event, keeps the file hash and attributes, and undoes the import', async () => {
    const ctx = await newSite();
    const bytes = new TextEncoder().encode(fieldGeoJson);
    const preview = await previewFieldImport(ctx, 'field-lonlat.geojson', bytes);
    expect(preview.attributes.map((a) => a.name)).toEqual(['plot', 'species', 'note']);
    const proposal = preview.proposeFor('species');
    expect(proposal.unknown).toEqual([{ value: 'Zwergwacholder', count: 1 }]);
    const head = ctx.store.state.head;
    // unknown values are not dropped silently: the import is refused until the user decides
    await expect(importFieldPolygons(ctx, preview, { mapping: proposal })).rejects.toThrow(ImportError);
    expect(ctx.store.state.head).toEqual(head);
    expect(ctx.store.state.patches.size).toBe(0);
    const importId = await importFieldPolygons(ctx, preview, { mapping: { attribute: 'species', values: { ...proposal.values, Zwergwacholder: 'mixed' } } });
    const state = ctx.store.state;
    expect(state.patches.size).toBe(4);
    expect(state.imports.get(importId)).toMatchObject({ fileName: 'field-lonlat.geojson', sha256: preview.sha256, sourceCrs: 'EPSG:4326', format: 'geojson' });
    expect([...state.tags.values()].map((t) => t.species).sort()).toEqual(['ALVI', 'PICE', 'mixed']);
    expect(state.patches.get(`${importId}-1`)!.source).toMatchObject({ kind: 'import', attributes: { note: 'Grünerle – dicht' } });
    await undo(ctx);
    expect(ctx.store.state.patches.size).toBe(0);
    expect(ctx.store.state.imports.size).toBe(0);
    ctx.store.close();
    await SiteStore.remove(state.site!.id);
  });

  it('tells a shapefile without .prj by name, with nothing stored', async () => {
    const ctx = await newSite();
    const zip = new Uint8Array(await (await fetch(noPrjUrl)).arrayBuffer());
    const head = ctx.store.state.head;
    await expect(previewFieldImport(ctx, 'field-noprj.zip', zip)).rejects.toThrow(/^field-noprj\.zip: field\.shp has no \.prj/);
    expect(ctx.store.state.head).toEqual(head);
    ctx.store.close();
    await SiteStore.remove(ctx.store.state.site!.id);
  });

  it('backs up and restores a site on a clean machine; refuses a tampered or newer file', async () => {
    const ctx = await newSite();
    const a = await addPatch(ctx, square(0, 0));
    await tagPatch(ctx, { patchId: a.id, species: 'PICE', confidence: 'sure', display });
    let saved = { name: '', data: '' };
    expect(await backupSite(ctx.store, async (name, data) => ((saved = { name, data }), true))).toBe(true);
    expect(saved.name).toMatch(/^use-case-\d+-site-\d+\.json$/);
    const id = ctx.store.state.site!.id;
    const before = snapshot(ctx.store);
    ctx.store.close();
    await SiteStore.remove(id);

    await expect(restoreSite('backup.json', saved.data.replace('"species":"PICE"', '"species":"ALVI"'))).rejects.toThrow(/^backup\.json: its "tags" do not match its ledger/);
    const newer = JSON.stringify({ ...JSON.parse(saved.data), version: 99 });
    await expect(restoreSite('backup.json', newer)).rejects.toThrow(/^backup\.json: it was written by a newer Fellfield/);
    await expect(SiteStore.open(id)).rejects.toThrow(); // nothing was written by the refusals

    const restored = await restoreSite('backup.json', saved.data);
    expect(snapshot(restored)).toEqual(before);
    await expect(restoreSite('backup.json', saved.data)).rejects.toThrow(/already on this machine/);
    await restored.undo('ak', now());
    expect(restored.state.tags.size).toBe(0);
    restored.close();
    await SiteStore.remove(id);
  });

  it('restores the history an export writes beside its data as a whole site', async () => {
    const ctx = await newSite();
    const a = await addPatch(ctx, square(0, 0));
    await tagPatch(ctx, { patchId: a.id, species: 'ALVI', confidence: 'likely', display });
    const id = ctx.store.state.site!.id;
    const before = snapshot(ctx.store);
    const history = exportHistoryText(await ctx.store.ledger());
    ctx.store.close();
    await SiteStore.remove(id);
    await expect(restoreSite('labels.site.json', history.replace('"species":"ALVI"', '"species":"PICE"'))).rejects.toThrow(/^labels\.site\.json: the history does not verify/);
    const restored = await restoreSite('labels.site.json', history);
    expect(snapshot(restored)).toEqual(before);
    expect(await restored.verify()).toMatchObject({ ok: true });
    restored.close();
    await SiteStore.remove(id);
  });

  it('keeps a copy on disk behind the store and restores from it when the store is gone', async () => {
    const ctx = await newSite();
    const files = new Map<string, string>();
    const target: CopyTarget = { write: async (n, t) => void files.set(n, t), read: async (n) => files.get(n) ?? null };
    const keeper = new DiskCopyKeeper(ctx.store, target, { quietMs: 20, maxDelayMs: 50 });
    for (let i = 0; i < 5; i++) await addPatch(ctx, square(i * 10, 0));
    await new Promise((r) => setTimeout(r, 150));
    const id = ctx.store.state.site!.id;
    expect(files.get(`${id}.site.json`)).toBe(await siteFileText(ctx.store));
    keeper.dispose();
    const before = snapshot(ctx.store);
    ctx.store.close();
    await SiteStore.remove(id); // the engine reset the store
    const restored = await restoreFromDiskCopy(id, target);
    expect(snapshot(restored!)).toEqual(before);
    restored!.close();
    await SiteStore.remove(id);
    expect(await restoreFromDiskCopy('no-such-site', target)).toBeNull();
  });
});
