/** A position in a projected CRS (metres) or in lon/lat degrees, as GeoJSON orders it. */
export type Position = [number, number];
/** A linear ring, closed (first position repeated last), as GeoJSON stores it. */
export type Ring = Position[];
/** Outer ring first, then holes. */
export type PolygonRings = Ring[];
/** A patch outline: one polygon, or several parts. */
export type MultiPolygonRings = PolygonRings[];

/** [minx, miny, maxx, maxy] */
export type Extent = [number, number, number, number];
