import proj4 from 'proj4';
import { register } from 'ol/proj/proj4.js';
import { get as getProjection, type ProjectionLike } from 'ol/proj.js';
import { ensureEpsg } from '../../core/crs.ts';

/** Makes an EPSG code known to OpenLayers (through proj4) and returns its projection. */
export function olProjection(epsg: number): ProjectionLike {
  const name = ensureEpsg(epsg);
  if (!name) throw new Error(`the scene's CRS EPSG:${epsg} is not one Fellfield can project yet`);
  if (!getProjection(name)) register(proj4);
  return getProjection(name)!;
}
