import type { RosterEntry } from '../core/site/types.ts';
import type { Raster } from '../imagery/Raster.ts';
import type { StretchLimits } from '../core/render/stretch.ts';
import type { BandEntry as BandInfo } from '../core/bandTable.ts';
import type { SiteStore } from '../store/SiteStore.ts';
import type { DiskCopySession } from './site/diskCopySession.ts';

// The site in hand, as the screens see it.

export type { RosterEntry } from '../core/site/types.ts';

export type { BandEntry as BandInfo } from '../core/bandTable.ts';

/** One acquisition: its panchromatic and multispectral rasters and their default stretch. */
export interface SceneView {
  date: string;
  pan: { raster: Raster; limits: StretchLimits } | null;
  ms: {
    raster: Raster;
    bands: BandInfo[];
    /** Natural colour: the red, green and blue bands (0-based) and their stretch. */
    naturalColour: { bands: [number, number, number]; limits: [StretchLimits, StretchLimits, StretchLimits] };
  } | null;
}

export interface FieldPolygons {
  type: 'FeatureCollection';
  features: { type: 'Feature'; id?: string | number; geometry: unknown; properties: Record<string, unknown> }[];
}

export interface OpenSite {
  name: string;
  epsg: number;
  crsName: string;
  extent: [number, number, number, number];
  scenes: SceneView[];
  roster: RosterEntry[];
  fieldPolygons: FieldPolygons;
  /** Things the user should know that did not stop the site opening (a band table that does not fit, a raster left out). */
  notes?: string[];
  /** Plain facts about how the site opened that are no problem (how its imagery was checked). */
  facts?: string[];
  /** The stored site (patches, tags, ledger) when the imagery belongs to one. */
  store?: SiteStore;
  /** The copy of the stored site on disk, kept while it is open (see app/site/diskCopySession.ts). */
  diskCopy?: DiskCopySession;
  dispose(): void;
}
