// The export's public surface: writers, provenance, the site file and verification.
export { consensus, rulingInForce, type Consensus, type ConsensusStatus } from './consensus.ts';
export { ExportError } from './ExportError.ts';
export { exportSite, EXPORT_FORMATS, type ExportFile, type ExportFormat, type ExportRun, type ExportSummary } from './exportSite.ts';
export { GEOJSON_DECIMALS, type ExportOptions, type ExportSelection } from './options.ts';
export { importExport, type ExportFiles, type ImportedExport } from './readExport.ts';
export { readSiteFile, siteFileText, SITE_FILE_KIND, type OpenedSite } from './siteFile.ts';
export { EXPORT_CAUTIONS } from './cautions.ts';
