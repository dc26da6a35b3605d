import type { EventPayloads } from '../site/events.ts';
import type { Confidence, DisplaySettings, ImportRecord, Patch, ReferenceFeature, Tag } from '../site/types.ts';
import { ImportError } from './ImportError.ts';
import { crsLabel, type FieldCrs, type FieldFile } from './fieldFeatures.ts';
import { valueText, type SpeciesMapping } from './speciesMapping.ts';

// Turns a read, reprojected field file into the one ledger event that imports it:
// polygons become patches (source file, SHA-256 and original attributes kept), points
// and lines reference features, mapped species values tags of the given pass.

export interface BuildImportOptions {
  importId: string;
  fileName: string;
  sha256: string;
  /** the file's own CRS, for the record */
  sourceCrs: FieldCrs;
  /** the user's mapping; null imports the patches untagged */
  mapping: Pick<SpeciesMapping, 'attribute' | 'values'> | null;
  /** values of the mapped attribute no entry covers: refused unless the user chose to leave them untagged */
  leaveUnmappedUntagged: boolean;
  passId: string;
  interpreter: string;
  time: string;
  /** the confidence field calls are recorded with */
  confidence: Confidence;
  display: DisplaySettings;
}

export function buildImport(file: FieldFile, o: BuildImportOptions): EventPayloads['import.added'] {
  const patches: Patch[] = [];
  const tags: Tag[] = [];
  const references: ReferenceFeature[] = [];
  const unmapped = new Set<string>();
  for (const feature of file.features) {
    let part = 0;
    for (const g of feature.geometries) {
      const suffix = feature.geometries.length > 1 ? `.${part++}` : '';
      const id = `${o.importId}-${feature.index}${suffix}`;
      if (g.kind !== 'polygon') {
        references.push({
          id, importId: o.importId, kind: g.kind, attributes: feature.attributes,
          coordinates: g.kind === 'point' ? [g.position] : g.path,
        });
        continue;
      }
      patches.push({
        id,
        geometry: g.parts,
        source: { kind: 'import', importId: o.importId, featureIndex: feature.index, attributes: feature.attributes },
        createdAt: o.time,
        createdBy: o.interpreter,
      });
      if (!o.mapping) continue;
      const value = valueText(feature.attributes[o.mapping.attribute]);
      if (value === '') continue;
      const species = o.mapping.values[value];
      if (!species) {
        unmapped.add(value);
        continue;
      }
      tags.push({
        patchId: id, passId: o.passId, species, confidence: o.confidence, note: '', interpreter: o.interpreter,
        time: o.time, display: o.display,
      });
    }
  }
  if (unmapped.size && !o.leaveUnmappedUntagged) {
    const list = [...unmapped].sort().slice(0, 20).map((v) => JSON.stringify(v)).join(', ');
    throw new ImportError(o.fileName, [`${unmapped.size} value(s) of "${o.mapping!.attribute}" match no roster entry: ${list}; map them or choose to leave those patches untagged`]);
  }
  const record: ImportRecord = {
    id: o.importId,
    fileName: o.fileName,
    sha256: o.sha256,
    format: file.format,
    sourceCrs: crsLabel(o.sourceCrs),
    counts: { patches: patches.length, references: references.length, skipped: file.skipped.length },
    mapping: o.mapping ? { attribute: o.mapping.attribute, values: o.mapping.values } : null,
    time: o.time,
    by: o.interpreter,
  };
  return { record, patches, tags, references };
}
