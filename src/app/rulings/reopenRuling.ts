import { RulingError } from '../../core/rulings/index.ts';
import type { Ruling } from '../../core/site/index.ts';
import type { SiteWriter } from '../blind/siteWriter.ts';
import { staleAsRulingError, type RulingActor } from './recordRuling.ts';

// Reopening a ruling: one 'ruling.reopened' event. The ruling itself stays in the site
// and the ledger, marked reopened with who, when and why, so the history reads in full;
// the patch goes back to the queue as open until a new ruling is recorded. A ruling can
// be reopened even when a pass it settled no longer has its call on the patch: that is
// exactly when it most needs another look.

export interface ReopenOutcome {
  ruling: Ruling;
  /** passes the ruling settled whose calls on the patch are gone, to tell the person */
  passesGone: string[];
}

export async function reopenRuling(store: SiteWriter, rulingId: string, reason: string, actor: RulingActor): Promise<ReopenOutcome> {
  const by = actor.interpreter.trim();
  if (!by) throw new RulingError('Choose who is reopening first.');
  const why = reason.trim();
  let outcome: ReopenOutcome | null = null;
  let patchId = '';
  try {
    await store.commitWith((state) => {
      const ruling = state.rulings.get(rulingId);
      if (!ruling) throw new RulingError(`There is no ruling ${rulingId} in this site.`);
      patchId = ruling.patchId;
      if (ruling.reopened) throw new RulingError(`Ruling ${rulingId} was already reopened by ${ruling.reopened.by} at ${ruling.reopened.time}.`, ruling.patchId);
      if (!why) throw new RulingError(`Say why ruling ${rulingId} is reopened: the reason stays in its history.`, ruling.patchId);
      const passesGone = ruling.passIds.filter((p) => !state.passes.has(p) || !state.tags.has(`${ruling.patchId}|${p}`));
      outcome = { ruling: { ...ruling, reopened: { by, time: actor.time, reason: why } }, passesGone };
      return { kind: 'ruling.reopened', payload: { rulingId, by, time: actor.time, reason: why }, actor: by, time: actor.time };
    });
  } catch (error) {
    throw staleAsRulingError(error, patchId);
  }
  return outcome!;
}
