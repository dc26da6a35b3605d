import { countByKind, type Finding, type FindingKind } from './findings.ts';
import { CheckSession, type CheckSessionOptions } from './CheckSession.ts';
import type { PatchInput } from './preparedPatch.ts';

export interface CheckReport {
  findings: Finding[];
  counts: Record<FindingKind, number>;
}

/** All checks over a set of patches at once (a fresh CheckSession, loaded and read). */
export function runChecks(patches: Iterable<PatchInput>, options: CheckSessionOptions = {}): CheckReport {
  const session = new CheckSession(options);
  session.load(patches);
  const findings = session.findings();
  return { findings, counts: countByKind(findings) };
}
