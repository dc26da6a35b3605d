import proj4 from 'proj4';
import { register } from 'ol/proj/proj4.js';
import Projection from 'ol/proj/Projection.js';
import { get as getProjection, type ProjectionLike } from 'ol/proj.js';
import { ensureEpsg } from '../../core/crs.ts';
import type { OpenSite } from '../../app/site.ts';

/** Makes an EPSG code known to OpenLayers (through proj4) and returns its projection. */
export function olProjection(epsg: number): ProjectionLike {
  const name = ensureEpsg(epsg);
  if (!name) throw new Error(`the scene's CRS EPSG:${epsg} is not one Fellfield can project yet`);
  if (!getProjection(name)) register(proj4);
  return getProjection(name)!;
}

/** The projection of a site's map: its CRS, or a plain grid of pixels for pixel space. */
export function siteProjection(site: Pick<OpenSite, 'epsg' | 'extent'>): ProjectionLike {
  if (site.epsg !== null) return olProjection(site.epsg);
  return new Projection({ code: 'fellfield:pixels', units: 'pixels', extent: site.extent });
}
