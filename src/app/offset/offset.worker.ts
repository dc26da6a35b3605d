/// <reference lib="webworker" />
// Runs the shift search away from the UI thread: one job per message, progress
// messages while it runs, then the estimate or the error's message.
import { runOffsetJob, type OffsetJob, type OffsetProgress } from './offsetJob.ts';
import type { OffsetEstimate } from '../../core/offset/index.ts';

export type OffsetWorkerReply =
  | { kind: 'progress'; id: number; progress: OffsetProgress }
  | { kind: 'done'; id: number; estimate: OffsetEstimate }
  | { kind: 'failed'; id: number; message: string };

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (event: MessageEvent<{ id: number; job: OffsetJob }>) => {
  const { id, job } = event.data;
  try {
    const estimate = runOffsetJob(job, (progress) => scope.postMessage({ kind: 'progress', id, progress } satisfies OffsetWorkerReply));
    scope.postMessage({ kind: 'done', id, estimate } satisfies OffsetWorkerReply);
  } catch (error) {
    scope.postMessage({ kind: 'failed', id, message: (error as Error).message } satisfies OffsetWorkerReply);
  }
};
