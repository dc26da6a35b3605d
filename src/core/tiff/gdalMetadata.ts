// GDAL's metadata tag (42112): a small XML document of <Item> elements. Band-level items
// carry sample="N" (0-based); role="description" is the band's description.
// We add our own band item "wavelength_nm" so our reader can build the band table.

export const WAVELENGTH_ITEM = 'wavelength_nm';

export interface GdalMetadata {
  /** Dataset-level items (no sample attribute). */
  dataset: Record<string, string>;
  /** Per-band items, by 0-based band index. */
  bands: Record<string, string>[];
  /** Per-band descriptions (role="description"), by 0-based band index. */
  descriptions: (string | undefined)[];
}

function escapeXml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

function unescapeXml(text: string): string {
  return text
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&apos;/g, "'")
    .replace(/&#(\d+);/g, (_, d: string) => String.fromCodePoint(Math.min(Number(d), 0x10ffff)))
    .replace(/&amp;/g, '&');
}

export function buildGdalMetadata(bandNames?: string[], wavelengthsNm?: number[]): string | null {
  const items: string[] = [];
  const bands = Math.max(bandNames?.length ?? 0, wavelengthsNm?.length ?? 0);
  for (let b = 0; b < bands; b++) {
    const name = bandNames?.[b];
    if (name !== undefined) {
      items.push(`  <Item name="DESCRIPTION" sample="${b}" role="description">${escapeXml(name)}</Item>`);
    }
    const nm = wavelengthsNm?.[b];
    if (nm !== undefined && Number.isFinite(nm)) {
      items.push(`  <Item name="${WAVELENGTH_ITEM}" sample="${b}">${nm}</Item>`);
    }
  }
  if (items.length === 0) return null;
  return `<GDALMetadata>\n${items.join('\n')}\n</GDALMetadata>\n`;
}

/** Reads the items of a GDAL metadata document; anything else in it is ignored. */
export function parseGdalMetadata(xml: string, bandCount: number): GdalMetadata {
  const result: GdalMetadata = {
    dataset: {},
    bands: Array.from({ length: bandCount }, () => ({})),
    descriptions: new Array(bandCount).fill(undefined),
  };
  const itemPattern = /<Item\b([^>]*)>([^<]*)<\/Item>/g;
  for (const match of xml.matchAll(itemPattern)) {
    const attributes: Record<string, string> = {};
    for (const a of match[1].matchAll(/(\w+)\s*=\s*"([^"]*)"/g)) attributes[a[1]] = unescapeXml(a[2]);
    const name = attributes.name;
    if (!name) continue;
    const value = unescapeXml(match[2]);
    if (attributes.sample === undefined) {
      result.dataset[name] = value;
      continue;
    }
    const band = Number(attributes.sample);
    if (!Number.isInteger(band) || band < 0 || band >= bandCount) continue;
    if (attributes.role === 'description') result.descriptions[band] = value;
    else result.bands[band][name] = value;
  }
  return result;
}
