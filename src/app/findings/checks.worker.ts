/// <reference lib="webworker" />
// Runs the checks of the open site away from the UI thread. Patches arrive in batches
// (so no one message is long to copy on the page), then one load; findings go back in
// batches too. Raster bytes for the no-data pixels are asked of the page, which alone
// reaches the platform bridge. Later edits come as upserts and removals; their findings
// come back as what changed.
import type { CheckDelta } from '../../core/checks/CheckSession.ts';
import type { Finding } from '../../core/checks/findings.ts';
import { CheckHost, type CheckProgress, type CheckScene, type TrackedPatch } from './checkHost.ts';
import { unpackPatches, type PatchBatch } from './patchBatch.ts';

export type ChecksMessage =
  | { kind: 'add'; batch: PatchBatch }
  | { kind: 'load'; id: number; scene: CheckScene }
  | { kind: 'apply'; id: number; upserts: TrackedPatch[]; removals: string[] }
  | { kind: 'bytes'; request: number; bytes?: ArrayBuffer; error?: string };

export type ChecksReply =
  | { kind: 'progress'; id: number; progress: CheckProgress }
  | { kind: 'findings'; id: number; findings: Finding[] }
  | { kind: 'loaded'; id: number }
  | { kind: 'applied'; id: number; delta: CheckDelta }
  | { kind: 'failed'; id: number; message: string }
  | { kind: 'read'; request: number; raster: number; offset: number; length: number };

/** Findings per message on the way back. */
export const FINDINGS_BATCH = 500;

const scope = self as unknown as DedicatedWorkerGlobalScope;
const waiting = new Map<number, { resolve: (b: Uint8Array) => void; reject: (e: Error) => void }>();
let nextRequest = 1;
let pending: TrackedPatch[] = [];
// Messages are handled one at a time, in order: an edit never overtakes the load.
let queue: Promise<unknown> = Promise.resolve();

const host = new CheckHost((raster, offset, length) => {
  const request = nextRequest++;
  return new Promise((resolve, reject) => {
    waiting.set(request, { resolve, reject });
    scope.postMessage({ kind: 'read', request, raster, offset, length } satisfies ChecksReply);
  });
});

const post = (reply: ChecksReply) => scope.postMessage(reply);

async function handle(message: Exclude<ChecksMessage, { kind: 'bytes' | 'add' }>): Promise<void> {
  try {
    if (message.kind === 'load') {
      const patches = pending;
      pending = [];
      const findings = await host.load(patches, message.scene, (progress) => post({ kind: 'progress', id: message.id, progress }));
      for (let i = 0; i < findings.length; i += FINDINGS_BATCH) post({ kind: 'findings', id: message.id, findings: findings.slice(i, i + FINDINGS_BATCH) });
      post({ kind: 'loaded', id: message.id });
      // The page has the findings; the first edit will not wait for the index.
      host.prepareEdits();
    } else {
      post({ kind: 'applied', id: message.id, delta: await host.apply(message.upserts, message.removals) });
    }
  } catch (error) {
    post({ kind: 'failed', id: message.id, message: (error as Error).message });
  }
}

scope.onmessage = (event: MessageEvent<ChecksMessage>) => {
  const message = event.data;
  if (message.kind === 'bytes') {
    const entry = waiting.get(message.request);
    waiting.delete(message.request);
    if (message.bytes) entry?.resolve(new Uint8Array(message.bytes));
    else entry?.reject(new Error(message.error ?? 'the raster could not be read'));
  } else if (message.kind === 'add') {
    pending.push(...unpackPatches(message.batch));
  } else {
    queue = queue.then(() => handle(message));
  }
};
