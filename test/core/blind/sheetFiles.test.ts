import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Papa from 'papaparse';
import { afterAll, describe, expect, it } from 'vitest';
import { agreementCsv, agreementReport, imagePdf, jpegSize, passSheet, passesFleiss } from '../../../src/core/blind/index.ts';
import { blindSite, startPass } from './blindSite.ts';

// The saved sheet read back by tools outside the project:
// - the CSV by PapaParse 5.7.1 (npm), an RFC 4180 reader;
// - the PDF by poppler-utils 22.12.0 (Debian: pdfinfo, pdfimages), on a JPEG written
//   by GDAL 3.6 (Debian gdal-bin: gdal_create, gdal_translate -of JPEG).

async function comparedSite() {
  const b = await blindSite();
  await startPass(b, { id: 'b', interpreter: 'ben', blind: true, patchIds: ['P11', 'P12', 'P15', 'P16'] });
  for (const [id, s] of [['P11', 'ABFI'], ['P12', 'SAIN'], ['P15', 'ABFI'], ['P16', "can't tell"]]) await b.tag(id, 'b', s, 'ben');
  await startPass(b, { id: 'c', interpreter: 'cleo', blind: true, patchIds: ['P11', 'P12'] });
  for (const [id, s] of [['P11', 'ABFI'], ['P12', 'ABFI']]) await b.tag(id, 'c', s, 'cleo');
  return b;
}

describe('the agreement sheet as CSV', () => {
  it('reads back by PapaParse with every figure and each matrix cell', async () => {
    const b = await comparedSite();
    const sheet = passSheet(b.state, 'a', 'b');
    const csv = agreementCsv({ sheet, fleiss: passesFleiss(b.state, ['a', 'b', 'c']) });
    const parsed = Papa.parse<Record<string, string>>(csv, { header: true, skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    const get = (section: string, row: string, column = '') => parsed.data.find((r) => r.section === section && r.row === row && r.column === column);
    expect(Number(get('figures', 'n')!.value)).toBe(4);
    expect(Number(get('figures', 'kappa')!.value)).toBe(sheet.sheet.figures.kappa.value);
    expect(get('figures', 'kappa')!.explanation).toBe(sheet.sheet.explanations.kappa);
    expect(Number(get('matrix counts', 'SAIN', "can't tell")!.value)).toBe(1);
    expect(Number(get('matrix row shares', 'ABFI', 'ABFI')!.value)).toBeCloseTo(2 / 3, 12);
    expect(get('fleiss', 'passes')!.value).toBe('a b c');
    // A class name with a quote mark is read back whole.
    expect(parsed.data.some((r) => r.column === "can't tell")).toBe(true);
  });

  it('quotes fields with commas, quotes and line breaks (RFC 4180 §2)', async () => {
    const b = await comparedSite();
    const sheet = passSheet(b.state, 'a', 'b');
    const odd = { ...sheet, first: { ...sheet.first, interpreter: 'Ana "the first", desk\nteam' } };
    const parsed = Papa.parse<string[]>(agreementCsv({ sheet: odd }), { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data[1]).toEqual(['passes', 'first', '', 'a', 'Ana "the first", desk\nteam']);
  });

  it('says why a figure is undefined instead of a number', async () => {
    const b = await comparedSite();
    // Pass c against a: both called P11 and P12 ABFI, and kappa has no value.
    const sheet = passSheet(b.state, 'a', 'c');
    const parsed = Papa.parse<Record<string, string>>(agreementCsv({ sheet }), { header: true, skipEmptyLines: true });
    const kappa = parsed.data.find((r) => r.section === 'figures' && r.row === 'kappa')!;
    expect(kappa.value).toBe('');
    expect(kappa.explanation).toMatch(/one class only \(ABFI\)/);
    expect(agreementReport({ sheet }, 'test').some((l) => l.text === "Cohen's kappa: not defined")).toBe(true);
  });
});

describe('the agreement report as PDF', () => {
  const dir = mkdtempSync(join(tmpdir(), 'fellfield-pdf-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('is a valid one-page PDF holding the JPEG, as poppler reads it', () => {
    execFileSync('gdal_create', ['-of', 'GTiff', '-outsize', '40', '30', '-bands', '3', '-ot', 'Byte', '-burn', '200', '-burn', '80', '-burn', '30', join(dir, 'base.tif')]);
    execFileSync('gdal_translate', ['-q', '-of', 'JPEG', join(dir, 'base.tif'), join(dir, 'img.jpg')]);
    const jpeg = new Uint8Array(readFileSync(join(dir, 'img.jpg')));
    expect(jpegSize(jpeg)).toEqual({ width: 40, height: 30 });
    writeFileSync(join(dir, 'report.pdf'), imagePdf(jpeg));
    const info = execFileSync('pdfinfo', [join(dir, 'report.pdf')], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
    expect(info).toMatch(/Pages:\s+1/);
    expect(info).toMatch(/Page size:\s+595\.28 x 446\.46 pts/); // 595.28 · 30 / 40
    expect(info).toMatch(/PDF version:\s+1\.4/);
    const images = execFileSync('pdfimages', ['-list', join(dir, 'report.pdf')], { encoding: 'utf8' });
    const row = images.trim().split('\n')[2].trim().split(/\s+/);
    // page num type width height color comp bpc enc
    expect(row.slice(0, 9)).toEqual(['1', '0', 'image', '40', '30', 'rgb', '3', '8', 'jpeg']);
    // A damaged cross-reference table would make poppler complain on stderr.
    const check = spawnSync('pdftoppm', ['-r', '10', '-png', join(dir, 'report.pdf'), join(dir, 'page')], { encoding: 'utf8' });
    expect(check.status).toBe(0);
    expect(check.stderr).toBe('');
  });

  it('refuses bytes that are not a JPEG', () => {
    expect(() => imagePdf(new Uint8Array([0x89, 0x50, 0x4e, 0x47]))).toThrow(/not a JPEG/);
  });
});
