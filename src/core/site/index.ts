// The site model's public surface.
export * from './types.ts';
export * from './events.ts';
export * from './state.ts';
export { applyEvent, replay } from './applyEvent.ts';
export { inverseOf } from './inverse.ts';
export { touchedRows, type TouchedRows } from './touchedRows.ts';
export { SiteRuleError } from './SiteRuleError.ts';
export { rosterProblems, isTaggable, type RosterProblem } from './roster.ts';
export { siteFileOf, writeSiteFile, readSiteFile, SiteFileError, SITE_FILE_FORMAT, SITE_FILE_VERSION, type SiteFile } from './siteFile.ts';
export { siteFileFromDemo, type DemoSiteInput } from './siteFileFromDemo.ts';
