import Papa from 'papaparse';
import { rosterProblems } from '../site/roster.ts';
import type { RosterEntry } from '../site/types.ts';
import { ImportError } from './ImportError.ts';

// The roster as a file: CSV (RFC 4180, a header row, read and written by papaparse) or
// JSON (an array of entries, or {"roster": [...]}). Column names are ours:
// code, scientific_name, common_name, group, colour, key.

const COLUMNS = ['code', 'scientific_name', 'common_name', 'group', 'colour', 'key'] as const;
const FIELD: Record<(typeof COLUMNS)[number], keyof RosterEntry> = {
  code: 'code', scientific_name: 'scientificName', common_name: 'commonName', group: 'group', colour: 'colour', key: 'key',
};
const ALIASES: Record<string, (typeof COLUMNS)[number]> = {
  color: 'colour', scientificname: 'scientific_name', commonname: 'common_name',
};

function columnOf(header: string): (typeof COLUMNS)[number] | null {
  const h = header.trim().toLowerCase().replace(/[\s-]+/g, '_');
  if ((COLUMNS as readonly string[]).includes(h)) return h as (typeof COLUMNS)[number];
  return ALIASES[h.replace(/_/g, '')] ?? null;
}

function finish(fileName: string, entries: RosterEntry[], rowLabel: (row: number) => string): RosterEntry[] {
  const problems = rosterProblems(entries);
  if (problems.length) throw new ImportError(fileName, problems.map((p) => `${rowLabel(p.row)}: ${p.problem}`));
  return entries;
}

export function readRosterCsv(fileName: string, text: string): RosterEntry[] {
  const parsed = Papa.parse<string[]>(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text, { skipEmptyLines: 'greedy' });
  const fatal = parsed.errors.find((e) => e.type === 'Quotes' || e.type === 'Delimiter');
  if (fatal) throw new ImportError(fileName, [`line ${(fatal.row ?? 0) + 1}: ${fatal.message}`]);
  const [header, ...rows] = parsed.data;
  if (!header) throw new ImportError(fileName, ['the file is empty']);
  const columns = header.map(columnOf);
  if (!columns.includes('code')) throw new ImportError(fileName, [`the header row has no "code" column (found: ${header.join(', ')}); expected ${COLUMNS.join(', ')}`]);
  const entries = rows.map((cells) => {
    const entry: RosterEntry = { code: '', scientificName: '', commonName: '', group: '', colour: '', key: '' };
    columns.forEach((column, i) => {
      if (column) entry[FIELD[column]] = (cells[i] ?? '').trim();
    });
    return entry;
  });
  return finish(fileName, entries, (row) => `line ${row + 1}`);
}

export function readRosterJson(fileName: string, text: string): RosterEntry[] {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (error) {
    throw new ImportError(fileName, [`not valid JSON (${(error as Error).message})`]);
  }
  const list = Array.isArray(doc) ? doc : (doc as { roster?: unknown })?.roster;
  if (!Array.isArray(list)) throw new ImportError(fileName, ['expected an array of roster entries or {"roster": [...]}']);
  const entries = list.map((item, i) => {
    if (!item || typeof item !== 'object') throw new ImportError(fileName, [`entry ${i + 1} is not an object`]);
    const o = item as Record<string, unknown>;
    const text = (k: keyof RosterEntry) => (o[k] === undefined || o[k] === null ? '' : String(o[k]).trim());
    return { code: text('code'), scientificName: text('scientificName'), commonName: text('commonName'), group: text('group'), colour: text('colour'), key: text('key') };
  });
  return finish(fileName, entries, (row) => `entry ${row}`);
}

export function writeRosterCsv(entries: readonly RosterEntry[]): string {
  return `${Papa.unparse({ fields: [...COLUMNS], data: entries.map((e) => COLUMNS.map((c) => e[FIELD[c]])) }, { newline: '\r\n' })}\r\n`;
}

export function writeRosterJson(entries: readonly RosterEntry[]): string {
  return `${JSON.stringify({ roster: entries }, null, 2)}\n`;
}
