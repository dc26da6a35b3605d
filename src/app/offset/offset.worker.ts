/// <reference lib="webworker" />
// Runs the shift search away from the UI thread: one job per message, progress
// messages while it runs, then the estimate or the error's message.
import { runOffsetJob, type OffsetJob, type OffsetJobResult, type OffsetProgress } from './offsetJob.ts';

export type OffsetWorkerReply =
  | { kind: 'progress'; id: number; progress: OffsetProgress }
  | { kind: 'done'; id: number; result: OffsetJobResult }
  | { kind: 'failed'; id: number; message: string };

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (event: MessageEvent<{ id: number; job: OffsetJob }>) => {
  const { id, job } = event.data;
  try {
    const result = runOffsetJob(job, (progress) => scope.postMessage({ kind: 'progress', id, progress } satisfies OffsetWorkerReply));
    scope.postMessage({ kind: 'done', id, result } satisfies OffsetWorkerReply);
  } catch (error) {
    scope.postMessage({ kind: 'failed', id, message: (error as Error).message } satisfies OffsetWorkerReply);
  }
};
