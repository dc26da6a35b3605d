import { blindView } from '../../core/blind/index.ts';
import { runChecks } from '../../core/checks/runChecks.ts';
import type { Finding } from '../../core/checks/findings.ts';
import { consensus, disagreementQueue, type QueueItem } from '../../core/rulings/index.ts';
import type { Ruling, SiteState, Tag } from '../../core/site/index.ts';

// The queue as the person ruling sees it: the site through the blind view (open blind
// passes stay hidden, so their calls never reach the rulings page early), with the
// checks run over the patches so that open mixed-species findings join the queue and
// every patch in hand can show its findings.

export interface RulingsQueue {
  view: SiteState;
  items: QueueItem[];
  findings: Finding[];
}

export function rulingsQueue(state: SiteState, interpreter: string): RulingsQueue {
  const view = blindView(state, interpreter);
  const tagsOf = new Map<string, Tag[]>();
  for (const t of view.tags.values()) tagsOf.set(t.patchId, [...(tagsOf.get(t.patchId) ?? []), t]);
  const rulingsOf = new Map<string, Ruling[]>();
  for (const r of view.rulings.values()) rulingsOf.set(r.patchId, [...(rulingsOf.get(r.patchId) ?? []), r]);
  const inputs = [...view.patches.values()].map((p) => {
    const tags = tagsOf.get(p.id) ?? [];
    const settled = consensus(tags, rulingsOf.get(p.id) ?? []).species;
    // The calls are left out of the check: differing calls are already a queue kind of
    // their own, so only a patch called or ruled mixed, or overlapping another species, is a finding.
    return { id: p.id, species: settled ?? tags[0]?.species ?? '', rings: p.geometry };
  });
  const findings = runChecks(inputs).findings;
  return { view, items: disagreementQueue({ state: view, findings }), findings };
}
