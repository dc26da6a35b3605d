import { sha256Hex } from '../../core/ledger/sha256.ts';
import {
  BlindError, isBlindCall, openBlindPassOf, patchesOfPass, referenceCalls, selectPatches, shuffledOrder,
  type PatchSelection, type SelectedPatches,
} from '../../core/blind/index.ts';
import { CONFIDENCES, isPaused, tagKey, type Confidence, type DisplaySettings, type Pass, type SiteState, type Tag } from '../../core/site/index.ts';
import type { SiteWriter } from './siteWriter.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import { checkPatchGeometry } from '../site/geometryRules.ts';

// Starting, tagging in and ending a blind pass. Every step is one ledger event; the
// checks run again inside the commit, on the state at its turn, so two windows cannot
// start two passes for one interpreter or tag a pass that was just ended.

export interface Actor {
  interpreter: string;
  time: string;
}

/** Who a pass is for, and who started it (the ledger's actor; default: the same person). */
export interface PassRequest extends Actor {
  by?: string;
}

function slug(name: string): string {
  return name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'interpreter';
}

function newPassId(state: SiteState, interpreter: string, kind: 'blind' | 'draw'): string {
  let n = 1;
  while (state.passes.has(`${kind}-${slug(interpreter)}-${n}`)) n++;
  return `${kind}-${slug(interpreter)}-${n}`;
}

/** A seed for the walking order from the pass id: fixed for the pass, unknown beforehand. */
async function orderSeed(passId: string, time: string): Promise<number> {
  return parseInt((await sha256Hex(`${passId}|${time}`)).slice(0, 12), 16);
}

function refuseIfBusy(state: SiteState, interpreter: string): void {
  const open = openBlindPassOf(state, interpreter);
  if (open) throw new BlindError(`${interpreter} is already in blind pass ${open.id}: end it before starting another.`);
}

export interface StartedPass {
  pass: Pass;
  selected: SelectedPatches;
}

/**
 * Starts a blind pass for `actor.interpreter` over the chosen patches, in shuffled
 * order. A second look must come from someone else: patches the same interpreter
 * called last are refused, with how many.
 */
export async function startBlindPass(store: SiteWriter, selection: PatchSelection, actor: PassRequest): Promise<StartedPass> {
  const interpreter = actor.interpreter.trim();
  if (!interpreter) throw new BlindError('Choose the interpreter who makes the second look.');
  let started: StartedPass | null = null;
  await store.commitWith(async (state) => {
    refuseIfBusy(state, interpreter);
    const selected = selectPatches(state, selection);
    const calls = referenceCalls(state);
    const own = selected.patchIds.filter((id) => calls.get(id)?.interpreter === interpreter);
    if (own.length) {
      throw new BlindError(`${own.length} of the ${selected.patchIds.length} chosen patches were last called by ${interpreter}: a second look must come from another interpreter.`);
    }
    const id = newPassId(state, interpreter, 'blind');
    const patchIds = shuffledOrder(selected.patchIds, await orderSeed(id, actor.time));
    const pass: Pass = { id, interpreter, blind: true, startedAt: actor.time, endedAt: null, patchIds };
    started = { pass, selected };
    return { kind: 'pass.started', payload: { pass }, actor: actor.by ?? interpreter, time: actor.time };
  });
  return started!;
}

/**
 * Starts an independent delineation: a blind pass asking for no patch, in which the
 * interpreter draws their own, within `area` when one is given (it is then compared
 * within that area; see delineationSheet).
 */
export async function startDelineation(store: SiteWriter, actor: PassRequest, area?: MultiPolygonRings): Promise<Pass> {
  if (area) checkPatchGeometry(area);
  let pass: Pass | null = null;
  await store.commitWith((state) => {
    refuseIfBusy(state, actor.interpreter);
    pass = { id: newPassId(state, actor.interpreter, 'draw'), interpreter: actor.interpreter, blind: true, startedAt: actor.time, endedAt: null, patchIds: [], ...(area ? { area } : {}) };
    return { kind: 'pass.started', payload: { pass }, actor: actor.by ?? actor.interpreter, time: actor.time };
  });
  return pass!;
}

