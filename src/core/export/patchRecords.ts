import { runChecks } from '../checks/runChecks.ts';
import type { MultiPolygonRings } from '../geometry/types.ts';
import { countPixels } from '../pixels/pixelCounts.ts';
import { describeRule } from '../pixels/rule.ts';
import type { LedgerEvent } from '../site/events.ts';
import type { SiteState } from '../site/state.ts';
import type { Patch, Ruling, Tag } from '../site/types.ts';
import { assignFolds, HELD_OUT } from '../training/folds.ts';
import { applyScheme } from '../training/scheme.ts';
import { consensus, type Consensus } from './consensus.ts';
import { ExportError } from './ExportError.ts';
import type { ExportOptions } from './options.ts';
import { patchHistory, type PatchHistory } from './patchHistory.ts';

// Each exported patch with its provenance: the calls, the rulings, where its outline
// came from and what was done to it, the scenes it was read on, what the checks still
// say about it, its pure pixels and its fold. Plain data, in a fixed member order, so
// the writers give the same bytes for the same site.

export interface ExportedTag {
  pass: string; interpreter: string; species: string; confidence: string; note: string; time: string;
  display: { composite: string; stretch: string; date: string };
}

export interface ExportedRuling {
  id: string; decision: string; species: string | null; passes: string[]; by: string; time: string; reason: string;
  reopened: { by: string; time: string; reason: string } | null;
}

export type ExportedSource =
  | { kind: 'drawn'; by: string; time: string }
  | { kind: 'import'; file: string; sha256: string; format: string; feature: number; attributes: Record<string, unknown>; by: string; time: string };

export type ExportedTransformation =
  | { kind: 'reprojection'; from: string; to: string }
  | { kind: 'shift'; dx: number; dy: number; by: string; time: string; ledger_seq: number; undo: boolean; uncertainty_m?: number; method?: string }
  | { kind: 'edit'; by: string; time: string; ledger_seq: number; undo: boolean; how?: 'cut' | 'join' };

export interface ExportedPatch {
  id: string;
  species: string | null;
  class: string | null;
  consensus: { status: Consensus['status']; species: string | null; ruling: string | null; reason: string };
  fold: number | null;
  pure_pixels: number | null;
  pixel_rule: string | null;
  tags: ExportedTag[];
  rulings: ExportedRuling[];
  source: ExportedSource;
  transformations: ExportedTransformation[];
  scenes: { id: string; date: string; files: { role: string; name: string; sha256: string }[] }[];
  findings: { kind: string; severity: string; message: string }[];
  /** Site CRS, metres: not a property, the writers place it. */
  geometry: MultiPolygonRings;
}

export interface RecordSet {
  patches: ExportedPatch[];
  /** Patches left out, by reason, with their ids. */
  leftOut: { reason: string; ids: string[] }[];
  messages: string[];
}

/** Ids in natural order (F2 before F10), then plain order: stable across runs and machines. */
export function compareNatural(a: string, b: string): number {
  const pa = a.split(/(\d+)/), pb = b.split(/(\d+)/);
  for (let i = 0; i < Math.min(pa.length, pb.length); i++) {
    if (pa[i] === pb[i]) continue;
    if (i % 2 === 1) {
      const d = Number(pa[i]) - Number(pb[i]);
      if (d !== 0) return d;
    }
    return pa[i] < pb[i] ? -1 : 1;
  }
  return pa.length - pb.length || (a < b ? -1 : a > b ? 1 : 0);
}

/** Sorts ids as compareNatural does, splitting each id once rather than at every comparison. */
export function sortedNatural(ids: string[]): string[] {
  const keyed = ids.map((id) => ({ id, parts: id.split(/(\d+)/) }));
  keyed.sort((x, y) => {
    const pa = x.parts, pb = y.parts;
    for (let i = 0; i < Math.min(pa.length, pb.length); i++) {
      if (pa[i] === pb[i]) continue;
      if (i % 2 === 1) {
        const d = Number(pa[i]) - Number(pb[i]);
        if (d !== 0) return d;
      }
      return pa[i] < pb[i] ? -1 : 1;
    }
    return pa.length - pb.length || (x.id < y.id ? -1 : x.id > y.id ? 1 : 0);
  });
  return keyed.map((k) => k.id);
}

function groupBy<T>(items: Iterable<T>, key: (item: T) => string): Map<string, T[]> {
  const out = new Map<string, T[]>();
  for (const item of items) {
    const k = key(item);
    const list = out.get(k);
    if (list) list.push(item);
    else out.set(k, [item]);
  }
  return out;
}

