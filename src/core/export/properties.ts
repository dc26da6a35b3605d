import type { ExportedPatch } from './patchRecords.ts';

// The attribute table both formats share: scalar columns a GIS can filter on, then the
// provenance as structured values (JSON text in a GeoPackage). Member order is fixed.

export const SCALAR_COLUMNS = ['patch_id', 'species', 'class', 'consensus', 'consensus_species', 'ruling', 'fold', 'pure_pixels', 'pixel_rule'] as const;
export const STRUCTURED_COLUMNS = ['tags', 'rulings', 'source', 'transformations', 'scenes', 'findings'] as const;

export type ScalarColumn = (typeof SCALAR_COLUMNS)[number];
export type StructuredColumn = (typeof STRUCTURED_COLUMNS)[number];

export function scalarValues(p: ExportedPatch): Record<ScalarColumn, string | number | null> {
  return {
    patch_id: p.id,
    species: p.species,
    class: p.class,
    consensus: p.consensus.status,
    consensus_species: p.consensus.species,
    ruling: p.consensus.ruling,
    fold: p.fold,
    pure_pixels: p.pure_pixels,
    pixel_rule: p.pixel_rule,
  };
}

export function structuredValues(p: ExportedPatch): Record<StructuredColumn, unknown> {
  return { tags: p.tags, rulings: p.rulings, source: p.source, transformations: p.transformations, scenes: p.scenes, findings: p.findings };
}
