import type { MultiPolygonRings, Position } from '../geometry/types.ts';

// The site model: plain, serialisable data. Every value here goes into the ledger
// and the site file as JSON, so no Maps, Dates or class instances.

/** How sure an interpreter is of a call. */
export type Confidence = 'sure' | 'likely' | 'unsure';
export const CONFIDENCES: readonly Confidence[] = ['sure', 'likely', 'unsure'];

/** Classes every roster has beside its species; their codes cannot be used by an entry. */
export const RESERVED_CLASSES = ['mixed', 'unknown', 'not vegetation'] as const;
export type ReservedClass = (typeof RESERVED_CLASSES)[number];

/** One species of the user's list. `key` is the keyboard key that tags with it. */
export interface RosterEntry {
  code: string;
  scientificName: string;
  commonName: string;
  /** e.g. 'conifer', 'broadleaf shrub', 'other' */
  group: string;
  /** CSS colour, e.g. '#0072B2' */
  colour: string;
  /** one key, e.g. '1' or 'p'; '' for none */
  key: string;
}

export interface Site {
  id: string;
  name: string;
  /** The CRS of every patch geometry: the scene's projected CRS (metres). */
  epsg: number;
  /** ISO 8601 UTC */
  createdAt: string;
}

/** One image file of a scene, identified by its content. */
export interface SceneFile {
  role: 'pan' | 'ms' | string;
  name: string;
  size: number;
  /** lower-case hex SHA-256 of the whole file */
  sha256: string;
}

/** A scene as the site refers to it; the imagery itself never enters the store. */
export interface SceneRef {
  id: string;
  /** acquisition date, YYYY-MM-DD */
  date: string;
  epsg: number;
  files: SceneFile[];
}

/** Where a patch outline came from. */
export type PatchSource =
  | { kind: 'drawn' }
  | {
      kind: 'import';
      importId: string;
      /** position of the feature in the imported file, from 0 */
      featureIndex: number;
      /** the feature's attributes exactly as read */
      attributes: Record<string, unknown>;
    };

export interface Patch {
  id: string;
  /** Parts, each an outer ring then holes, in the site CRS (metres). */
  geometry: MultiPolygonRings;
  source: PatchSource;
  createdAt: string;
  createdBy: string;
}

/** What was on screen when a tag was made. */
export interface DisplaySettings {
  /** e.g. 'natural', 'nir-red-green', 'pan' */
  composite: string;
  /** e.g. 'percentile 2-98' */
  stretch: string;
  /** the date of the scene shown */
  date: string;
}

/** One interpreter's call on one patch in one pass. A patch has at most one tag per pass. */
export interface Tag {
  patchId: string;
  passId: string;
  /** a roster code or a reserved class */
  species: string;
  confidence: Confidence;
  note: string;
  interpreter: string;
  time: string;
  display: DisplaySettings;
}

/** One interpreter's round of tagging. A blind pass hides everyone else's tags. */
export interface Pass {
  id: string;
  interpreter: string;
  blind: boolean;
  startedAt: string;
  endedAt: string | null;
  /** the patches asked for in a blind pass; null when the pass covers everything */
  patchIds: string[] | null;
  /**
   * An independent delineation's area to delineate (site CRS metres), fixed when the
   * pass starts; absent, the delineation is compared within the extent of its outlines.
   */
  area?: MultiPolygonRings;
  /** when the pass was held and taken up again, oldest first; absent until its first pause */
  pauses?: PausePeriod[];
}

/** A blind pass held (no calls taken) from `pausedAt` until `resumedAt`, null while held. */
export interface PausePeriod {
  pausedAt: string;
  resumedAt: string | null;
}

/** Whether a pass is held right now. */
export function isPaused(pass: Pass): boolean {
  const last = pass.pauses?.at(-1);
  return last !== undefined && last.resumedAt === null;
}

export type RulingDecision =
  | { kind: 'accept'; passId: string }
  | { kind: 'species'; species: string }
  | { kind: 'mixed' }
  | { kind: 'exclude' };

/** The recorded decision settling a disagreement on one patch. */
export interface Ruling {
  id: string;
  patchId: string;
  decision: RulingDecision;
  /** the passes whose disagreement this settles */
  passIds: string[];
  by: string;
  time: string;
  reason: string;
  /** set when the ruling was reopened; the ruling stays in the history */
  reopened: { by: string; time: string; reason: string } | null;
}

/** A point or line from a field file kept for reference only (GPX waypoints, tracks). */
export interface ReferenceFeature {
  id: string;
  importId: string;
  kind: 'point' | 'line';
  /** site CRS metres: one position for a point, a path for a line */
  coordinates: Position[];
  attributes: Record<string, unknown>;
}

/** One imported file, kept for provenance. */
export interface ImportRecord {
  id: string;
  fileName: string;
  sha256: string;
  format: 'geojson' | 'shapefile' | 'kml' | 'gpx';
  /** the CRS the file's coordinates were in, e.g. 'EPSG:4326' or the name in a .prj */
  sourceCrs: string;
  /** features read as patches, and as reference points or lines */
  counts: { patches: number; references: number; skipped: number };
  /** the attribute read as the species, with each value's roster code; null when none */
  mapping: { attribute: string; values: Record<string, string> } | null;
  time: string;
  by: string;
}

/** The tag id: one per patch and pass. */
export function tagKey(patchId: string, passId: string): string {
  return `${patchId}|${passId}`;
}
