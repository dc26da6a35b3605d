import { sealEvent } from '../ledger/chain.ts';
import { sha256Hex } from '../ledger/sha256.ts';
import { buildImport } from '../imports/buildImport.ts';
import { proposeMapping } from '../imports/speciesMapping.ts';
import { readFieldFile } from '../imports/readFieldFile.ts';
import { applyEvent } from './applyEvent.ts';
import type { EventDraft, LedgerEvent } from './events.ts';
import { siteFileOf, writeSiteFile } from './siteFile.ts';
import { emptySiteState } from './state.ts';
import type { RosterEntry, SceneRef } from './types.ts';

// The demo as a site file, for `npm run demo:data` and `fellfield export`: the same
// ledger a user would make by creating the site, adding its scenes and roster, and
// importing the field polygons with their species attribute. Deterministic: every id
// and time comes from the input.

export interface DemoSiteInput {
  siteId: string;
  name: string;
  /** the scene CRS (metres) */
  epsg: number;
  /** ISO 8601 UTC, used for every event */
  time: string;
  interpreter: string;
  scenes: SceneRef[];
  roster: RosterEntry[];
  /** the field polygons file as written, e.g. field.geojson */
  fieldFile: { name: string; bytes: Uint8Array; speciesAttribute: string };
}

export async function siteFileFromDemo(input: DemoSiteInput): Promise<string> {
  let state = emptySiteState();
  const ledger: LedgerEvent[] = [];
  const add = async (draft: Omit<EventDraft, 'actor' | 'time'>) => {
    const event = await sealEvent({ ...draft, actor: input.interpreter, time: input.time } as EventDraft, state.head);
    state = applyEvent(state, event);
    ledger.push(event);
  };
  const passId = `${input.siteId}-pass-field`;
  await add({ kind: 'site.created', payload: { site: { id: input.siteId, name: input.name, epsg: input.epsg, createdAt: input.time } } });
  for (const scene of input.scenes) await add({ kind: 'scene.added', payload: { scene } });
  await add({ kind: 'roster.set', payload: { entries: input.roster, previous: [] } });
  await add({ kind: 'pass.started', payload: { pass: { id: passId, interpreter: input.interpreter, blind: false, startedAt: input.time, endedAt: null, patchIds: null } } });
  const { name, bytes, speciesAttribute } = input.fieldFile;
  const { file, original } = readFieldFile(name, bytes, { siteEpsg: input.epsg });
  const mapping = proposeMapping(file.features, speciesAttribute, input.roster);
  const payload = buildImport(file, {
    importId: `${input.siteId}-field`, fileName: name, sha256: await sha256Hex(bytes), sourceCrs: original.crs,
    mapping, leaveUnmappedUntagged: true, passId, interpreter: input.interpreter, time: input.time, confidence: 'likely',
    display: { composite: 'field survey', stretch: '', date: '' },
  });
  await add({ kind: 'import.added', payload });
  return writeSiteFile(siteFileOf(state, ledger));
}
