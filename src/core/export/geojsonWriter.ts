import { transformer } from '../crs.ts';
import type { MultiPolygonRings, Position, Ring } from '../geometry/types.ts';
import { GEOJSON_DECIMALS } from './options.ts';
import type { ExportedPatch } from './patchRecords.ts';
import { scalarValues, structuredValues } from './properties.ts';

// GeoJSON after RFC 7946: WGS 84 longitude/latitude (§4), no "crs" member, exterior
// rings counterclockwise and holes clockwise (§3.1.6), coordinates rounded to a stated
// number of decimals (§11.2 advises against needless precision). Winding is settled
// after rounding, so the written ring is the one that obeys the rule. One feature per
// line: a change to one patch changes one line.

export interface GeoJsonHeader {
  /** Written as the foreign member "fellfield": what the file is and how to verify it. */
  site: { id: string; name: string; epsg: number };
  ledgerHead: { seq: number; hash: string };
  options: Record<string, unknown>;
}

function signedArea(ring: Ring): number {
  let sum = 0;
  const [x0, y0] = ring[0];
  for (let i = 1; i < ring.length - 1; i++) {
    sum += (ring[i][0] - x0) * (ring[i + 1][1] - y0) - (ring[i + 1][0] - x0) * (ring[i][1] - y0);
  }
  return sum / 2;
}

/** A projected ring in rounded lon/lat: closed, without repeated positions, wound as asked. */
function lonLatRing(ring: Ring, project: (xy: [number, number]) => [number, number], scale: number, ccw: boolean): Ring {
  const out: Ring = [];
  for (const p of ring) {
    const [lon, lat] = project([p[0], p[1]]);
    const q: Position = [Math.round(lon * scale) / scale, Math.round(lat * scale) / scale];
    const last = out[out.length - 1];
    if (!last || last[0] !== q[0] || last[1] !== q[1]) out.push(q);
  }
  const first = out[0], last = out[out.length - 1];
  if (first && (first[0] !== last[0] || first[1] !== last[1])) out.push([first[0], first[1]]);
  if (out.length >= 4 && (signedArea(out) > 0) !== ccw) out.reverse();
  return out;
}

type Projector = (xy: [number, number]) => [number, number];

/** Parts in the site CRS to RFC 7946 MultiPolygon coordinates. */
export function lonLatParts(parts: MultiPolygonRings, epsg: number, decimals = GEOJSON_DECIMALS, project: Projector = transformer(epsg, 4326)): MultiPolygonRings {
  const scale = 10 ** decimals;
  return parts.map((rings) => rings.map((ring, i) => lonLatRing(ring, project, scale, i === 0)));
}

function featureLine(p: ExportedPatch, epsg: number, project: Projector): string {
  const { patch_id: _id, ...scalars } = scalarValues(p);
  const feature = {
    type: 'Feature',
    id: p.id,
    geometry: { type: 'MultiPolygon', coordinates: lonLatParts(p.geometry, epsg, GEOJSON_DECIMALS, project) },
    properties: { ...scalars, ...structuredValues(p) },
  };
  return JSON.stringify(feature);
}

/** The GeoJSON text of the exported patches (their order kept). */
export function geojsonText(patches: readonly ExportedPatch[], header: GeoJsonHeader): string {
  const meta = {
    site: header.site,
    ledger_head: header.ledgerHead,
    coordinate_decimals: GEOJSON_DECIMALS,
    options: header.options,
  };
  // One transformer for the whole file: building one costs far more than a point.
  const project = transformer(header.site.epsg, 4326);
  const lines = patches.map((p) => featureLine(p, header.site.epsg, project));
  return `{"type":"FeatureCollection","fellfield":${JSON.stringify(meta)},"features":[\n${lines.join(',\n')}\n]}\n`;
}
