import { DOMParser } from '@xmldom/xmldom';
import { gpx, kml } from '@tmcw/togeojson';
import { ImportError } from './ImportError.ts';
import { readGeoJson } from './readGeoJson.ts';
import type { FieldFile } from './fieldFeatures.ts';

// KML and GPX, always longitude/latitude on WGS 84. togeojson turns them into GeoJSON
// (KML polygons stay polygons; GPX waypoints become points and tracks and routes lines,
// kept for reference); xmldom parses the XML the same way in Node, a worker or a page.

function parseXml(fileName: string, text: string): Document {
  const problems: string[] = [];
  let doc: ReturnType<DOMParser['parseFromString']> | null = null;
  try {
    doc = new DOMParser({
      onError: (level, message) => {
        if (level !== 'warning') problems.push(String(message).split('\n')[0]);
      },
    }).parseFromString(text, 'text/xml');
  } catch (error) {
    // xmldom throws on a fatal error after reporting it
    if (!problems.length) problems.push((error as Error).message.split('\n')[0]);
  }
  if (problems.length || !doc?.documentElement) throw new ImportError(fileName, [`not well-formed XML (${problems[0] ?? 'empty document'})`]);
  return doc as unknown as Document;
}

export function readKmlGpx(fileName: string, text: string, format: 'kml' | 'gpx'): FieldFile {
  const doc = parseXml(fileName, text);
  const root = doc.documentElement.localName;
  if (format === 'kml' && root !== 'kml') throw new ImportError(fileName, [`the root element is <${root}>, not <kml>`]);
  if (format === 'gpx' && root !== 'gpx') throw new ImportError(fileName, [`the root element is <${root}>, not <gpx>`]);
  const collection = format === 'kml' ? kml(doc) : gpx(doc);
  const file = readGeoJson(fileName, JSON.stringify(collection));
  return { ...file, format };
}
