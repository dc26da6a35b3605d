import { BlindError } from '../../core/blind/index.ts';
import { RulingError } from '../../core/rulings/index.ts';
import { tagsOfPatch, type Pass } from '../../core/site/index.ts';
import { startBlindPass } from '../blind/blindPasses.ts';
import type { SiteWriter } from '../blind/siteWriter.ts';
import type { RulingActor } from './recordRuling.ts';

// Sending a patch to a third reader: a new blind pass of that one patch for someone who
// has not called it yet. It goes through the blind-pass use case, so the reader sees
// nobody's calls; when the pass ends, its call joins the patch's calls in the queue.

export async function sendToThirdReader(store: SiteWriter, patchId: string, reader: string, actor: RulingActor): Promise<Pass> {
  const who = reader.trim();
  if (!who) throw new RulingError('Name the third reader.', patchId);
  const state = store.state;
  if (!state.patches.has(patchId)) throw new RulingError(`Patch ${patchId} is no longer in the site (deleted meanwhile?).`, patchId);
  const called = tagsOfPatch(state, patchId).map((t) => t.interpreter);
  if (called.includes(who)) throw new RulingError(`${who} has already called patch ${patchId}: a third reader must be someone else.`, patchId);
  try {
    const started = await startBlindPass(store, { kind: 'picked', patchIds: [patchId] }, { interpreter: who, time: actor.time });
    return started.pass;
  } catch (error) {
    if (error instanceof BlindError) throw new RulingError(error.message, patchId);
    throw error;
  }
}
