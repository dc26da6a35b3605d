import type { FileRef } from '../platform/types.ts';
import type { RangeReader } from './Raster.ts';
import { abortError } from './WorkerPool.ts';

// Byte-range reads of a file, gathered: the reads asked for in one turn of the event loop
// (a screen's tiles all ask at once) are sorted, and neighbours whose bytes lie close
// together are fetched as one read, then cut apart. A screen of 3-band tiles costs a few
// requests instead of one per block; a block two tiles share is read once.

export interface CoalescingOptions {
  /** Bytes between two reads that are fetched and thrown away to make one read of them. Default 64 KiB. */
  maxGap?: number;
  /** The longest read made of several. Default 16 MiB (the bridge allows 64 MiB). */
  maxSpan?: number;
}

interface Wanted {
  offset: number;
  length: number;
  signal?: AbortSignal;
  resolve: (bytes: Uint8Array) => void;
  reject: (error: unknown) => void;
}

/** A range reader that gathers the reads of each turn into as few reads of `inner` as it can. */
export function coalescingReader(inner: RangeReader, options: CoalescingOptions = {}): RangeReader {
  const maxGap = options.maxGap ?? 64 * 1024;
  const maxSpan = options.maxSpan ?? 16 * 1024 * 1024;
  const waiting = new Map<string, { file: FileRef; wanted: Wanted[] }>();

  function flush(): void {
    const batches = [...waiting.values()];
    waiting.clear();
    for (const { file, wanted } of batches) {
      wanted.sort((a, b) => a.offset - b.offset);
      let group: Wanted[] = [];
      let start = 0, end = 0;
      for (const want of wanted) {
        const wantEnd = want.offset + want.length;
        if (group.length && want.offset - end <= maxGap && Math.max(end, wantEnd) - start <= maxSpan) {
          group.push(want);
          end = Math.max(end, wantEnd);
          continue;
        }
        if (group.length) readGroup(file, group, start, end);
        group = [want];
        start = want.offset;
        end = wantEnd;
      }
      if (group.length) readGroup(file, group, start, end);
    }
  }

  /** One read for the group; each member gets its own copy of its bytes (so it can be transferred). */
  function readGroup(file: FileRef, group: Wanted[], start: number, end: number): void {
    const live = group.filter((w) => !w.signal?.aborted);
    for (const w of group) if (w.signal?.aborted) w.reject(abortError());
    if (live.length === 0) return;
    // The shared read is cancelled only when every read in it has been.
    const abort = new AbortController();
    let open = live.length;
    for (const w of live) {
      w.signal?.addEventListener('abort', () => {
        w.reject(abortError());
        if (--open === 0) abort.abort();
      }, { once: true });
    }
    inner.readRange(file, start, end - start, abort.signal).then(
      (bytes) => {
        for (const w of live) w.resolve(bytes.slice(w.offset - start, w.offset - start + w.length));
      },
      (error) => {
        for (const w of live) w.reject(abort.signal.aborted ? abortError() : error);
      },
    );
  }

  return {
    readRange(file: FileRef, offset: number, length: number, signal?: AbortSignal): Promise<Uint8Array> {
      if (signal?.aborted) return Promise.reject(abortError());
      return new Promise<Uint8Array>((resolve, reject) => {
        if (waiting.size === 0) queueMicrotask(flush);
        let batch = waiting.get(file.id);
        if (!batch) waiting.set(file.id, (batch = { file, wanted: [] }));
        batch.wanted.push({ offset, length, signal, resolve, reject });
      });
    },
  };
}