const byTime = <T extends { time: string }>(a: T, b: T) => (a.time < b.time ? -1 : a.time > b.time ? 1 : 0);

function exportedTag(t: Tag): ExportedTag {
  return {
    pass: t.passId, interpreter: t.interpreter, species: t.species, confidence: t.confidence, note: t.note, time: t.time,
    display: { composite: t.display.composite, stretch: t.display.stretch, date: t.display.date },
  };
}

function exportedRuling(r: Ruling): ExportedRuling {
  const d = r.decision;
  return {
    id: r.id,
    decision: d.kind === 'accept' ? `accept pass ${d.passId}` : d.kind,
    species: d.kind === 'species' ? d.species : d.kind === 'mixed' ? 'mixed' : null,
    passes: [...r.passIds], by: r.by, time: r.time, reason: r.reason,
    reopened: r.reopened ? { ...r.reopened } : null,
  };
}

function sourceOf(patch: Patch, state: SiteState): ExportedSource {
  if (patch.source.kind === 'drawn') return { kind: 'drawn', by: patch.createdBy, time: patch.createdAt };
  const record = state.imports.get(patch.source.importId);
  return {
    kind: 'import', file: record?.fileName ?? '(import record missing)', sha256: record?.sha256 ?? '', format: record?.format ?? '',
    feature: patch.source.featureIndex, attributes: patch.source.attributes, by: record?.by ?? patch.createdBy, time: record?.time ?? patch.createdAt,
  };
}

function transformationsOf(patch: Patch, state: SiteState, history: PatchHistory, siteCrs: string): ExportedTransformation[] {
  const out: ExportedTransformation[] = [];
  if (patch.source.kind === 'import') {
    const record = state.imports.get(patch.source.importId) as { sourceCrs?: string; sourceEpsg?: number } | undefined;
    const from = record?.sourceCrs ?? (record?.sourceEpsg ? `EPSG:${record.sourceEpsg}` : null);
    if (from && from !== siteCrs) out.push({ kind: 'reprojection', from, to: siteCrs });
  }
  for (const c of history.changes.get(patch.id) ?? []) {
    out.push(c.kind === 'shift'
      ? {
          kind: 'shift', dx: c.dx, dy: c.dy, by: c.by, time: c.time, ledger_seq: c.seq, undo: c.undo,
          ...(c.uncertaintyM !== undefined ? { uncertainty_m: c.uncertaintyM, method: c.method } : {}),
        }
      : { kind: 'edit', by: c.by, time: c.time, ledger_seq: c.seq, undo: c.undo, ...(c.how ? { how: c.how } : {}) });
  }
  return out;
}

