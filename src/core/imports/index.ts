// Field files and roster files in; the public surface of src/core/imports.
export { ImportError } from './ImportError.ts';
export { MAX_VERTICES_PER_POLYGON, crsLabel, type FieldFeature, type FieldFile, type FieldCrs, type FieldGeometry } from './fieldFeatures.ts';
export { readFieldFile, formatOf, type ReadFieldOptions } from './readFieldFile.ts';
export { summariseAttributes, proposeMapping, type AttributeSummary, type SpeciesMapping } from './speciesMapping.ts';
export { buildImport, type BuildImportOptions } from './buildImport.ts';
export { readRosterCsv, readRosterJson, writeRosterCsv, writeRosterJson } from './rosterFile.ts';
