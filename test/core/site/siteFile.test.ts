import { describe, expect, it } from 'vitest';
import { readSiteFile, SiteFileError, siteFileOf, writeSiteFile, SITE_FILE_VERSION } from '../../../src/core/site/index.ts';
import { buildSite } from './scenario.ts';

async function refusal(fileName: string, text: string): Promise<string> {
  try {
    await readSiteFile(fileName, text);
  } catch (error) {
    expect(error).toBeInstanceOf(SiteFileError);
    return (error as Error).message;
  }
  throw new Error('expected the file to be refused');
}

describe('the site file', () => {
  it('round-trips a site: same state, same ledger', async () => {
    const l = await buildSite();
    const text = writeSiteFile(siteFileOf(l.state, l.events));
    const { state, ledger } = await readSiteFile('basin-site.json', text);
    expect(state).toEqual(l.state);
    expect(ledger).toEqual(l.events);
    expect(JSON.parse(text).version).toBe(SITE_FILE_VERSION);
  });

  it('refuses a newer version, naming the file and what to do', async () => {
    const l = await buildSite();
    const doc = { ...siteFileOf(l.state, l.events), version: SITE_FILE_VERSION + 1 };
    expect(await refusal('basin-site.json', JSON.stringify(doc))).toBe(
      `basin-site.json: it was written by a newer Fellfield (site file version ${SITE_FILE_VERSION + 1}; this one reads up to ${SITE_FILE_VERSION}); update Fellfield to restore it`,
    );
  });

  it('refuses a tampered ledger and tampered current state', async () => {
    const l = await buildSite();
    const file = siteFileOf(l.state, l.events);
    const text = writeSiteFile(file);
    // one species changed inside the ledger
    expect(await refusal('b.json', text.replace('"species":"ALVI"', '"species":"PICE"'))).toMatch(/^b\.json: the ledger does not verify: event \d+ was changed after it was recorded/);
    // the state changed but not the ledger: the replay gives away the edit
    const forged = { ...file, tags: file.tags.map((t) => ({ ...t, species: 'PICE' })) };
    expect(await refusal('b.json', writeSiteFile(forged))).toBe('b.json: its "tags" do not match its ledger; the file was changed or damaged, so it is not restored');
    // a ledger cut short
    expect(await refusal('b.json', writeSiteFile({ ...file, ledger: file.ledger.slice(0, -1) }))).toMatch(/do not match its ledger/);
    expect(await refusal('b.json', text.slice(0, text.length / 2))).toMatch(/^b\.json: not valid JSON .*cut short$/);
    expect(await refusal('b.json', '{"format":"something-else"}')).toBe('b.json: not a Fellfield site file');
  });
});

describe('siteFileFromDemo', () => {
  it('writes a site file that restores, with the field polygons imported and tagged', async () => {
    const { siteFileFromDemo } = await import('../../../src/core/site/index.ts');
    const field = { type: 'FeatureCollection', features: [0, 1, 2].map((i) => ({ type: 'Feature', properties: { id: `F${i}`, species: ['PIEX', 'ABFI', 'ZZZZ'][i] }, geometry: { type: 'Polygon', coordinates: [[[-135.07 + i * 1e-4, 40.01], [-135.0699 + i * 1e-4, 40.01], [-135.0699 + i * 1e-4, 40.0101], [-135.07 + i * 1e-4, 40.01]]] } })) };
    const roster = ['ABFI', 'PIEX'].map((code, i) => ({ code, scientificName: '', commonName: '', group: 'conifer', colour: '#000000', key: String(i + 1) }));
    const text = await siteFileFromDemo({
      siteId: 'demo', name: 'Demo', epsg: 32608, time: '2025-07-24T12:00:00.000Z', interpreter: 'demo',
      scenes: [{ id: 'early', date: '2025-07-24', epsg: 32608, files: [{ role: 'pan', name: 'pan.tif', size: 1, sha256: 'ab' }] }],
      roster, fieldFile: { name: 'field.geojson', bytes: new TextEncoder().encode(JSON.stringify(field)), speciesAttribute: 'species' },
    });
    const { state } = await readSiteFile('demo.site.json', text);
    expect(state.patches.size).toBe(3);
    expect([...state.tags.values()].map((t) => t.species).sort()).toEqual(['ABFI', 'PIEX']);
    expect(state.scenes.get('early')?.files[0].sha256).toBe('ab');
    expect(await siteFileFromDemo({ siteId: 'demo', name: 'Demo', epsg: 32608, time: '2025-07-24T12:00:00.000Z', interpreter: 'demo', scenes: [], roster, fieldFile: { name: 'field.geojson', bytes: new TextEncoder().encode(JSON.stringify(field)), speciesAttribute: 'species' } }))
      .toMatch(/^\{"format":"fellfield-site"/);
  });
});
