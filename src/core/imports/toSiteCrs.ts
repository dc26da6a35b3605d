import proj4 from 'proj4';
import { ensureEpsg, isGeographicEpsg } from '../crs.ts';
import type { Position } from '../geometry/types.ts';
import { ImportError } from './ImportError.ts';
import { crsLabel, type FieldCrs, type FieldFile, type FieldGeometry } from './fieldFeatures.ts';

// Reprojection of field features into the site's CRS with proj4 (EPSG codes through
// src/core/crs.ts; a shapefile's .prj WKT handed to proj4 as it is).

export function isGeographic(crs: FieldCrs): boolean {
  if (crs.kind === 'epsg') return isGeographicEpsg(crs.epsg);
  return /^\s*GEOG(CS|CRS)\b/i.test(crs.definition);
}

/** A function mapping a position in `from` to the site's CRS; identity when they are the same. */
export function positionMapper(fileName: string, from: FieldCrs, siteEpsg: number): (p: Position) => Position {
  const to = ensureEpsg(siteEpsg);
  if (!to) throw new ImportError(fileName, [`the site's CRS EPSG:${siteEpsg} is not one we can reproject to`]);
  if (from.kind === 'epsg' && from.epsg === siteEpsg) return (p) => [p[0], p[1]];
  let source: string;
  if (from.kind === 'epsg') {
    const name = ensureEpsg(from.epsg);
    if (!name) throw new ImportError(fileName, [`its CRS EPSG:${from.epsg} is not one we can reproject from; choose another or convert the file`]);
    source = name;
  } else source = from.definition;
  let converter: proj4.Converter;
  try {
    converter = proj4(source, to);
  } catch (error) {
    throw new ImportError(fileName, [`its CRS (${crsLabel(from)}) cannot be read (${(error as Error).message})`]);
  }
  return (p) => converter.forward([p[0], p[1]]) as Position;
}

function mapGeometry(g: FieldGeometry, map: (p: Position) => Position): FieldGeometry {
  if (g.kind === 'point') return { kind: 'point', position: map(g.position) };
  if (g.kind === 'line') return { kind: 'line', path: g.path.map(map) };
  return { kind: 'polygon', parts: g.parts.map((rings) => rings.map((ring) => ring.map(map))) };
}

/** The file's features with every position in the site's CRS; refuses positions that do not project. */
export function toSiteCrs(fileName: string, file: FieldFile, siteEpsg: number): FieldFile {
  const map = positionMapper(fileName, file.crs, siteEpsg);
  let bad: { feature: number; position: Position } | null = null;
  const checked = (p: Position): Position => {
    const q = map(p);
    if (!bad && !(Number.isFinite(q[0]) && Number.isFinite(q[1]))) bad = { feature: -1, position: p };
    return q;
  };
  const features = file.features.map((f) => {
    const geometries = f.geometries.map((g) => mapGeometry(g, checked));
    if (bad && bad.feature < 0) bad.feature = f.index;
    return { ...f, geometries };
  });
  if (bad) {
    const { feature, position } = bad as { feature: number; position: Position };
    throw new ImportError(fileName, [`feature ${feature + 1}: position [${position[0]}, ${position[1]}] does not project into EPSG:${siteEpsg}`]);
  }
  return { ...file, crs: { kind: 'epsg', epsg: siteEpsg }, features };
}
