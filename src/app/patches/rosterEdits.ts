import type { SiteStore } from '../../store/SiteStore.ts';
import { rosterProblems, type LedgerEvent, type RosterEntry, type SiteState } from '../../core/site/index.ts';
import { readRosterCsv, readRosterJson, writeRosterCsv, writeRosterJson } from '../../core/imports/index.ts';
import type { Platform } from '../../platform/types.ts';

// The roster of a stored site: edited on the desk, read from and written to CSV or JSON.
// A roster is refused whole, with every problem by row: duplicate codes or keys, a key
// the desk already uses, or a code some patch is still tagged with that the new roster drops.

export class RosterRefused extends Error {
  constructor(readonly problems: string[]) {
    super(problems.length === 1 ? `The roster was not saved: ${problems[0]}` : `The roster was not saved: ${problems.length} problems:\n- ${problems.join('\n- ')}`);
    this.name = 'RosterRefused';
  }
}

/** Every reason a roster cannot replace the site's, as plain sentences; [] when it can. */
export function rosterRefusals(state: SiteState, entries: readonly RosterEntry[], deskKeys: ReadonlySet<string>): string[] {
  const problems = rosterProblems(entries).map((p) => `row ${p.row}: ${p.problem}`);
  entries.forEach((entry, i) => {
    const key = entry.key.toLowerCase();
    if (key && deskKeys.has(key)) problems.push(`row ${i + 1}: key '${entry.key}' already does something else on the desk (see the keys page)`);
    if (entry.colour && !/^#[0-9a-f]{6}$/i.test(entry.colour)) problems.push(`row ${i + 1}: colour '${entry.colour}' is not of the form #RRGGBB`);
  });
  const kept = new Set(entries.map((e) => e.code.trim()));
  const inUse = new Map<string, number>();
  for (const tag of state.tags.values()) {
    if (state.roster.some((e) => e.code === tag.species) && !kept.has(tag.species)) inUse.set(tag.species, (inUse.get(tag.species) ?? 0) + 1);
  }
  for (const [code, count] of inUse) problems.push(`code '${code}' is dropped but ${count} tag(s) still use it; retag those patches first`);
  return problems;
}

/** Replaces the roster (one undoable event); resolves to null when nothing changed. */
export function setRoster(store: SiteStore, entries: RosterEntry[], deskKeys: ReadonlySet<string>, who: { interpreter: string; time: string }): Promise<LedgerEvent | null> {
  const clean = entries.map((e) => ({ ...e, code: e.code.trim(), key: e.key.trim() }));
  return store.commitWith((state) => {
    const problems = rosterRefusals(state, clean, deskKeys);
    if (problems.length) throw new RosterRefused(problems);
    if (JSON.stringify(state.roster) === JSON.stringify(clean)) return null;
    return { kind: 'roster.set', payload: { entries: clean, previous: [...state.roster] }, actor: who.interpreter, time: who.time };
  });
}

/** Asks for a roster file (CSV or JSON) and reads it; null when the user cancels. */
export async function pickRosterFile(platform: Platform): Promise<RosterEntry[] | null> {
  const [file] = await platform.pickFiles({ title: 'Import a roster (CSV or JSON)', extensions: ['csv', 'json'] });
  if (!file) return null;
  const text = new TextDecoder().decode(await platform.readRange(file, 0, file.size));
  return file.name.toLowerCase().endsWith('.json') ? readRosterJson(file.name, text) : readRosterCsv(file.name, text);
}

/** Offers the roster as a file; false when the user cancels. */
export function saveRosterFile(platform: Platform, siteName: string, entries: readonly RosterEntry[], format: 'csv' | 'json'): Promise<boolean> {
  const base = `${siteName.replace(/[^\w-]+/g, '-').replace(/^-|-$/g, '') || 'site'}-roster`;
  return platform.saveFile(`${base}.${format}`, format === 'csv' ? writeRosterCsv(entries) : writeRosterJson(entries));
}
