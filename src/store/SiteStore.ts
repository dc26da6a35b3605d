import { sealEvent, verifyChain, type ChainCheck } from '../core/ledger/chain.ts';
import {
  applyEvent, emptySiteState, inverseOf, tagKey, touchedRows, type EventDraft, type LedgerEvent,
  type RosterEntry, type Site, type SiteState,
} from '../core/site/index.ts';
import type { Scheme } from '../core/training/scheme.ts';
import { patchMeasures, SiteDatabase, siteDatabaseName, type PatchRow, type TagRow } from './schema.ts';
import { StorageError, storageError } from './StorageError.ts';
import { forgetSite, rememberSite } from './siteCatalogue.ts';

// The live store of one site. Every change goes through `commit`, which numbers and
// hashes the event, applies it to the in-memory state (refusing what does not fit),
// and writes the ledger row and every current-state row it touches in ONE strict
// IndexedDB transaction. The in-memory state moves on only once that transaction is
// durable, so what the screens show as saved is on disk.

export type DraftMaker = (state: SiteState) => EventDraft | null | Promise<EventDraft | null>;

export interface StoreOptions {
  /** for tests: another IndexedDB implementation */
  indexedDB?: IDBFactory;
  IDBKeyRange?: typeof IDBKeyRange;
}

const CURRENT_TABLES = ['ledger', 'meta', 'scenes', 'patches', 'tags', 'passes', 'rulings', 'references', 'imports'] as const;

export class SiteStore {
  private current: SiteState;
  private queue: Promise<unknown> = Promise.resolve();
  private listeners = new Set<(state: SiteState, event: LedgerEvent) => void>();

  private constructor(private readonly db: SiteDatabase, state: SiteState) {
    this.current = state;
  }

  /** Creates a new site: its database and the first ledger event. */
  static async create(site: Site, actor: string, options: StoreOptions = {}): Promise<SiteStore> {
    const db = new SiteDatabase(siteDatabaseName(site.id), options);
    try {
      await db.open();
      if ((await db.ledger.count()) > 0) throw new StorageError(`A site with id ${site.id} already exists on this machine.`, 'other');
    } catch (error) {
      db.close();
      throw storageError(error, site.name);
    }
    const store = new SiteStore(db, emptySiteState());
    await store.commit({ kind: 'site.created', payload: { site }, actor, time: site.createdAt });
    await rememberSite(site, options);
    return store;
  }

  /** Opens an existing site from its current-state tables. */
  static async open(siteId: string, options: StoreOptions = {}): Promise<SiteStore> {
    const db = new SiteDatabase(siteDatabaseName(siteId), options);
    try {
      await db.open();
      const state = await loadState(db);
      if (!state.site) throw new StorageError(`No site with id ${siteId} is stored on this machine.`, 'unavailable');
      return new SiteStore(db, state);
    } catch (error) {
      db.close();
      throw storageError(error, siteId);
    }
  }

  /**
   * Writes a whole site (a verified ledger and the state it replays to) into a new
   * database in one transaction. Refuses when the site is already here, unless `replace`.
   */
  static async restore(state: SiteState, ledger: LedgerEvent[], options: StoreOptions & { replace?: boolean } = {}): Promise<SiteStore> {
    const site = state.site;
    if (!site) throw new StorageError('The site to restore has no site record.', 'other');
    const db = new SiteDatabase(siteDatabaseName(site.id), options);
    try {
      await db.open();
      if ((await db.ledger.count()) > 0 && !options.replace) {
        throw new StorageError(`Site "${site.name}" is already on this machine; remove it first or choose to replace it.`, 'other');
      }
      await db.transaction('rw', CURRENT_TABLES.map((t) => db.table(t)), async () => {
        await Promise.all(CURRENT_TABLES.map((t) => db.table(t).clear()));
        await db.ledger.bulkAdd(ledger);
        await db.meta.bulkPut([
          { key: 'head', value: state.head },
          { key: 'history', value: state.history },
          { key: 'site', value: state.site },
          { key: 'roster', value: state.roster },
          { key: 'schemes', value: state.schemes },
        ]);
        await db.scenes.bulkPut([...state.scenes.values()]);
        await db.patches.bulkPut([...state.patches.values()].map((p) => ({ ...p, ...patchMeasures(p.geometry) })));
        await db.tags.bulkPut([...state.tags].map(([key, tag]) => ({ ...tag, key })));
        await db.passes.bulkPut([...state.passes.values()]);
        await db.rulings.bulkPut([...state.rulings.values()]);
        await db.references.bulkPut([...state.references.values()]);
        await db.imports.bulkPut([...state.imports.values()]);
      });
    } catch (error) {
      db.close();
      throw storageError(error, site.name);
    }
    await rememberSite(site, options);
    return new SiteStore(db, state);
  }

