import { writeGeoTiff } from '../src/core/tiff/writeGeoTiff.ts';

/**
 * A small scene of a site of the user's own: a panchromatic GeoTIFF `size` pixels square
 * and a 4-band multiband one at a quarter of its resolution, over the same ground.
 */
export function sceneFiles(size: number, epsg: number, origin: [number, number], pixel: number, seed: number): { pan: Buffer; ms: Buffer } {
  const pan = new Uint16Array(size * size);
  for (let i = 0; i < pan.length; i++) {
    const x = i % size, y = Math.floor(i / size);
    pan[i] = 400 + Math.round(250 * Math.sin((x + seed) / 37) * Math.cos(y / 23)) + ((x * 7 + y * 3) % 40);
  }
  const m = size / 4;
  const bands = [0, 1, 2, 3].map((b) => {
    const band = new Uint16Array(m * m);
    for (let i = 0; i < band.length; i++) band[i] = 300 + b * 120 + Math.round(200 * Math.sin(((i % m) + b * 9) / 11) * Math.cos(Math.floor(i / m) / 7));
    return band;
  });
  return {
    pan: Buffer.from(writeGeoTiff({ width: size, height: size, sampleType: 'uint16', bands: [pan], epsg, origin, pixelSize: [pixel, pixel] })),
    ms: Buffer.from(writeGeoTiff({ width: m, height: m, sampleType: 'uint16', bands, epsg, origin, pixelSize: [pixel * 4, pixel * 4], bandNames: ['blue', 'green', 'red', 'nir'], bandWavelengthsNm: [480, 545, 660, 830] })),
  };
}
