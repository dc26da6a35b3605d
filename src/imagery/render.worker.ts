/// <reference lib="webworker" />
// The render worker: decodes compressed tiles (with their size capped to what the file
// declares), does the band math (composite, index, pan-sharpening) and the stretch, and
// returns finished RGBA tiles as ImageBitmaps, so the UI thread only draws.
import { composeTile, cutTiles, decodeBlocks, readWindow, reduceTile, sampleWindow } from './composeTile.ts';
import type { RenderRequest } from './renderJobs.ts';
import type { WorkerReply } from './WorkerPool.ts';

export type { EncodedTile, RenderRequest, RenderResult } from './renderJobs.ts';

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = async (event: MessageEvent<{ id: number; request: RenderRequest }>) => {
  const { id, request } = event.data;
  try {
    let result: unknown;
    let transfer: Transferable[] = [];
    await decodeBlocks(request);
    if (request.kind === 'sample') {
      const sample = sampleWindow(request);
      result = sample;
      transfer = [sample.sorted.buffer];
    } else if (request.kind === 'window') {
      const bands = readWindow(request);
      result = bands;
      transfer = bands.map((b) => b.buffer);
    } else if (request.kind === 'cut') {
      const tiles = cutTiles(request);
      result = tiles;
      transfer = tiles;
    } else if (request.kind === 'reduce') {
      const tile = reduceTile(request);
      result = tile;
      transfer = [tile];
    } else {
      const { rgba, width, height } = composeTile(request);
      const bitmap = await createImageBitmap(new ImageData(rgba, width, height));
      result = bitmap;
      transfer = [bitmap];
    }
    scope.postMessage({ id, ok: true, result } satisfies WorkerReply, transfer);
  } catch (error) {
    scope.postMessage({ id, ok: false, error: (error as Error).message } satisfies WorkerReply);
  }
};
