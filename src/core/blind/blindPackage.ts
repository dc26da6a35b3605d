import { canonicalJson } from '../ledger/canonicalJson.ts';
import { sha256Hex } from '../ledger/sha256.ts';
import type { MultiPolygonRings } from '../geometry/types.ts';
import type { RosterEntry, SceneRef, SiteState } from '../site/index.ts';
import { BLIND_ANSWERS } from './answers.ts';
import { BlindError } from './BlindError.ts';
import { isDelineationPass } from './blindView.ts';
import { geometryProblem, isObject, textProblem } from './shapeChecks.ts';

// The blind package: one file that carries a blind pass to an interpreter on another
// machine. It holds what the second look needs and nothing of the first: the outlines
// (ids and geometry, in the pass's shuffled order), the scenes by name, size and
// SHA-256 (the imagery itself travels apart), the roster, and the pass. No tag, no
// confidence, no note, no file attribute.
//
// Two hashes: `contentHash` identifies the package by what it asks (pass, outlines,
// scenes, roster); both machines can recompute it from their site, so answers prove
// which package they answer. `hash` covers every member of the file, so a changed
// byte is noticed before anything is read from it.

export const BLIND_PACKAGE_FORMAT = 'fellfield-blind-package';
export const BLIND_PACKAGE_VERSION = 1;

export interface PackagePatch {
  id: string;
  geometry: MultiPolygonRings;
}

/** What a package asks, and all its identity depends on. */
export interface PackageContent {
  epsg: number;
  pass: { id: string; interpreter: string };
  /** in the order the pass walks them */
  patches: PackagePatch[];
  scenes: SceneRef[];
  roster: RosterEntry[];
  /** the calls beside the roster species */
  answers: string[];
}

export interface BlindPackage extends PackageContent {
  format: typeof BLIND_PACKAGE_FORMAT;
  version: number;
  /** 'pkg-' and the first 16 hex digits of contentHash */
  packageId: string;
  contentHash: string;
  /** where it came from, for people: not part of its identity */
  origin: { siteId: string; siteName: string; createdAt: string; createdBy: string };
  /** SHA-256 of the canonical JSON of every other member */
  hash: string;
}

/** The content of the package of a blind pass, as the site holds it now. */
export function packageContentOf(state: SiteState, passId: string): PackageContent {
  const pass = state.passes.get(passId);
  if (!pass) throw new BlindError(`There is no pass ${passId} in this site.`);
  if (!pass.blind) throw new BlindError(`Pass ${passId} is not blind: only a blind pass goes out as a package.`);
  if (isDelineationPass(pass)) throw new BlindError(`Pass ${passId} is an independent delineation: it is drawn on this machine, not sent out.`);
  const ids = pass.patchIds ?? [];
  const patches = ids.map((id) => {
    const patch = state.patches.get(id);
    if (!patch) throw new BlindError(`Patch ${id} of pass ${passId} is no longer in the site.`);
    return { id, geometry: patch.geometry };
  });
  const scenes = [...state.scenes.values()].sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  return {
    epsg: state.site?.epsg ?? 0,
    pass: { id: pass.id, interpreter: pass.interpreter },
    patches,
    scenes,
    roster: [...state.roster],
    answers: [...BLIND_ANSWERS],
  };
}

export async function contentHashOf(content: PackageContent): Promise<string> {
  const { epsg, pass, patches, scenes, roster, answers } = content;
  return sha256Hex(canonicalJson({ epsg, pass, patches, scenes, roster, answers }));
}

async function fileHash(doc: Omit<BlindPackage, 'hash'> | BlindPackage): Promise<string> {
  const { hash: _hash, ...rest } = doc as BlindPackage;
  return sha256Hex(canonicalJson(rest));
}

export async function buildBlindPackage(state: SiteState, passId: string, made: { time: string; by: string }): Promise<BlindPackage> {
  const content = packageContentOf(state, passId);
  const contentHash = await contentHashOf(content);
  const unsealed: Omit<BlindPackage, 'hash'> = {
    format: BLIND_PACKAGE_FORMAT,
    version: BLIND_PACKAGE_VERSION,
    packageId: `pkg-${contentHash.slice(0, 16)}`,
    contentHash,
    origin: { siteId: state.site?.id ?? '', siteName: state.site?.name ?? '', createdAt: made.time, createdBy: made.by },
    ...content,
  };
  return { ...unsealed, hash: await fileHash(unsealed) };
}

export function writeBlindPackage(pkg: BlindPackage): string {
  return `${JSON.stringify(pkg, null, 1)}\n`;
}

const PATCH_KEYS = new Set(['id', 'geometry']);

/** Reads and checks a package file: format, version, shape, both hashes. */
export async function readBlindPackage(fileName: string, text: string): Promise<BlindPackage> {
  const fail = (problem: string): never => {
    throw new BlindError(problem, fileName);
  };
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (error) {
    return fail(`not valid JSON (${(error as Error).message}); the file may be cut short`);
  }
  if (!isObject(doc) || doc.format !== BLIND_PACKAGE_FORMAT) {
    return fail(doc && isObject(doc) && doc.format === 'fellfield-blind-answers'
      ? 'this is an answers file, not a blind package; import it with "Import answers"'
      : 'not a Fellfield blind package');
  }
  if (!Number.isInteger(doc.version) || (doc.version as number) < 1) fail(`the package version ${JSON.stringify(doc.version)} is not a version number`);
  if ((doc.version as number) > BLIND_PACKAGE_VERSION) fail(`it was made by a newer Fellfield (package version ${String(doc.version)}; this one reads up to ${BLIND_PACKAGE_VERSION})`);
  for (const key of ['packageId', 'contentHash', 'hash'] as const) {
    const problem = textProblem(doc[key], key);
    if (problem) fail(problem);
  }
  if (!Number.isInteger(doc.epsg)) fail('its CRS (epsg) is missing');
  if (!isObject(doc.pass) || textProblem(doc.pass.id, 'the pass id') || textProblem(doc.pass.interpreter, 'the interpreter')) fail('its pass is missing or has no id and interpreter');
  if (!isObject(doc.origin)) fail('its origin is missing');
  if (!Array.isArray(doc.scenes)) fail('its scene list is missing');
  if (!Array.isArray(doc.roster)) fail('its roster is missing');
  if (!Array.isArray(doc.answers)) fail('its list of answers beside the species is missing');
  if (!Array.isArray(doc.patches) || doc.patches.length === 0) fail('it holds no patches');
  const seen = new Set<string>();
  for (const [i, patch] of (doc.patches as unknown[]).entries()) {
    if (!isObject(patch) || typeof patch.id !== 'string' || !patch.id) fail(`patch ${i + 1} has no id`);
    const p = patch as Record<string, unknown>;
    if (seen.has(p.id as string)) fail(`patch ${String(p.id)} is listed twice`);
    seen.add(p.id as string);
    const extra = Object.keys(p).filter((k) => !PATCH_KEYS.has(k));
    if (extra.length) fail(`patch ${String(p.id)} carries ${extra.join(', ')}: a blind package holds outlines only, no calls`);
    const problem = geometryProblem(p.geometry, `patch ${String(p.id)}`);
    if (problem) fail(problem);
  }
  const pkg = doc as unknown as BlindPackage;
  if ((await fileHash(pkg)) !== pkg.hash) fail('its hash does not match its content: the file was changed after it was made');
  const content = await contentHashOf(pkg);
  if (content !== pkg.contentHash || pkg.packageId !== `pkg-${content.slice(0, 16)}`) fail('its package id does not match its content');
  return pkg;
}
