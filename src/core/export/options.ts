import type { RasterGrid } from '../geometry/rasterGrid.ts';
import type { PixelRule } from '../pixels/rule.ts';
import type { Scheme } from '../training/scheme.ts';

// What an export carries out of the site, chosen by the user.

/** Which calls give a patch its species. */
export type ExportSelection =
  /** The settled species of each patch (tags and rulings); the training set. */
  | { kind: 'consensus' }
  /** Every patch, every tag of every pass, the consensus beside them. */
  | { kind: 'all-passes' }
  /** One pass's calls only: the patches it tagged and only its tags. */
  | { kind: 'pass'; passId: string };

export interface ExportFoldOptions {
  /** default 5 */
  k?: number;
  /** block side in metres, default 50 */
  blockSize?: number;
  /** default 1 */
  seed?: number;
}

export interface ExportOptions {
  selection: ExportSelection;
  /** Classes for the species; none: each species its own class. */
  scheme?: Scheme | null;
  /** Spatial folds to assign; none: no fold column values. */
  folds?: ExportFoldOptions | null;
  /** The multispectral grid and the rule for the pure-pixel count; none: counts are null. */
  pixels?: { grid: RasterGrid; rule: PixelRule } | null;
  /**
   * Patches with an open disagreement: refuse the export ('refuse', the default, so none
   * slips into a training set unseen), leave them out, or include them without a species.
   */
  open?: 'refuse' | 'leave-out' | 'include';
}

/** Decimal places of exported longitude and latitude: 1e-8 degree is about a millimetre. */
export const GEOJSON_DECIMALS = 8;

/** The plain form of the options that an export records, so it can be made again. */
export function recordedOptions(options: ExportOptions): Record<string, unknown> {
  return {
    selection: options.selection,
    scheme: options.scheme ?? null,
    folds: options.folds ? { k: options.folds.k ?? 5, blockSize: options.folds.blockSize ?? 50, seed: options.folds.seed ?? 1 } : null,
    pixels: options.pixels ?? null,
    open: options.open ?? 'refuse',
  };
}
