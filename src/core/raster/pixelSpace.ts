import { ensureEpsg } from '../crs.ts';
import type { TiffSummary } from '../tiff/inspectTiff.ts';

// Pixel space: how a scene is shown when its CRS cannot be placed on a map. Coordinates
// are pixels of one reference raster, x to the right from its left edge and y up from
// its bottom edge (as a map draws them), so its row r lies at y = height - r. Another
// raster of the scene is placed by its geotransform relative to the reference's, which
// needs both to carry one in the same CRS (an affine geotransform: x = x0 + col * px,
// y = y0 - row * py, as GDAL's raster data model writes it).

type Georeference = Pick<TiffSummary, 'fileName' | 'georeferenced' | 'epsg' | 'crsName' | 'width' | 'height' | 'origin' | 'pixelSize'>;

/** Why a raster cannot be placed on a map (said in one line after its file name), or null when it can. */
export function unplacedReason(summary: Georeference): string | null {
  if (!summary.georeferenced) return 'has no georeferencing (no tiepoint and pixel scale, nor a transformation)';
  if (summary.epsg === null) {
    return `its CRS has no EPSG code (user-defined${summary.crsName ? `: "${summary.crsName}"` : ''}), so it cannot be projected`;
  }
  if (ensureEpsg(summary.epsg) === null) return `its CRS EPSG:${summary.epsg} is not one Fellfield can project yet`;
  return null;
}

export interface PixelPlacement {
  origin: [number, number];
  pixelSize: [number, number];
  extent: [number, number, number, number];
}

/** The reference raster in its own pixels: origin [0, height], pixels of 1. */
export function referencePlacement(reference: Pick<TiffSummary, 'width' | 'height'>): PixelPlacement {
  return { origin: [0, reference.height], pixelSize: [1, 1], extent: [0, 0, reference.width, reference.height] };
}

/**
 * Where `raster` lies in pixels of `reference`, or null when it cannot be placed there
 * (either lacks a geotransform, or their CRSs differ).
 */
export function placementIn(reference: Georeference, raster: Georeference): PixelPlacement | null {
  if (!reference.georeferenced || !raster.georeferenced) return null;
  const sameCrs = reference.epsg === raster.epsg && (reference.epsg !== null || reference.crsName === raster.crsName);
  if (!sameCrs) return null;
  const [rx, ry] = reference.pixelSize;
  const pixelSize: [number, number] = [raster.pixelSize[0] / rx, raster.pixelSize[1] / ry];
  const origin: [number, number] = [
    (raster.origin[0] - reference.origin[0]) / rx,
    reference.height + (raster.origin[1] - reference.origin[1]) / ry,
  ];
  return {
    origin, pixelSize,
    extent: [origin[0], origin[1] - raster.height * pixelSize[1], origin[0] + raster.width * pixelSize[0], origin[1]],
  };
}
