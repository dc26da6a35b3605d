import { writeGeoTiff } from '../src/core/tiff/writeGeoTiff.ts';

/** A one-band striped GeoTIFF without overviews, `size` pixels square: a file that needs a pyramid cache. */
export function stripedPan(size: number): Buffer {
  const band = new Uint16Array(size * size);
  for (let i = 0; i < band.length; i++) {
    const x = i % size, y = Math.floor(i / size);
    band[i] = 300 + Math.round(200 * Math.sin(x / 40) * Math.cos(y / 25)) + ((x * 7 + y * 3) % 50);
  }
  return Buffer.from(writeGeoTiff({
    width: size, height: size, sampleType: 'uint16', bands: [band], epsg: 32633, origin: [500000, 5000000],
    pixelSize: [0.5, 0.5], compression: 'lzw', stripped: true, overviewFactors: [],
  }));
}
