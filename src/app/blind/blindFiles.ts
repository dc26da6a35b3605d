import {
  BlindError, buildBlindAnswers, buildBlindPackage, contentHashOf, fitAnswers, packageContentOf, readBlindAnswers,
  writeBlindAnswers, writeBlindPackage, type BlindPackage,
} from '../../core/blind/index.ts';
import type { EventDraft, Patch, Site, SiteState } from '../../core/site/index.ts';
import { tagKey } from '../../core/site/index.ts';
import type { SiteWriter } from './siteWriter.ts';
import type { Actor } from './blindPasses.ts';

// Moving a blind pass between machines: the package goes out, the other machine makes
// a site of it and answers, and the answers come back. Every incoming file is checked
// whole before anything is written; a refused file changes nothing.

/** What a file is saved through (the platform bridge's saveFile). */
export type SaveFile = (suggestedName: string, data: string) => Promise<boolean>;

export async function exportBlindPackage(state: SiteState, passId: string, save: SaveFile, actor: Actor): Promise<BlindPackage | null> {
  const pkg = await buildBlindPackage(state, passId, { time: actor.time, by: actor.interpreter });
  return (await save(`${passId}.blind-package.json`, writeBlindPackage(pkg))) ? pkg : null;
}

export interface ImportedAnswers {
  passId: string;
  recorded: number;
  unanswered: string[];
}

/**
 * Imports answers into the site their package came from: checked whole (package id and
 * content hash, interpreter, ids, calls, answered once), then every call recorded in
 * the pass and the pass ended, so a second import of the same answers is refused.
 */
export async function importBlindAnswers(store: SiteWriter, fileName: string, text: string, actor: Actor): Promise<ImportedAnswers> {
  const answers = await readBlindAnswers(fileName, text);
  const fit = await fitAnswers(store.state, answers, fileName);
  for (const tag of fit.tags) {
    await store.commitWith((state) => {
      if (state.tags.has(tagKey(tag.patchId, tag.passId))) throw new BlindError(`patch ${tag.patchId} got a call in pass ${tag.passId} while the answers were imported`, fileName);
      return { kind: 'tag.set', payload: { patchId: tag.patchId, passId: tag.passId, tag, previous: null }, actor: tag.interpreter, time: tag.time };
    });
  }
  await store.commitWith(() => ({ kind: 'pass.ended', payload: { passId: answers.passId, time: actor.time }, actor: actor.interpreter, time: actor.time }));
  return { passId: answers.passId, recorded: fit.tags.length, unanswered: fit.unanswered };
}

/** The id of the site a package becomes on the answering machine. */
export function receivedSiteId(pkg: BlindPackage): string {
  return `blind-${pkg.packageId}`;
}

/**
 * The ledger events that make a site of a package on the answering machine: the same
 * CRS, scenes, roster, outlines and pass as the package, so the package's content hash
 * is recomputed there exactly, and no call of anyone.
 */
export function receivedSiteEvents(pkg: BlindPackage, actor: Actor): { site: Site; events: EventDraft[] } {
  const site: Site = { id: receivedSiteId(pkg), name: `Blind look for ${pkg.pass.interpreter}: ${pkg.origin.siteName || 'a site'}`, epsg: pkg.epsg, createdAt: actor.time };
  const at = { actor: actor.interpreter, time: actor.time };
  const events: EventDraft[] = [
    ...pkg.scenes.map((scene): EventDraft => ({ kind: 'scene.added', payload: { scene }, ...at })),
    { kind: 'roster.set', payload: { entries: pkg.roster, previous: [] }, ...at },
    ...pkg.patches.map((p): EventDraft => {
      const patch: Patch = { id: p.id, geometry: p.geometry, source: { kind: 'drawn' }, createdAt: actor.time, createdBy: pkg.origin.createdBy || 'package' };
      return { kind: 'patch.added', payload: { patch, tags: [] }, ...at };
    }),
    {
      kind: 'pass.started',
      payload: { pass: { id: pkg.pass.id, interpreter: pkg.pass.interpreter, blind: true, startedAt: actor.time, endedAt: null, patchIds: pkg.patches.map((p) => p.id) } },
      ...at,
    },
  ];
  return { site, events };
}

/** Commits the events of a received package into a freshly created store, then checks it rebuilt the same package. */
export async function receiveBlindPackage(store: SiteWriter, pkg: BlindPackage, actor: Actor): Promise<void> {
  const { events } = receivedSiteEvents(pkg, actor);
  for (const event of events) await store.commitWith(() => event);
  const rebuilt = await contentHashOf(packageContentOf(store.state, pkg.pass.id));
  if (rebuilt !== pkg.contentHash) throw new BlindError(`the site made from package ${pkg.packageId} does not match it; answers made here would be refused`);
}

/** On the answering machine: the answers file of the pass, saved through `save`. */
export async function exportBlindAnswers(state: SiteState, passId: string, save: SaveFile, actor: Actor): Promise<boolean> {
  const content = packageContentOf(state, passId);
  const contentHash = await contentHashOf(content);
  const pkg = { ...content, packageId: `pkg-${contentHash.slice(0, 16)}`, contentHash } as BlindPackage;
  const tags = [...state.tags.values()].filter((t) => t.passId === passId);
  if (tags.length === 0) throw new BlindError(`Pass ${passId} has no calls yet: there is nothing to send back.`);
  const answers = await buildBlindAnswers(pkg, tags, actor.time);
  return save(`${passId}.answers.json`, writeBlindAnswers(answers));
}
