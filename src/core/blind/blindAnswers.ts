import { canonicalJson } from '../ledger/canonicalJson.ts';
import { sha256Hex } from '../ledger/sha256.ts';
import { CONFIDENCES, tagKey, type Confidence, type DisplaySettings, type SiteState, type Tag } from '../site/index.ts';
import { isBlindCall } from './answers.ts';
import { BlindError } from './BlindError.ts';
import { contentHashOf, packageContentOf, type BlindPackage } from './blindPackage.ts';
import { isObject, textProblem } from './shapeChecks.ts';

// The answers file: the calls an interpreter made on a blind package, on their machine,
// to be imported into the site the package came from. It names its package by id and
// content hash; importing checks both against what the site would send now, so answers
// for another package, or for patches changed since, are refused whole.

export const BLIND_ANSWERS_FORMAT = 'fellfield-blind-answers';
export const BLIND_ANSWERS_VERSION = 1;

export interface BlindAnswer {
  patchId: string;
  species: string;
  confidence: Confidence;
  note: string;
  time: string;
  display: DisplaySettings;
}

export interface BlindAnswers {
  format: typeof BLIND_ANSWERS_FORMAT;
  version: number;
  packageId: string;
  contentHash: string;
  passId: string;
  interpreter: string;
  answeredAt: string;
  answers: BlindAnswer[];
  /** SHA-256 of the canonical JSON of every other member */
  hash: string;
}

async function fileHash(doc: Omit<BlindAnswers, 'hash'> | BlindAnswers): Promise<string> {
  const { hash: _hash, ...rest } = doc as BlindAnswers;
  return sha256Hex(canonicalJson(rest));
}

/** The answers file of a package from the calls made on it (tags of its pass). */
export async function buildBlindAnswers(pkg: BlindPackage, tags: readonly Tag[], answeredAt: string): Promise<BlindAnswers> {
  const order = new Map(pkg.patches.map((p, i) => [p.id, i] as const));
  const answers = tags
    .filter((t) => t.passId === pkg.pass.id && order.has(t.patchId))
    .sort((a, b) => order.get(a.patchId)! - order.get(b.patchId)!)
    .map((t) => ({ patchId: t.patchId, species: t.species, confidence: t.confidence, note: t.note, time: t.time, display: t.display }));
  const unsealed: Omit<BlindAnswers, 'hash'> = {
    format: BLIND_ANSWERS_FORMAT,
    version: BLIND_ANSWERS_VERSION,
    packageId: pkg.packageId,
    contentHash: pkg.contentHash,
    passId: pkg.pass.id,
    interpreter: pkg.pass.interpreter,
    answeredAt,
    answers,
  };
  return { ...unsealed, hash: await fileHash(unsealed) };
}

export function writeBlindAnswers(answers: BlindAnswers): string {
  return `${JSON.stringify(answers, null, 1)}\n`;
}

/** Reads an answers file and checks its own shape and hash (not yet against a site). */
export async function readBlindAnswers(fileName: string, text: string): Promise<BlindAnswers> {
  const fail = (problem: string): never => {
    throw new BlindError(problem, fileName);
  };
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (error) {
    return fail(`not valid JSON (${(error as Error).message}); the file may be cut short`);
  }
  if (!isObject(doc) || doc.format !== BLIND_ANSWERS_FORMAT) {
    return fail(isObject(doc) && doc.format === 'fellfield-blind-package'
      ? 'this is the blind package itself, not the answers made on it'
      : 'not a Fellfield answers file');
  }
  if (!Number.isInteger(doc.version) || (doc.version as number) < 1) fail(`the answers version ${JSON.stringify(doc.version)} is not a version number`);
  if ((doc.version as number) > BLIND_ANSWERS_VERSION) fail(`it was made by a newer Fellfield (answers version ${String(doc.version)}; this one reads up to ${BLIND_ANSWERS_VERSION})`);
  for (const key of ['packageId', 'contentHash', 'passId', 'interpreter', 'answeredAt', 'hash'] as const) {
    const problem = textProblem(doc[key], key);
    if (problem) fail(problem);
  }
  if (!Array.isArray(doc.answers)) fail('its list of answers is missing');
  for (const [i, a] of (doc.answers as unknown[]).entries()) {
    if (!isObject(a) || typeof a.patchId !== 'string' || !a.patchId) fail(`answer ${i + 1} names no patch`);
    const answer = a as Record<string, unknown>;
    if (typeof answer.species !== 'string' || !answer.species) fail(`the answer on patch ${String(answer.patchId)} has no species`);
    if (!CONFIDENCES.includes(answer.confidence as Confidence)) fail(`the answer on patch ${String(answer.patchId)} has confidence ${JSON.stringify(answer.confidence)}, not one of ${CONFIDENCES.join(', ')}`);
    if (typeof answer.note !== 'string' || typeof answer.time !== 'string' || !isObject(answer.display)) fail(`the answer on patch ${String(answer.patchId)} lacks its note, time or display`);
  }
  const answers = doc as unknown as BlindAnswers;
  if ((await fileHash(answers)) !== answers.hash) fail('its hash does not match its content: the file was changed after it was written');
  return answers;
}

