import { readRosterCsv, readRosterJson } from '../../core/imports/index.ts';
import { rosterProblems, type RosterEntry } from '../../core/site/index.ts';
import { readText } from '../../platform/read-whole.ts';
import type { FileRef, Platform } from '../../platform/types.ts';

// The roster a new site starts with: none (only the reserved classes mixed, unknown and
// not vegetation, which every roster has), a roster file of the user's (CSV or JSON), or
// a copy of the demo's as a starting point to edit.

const ROSTER_FILE_LIMIT = 4 * 1024 * 1024;

/** Reads a picked roster file; refusals name the file and the rows at fault. */
export async function rosterFromFile(platform: Platform, file: FileRef): Promise<RosterEntry[]> {
  const text = await readText(platform, file, { maxBytes: ROSTER_FILE_LIMIT });
  return /\.json$/i.test(file.name) ? readRosterJson(file.name, text) : readRosterCsv(file.name, text);
}

/** A copy of the demo's roster. */
export async function demoRoster(platform: Platform): Promise<RosterEntry[]> {
  const file = await platform.openDemoFile('roster.json');
  const doc = JSON.parse(await readText(platform, file, { maxBytes: ROSTER_FILE_LIMIT })) as { species?: RosterEntry[] };
  const entries = (doc.species ?? []).map((e) => ({ code: e.code, scientificName: e.scientificName, commonName: e.commonName, group: e.group, colour: e.colour, key: e.key }));
  if (entries.length === 0 || rosterProblems(entries).length) throw new Error('roster.json: the demo roster cannot be read; start with an empty roster or a file of your own');
  return entries;
}
