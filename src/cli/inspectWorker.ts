// Runs in a worker thread: inspects one file by ranges and test-decodes some of its
// blocks. The parent thread's watchdog ends it if it takes too long.
import { parentPort, workerData } from 'node:worker_threads';
import { blockLayout } from '../core/tiff/blocks.ts';
import { decodeTile } from '../core/tiff/decodeTile.ts';
import { TiffError } from '../core/tiff/errors.ts';
import { inspectTiff, type TiffLimits, type TiffSummary } from '../core/tiff/inspectTiff.ts';
import type { ReadRange } from '../core/tiff/byteSource.ts';
import { openFileRange } from './readFileRange.ts';
import { InputError } from './errors.ts';

export interface InspectJob {
  path: string;
  limits?: TiffLimits;
  /** 'first': the first block of each band at each level; 'all': every block. */
  check: 'none' | 'first' | 'all';
}

export type InspectReply =
  | { ok: true; summary: TiffSummary; checkedBlocks: number }
  | { ok: false; code: string; message: string };

/** Decodes blocks of every level; throws the decoder's TiffError on the first bad one. */
export async function checkBlocks(read: ReadRange, summary: TiffSummary, mode: 'first' | 'all'): Promise<number> {
  let checked = 0;
  for (let l = 0; l < summary.levels.length; l++) {
    const level = summary.levels[l];
    const perBand = level.blocksAcross * level.blocksDown;
    const bandsToCheck = summary.planar === 2 ? summary.bands : 1;
    for (let band = 0; band < bandsToCheck; band++) {
      const count = mode === 'all' ? perBand : 1;
      for (let k = 0; k < count; k++) {
        const index = band * perBand + k;
        const length = level.byteCounts[index];
        if (length === 0) continue; // sparse: no data written, read as no-data
        const bytes = await read(level.offsets[index], length);
        decodeTile(bytes, blockLayout(summary, l, index));
        checked++;
      }
    }
  }
  return checked;
}

async function run(job: InspectJob): Promise<InspectReply> {
  try {
    const file = await openFileRange(job.path);
    try {
      const summary = await inspectTiff(file.read, file.size, job.path, job.limits);
      const checkedBlocks = job.check !== 'none' && summary.decodable ? await checkBlocks(file.read, summary, job.check) : 0;
      return { ok: true, summary, checkedBlocks };
    } finally {
      await file.close();
    }
  } catch (error) {
    if (error instanceof TiffError) return { ok: false, code: error.code, message: error.message };
    if (error instanceof InputError) return { ok: false, code: 'input', message: error.message };
    return { ok: false, code: 'internal', message: `${job.path}: ${(error as Error)?.message ?? String(error)}` };
  }
}

if (parentPort && workerData?.fellfieldInspect) {
  const port = parentPort;
  void run(workerData.fellfieldInspect as InspectJob).then((reply) => port.postMessage(reply));
}