export interface AnswersFit {
  /** the tags to record in the pass, in package order */
  tags: Tag[];
  /** patches of the package left without an answer */
  unanswered: string[];
}

const list = (ids: readonly string[]) => `${ids.slice(0, 5).join(', ')}${ids.length > 5 ? ` and ${ids.length - 5} more` : ''}`;

/**
 * Checks that answers belong to a pass of this site exactly as the site would send it
 * now, and that the pass has not been answered yet. Refuses (throws) on the first
 * problem; on success returns the tags to record, so nothing is merged half-way.
 */
export async function fitAnswers(state: SiteState, answers: BlindAnswers, fileName: string): Promise<AnswersFit> {
  const fail = (problem: string): never => {
    throw new BlindError(problem, fileName);
  };
  const pass = state.passes.get(answers.passId);
  if (!pass || !pass.blind) return fail(`the answers are for pass ${answers.passId}, which this site does not hold: they belong to another site or package`);
  if (pass.interpreter !== answers.interpreter) fail(`the answers are signed by ${answers.interpreter}, but pass ${pass.id} was given to ${pass.interpreter}`);
  const content = packageContentOf(state, pass.id);
  const contentHash = await contentHashOf(content);
  if (answers.packageId !== `pkg-${contentHash.slice(0, 16)}` || answers.contentHash !== contentHash) {
    if (answers.packageId !== `pkg-${answers.contentHash.slice(0, 16)}`) fail('its package id does not match the hash it names');
    fail(`the answers are for package ${answers.packageId}, but pass ${pass.id} would go out now as pkg-${contentHash.slice(0, 16)}: `
      + 'the answers belong to another package, or its patches, scenes or roster changed since it was sent');
  }
  const answered = [...state.tags.values()].filter((t) => t.passId === pass.id);
  if (answered.length > 0) fail(`pass ${pass.id} already holds ${answered.length} answer${answered.length === 1 ? '' : 's'}: a package is answered once, so these are not merged`);
  if (pass.endedAt !== null) fail(`pass ${pass.id} was ended on ${pass.endedAt}: a package is answered once, so these are not merged`);

  const inPackage = new Set(content.patches.map((p) => p.id));
  const strangers = answers.answers.map((a) => a.patchId).filter((id) => !inPackage.has(id));
  if (strangers.length) fail(`it answers patch${strangers.length === 1 ? '' : 'es'} ${list(strangers)}, which the package does not hold`);
  const seen = new Set<string>();
  const twice = answers.answers.map((a) => a.patchId).filter((id) => (seen.has(id) ? true : (seen.add(id), false)));
  if (twice.length) fail(`it answers patch${twice.length === 1 ? '' : 'es'} ${list([...new Set(twice)])} more than once`);
  const badCall = answers.answers.find((a) => !isBlindCall(state.roster, a.species));
  if (badCall) fail(`the answer on patch ${badCall.patchId} is "${badCall.species}", which is neither a roster code nor one of ${content.answers.join(', ')}`);

  const tags: Tag[] = answers.answers.map((a) => ({
    patchId: a.patchId, passId: pass.id, species: a.species, confidence: a.confidence, note: a.note,
    interpreter: pass.interpreter, time: a.time, display: a.display,
  }));
  for (const t of tags) if (state.tags.has(tagKey(t.patchId, t.passId))) fail(`patch ${t.patchId} already has a call in pass ${pass.id}`);
  return { tags, unanswered: content.patches.map((p) => p.id).filter((id) => !seen.has(id)) };
}