  /** Removes a site's database from this machine. */
  static async remove(siteId: string, options: StoreOptions = {}): Promise<void> {
    await new SiteDatabase(siteDatabaseName(siteId), options).delete();
    await forgetSite(siteId, options);
  }

  get state(): SiteState {
    return this.current;
  }

  get name(): string {
    return this.current.site?.name ?? '(new site)';
  }

  /** Called after each durable commit with the new state and its event. */
  subscribe(listener: (state: SiteState, event: LedgerEvent) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  /** Commits one change; resolves once it is durable. Changes are written in call order. */
  commit(draft: EventDraft): Promise<LedgerEvent> {
    return this.commitWith(() => draft) as Promise<LedgerEvent>;
  }

  /**
   * Commits the change `make` builds from the state at its turn in the queue (so a
   * `previous` value is never stale); `make` returning null commits nothing.
   */
  commitWith(make: DraftMaker): Promise<LedgerEvent | null> {
    const run = this.queue.then(async () => {
      const draft = await make(this.current);
      return draft ? this.write(draft) : null;
    });
    this.queue = run.catch(() => undefined);
    return run;
  }

  /** Undoes the newest change still on the undo stack; null when there is none. */
  undo(actor: string, time: string): Promise<LedgerEvent | null> {
    return this.commitWith(async (state) => {
      const target = state.history.undo.at(-1);
      if (target === undefined) return null;
      const event = await this.db.ledger.get(target);
      if (!event) throw new StorageError(`Site "${this.name}": ledger event ${target} is missing.`, 'unavailable');
      return { ...inverseOf(event), actor, time, undoes: target } as EventDraft;
    });
  }

  /** Redoes the newest undo still on the redo stack; null when there is none. */
  redo(actor: string, time: string): Promise<LedgerEvent | null> {
    return this.commitWith(async (state) => {
      const target = state.history.redo.at(-1);
      if (target === undefined) return null;
      const event = await this.db.ledger.get(target);
      if (!event) throw new StorageError(`Site "${this.name}": ledger event ${target} is missing.`, 'unavailable');
      return { ...inverseOf(event), actor, time, redoes: target } as EventDraft;
    });
  }

  /** The whole ledger, in order. */
  async ledger(): Promise<LedgerEvent[]> {
    return this.db.ledger.orderBy('seq').toArray();
  }

  /** Verifies the stored chain and that its head is the state's head. */
  async verify(): Promise<ChainCheck> {
    const check = await verifyChain(await this.ledger());
    if (check.ok && check.head !== this.current.head.hash) {
      return { ok: false, seq: check.length, index: check.length - 1, problem: 'the current state does not match the ledger head' };
    }
    return check;
  }

  /** Closes the database for good: a late read must not reopen it and block a delete. */
  close(): void {
    this.db.close({ disableAutoOpen: true });
  }

  private async write(draft: EventDraft): Promise<LedgerEvent> {
    const event = await sealEvent(draft, this.current.head);
    const next = applyEvent(this.current, event);
    const expectedSeq = this.current.head.seq;
    const rows = touchedRows(event);
    const db = this.db;
    try {
      await db.transaction('rw', CURRENT_TABLES.map((t) => db.table(t)), async () => {
        const head = (await db.meta.get('head'))?.value as { seq: number } | undefined;
        if ((head?.seq ?? 0) !== expectedSeq) {
          throw new StorageError(`Site "${this.name}" was changed in another window; reopen it to see those changes.`, 'stale');
        }
        await db.ledger.add(event);
        const meta: { key: string; value: unknown }[] = [
          { key: 'head', value: next.head },
          { key: 'history', value: next.history },
        ];
        if (rows.site) meta.push({ key: 'site', value: next.site });
        if (rows.roster) meta.push({ key: 'roster', value: next.roster });
        if (rows.schemes) meta.push({ key: 'schemes', value: next.schemes });
        await db.meta.bulkPut(meta);
        await syncRows(db.patches, rows.patches, (id) => patchRow(next, id));
        await syncRows(db.tags, rows.tags, (key) => {
          const tag = next.tags.get(key);
          return tag ? ({ ...tag, key } as TagRow) : undefined;
        });
        await syncRows(db.scenes, rows.scenes, (id) => next.scenes.get(id));
        await syncRows(db.passes, rows.passes, (id) => next.passes.get(id));
        await syncRows(db.rulings, rows.rulings, (id) => next.rulings.get(id));
        await syncRows(db.references, rows.references, (id) => next.references.get(id));
        await syncRows(db.imports, rows.imports, (id) => next.imports.get(id));
      });
    } catch (error) {
      throw storageError(error, this.name);
    }
    this.current = next;
    for (const listener of this.listeners) listener(next, event);
    return event;
  }
}

function patchRow(state: SiteState, id: string): PatchRow | undefined {
  const patch = state.patches.get(id);
  return patch ? { ...patch, ...patchMeasures(patch.geometry) } : undefined;
}

async function syncRows<T>(
  table: { bulkPut(rows: readonly T[]): Promise<unknown>; bulkDelete(keys: string[]): Promise<void> },
  keys: string[],
  rowOf: (key: string) => T | undefined,
): Promise<void> {
  if (keys.length === 0) return;
  const puts: T[] = [];
  const deletes: string[] = [];
  for (const key of keys) {
    const row = rowOf(key);
    if (row === undefined) deletes.push(key);
    else puts.push(row);
  }
  if (puts.length) await table.bulkPut(puts);
  if (deletes.length) await table.bulkDelete(deletes);
}

/** Reads the current-state tables back into a SiteState. */
async function loadState(db: SiteDatabase): Promise<SiteState> {
  return db.transaction('r', CURRENT_TABLES.map((t) => db.table(t)), async () => {
    const meta = new Map((await db.meta.toArray()).map((row) => [row.key, row.value]));
    const empty = emptySiteState();
    const strip = ({ extent: _e, area: _a, ...patch }: PatchRow) => patch;
    const untag = ({ key: _k, ...tag }: TagRow) => tag;
    return {
      site: (meta.get('site') as Site | undefined) ?? null,
      roster: (meta.get('roster') as RosterEntry[] | undefined) ?? [],
      schemes: (meta.get('schemes') as Scheme[] | undefined) ?? [],
      history: (meta.get('history') as SiteState['history'] | undefined) ?? empty.history,
      head: (meta.get('head') as SiteState['head'] | undefined) ?? empty.head,
      scenes: new Map((await db.scenes.toArray()).map((r) => [r.id, r])),
      patches: new Map((await db.patches.toArray()).map((r) => [r.id, strip(r)])),
      tags: new Map((await db.tags.toArray()).map((r) => [tagKey(r.patchId, r.passId), untag(r)])),
      passes: new Map((await db.passes.toArray()).map((r) => [r.id, r])),
      rulings: new Map((await db.rulings.toArray()).map((r) => [r.id, r])),
      references: new Map((await db.references.toArray()).map((r) => [r.id, r])),
      imports: new Map((await db.imports.toArray()).map((r) => [r.id, r])),
    };
  });
}