/** The exported patches of a site state under the options, in natural id order. */
export function patchRecords(state: SiteState, events: readonly LedgerEvent[], options: ExportOptions): RecordSet {
  const selection = options.selection;
  if (selection.kind === 'pass' && !state.passes.has(selection.passId)) {
    throw new ExportError(`the site has no pass "${selection.passId}" (passes: ${[...state.passes.keys()].join(', ') || 'none'})`);
  }
  // A blind pass hides everyone's calls while it runs (exports included), and the history
  // that travels with every export holds them all: so no export until it ends.
  const running = [...state.passes.values()].filter((p) => p.blind && p.endedAt === null).map((p) => p.id);
  if (running.length) {
    throw new ExportError(`blind pass ${running.join(', ')} is still running: end it before exporting, since an export shows every interpreter's calls`);
  }
  const siteCrs = `EPSG:${state.site?.epsg}`;
  const tagsOf = groupBy(state.tags.values(), (t) => t.patchId);
  const rulingsOf = groupBy(state.rulings.values(), (r) => r.patchId);
  const history = patchHistory(events);
  const scenes = [...state.scenes.values()].sort((a, b) => compareNatural(a.id, b.id)).map((s) => ({
    id: s.id, date: s.date, files: s.files.map((f) => ({ role: f.role, name: f.name, sha256: f.sha256 })),
  }));
  const ids = sortedNatural([...state.patches.keys()]);
  const leftOut = new Map<string, string[]>();
  const leave = (reason: string, id: string) => (leftOut.get(reason) ?? leftOut.set(reason, []).get(reason)!).push(id);
  const open = options.open ?? 'refuse';
  const chosen: { patch: Patch; tags: Tag[]; rulings: Ruling[]; agreed: Consensus; species: string | null }[] = [];
  for (const id of ids) {
    const patch = state.patches.get(id)!;
    const allTags = (tagsOf.get(id) ?? []).sort((a, b) => byTime(a, b) || compareNatural(a.passId, b.passId));
    const rulings = (rulingsOf.get(id) ?? []).sort((a, b) => byTime(a, b) || compareNatural(a.id, b.id));
    const agreed = consensus(allTags, rulings);
    if (selection.kind === 'pass') {
      const own = allTags.filter((t) => t.passId === selection.passId);
      if (own.length === 0) { leave(`not tagged in pass ${selection.passId}`, id); continue; }
      chosen.push({ patch, tags: own, rulings, agreed, species: own[0].species });
      continue;
    }
    if (selection.kind === 'consensus') {
      if (agreed.status === 'untagged') { leave('untagged', id); continue; }
      if (agreed.status === 'excluded') { leave('excluded by a ruling', id); continue; }
      if (agreed.status === 'open' && open !== 'include') { leave('open disagreement', id); continue; }
    }
    chosen.push({ patch, tags: allTags, rulings, agreed, species: agreed.species });
  }
  const openIds = leftOut.get('open disagreement') ?? [];
  if (open === 'refuse' && openIds.length > 0) {
    const shown = openIds.slice(0, 5).join(', ') + (openIds.length > 5 ? `, … (${openIds.length - 5} more)` : '');
    throw new ExportError(`${openIds.length} patch(es) have an open disagreement (${shown}): settle them with rulings first, or choose to leave them out or include them without a species`);
  }

  const messages: string[] = [];
  const species = chosen.map((c) => c.species);
  const scheme = options.scheme ?? null;
  let classes: (string | null)[] = species;
  if (scheme) {
    const applied = applyScheme(scheme, species.map((s) => s ?? ''));
    classes = applied.classes.map((c, i) => (species[i] === null ? null : c));
    messages.push(...applied.messages.filter((_, i) => applied.unmapped[i] !== ''));
  }

  let folds: Int32Array | null = null;
  if (options.folds) {
    folds = assignFolds(chosen.map((c, i) => ({ id: c.patch.id, cls: classes[i] ?? '(none)', rings: c.patch.geometry })), options.folds).fold;
  }

  let pure: (number | null)[] = chosen.map(() => null);
  let ruleText: string | null = null;
  if (options.pixels) {
    const report = countPixels(chosen.map((c, i) => ({ id: c.patch.id, species: classes[i] ?? '', rings: c.patch.geometry })), options.pixels.grid, options.pixels.rule);
    pure = report.patches.map((p) => p.pure);
    ruleText = describeRule(options.pixels.rule);
  }

  // The checks see every patch of the site, since a neighbour left out still overlaps.
  const speciesOfAll = new Map(chosen.map((c) => [c.patch.id, c.species ?? '']));
  const report = runChecks(ids.map((id) => ({ id, species: speciesOfAll.get(id) ?? '', rings: state.patches.get(id)!.geometry })),
    options.pixels ? { scene: { ms: options.pixels.grid } } : {});
  const findingsOf = new Map<string, { kind: string; severity: string; message: string }[]>();
  for (const f of report.findings) {
    for (const pid of f.patches) {
      const key = String(pid);
      (findingsOf.get(key) ?? findingsOf.set(key, []).get(key)!).push({ kind: f.kind, severity: f.severity, message: f.message });
    }
  }

  const patches = chosen.map((c, i): ExportedPatch => ({
    id: c.patch.id,
    species: c.species,
    class: classes[i],
    consensus: { status: c.agreed.status, species: c.agreed.species, ruling: c.agreed.rulingId, reason: c.agreed.reason },
    fold: folds ? (folds[i] === HELD_OUT ? -1 : folds[i] < 0 ? null : folds[i]) : null,
    pure_pixels: pure[i],
    pixel_rule: ruleText,
    tags: c.tags.map(exportedTag),
    rulings: selection.kind === 'pass' ? [] : c.rulings.map(exportedRuling),
    source: sourceOf(c.patch, state),
    transformations: transformationsOf(c.patch, state, history, siteCrs),
    scenes,
    findings: findingsOf.get(c.patch.id) ?? [],
    geometry: c.patch.geometry,
  }));
  return { patches, leftOut: [...leftOut].map(([reason, list]) => ({ reason, ids: list })), messages };
}
