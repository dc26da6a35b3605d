import { readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { appliedShifts } from '../../../src/app/offset/appliedShifts.ts';
import { applyShift, restoreOriginals } from '../../../src/app/offset/applyShift.ts';
import { checkRequest, estimateOffset, type EstimateProgress, type OffsetRun } from '../../../src/app/offset/estimateOffset.ts';
import { OffsetInputError } from '../../../src/app/offset/offsetSignal.ts';
import { InlineOffsetRunner } from '../../../src/app/offset/offsetRunner.ts';
import { patchesOfSet } from '../../../src/app/offset/offsetSets.ts';
import type { SceneView } from '../../../src/app/site.ts';
import { readLabelFile } from '../../../src/core/geojson/labelFile.ts';
import { extentOfRings } from '../../../src/core/geometry/measure.ts';
import { canonicalJson } from '../../../src/core/ledger/canonicalJson.ts';
import { defaultSettings, estimateByArea, estimateShift, sceneSignal } from '../../../src/core/offset/index.ts';
import { emptySiteState, replay, type Patch } from '../../../src/core/site/index.ts';
import { inspectTiff } from '../../../src/core/tiff/inspectTiff.ts';
import type { SiteStore } from '../../../src/store/SiteStore.ts';
import { writeDemoScene, type DemoSite } from '../../core/offset/demoSite.ts';
import { MemoryLedger } from '../../core/site/scenario.ts';
import { openRasterFile } from '../../imagery/nodeRaster.ts';

// The desk's shift use cases on a generated demo scene: the estimate read through the
// app's raster path agrees to the bit with the command line's file path and recovers
// the generator's known shift (demo truth, src/core/demo/truth.ts); applying and
// restoring go through a real ledger (sealed, hash-chained, replayed).

/** The SiteStore surface these use cases call, over an in-memory ledger (the same reducer and seal). */
function ledgerStore(l: MemoryLedger): SiteStore {
  let queue: Promise<unknown> = Promise.resolve();
  return {
    get state() { return l.state; },
    commitWith(make: (s: typeof l.state) => Parameters<MemoryLedger['add']>[0] | null) {
      const run = queue.then(async () => {
        const draft = await make(l.state);
        return draft ? l.add(draft) : null;
      });
      queue = run.catch(() => undefined);
      return run;
    },
    ledger: async () => [...l.events],
  } as unknown as SiteStore;
}

let site: DemoSite;
let patches: Patch[];
let scene: SceneView;
const PAN = 0.3;

beforeAll(async () => {
  site = writeDemoScene({ seed: 1, size: 1024 });
  const file = readLabelFile(readFileSync(site.field, 'utf8'), 'field.geojson', { targetEpsg: site.truth.crs.epsg });
  patches = file.patches.map((p, i) => ({
    id: String(p.id), geometry: p.rings, createdAt: 't', createdBy: 'crew',
    source: { kind: 'import', importId: 'import-1', featureIndex: i, attributes: { id: p.id } },
  }));
  const ms = await openRasterFile(site.ms);
  const pan = await openRasterFile(site.pan);
  scene = { date: '2025-07-21', pan: { raster: pan }, ms: { raster: ms, bands: [], naturalColour: { bands: [2, 1, 0] } } };
});

describe('estimateOffset', () => {
  let run: OffsetRun;
  const progress: EstimateProgress[] = [];

  beforeAll(async () => {
    run = await estimateOffset({ patches, scene, radius: 3, areasAcross: 2, runner: new InlineOffsetRunner(), onProgress: (p) => progress.push(p) });
  });

  it('recovers the demo truth within a quarter of a panchromatic pixel, inside its uncertainty', () => {
    const e = run.estimate;
    expect(e.reliable, e.reasons.join('; ')).toBe(true);
    const error = Math.hypot(e.dx! - site.truth.offset.dx, e.dy! - site.truth.offset.dy);
    expect(error).toBeLessThan(PAN / 4);
    expect(error).toBeLessThanOrEqual(e.uncertainty!);
    expect(run.panPixel).toBeCloseTo(PAN, 9);
    expect(progress[0].stage).toBe('reading');
    expect(progress.at(-1)!.share).toBe(1);
  });

  it('gives the same estimate as the command line path (core sceneSignal on the file, estimateShift)', async () => {
    const bytes = readFileSync(site.ms);
    const read = async (offset: number, length: number) => new Uint8Array(bytes.buffer, bytes.byteOffset + offset, Math.min(length, bytes.length - offset));
    const summary = await inspectTiff(read, bytes.length, 'ms.tif');
    const settings = defaultSettings(PAN, summary.pixelSize[0], { radius: 3 });
    // The extent the command line reads (src/cli/verbs/offset.ts): the polygons' extent and the search margin.
    const all = extentOfRings(patches.flatMap((p) => p.geometry));
    const m = 3 + settings.ownReach + settings.ringWidth + 2 * summary.pixelSize[0];
    const grid = await sceneSignal({ read, summary }, 'ndvi', [all[0] - m, all[1] - m, all[2] + m, all[3] + m]);
    const cli = estimateShift(patches.map((p) => ({ id: p.id, rings: p.geometry })), grid, settings);
    expect(run.estimate.dx).toBe(cli.dx);
    expect(run.estimate.dy).toBe(cli.dy);
    expect(run.estimate.uncertainty).toBe(cli.uncertainty);
    expect(run.estimate.outliers).toEqual(cli.outliers);
    // The per-area shifts too (the path of fellfield offset --areas 2).
    expect(run.areas).toEqual(estimateByArea(patches.map((p) => ({ id: p.id, rings: p.geometry })), grid, settings, cli, 2));
    expect(run.areas!.cells).toHaveLength(4);
  });

  it('refuses one patch, patches off the scene and a radius as large as the scene, naming the file', () => {
    const extent = scene.ms!.raster.summary.extent as [number, number, number, number];
    expect(() => checkRequest(patches.slice(0, 1), extent, 'ms.tif', 3)).toThrow(/holds 1 patch; a common shift needs at least two/);
    const far: Patch = { ...patches[0], id: 'far', geometry: [[[[0, 0], [1, 0], [1, 1], [0, 0]]]] };
    expect(() => checkRequest([...patches.slice(0, 3), far], extent, 'ms.tif', 3)).toThrow(/1 of 4 patches lie outside the scene ms.tif \(far\)/);
    expect(() => checkRequest(patches, extent, 'ms.tif', 1e6)).toThrow(OffsetInputError);
    expect(() => checkRequest(patches, extent, 'ms.tif', 0)).toThrow(/must be above 0/);
  });

  it('applies the shift as one event, undoes it byte for byte, and restores the originals after an edit', async () => {
    const l = new MemoryLedger();
    await l.add({ kind: 'site.created', payload: { site: { id: 's', name: 'Demo', epsg: site.truth.crs.epsg, createdAt: l.time() } } });
    await l.add({ kind: 'import.added', payload: { record: {
      id: 'import-1', fileName: 'field.geojson', sha256: '0'.repeat(64), format: 'geojson', sourceCrs: 'EPSG:4326',
      counts: { patches: patches.length, references: 0, skipped: 0 }, mapping: null, time: l.time(), by: 'crew',
    }, patches, tags: [], references: [] } });
    const store = ledgerStore(l);
    const original = canonicalJson([...l.state.patches.values()]);
    expect(patchesOfSet(l.state, { kind: 'import', importId: 'import-1' })).toHaveLength(patches.length);

    const who = { interpreter: 'ak', time: l.time() };
    const applied = await applyShift(store, run.estimate, run.patchIds, who);
    expect(applied.kind).toBe('patches.shifted');
    const moved = l.state.patches.get(patches[0].id)!.geometry[0][0][0];
    expect(moved[0] - patches[0].geometry[0][0][0][0]).toBeCloseTo(run.estimate.dx!, 9);
    expect(moved[1] - patches[0].geometry[0][0][0][1]).toBeCloseTo(run.estimate.dy!, 9);
    await l.undo();
    expect(canonicalJson([...l.state.patches.values()])).toBe(original);
    await l.redo();

    // An edit after the shift: restore gives the untouched patches their originals exactly and moves the edited one back.
    const edited = patches[1].id;
    const g = l.state.patches.get(edited)!.geometry;
    const reshaped = [[g[0][0].map(([x, y], i) => (i === 1 ? [x + 0.5, y] : [x, y]) as [number, number])]];
    reshaped[0][0][reshaped[0][0].length - 1] = reshaped[0][0][0];
    await l.add({ kind: 'patch.geometry', payload: { patchId: edited, geometry: reshaped, previous: g } });
    const shifts = appliedShifts(l.events);
    const [only] = [...shifts.values()];
    expect(shifts.size).toBe(1);
    expect(only.direction).toBe('apply');
    const restored = await restoreOriginals(store, only.shiftId, { interpreter: 'ak', time: l.time() });
    expect(restored.movedBack).toEqual([edited]);
    expect(appliedShifts(l.events).get(only.shiftId)!.direction).toBe('restore');
    for (const p of patches) {
      if (p.id === edited) continue;
      expect(canonicalJson(l.state.patches.get(p.id)!.geometry)).toBe(canonicalJson(p.geometry));
    }
    expect(l.state.patches.get(edited)!.geometry[0][0][1][0]).toBeCloseTo(patches[1].geometry[0][0][1][0] + 0.5, 9);
    await expect(restoreOriginals(store, only.shiftId, who)).rejects.toThrow(/already back/);
    expect(replay(emptySiteState(), l.events)).toEqual(l.state);
  });

  it('refuses to apply an estimate that is not reliable', async () => {
    const l = new MemoryLedger();
    const unreliable = { ...run.estimate, reliable: false, dx: null, dy: null, reasons: ['the peak does not stand out'] };
    await expect(applyShift(ledgerStore(l), unreliable, run.patchIds, { interpreter: 'ak', time: 't' })).rejects.toThrow(/no reliable shift to apply: the peak does not stand out/);
  });

  it('keeps the newest word on each shift when an older ledger read arrives late', async () => {
    const l = new MemoryLedger();
    await l.add({ kind: 'site.created', payload: { site: { id: 's', name: 'Demo', epsg: site.truth.crs.epsg, createdAt: l.time() } } });
    for (const p of patches.slice(0, 3)) await l.add({ kind: 'patch.added', payload: { patch: p, tags: [] } });
    const store = ledgerStore(l);
    await applyShift(store, run.estimate, patches.slice(0, 3).map((p) => p.id), { interpreter: 'ak', time: l.time() });
    const stale = [...l.events];
    await l.undo();
    const heard = appliedShifts([l.events.at(-1)!]);
    appliedShifts(stale, heard);
    expect([...heard.values()].map((s) => s.direction)).toEqual(['restore']);
  });
});
