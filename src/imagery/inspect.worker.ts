/// <reference lib="webworker" />
// Parses an untrusted TIFF header away from the UI thread. Bytes are asked of the page
// (only it can reach the platform bridge); the page terminates this worker if it runs
// too long, since a starved event loop fires no timers of its own.
import { inspectTiff } from '../core/tiff/inspectTiff.ts';

export type InspectMessage =
  | { kind: 'inspect'; fileName: string; fileSize: number }
  | { kind: 'bytes'; request: number; bytes?: ArrayBuffer; error?: string };

export type InspectReply =
  | { kind: 'read'; request: number; offset: number; length: number }
  | { kind: 'done'; summary: unknown }
  | { kind: 'failed'; message: string; code?: string };

const scope = self as unknown as DedicatedWorkerGlobalScope;
const waiting = new Map<number, { resolve: (b: Uint8Array) => void; reject: (e: Error) => void }>();
let nextRequest = 1;

function read(offset: number, length: number): Promise<Uint8Array> {
  const request = nextRequest++;
  return new Promise((resolve, reject) => {
    waiting.set(request, { resolve, reject });
    scope.postMessage({ kind: 'read', request, offset, length } satisfies InspectReply);
  });
}

scope.onmessage = async (event: MessageEvent<InspectMessage>) => {
  const message = event.data;
  if (message.kind === 'bytes') {
    const entry = waiting.get(message.request);
    waiting.delete(message.request);
    if (!entry) return;
    if (message.bytes) entry.resolve(new Uint8Array(message.bytes));
    else entry.reject(new Error(message.error ?? 'the file could not be read'));
    return;
  }
  try {
    const summary = await inspectTiff(read, message.fileSize, message.fileName);
    scope.postMessage({ kind: 'done', summary } satisfies InspectReply);
  } catch (error) {
    const e = error as Error & { code?: string };
    scope.postMessage({ kind: 'failed', message: e.message, code: e.code } satisfies InspectReply);
  }
};
