import { describe, expect, it } from 'vitest';
import { readSiteFile, siteFileText } from '../../../src/core/export/siteFile.ts';
import { twoPassSite } from './siteBuilder.ts';

describe('the site file', () => {
  it('reads back to the same state and ledger, one event per line', async () => {
    const b = await twoPassSite(4);
    const text = siteFileText(b.events);
    expect(text.split('\n').length).toBe(b.events.length + 8);
    const opened = await readSiteFile(text, 'site.json');
    expect(opened.events).toEqual(b.events);
    expect(opened.state).toEqual(b.state);
    expect(siteFileText(opened.events)).toBe(text);
  });

  it('names the file and the problem for bad input', async () => {
    const b = await twoPassSite(2);
    const good = JSON.parse(siteFileText(b.events));
    const bad = async (value: unknown) => readSiteFile(typeof value === 'string' ? value : JSON.stringify(value), 'x.site.json');
    await expect(bad('{"kind":')).rejects.toThrow(/^x\.site\.json: is not a JSON document/);
    await expect(bad({ kind: 'something else' })).rejects.toThrow(/^x\.site\.json: is not a Fellfield site file/);
    await expect(bad({ ...good, version: 99 })).rejects.toThrow(/^x\.site\.json: is a site file of version 99; this version reads up to 1/);
    await expect(bad({ ...good, ledger: [] })).rejects.toThrow(/holds no ledger events/);
    await expect(bad({ ...good, head: { seq: 1, hash: 'f'.repeat(64) } })).rejects.toThrow(/the stated head of the history \(ffffffffffff…\) is not the head of its ledger/);
    const reordered = [...good.ledger];
    [reordered[2], reordered[3]] = [reordered[3], reordered[2]];
    await expect(bad({ ...good, ledger: reordered })).rejects.toThrow(/the history does not verify: event at position 3 is numbered 4/);
  });
});
