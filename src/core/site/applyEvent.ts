import { SiteRuleError } from './SiteRuleError.ts';
import { UNDOABLE_KINDS, type LedgerEvent, type ShiftedOutline } from './events.ts';
import { UNDO_DEPTH, type SiteState } from './state.ts';
import { isPaused, tagKey, type Pass, type Patch, type Tag } from './types.ts';

// The one reducer of the site: pure, it returns a new state and never changes the one it
// was given (maps are copied only when the event touches them). It refuses an event that
// does not fit the state, so a stale or forged event never half-applies.

function withSet<K, V>(map: ReadonlyMap<K, V>, entries: Iterable<[K, V]>): Map<K, V> {
  const next = new Map(map);
  for (const [k, v] of entries) next.set(k, v);
  return next;
}

function withDeleted<K, V>(map: ReadonlyMap<K, V>, keys: Iterable<K>): Map<K, V> {
  const next = new Map(map);
  for (const k of keys) next.delete(k);
  return next;
}

function requirePatch(state: SiteState, id: string): Patch {
  const patch = state.patches.get(id);
  if (!patch) throw new SiteRuleError(`no patch ${id} in the site`);
  return patch;
}

function addPatches(state: SiteState, patches: Patch[], tags: Tag[]): Partial<SiteState> {
  for (const p of patches) if (state.patches.has(p.id)) throw new SiteRuleError(`patch ${p.id} already exists`);
  return {
    patches: withSet(state.patches, patches.map((p) => [p.id, p])),
    tags: tags.length ? withSet(state.tags, tags.map((t) => [tagKey(t.patchId, t.passId), t])) : state.tags,
  };
}

function removePatches(state: SiteState, patches: Patch[], tags: Tag[]): Partial<SiteState> {
  const ids = new Set(patches.map((p) => p.id));
  for (const id of ids) requirePatch(state, id);
  const listed = new Set(tags.map((t) => tagKey(t.patchId, t.passId)));
  for (const [key, tag] of state.tags) {
    if (ids.has(tag.patchId) && !listed.has(key)) throw new SiteRuleError(`patch ${tag.patchId} has a tag the event does not carry`);
  }
  return { patches: withDeleted(state.patches, ids), tags: withDeleted(state.tags, listed) };
}

/** Two outlines with the same parts, rings and positions (numbers compared exactly). */
function sameOutline(a: Patch['geometry'], b: Patch['geometry']): boolean {
  if (a === b) return true;
  if (a.length !== b.length) return false;
  for (let p = 0; p < a.length; p++) {
    if (a[p].length !== b[p].length) return false;
    for (let r = 0; r < a[p].length; r++) {
      const ra = a[p][r], rb = b[p][r];
      if (ra.length !== rb.length) return false;
      for (let i = 0; i < ra.length; i++) if (ra[i][0] !== rb[i][0] || ra[i][1] !== rb[i][1]) return false;
    }
  }
  return true;
}

/** A shift moves many outlines at once; each must still be where the event found it, so a stale shift never half-applies. */
function withShiftedOutlines(state: SiteState, outlines: readonly ShiftedOutline[]) {
  const seen = new Set<string>();
  const moved: [string, Patch][] = [];
  for (const o of outlines) {
    if (seen.has(o.patchId)) throw new SiteRuleError(`patch ${o.patchId} is moved twice by one shift`);
    seen.add(o.patchId);
    const patch = requirePatch(state, o.patchId);
    if (!sameOutline(patch.geometry, o.previous)) throw new SiteRuleError(`patch ${o.patchId} changed since the shift was worked out`);
    moved.push([patch.id, { ...patch, geometry: o.geometry }]);
  }
  return withSet(state.patches, moved);
}

function requirePass(state: SiteState, id: string): Pass {
  const pass = state.passes.get(id);
  if (!pass) throw new SiteRuleError(`no pass ${id} in the site`);
  return pass;
}

/** Holds or takes up an open blind pass, keeping every earlier period. */
function withPause(state: SiteState, passId: string, time: string, hold: boolean): Partial<SiteState> {
  const pass = requirePass(state, passId);
  if (!pass.blind || pass.endedAt !== null) throw new SiteRuleError(`pass ${passId} is not an open blind pass`);
  if (isPaused(pass) === hold) throw new SiteRuleError(`pass ${passId} is ${hold ? 'already' : 'not'} paused`);
  const periods = pass.pauses ?? [];
  const pauses = hold
    ? [...periods, { pausedAt: time, resumedAt: null }]
    : [...periods.slice(0, -1), { ...periods[periods.length - 1], resumedAt: time }];
  return { passes: withSet(state.passes, [[pass.id, { ...pass, pauses }]]) };
}

