import type { RasterGrid } from '../geometry/rasterGrid.ts';
import type { NoDataMask } from './noDataMask.ts';

// Tolerances and thresholds of the checks, each with its default and why.

export interface CheckSettings {
  /**
   * Overlaps up to this area are digitizing noise, not findings. Default: 0.1 of a
   * panchromatic pixel's area (0.1 x 0.3 m x 0.3 m = 0.009 m² with no scene given).
   */
  sliverAreaM2: number;
  /** Two patches with IoU above this are near-duplicates. Default 0.9. */
  nearDuplicateIoU: number;
  /** Fewer pure multispectral pixels than this is undersized (needs the MS grid). Default 1. */
  minPurePixels: number;
  /** Area under this many multispectral pixel areas is undersized. Default 2. */
  minAreaInMsPixels: number;
  /** Multispectral pixel size (m) used for the area rule when no MS grid is given. Default 1.2. */
  msPixelSize: number;
  /** Outlines with more vertices are reported and not checked further, which bounds the
   * time one patch can take (a crown needs hundreds at most). Default 20,000. */
  maxVertices: number;
  /** Species codes that mean "more than one species here". Default ["mixed"]. */
  mixedCodes: string[];
}

/** The scene's grids, from the GeoTIFF headers; either may be missing. */
export interface SceneGrids {
  pan?: RasterGrid;
  ms?: RasterGrid;
  /**
   * Where the scene's rasters hold no data, for the rasters that have a no-data value.
   * The blocks under every checked patch must be read first (see readMasksFor).
   */
  noData?: NoDataMask[];
}

/** Panchromatic pixel size assumed with no scene: 0.3 m, a current very-high-resolution sensor class. */
export const NOMINAL_PAN_PIXEL = 0.3;
/** Share of a panchromatic pixel's area below which an overlap is a sliver. */
export const SLIVER_PIXEL_SHARE = 0.1;

export function defaultSettings(scene: SceneGrids = {}): CheckSettings {
  const pan = scene.pan;
  const panArea = pan ? pan.pixelWidth * pan.pixelHeight : NOMINAL_PAN_PIXEL * NOMINAL_PAN_PIXEL;
  return {
    sliverAreaM2: SLIVER_PIXEL_SHARE * panArea,
    nearDuplicateIoU: 0.9,
    minPurePixels: 1,
    minAreaInMsPixels: 2,
    msPixelSize: scene.ms ? Math.sqrt(scene.ms.pixelWidth * scene.ms.pixelHeight) : 1.2,
    maxVertices: 20_000,
    mixedCodes: ['mixed'],
  };
}

export function resolveSettings(partial: Partial<CheckSettings> = {}, scene: SceneGrids = {}): CheckSettings {
  const settings = { ...defaultSettings(scene) };
  for (const [key, value] of Object.entries(partial)) {
    if (value !== undefined) (settings as unknown as Record<string, unknown>)[key] = value;
  }
  return settings;
}
