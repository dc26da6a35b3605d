// The GeoTIFF module's public surface.
export { writeGeoTiff, type WriteGeoTiffOptions, type SampleType, type BandArray } from './writeGeoTiff.ts';
export {
  inspectTiff, requireGeoreference, defaultLimits,
  type TiffSummary, type TiffLevel, type TiffLimits, type ReadRange,
} from './inspectTiff.ts';
export { decodeTile, decodeTileAsync, type TileLayout } from './decodeTile.ts';
export { blockIndex, blockLayout, blockPosition } from './blocks.ts';
export { TiffError, isTiffError, type TiffErrorCode } from './errors.ts';
export type { Dtype, SampleArray } from './tags.ts';
