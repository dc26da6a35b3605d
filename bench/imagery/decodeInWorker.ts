// Runs in a Web Worker in headless Chromium for imagery.decode: decodes the tiles it is
// given with the render worker's decoder, as many rounds as asked, and posts each round's
// time in ms.
import { decodeTileAsync, type TileLayout } from '../../src/core/tiff/decodeTile.ts';

const scope = self as unknown as { onmessage: ((event: MessageEvent) => void) | null; postMessage(message: unknown): void };

scope.onmessage = async (event: MessageEvent<{ tiles: { bytes: Uint8Array; layout: TileLayout }[]; rounds: number }>) => {
  const { tiles, rounds } = event.data;
  const times: number[] = [];
  let checksum = 0;
  for (let r = 0; r < rounds; r++) {
    const start = performance.now();
    for (const tile of tiles) checksum += (await decodeTileAsync(tile.bytes, tile.layout))[0];
    times.push(performance.now() - start);
  }
  scope.postMessage({ times, checksum });
};