function applyChange(state: SiteState, event: LedgerEvent): Partial<SiteState> {
  switch (event.kind) {
    case 'site.created':
      if (state.site) throw new SiteRuleError('the site already exists');
      return { site: event.payload.site };
    case 'site.renamed':
      if (!state.site) throw new SiteRuleError('no site to rename');
      return { site: { ...state.site, name: event.payload.name } };
    case 'scene.added':
      if (state.scenes.has(event.payload.scene.id)) throw new SiteRuleError(`scene ${event.payload.scene.id} already exists`);
      return { scenes: withSet(state.scenes, [[event.payload.scene.id, event.payload.scene]]) };
    case 'roster.set':
      return { roster: event.payload.entries };
    case 'patch.added':
      return addPatches(state, [event.payload.patch], event.payload.tags);
    case 'patch.deleted':
      return removePatches(state, [event.payload.patch], event.payload.tags);
    case 'patch.geometry': {
      const patch = requirePatch(state, event.payload.patchId);
      return { patches: withSet(state.patches, [[patch.id, { ...patch, geometry: event.payload.geometry }]]) };
    }
    case 'patches.shifted':
      return { patches: withShiftedOutlines(state, event.payload.outlines) };
    case 'patches.replaced': {
      const { before, after } = event.payload;
      const removed = { ...state, ...removePatches(state, before.patches, before.tags) };
      return addPatches(removed, after.patches, after.tags);
    }
    case 'tag.set': {
      const { patchId, passId, tag } = event.payload;
      requirePatch(state, patchId);
      if (!state.passes.has(passId)) throw new SiteRuleError(`no pass ${passId} in the site`);
      const key = tagKey(patchId, passId);
      if (tag && (tag.patchId !== patchId || tag.passId !== passId)) throw new SiteRuleError('the tag names another patch or pass');
      return { tags: tag ? withSet(state.tags, [[key, tag]]) : withDeleted(state.tags, [key]) };
    }
    case 'import.added': {
      const { record, patches, tags, references } = event.payload;
      if (state.imports.has(record.id)) throw new SiteRuleError(`import ${record.id} already exists`);
      return {
        ...addPatches(state, patches, tags),
        imports: withSet(state.imports, [[record.id, record]]),
        references: withSet(state.references, references.map((r) => [r.id, r])),
      };
    }
    case 'import.removed': {
      const { record, patches, tags, references } = event.payload;
      if (!state.imports.has(record.id)) throw new SiteRuleError(`no import ${record.id} in the site`);
      return {
        ...removePatches(state, patches, tags),
        imports: withDeleted(state.imports, [record.id]),
        references: withDeleted(state.references, references.map((r) => r.id)),
      };
    }
    case 'pass.started':
      if (state.passes.has(event.payload.pass.id)) throw new SiteRuleError(`pass ${event.payload.pass.id} already exists`);
      return { passes: withSet(state.passes, [[event.payload.pass.id, event.payload.pass]]) };
    case 'pass.ended': {
      const pass = requirePass(state, event.payload.passId);
      // Ending a held pass closes its last pause at the same moment.
      const pauses = isPaused(pass) ? pass.pauses!.map((p) => (p.resumedAt === null ? { ...p, resumedAt: event.payload.time } : p)) : pass.pauses;
      return { passes: withSet(state.passes, [[pass.id, { ...pass, endedAt: event.payload.time, ...(pauses ? { pauses } : {}) }]]) };
    }
    case 'pass.paused':
      return withPause(state, event.payload.passId, event.payload.time, true);
    case 'pass.resumed':
      return withPause(state, event.payload.passId, event.payload.time, false);
    case 'interpreter.switched':
      // Recorded for the history only: who is at the desk is the machine's, not the site's.
      return {};
    case 'schemes.set': {
      const names = new Set<string>();
      for (const scheme of event.payload.schemes) {
        if (names.has(scheme.name)) throw new SiteRuleError(`two schemes are called "${scheme.name}"`);
        names.add(scheme.name);
      }
      return { schemes: event.payload.schemes };
    }
    case 'ruling.recorded': {
      const { ruling } = event.payload;
      requirePatch(state, ruling.patchId);
      if (state.rulings.has(ruling.id)) throw new SiteRuleError(`ruling ${ruling.id} already exists`);
      return { rulings: withSet(state.rulings, [[ruling.id, ruling]]) };
    }
    case 'ruling.reopened': {
      const { rulingId, by, time, reason } = event.payload;
      const ruling = state.rulings.get(rulingId);
      if (!ruling) throw new SiteRuleError(`no ruling ${rulingId} in the site`);
      return { rulings: withSet(state.rulings, [[rulingId, { ...ruling, reopened: { by, time, reason } }]]) };
    }
    default: {
      const unknown: never = event;
      throw new SiteRuleError(`unknown event kind ${(unknown as { kind: string }).kind}`);
    }
  }
}

function nextHistory(history: SiteState['history'], event: LedgerEvent): SiteState['history'] {
  const top = (stack: readonly number[]) => stack[stack.length - 1];
  if (event.undoes !== undefined) {
    if (top(history.undo) !== event.undoes) throw new SiteRuleError(`event ${event.undoes} is not the next to undo`);
    return { undo: history.undo.slice(0, -1), redo: [...history.redo, event.seq] };
  }
  if (event.redoes !== undefined) {
    if (top(history.redo) !== event.redoes) throw new SiteRuleError(`event ${event.redoes} is not the next to redo`);
    return { undo: [...history.undo, event.seq], redo: history.redo.slice(0, -1) };
  }
  if (!UNDOABLE_KINDS.has(event.kind)) return history;
  return { undo: [...history.undo, event.seq].slice(-UNDO_DEPTH), redo: [] };
}

/** The state after one ledger event. The event must follow the state's head. */
export function applyEvent(state: SiteState, event: LedgerEvent): SiteState {
  if (event.seq !== state.head.seq + 1) throw new SiteRuleError(`event ${event.seq} does not follow ${state.head.seq}`);
  if (event.prev !== state.head.hash) throw new SiteRuleError(`event ${event.seq} is chained to another ledger`);
  if (event.seq > 1 && !state.site) throw new SiteRuleError('the ledger does not begin with site.created');
  if (event.seq === 1 && event.kind !== 'site.created') throw new SiteRuleError('the ledger must begin with site.created');
  const change = applyChange(state, event);
  return { ...state, ...change, history: nextHistory(state.history, event), head: { seq: event.seq, hash: event.hash } };
}

/** Replays events in order from a given state (empty for a whole ledger). */
export function replay(state: SiteState, events: Iterable<LedgerEvent>): SiteState {
  let current = state;
  for (const event of events) current = applyEvent(current, event);
  return current;
}
