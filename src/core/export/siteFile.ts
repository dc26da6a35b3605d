import { verifyChain } from '../ledger/chain.ts';
import { emptySiteState, replay, SiteRuleError, type LedgerEvent, type SiteState } from '../site/index.ts';
import { ExportError } from './ExportError.ts';
import { readSiteFile as readBackupFile, SITE_FILE_FORMAT as BACKUP_FORMAT, SiteFileError } from '../site/siteFile.ts';

// The site file: a whole site as one JSON document, the hash-chained ledger with its
// head. The current state is not stored beside it, because replaying the ledger gives it
// and a stored copy could only disagree. One event per line keeps the file diffable.
// The app's backup (core/site/siteFile.ts) carries the same ledger with the current state
// beside it; this reader takes both layouts, so an export's history restores as a site
// and `fellfield export` reads a backup.

export const SITE_FILE_KIND = 'fellfield site';
export const SITE_FILE_VERSION = 1;

export interface SiteFile {
  kind: typeof SITE_FILE_KIND;
  version: number;
  head: { seq: number; hash: string };
  ledger: LedgerEvent[];
}

/** The site file's text for a ledger (ledger order, fixed layout: same ledger, same bytes). */
export function siteFileText(events: readonly LedgerEvent[]): string {
  const last = events[events.length - 1];
  const head = { seq: last?.seq ?? 0, hash: last?.hash ?? '0'.repeat(64) };
  const lines = events.map((e) => `    ${JSON.stringify(e)}`);
  return `{\n  "kind": ${JSON.stringify(SITE_FILE_KIND)},\n  "version": ${SITE_FILE_VERSION},\n  "head": ${JSON.stringify(head)},\n  "ledger": [\n${lines.join(',\n')}\n  ]\n}\n`;
}

export interface OpenedSite {
  state: SiteState;
  events: LedgerEvent[];
}

/** Reads a site file: checks its form, verifies the whole chain and its head, replays it. */
export async function readSiteFile(text: string, fileName: string): Promise<OpenedSite> {
  let doc: Partial<SiteFile>;
  try {
    doc = JSON.parse(text) as Partial<SiteFile>;
  } catch (error) {
    throw new ExportError(`is not a JSON document (${(error as Error).message})`, fileName);
  }
  // A backup saved by the app (the store's site file) carries the same ledger with the
  // current state beside it; its own reader checks both, so the two layouts read alike.
  if (doc && typeof doc === 'object' && (doc as { format?: unknown }).format === BACKUP_FORMAT) {
    try {
      const backup = await readBackupFile(fileName, text);
      return { state: backup.state, events: backup.ledger };
    } catch (error) {
      if (error instanceof SiteFileError) throw new ExportError(error.problem, fileName);
      throw error;
    }
  }
  if (!doc || typeof doc !== 'object' || doc.kind !== SITE_FILE_KIND) {
    throw new ExportError('is not a Fellfield site file (neither a backup saved by the app nor the history written beside an export)', fileName);
  }
  if (typeof doc.version !== 'number' || doc.version > SITE_FILE_VERSION) {
    throw new ExportError(`is a site file of version ${String(doc.version)}; this version reads up to ${SITE_FILE_VERSION}`, fileName);
  }
  if (!Array.isArray(doc.ledger) || doc.ledger.length === 0) throw new ExportError('holds no ledger events', fileName);
  const events = doc.ledger;
  const check = await verifyChain(events);
  if (!check.ok) throw new ExportError(`the history does not verify: ${check.problem}`, fileName);
  if (!doc.head || doc.head.hash !== check.head || doc.head.seq !== check.length) {
    throw new ExportError(`the stated head of the history (${String(doc.head?.hash).slice(0, 12)}…) is not the head of its ledger (${check.head.slice(0, 12)}…)`, fileName);
  }
  let state: SiteState;
  try {
    state = replay(emptySiteState(), events);
  } catch (error) {
    if (error instanceof SiteRuleError) throw new ExportError(`the history cannot be replayed: ${error.message}`, fileName);
    throw error;
  }
  return { state, events };
}
