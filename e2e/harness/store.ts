// A page that drives the site store the way the screens do, for the durability and
// disk-full checks in e2e/store-durability.e2e.ts. It reports each edit once the store
// says it is durable, through a binding the test installs (window.reportSaved).
import { canonicalJson } from '../../src/core/ledger/canonicalJson.ts';
import { emptySiteState, replay, siteFileOf, tagKey, type Patch, type SiteState } from '../../src/core/site/index.ts';
import { SiteStore } from '../../src/store/SiteStore.ts';
import { listSites } from '../../src/store/siteCatalogue.ts';
import { DiskCopyKeeper, restoreFromDiskCopy, type CopyTarget } from '../../src/app/site/diskCopy.ts';

declare global {
  interface Window {
    reportSaved(report: { seq: number; hash: string; kind: string }): Promise<void>;
    copyWrite(name: string, text: string): Promise<void>;
    copyRead(name: string): Promise<string | null>;
    storeHarness: typeof harness;
  }
}

const status = document.getElementById('status')!;
const show = (text: string) => (status.textContent = text);
const target: CopyTarget = { write: (n, t) => window.copyWrite(n, t), read: (n) => window.copyRead(n) };
let store: SiteStore | null = null;
let keeper: DiskCopyKeeper | null = null;
let clock = Date.UTC(2026, 6, 1, 8);
const now = () => new Date((clock += 1000)).toISOString();
const display = { composite: 'natural', stretch: 'percentile 2-98', date: '2026-07-01' };

function square(x: number, y: number, size: number): Patch['geometry'] {
  return [[[[x, y], [x + size, y], [x + size, y + size], [x, y + size], [x, y]]]];
}

