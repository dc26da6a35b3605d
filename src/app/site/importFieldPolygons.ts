import { sha256Hex } from '../../core/ledger/sha256.ts';
import {
  buildImport, proposeMapping, readFieldFile, summariseAttributes, type AttributeSummary, type FieldFile, type FieldCrs,
  type SpeciesMapping,
} from '../../core/imports/index.ts';
import type { Confidence, DisplaySettings } from '../../core/site/index.ts';
import { newId, type SiteContext } from './context.ts';
import { openPassFor } from './openPassFor.ts';

// Importing field polygons is two steps: read (checked, reprojected, nothing stored) so
// the user can pick the species attribute and see the values no roster entry matches,
// then commit as ONE ledger event, so a failed or refused import changes nothing.

export interface FieldImportPreview {
  fileName: string;
  sha256: string;
  file: FieldFile;
  sourceCrs: FieldCrs;
  attributes: AttributeSummary[];
  /** the mapping proposed for an attribute; call proposeFor to try another */
  proposeFor(attribute: string): SpeciesMapping;
}

export async function previewFieldImport(ctx: SiteContext, fileName: string, bytes: Uint8Array, options: { assumeEpsg?: number } = {}): Promise<FieldImportPreview> {
  const site = ctx.store.state.site!;
  const { file, original } = readFieldFile(fileName, bytes, { siteEpsg: site.epsg, assumeEpsg: options.assumeEpsg });
  return {
    fileName,
    sha256: await sha256Hex(bytes),
    file,
    sourceCrs: original.crs,
    attributes: summariseAttributes(file.features),
    proposeFor: (attribute) => proposeMapping(file.features, attribute, ctx.store.state.roster),
  };
}

export interface FieldImportChoices {
  /** attribute and value → code map; null imports the patches untagged */
  mapping: Pick<SpeciesMapping, 'attribute' | 'values'> | null;
  leaveUnmappedUntagged?: boolean;
  /** field calls are recorded with this confidence; default 'likely' */
  confidence?: Confidence;
  display?: DisplaySettings;
}

/** Commits a previewed import; returns the import's id. */
export async function importFieldPolygons(ctx: SiteContext, preview: FieldImportPreview, choices: FieldImportChoices): Promise<string> {
  const pass = choices.mapping ? await openPassFor(ctx) : null;
  const importId = newId('import');
  const payload = buildImport(preview.file, {
    importId,
    fileName: preview.fileName,
    sha256: preview.sha256,
    sourceCrs: preview.sourceCrs,
    mapping: choices.mapping,
    leaveUnmappedUntagged: choices.leaveUnmappedUntagged ?? false,
    passId: pass?.id ?? '',
    interpreter: ctx.interpreter,
    time: ctx.now(),
    confidence: choices.confidence ?? 'likely',
    display: choices.display ?? { composite: 'field import', stretch: '', date: '' },
  });
  await ctx.store.commit({ kind: 'import.added', payload, actor: ctx.interpreter, time: payload.record.time });
  return importId;
}
