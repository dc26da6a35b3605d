import { readRosterCsv, readRosterJson, writeRosterCsv, writeRosterJson } from '../../core/imports/index.ts';
import { rosterProblems, type RosterEntry } from '../../core/site/index.ts';
import type { SiteContext } from './context.ts';

/** Replaces the roster (an edit or a file's entries); refuses duplicate codes or keys. */
export async function setRoster(ctx: SiteContext, entries: RosterEntry[]): Promise<void> {
  const problems = rosterProblems(entries);
  if (problems.length) throw new Error(`the roster has problems: ${problems.map((p) => `row ${p.row}: ${p.problem}`).join('; ')}`);
  await ctx.store.commitWith((state) => ({ kind: 'roster.set', payload: { entries, previous: [...state.roster] }, actor: ctx.interpreter, time: ctx.now() }));
}

/** Reads a roster file (.csv or .json) and makes it the site's roster. */
export async function importRoster(ctx: SiteContext, fileName: string, text: string): Promise<RosterEntry[]> {
  const entries = /\.json$/i.test(fileName) ? readRosterJson(fileName, text) : readRosterCsv(fileName, text);
  await setRoster(ctx, entries);
  return entries;
}

export function exportRoster(ctx: SiteContext, format: 'csv' | 'json'): string {
  return format === 'csv' ? writeRosterCsv(ctx.store.state.roster) : writeRosterJson(ctx.store.state.roster);
}