function random(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function problemsOf(state: SiteState): string[] {
  const problems: string[] = [];
  for (const p of state.patches.values()) {
    const ring = p.geometry?.[0]?.[0];
    if (!ring || ring.length < 4 || ring.some((q) => !Number.isFinite(q[0]) || !Number.isFinite(q[1]))) problems.push(`patch ${p.id} is half-written`);
  }
  for (const t of state.tags.values()) if (!state.patches.has(t.patchId)) problems.push(`tag ${tagKey(t.patchId, t.passId)} has no patch`);
  return problems;
}

const harness = {
  /**
   * Opens the site, or creates it when this profile has never had it. With `mustExist`,
   * a site this profile has lost (the browser engine reset its storage) is not made anew:
   * `missing` says so, and the caller may restore it from its copy on disk.
   */
  async open(siteId: string, copy: boolean, mustExist = false): Promise<{ seq: number; patches: number; missing: boolean }> {
    const known = (await listSites()).some((s) => s.id === siteId);
    const missing = () => {
      show('missing');
      return { seq: 0, patches: 0, missing: true };
    };
    if (!known && mustExist) return missing();
    if (known) {
      try {
        store = await SiteStore.open(siteId);
      } catch (error) {
        // the catalogue kept the site's name but its database was lost
        if (mustExist && /^No site/.test((error as Error).message)) return missing();
        throw error;
      }
    } else {
      store = await SiteStore.create({ id: siteId, name: 'Durability', epsg: 32632, createdAt: now() }, 'ak');
      await store.commit({
        kind: 'roster.set', actor: 'ak', time: now(),
        payload: { entries: [{ code: 'PICE', scientificName: 'Picea abies', commonName: 'Norway spruce', group: 'conifer', colour: '#009E73', key: '1' }, { code: 'ALVI', scientificName: 'Alnus viridis', commonName: 'Green alder', group: 'broadleaf shrub', colour: '#E69F00', key: '2' }], previous: [] },
      });
      await store.commit({ kind: 'pass.started', actor: 'ak', time: now(), payload: { pass: { id: 'pass-ak', interpreter: 'ak', blind: false, startedAt: now(), endedAt: null, patchIds: null } } });
    }
    if (copy) keeper = new DiskCopyKeeper(store, target, { quietMs: 1000, maxDelayMs: 5000, onError: (e) => show(`copy failed: ${e.message}`) });
    show(`open at ${store.state.head.seq}`);
    return { seq: store.state.head.seq, patches: store.state.patches.size, missing: false };
  },

  /** Runs `count` edits one after another (adds, tags, vertex moves, deletions), reporting each once durable. */
  async runEdits(count: number, seed: number, big = 0): Promise<{ done: number; error: string | null }> {
    const s = store!;
    const rand = random(seed);
    for (let i = 0; i < count; i++) {
      try {
        const event = await s.commitWith((state) => {
          const ids = [...state.patches.keys()];
          const choice = ids.length < 5 || big ? 0 : Math.floor(rand() * 4);
          const time = now();
          const id = ids[Math.floor(rand() * ids.length)];
          if (choice === 0) {
            const size = 2 + rand() * 5;
            let geometry = square(rand() * 1000, rand() * 1000, size);
            if (big) {
              const ring = Array.from({ length: big }, (_, k) => [Math.cos((k / big) * 6.283) * size + rand() * 1e-3, Math.sin((k / big) * 6.283) * size] as [number, number]);
              geometry = [[[...ring, ring[0]]]];
            }
            const patch: Patch = { id: `p${seed}-${i}`, geometry, source: { kind: 'drawn' }, createdAt: time, createdBy: 'ak' };
            return { kind: 'patch.added', actor: 'ak', time, payload: { patch, tags: [] } };
          }
          if (choice === 1 || choice === 2) {
            const previous = state.tags.get(tagKey(id, 'pass-ak')) ?? null;
            const tag = { patchId: id, passId: 'pass-ak', species: rand() < 0.5 ? 'PICE' : 'ALVI', confidence: 'likely' as const, note: `edit ${i}`, interpreter: 'ak', time, display };
            return { kind: 'tag.set', actor: 'ak', time, payload: { patchId: id, passId: 'pass-ak', tag, previous } };
          }
          const patch = state.patches.get(id)!;
          const ring = patch.geometry[0][0].map(([x, y], k) => (k === 1 ? [x + rand(), y] : [x, y]) as [number, number]); // not the closing vertex
          return { kind: 'patch.geometry', actor: 'ak', time, payload: { patchId: id, geometry: [[ring]], previous: patch.geometry } };
        });
        if (event) {
          show(`saved ${event.seq}`);
          void window.reportSaved({ seq: event.seq, hash: event.hash, kind: event.kind });
        }
      } catch (error) {
        // what the screens do: say it at once, keep what was saved
        show(`not saved: ${(error as Error).message}`);
        return { done: i, error: (error as Error).message };
      }
    }
    return { done: count, error: null };
  },

  /** The stored site checked: chain, replay equal to the tables, no half-written rows. */
  async check(): Promise<{ ok: boolean; seq: number; problems: string[]; ledger: { seq: number; hash: string }[] }> {
    const s = store!;
    const chain = await s.verify();
    const ledger = await s.ledger();
    const problems = problemsOf(s.state);
    if (!chain.ok) problems.push(chain.problem);
    const replayed = replay(emptySiteState(), ledger);
    if (canonicalJson(siteFileOf(replayed, [])) !== canonicalJson(siteFileOf(s.state, []))) problems.push('the tables differ from the ledger replayed');
    return { ok: problems.length === 0, seq: s.state.head.seq, problems, ledger: ledger.map((e) => ({ seq: e.seq, hash: e.hash })) };
  },

  async undoOnce(): Promise<{ undone: number | null; seq: number }> {
    const event = await store!.undo('ak', now());
    return { undone: event?.undoes ?? null, seq: store!.state.head.seq };
  },

  /** The state as one canonical text, to compare across a restore. */
  snapshot(): string {
    return canonicalJson(siteFileOf(store!.state, []));
  },

  async flushCopy(): Promise<void> {
    await keeper?.flush();
  },

  /** Restores a site from its copy on disk into this (empty) profile. */
  async restoreFromCopy(siteId: string, copy = false): Promise<string> {
    store = await restoreFromDiskCopy(siteId, target);
    if (!store) throw new Error('no copy on disk');
    if (copy) keeper = new DiskCopyKeeper(store, target, { quietMs: 1000, maxDelayMs: 5000, onError: (e) => show(`copy failed: ${e.message}`) });
    return harness.snapshot();
  },
};

window.storeHarness = harness;
show('ready');
