import type { RosterEntry } from '../core/site/types.ts';
import type { Raster } from '../imagery/Raster.ts';
import type { BandEntry as BandInfo } from '../core/bandTable.ts';
import type { SiteStore } from '../store/SiteStore.ts';
import type { DiskCopySession } from './site/diskCopySession.ts';

// The site in hand, as the screens see it.

export type { RosterEntry } from '../core/site/types.ts';

export type { BandEntry as BandInfo } from '../core/bandTable.ts';

/** One acquisition: its panchromatic and multispectral rasters (each date is stretched by its own samples, on the desk). */
export interface SceneView {
  date: string;
  pan: { raster: Raster } | null;
  ms: {
    raster: Raster;
    bands: BandInfo[];
    /** Natural colour: the red, green and blue bands (0-based). */
    naturalColour: { bands: [number, number, number] };
  } | null;
}

export interface FieldPolygons {
  type: 'FeatureCollection';
  features: { type: 'Feature'; id?: string | number; geometry: unknown; properties: Record<string, unknown> }[];
}

export interface OpenSite {
  name: string;
  /**
   * The CRS of the map, or null for pixel space: a scene whose CRS cannot be placed on
   * a map (none, user-defined, or a code Fellfield cannot project) shown in pixels of
   * its first raster, view-only.
   */
  epsg: number | null;
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

/** A site whose imagery sits on a map (not pixel space): what a stored site is made from. */
export type MappedSite = OpenSite & { epsg: number };
