import { describe, expect, it } from 'vitest';
import { readSiteFile } from '../../../src/core/export/siteFile.ts';
import { siteFileOf, writeSiteFile } from '../../../src/core/site/index.ts';
import { buildSite } from '../site/scenario.ts';

// `fellfield export` reads the backup the app saves (the store's site file) as well as
// the ledger-only history it writes beside each export: both give the same site.

describe('export reads the app backup', () => {
  it('gives the same state and ledger as the backup holds', async () => {
    const site = await buildSite();
    const text = writeSiteFile(siteFileOf(site.state, site.events));
    const opened = await readSiteFile(text, 'basin-backup.json');
    expect(opened.state).toEqual(site.state);
    expect(opened.events).toEqual(site.events);
  });

  it('refuses a tampered backup with the backup reader\'s reason, naming the file', async () => {
    const site = await buildSite();
    const text = writeSiteFile(siteFileOf(site.state, site.events)).replace('"species":"ALVI"', '"species":"PICE"');
    await expect(readSiteFile(text, 'basin-backup.json')).rejects.toThrow(/basin-backup\.json.*does not verify/);
  });
});
