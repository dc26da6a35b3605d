// A worker thread for imagery.decode: decodes the tiles it is given with the render
// worker's decoder, as many rounds as asked, and says how long it took.
import { parentPort } from 'node:worker_threads';
import { decodeTile, type TileLayout } from '../../src/core/tiff/decodeTile.ts';

parentPort!.on('message', (message: { tiles: { bytes: Uint8Array; layout: TileLayout }[]; rounds: number }) => {
  const start = performance.now();
  let checksum = 0;
  for (let r = 0; r < message.rounds; r++) {
    for (const tile of message.tiles) checksum += decodeTile(tile.bytes, tile.layout)[0];
  }
  parentPort!.postMessage({ ms: performance.now() - start, checksum });
});
