import { describe, expect, it } from 'vitest';
import { placementIn, referencePlacement, unplacedReason } from '../../../src/core/raster/pixelSpace.ts';

// Pixel space places one raster in pixels of another by their affine geotransforms. The
// geotransform's meaning is GDAL's (GDAL Raster Data Model, "Affine GeoTransform"):
// Xgeo = GT0 + col * GT1 + row * GT2, Ygeo = GT3 + col * GT4 + row * GT5, here with no
// rotation (GT2 = GT4 = 0) and GT5 = -pixel height.

const pan = {
  fileName: 'pan.tif', georeferenced: true, epsg: null, crsName: 'Local grid', width: 1000, height: 800,
  origin: [2000, 9000] as [number, number], pixelSize: [0.5, 0.5] as [number, number],
};
const ms = { ...pan, fileName: 'ms.tif', width: 250, height: 200, origin: [2010, 9020] as [number, number], pixelSize: [2, 2] as [number, number] };

/** GDAL's forward geotransform of a pixel corner. */
const ground = (r: typeof pan, col: number, row: number) => [r.origin[0] + col * r.pixelSize[0], r.origin[1] - row * r.pixelSize[1]];

describe('pixel space', () => {
  it('puts the reference raster at its own pixels, row r at y = height - r', () => {
    expect(referencePlacement(pan)).toEqual({ origin: [0, 800], pixelSize: [1, 1], extent: [0, 0, 1000, 800] });
  });

  it('places a second raster by the geotransforms, so each of its pixel corners lands on the same ground', () => {
    const placed = placementIn(pan, ms)!;
    expect(placed.pixelSize).toEqual([4, 4]);
    expect(placed.origin).toEqual([20, 840]); // 10 m east and 20 m north of the pan corner, in 0.5 m pixels
    expect(placed.extent).toEqual([20, 40, 1020, 840]);
    for (const [col, row] of [[0, 0], [17, 3], [249, 199]]) {
      // The ms pixel corner in pan pixels, then back to the ground through the pan's geotransform.
      const x = placed.origin[0] + col * placed.pixelSize[0];
      const y = placed.origin[1] - row * placed.pixelSize[1];
      expect(ground(pan, x, pan.height - y)).toEqual(ground(ms, col, row));
    }
  });

  it('will not place rasters whose CRSs differ or that lack a geotransform', () => {
    expect(placementIn(pan, { ...ms, crsName: 'Another grid' })).toBeNull();
    expect(placementIn(pan, { ...ms, epsg: 32633 })).toBeNull();
    expect(placementIn(pan, { ...ms, georeferenced: false })).toBeNull();
    expect(placementIn({ ...pan, epsg: 2056 }, { ...ms, epsg: 2056 })).not.toBeNull();
  });

  it('says why a raster cannot be placed on a map', () => {
    expect(unplacedReason({ ...pan, georeferenced: false })).toMatch(/^has no georeferencing/);
    expect(unplacedReason(pan)).toBe('its CRS has no EPSG code (user-defined: "Local grid"), so it cannot be projected');
    // CH1903+ / LV95 is a real EPSG code Fellfield has no definition for.
    expect(unplacedReason({ ...pan, epsg: 2056 })).toBe('its CRS EPSG:2056 is not one Fellfield can project yet');
    expect(unplacedReason({ ...pan, epsg: 32633 })).toBeNull();
    expect(unplacedReason({ ...pan, epsg: 32733 })).toBeNull();
  });
});