export async function endBlindPass(store: SiteWriter, passId: string, actor: Actor): Promise<void> {
  await store.commitWith((state) => {
    const pass = state.passes.get(passId);
    if (!pass || !pass.blind) throw new BlindError(`There is no blind pass ${passId} in this site.`);
    if (pass.endedAt !== null) return null;
    return { kind: 'pass.ended', payload: { passId, time: actor.time }, actor: actor.interpreter, time: actor.time };
  });
}

/**
 * Holds an open blind pass (`hold` true) or takes it up again: one ledger event with
 * its time, so the history shows every break. Asking for the state it is in already
 * writes nothing.
 */
export async function pauseBlindPass(store: SiteWriter, passId: string, hold: boolean, actor: Actor): Promise<void> {
  await store.commitWith((state) => {
    const pass = state.passes.get(passId);
    if (!pass || !pass.blind) throw new BlindError(`There is no blind pass ${passId} in this site.`);
    if (pass.endedAt !== null) throw new BlindError(`Blind pass ${passId} has ended.`);
    if (isPaused(pass) === hold) return null;
    return { kind: hold ? 'pass.paused' : 'pass.resumed', payload: { passId, time: actor.time }, actor: actor.interpreter, time: actor.time };
  });
}

export interface BlindCall {
  species?: string;
  confidence?: Confidence;
  note?: string;
}

/** A blind call starts 'likely' until the interpreter says otherwise, as on the desk. */
const DEFAULT_CONFIDENCE: Confidence = 'likely';

/** Sets the interpreter's call on a patch of their open blind pass. */
export async function tagInBlindPass(store: SiteWriter, passId: string, patchId: string, call: BlindCall, actor: Actor & { display: DisplaySettings }): Promise<Tag | null> {
  if (call.confidence !== undefined && !CONFIDENCES.includes(call.confidence)) throw new BlindError(`Confidence must be one of ${CONFIDENCES.join(', ')}.`);
  let made: Tag | null = null;
  await store.commitWith((state) => {
    const pass = state.passes.get(passId);
    if (!pass || !pass.blind) throw new BlindError(`There is no blind pass ${passId} in this site.`);
    if (pass.endedAt !== null) throw new BlindError(`Blind pass ${passId} has ended; its calls can no longer change.`);
    if (pass.interpreter !== actor.interpreter) throw new BlindError(`Blind pass ${passId} belongs to ${pass.interpreter}, not ${actor.interpreter}.`);
    if (isPaused(pass)) throw new BlindError(`Blind pass ${passId} is paused: resume it to go on calling.`);
    if (!patchesOfPass(state, pass).some((p) => p.id === patchId)) throw new BlindError(`Patch ${patchId} is not part of blind pass ${passId}.`);
    if (call.species !== undefined && !isBlindCall(state.roster, call.species)) {
      throw new BlindError(`"${call.species}" is neither a roster code nor one of mixed, unknown, can't tell.`);
    }
    const previous = state.tags.get(tagKey(patchId, passId)) ?? null;
    const species = call.species ?? previous?.species;
    if (species === undefined) throw new BlindError(`Patch ${patchId} has no call in this pass yet: press a species key first.`);
    const tag: Tag = {
      patchId, passId, species,
      confidence: call.confidence ?? previous?.confidence ?? DEFAULT_CONFIDENCE,
      note: call.note ?? previous?.note ?? '',
      interpreter: actor.interpreter, time: actor.time, display: actor.display,
    };
    if (previous && previous.species === tag.species && previous.confidence === tag.confidence && previous.note === tag.note) return null;
    made = tag;
    return { kind: 'tag.set', payload: { patchId, passId, tag, previous }, actor: actor.interpreter, time: actor.time };
  });
  return made;
}

export interface PassProgress {
  total: number;
  called: number;
  /** the next patch without a call, in the pass's order; null when all are called */
  next: string | null;
}

/** How far a blind pass has come, in its own (shuffled) order. */
export function passProgress(state: SiteState, pass: Pass): PassProgress {
  const ids = patchesOfPass(state, pass).map((p) => p.id);
  const called = ids.filter((id) => state.tags.has(tagKey(id, pass.id)));
  return { total: ids.length, called: called.length, next: ids.find((id) => !state.tags.has(tagKey(id, pass.id))) ?? null };
}
