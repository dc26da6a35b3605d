// The parts of shpjs (6.2) we use; the package ships no types.
declare module 'shpjs' {
  /** Shapes of a .shp as GeoJSON geometries, reprojected only when a prj is given. */
  export function parseShp(shp: ArrayBuffer | ArrayBufferView | DataView, prj?: string): unknown[];
  /** Rows of a .dbf, text decoded by the .cpg code page (e.g. 'UTF-8', '1252', 'ISO-8859-1'). */
  export function parseDbf(dbf: ArrayBuffer | ArrayBufferView | DataView, cpg?: string): Record<string, unknown>[];
}
