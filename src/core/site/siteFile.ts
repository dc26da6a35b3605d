import { canonicalJson } from '../ledger/canonicalJson.ts';
import { verifyChain } from '../ledger/chain.ts';
import { replay } from './applyEvent.ts';
import { EVENT_KINDS, type LedgerEvent } from './events.ts';
import { emptySiteState, type SiteState } from './state.ts';
import type {
  ImportRecord, Pass, Patch, ReferenceFeature, RosterEntry, Ruling, SceneRef, Site, Tag,
} from './types.ts';
import type { Scheme } from '../training/scheme.ts';

// The site file: a whole site in one JSON document, for backup, restore on another
// machine, the copy on disk and `fellfield export`. Not the imagery: scenes are named by
// their files' SHA-256.
//
//   {
//     "format": "fellfield-site",
//     "version": 2,                 // SITE_FILE_VERSION; a reader refuses a newer one
//     "site": Site, "scenes": SceneRef[], "roster": RosterEntry[], "schemes": Scheme[],
//     "patches": Patch[], "tags": Tag[], "passes": Pass[], "rulings": Ruling[],
//     "references": ReferenceFeature[], "imports": ImportRecord[],
//     "history": { "undo": seq[], "redo": seq[] },
//     "head": { "seq": n, "hash": hex },   // the last ledger event
//     "ledger": LedgerEvent[]              // every change, hash-chained (see core/ledger)
//   }
//
// The current-state members are there for readers that do not replay; a reader that
// restores checks them: the ledger must verify and replay to exactly those members.
// Version 2 added the event kinds of one-step cuts and joins, pass pauses, interpreter
// switches and stored schemes, and the "schemes" member (read as [] from version 1).

export const SITE_FILE_FORMAT = 'fellfield-site';
export const SITE_FILE_VERSION = 2;

export interface SiteFile {
  format: typeof SITE_FILE_FORMAT;
  version: number;
  site: Site;
  scenes: SceneRef[];
  roster: RosterEntry[];
  schemes: Scheme[];
  patches: Patch[];
  tags: Tag[];
  passes: Pass[];
  rulings: Ruling[];
  references: ReferenceFeature[];
  imports: ImportRecord[];
  history: SiteState['history'];
  head: SiteState['head'];
  ledger: LedgerEvent[];
}

/** A site file that cannot be restored: names the file and the problem. */
export class SiteFileError extends Error {
  constructor(readonly fileName: string, readonly problem: string) {
    super(`${fileName}: ${problem}`);
    this.name = 'SiteFileError';
  }
}

export function siteFileOf(state: SiteState, ledger: LedgerEvent[]): SiteFile {
  if (!state.site) throw new Error('siteFileOf: the state has no site');
  const byId = <T>(map: ReadonlyMap<string, T>) => [...map.keys()].sort().map((k) => map.get(k)!);
  return {
    format: SITE_FILE_FORMAT,
    version: SITE_FILE_VERSION,
    site: state.site,
    scenes: byId(state.scenes),
    roster: [...state.roster],
    schemes: [...state.schemes],
    patches: byId(state.patches),
    tags: byId(state.tags),
    passes: byId(state.passes),
    rulings: byId(state.rulings),
    references: byId(state.references),
    imports: byId(state.imports),
    history: state.history,
    head: state.head,
    ledger,
  };
}

/** The site file as text: one line per ledger event keeps large files diffable and fast to write. */
export function writeSiteFile(file: SiteFile): string {
  const { ledger, ...rest } = file;
  const head = JSON.stringify(rest);
  return `${head.slice(0, -1)},"ledger":[\n${ledger.map((e) => JSON.stringify(e)).join(',\n')}\n]}\n`;
}

/**
 * Reads and checks a site file: its format and version, the ledger chain, and that the
 * ledger replays to the state the file carries. Returns the replayed state and ledger.
 */
export async function readSiteFile(fileName: string, text: string): Promise<{ state: SiteState; ledger: LedgerEvent[] }> {
  let doc: Partial<SiteFile> & Record<string, unknown>;
  try {
    doc = JSON.parse(text);
  } catch (error) {
    throw new SiteFileError(fileName, `not valid JSON (${(error as Error).message}); the file may be cut short`);
  }
  if (!doc || typeof doc !== 'object' || doc.format !== SITE_FILE_FORMAT) {
    throw new SiteFileError(fileName, 'not a Fellfield site file');
  }
  if (typeof doc.version !== 'number' || !Number.isInteger(doc.version) || doc.version < 1) {
    throw new SiteFileError(fileName, `the site file version ${JSON.stringify(doc.version)} is not a version number`);
  }
  if (doc.version > SITE_FILE_VERSION) {
    throw new SiteFileError(fileName, `it was written by a newer Fellfield (site file version ${doc.version}; this one reads up to ${SITE_FILE_VERSION}); update Fellfield to restore it`);
  }
  if (!Array.isArray(doc.ledger) || doc.ledger.length === 0) throw new SiteFileError(fileName, 'it has no ledger');
  const ledger = doc.ledger as LedgerEvent[];
  const known = new Set<string>(EVENT_KINDS);
  const strange = ledger.find((e) => !known.has(e?.kind));
  if (strange) throw new SiteFileError(fileName, `ledger event ${String(strange?.seq)} is of an unknown kind "${String(strange?.kind)}"`);
  const check = await verifyChain(ledger);
  if (!check.ok) throw new SiteFileError(fileName, `the ledger does not verify: ${check.problem}; the file was changed or damaged, so it is not restored`);
  let state: SiteState;
  try {
    state = replay(emptySiteState(), ledger);
  } catch (error) {
    throw new SiteFileError(fileName, `the ledger cannot be replayed (${(error as Error).message})`);
  }
  const expected = siteFileOf(state, ledger);
  if (doc.version === 1) doc.schemes = []; // version 1 had no stored schemes
  for (const member of ['site', 'scenes', 'roster', 'schemes', 'patches', 'tags', 'passes', 'rulings', 'references', 'imports', 'history', 'head'] as const) {
    if (canonicalJson(doc[member] ?? null) !== canonicalJson(expected[member])) {
      throw new SiteFileError(fileName, `its "${member}" do not match its ledger; the file was changed or damaged, so it is not restored`);
    }
  }
  return { state, ledger };
}
