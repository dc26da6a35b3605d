import { describe, expect, it } from 'vitest';
import { blindView, openBlindPassOf, isDelineationPass } from '../../../src/core/blind/blindView.ts';
import { square } from '../export/siteBuilder.ts';
import { blindSite, startPass } from './blindSite.ts';

// The one filter every screen reads through. A leak would be any earlier call, note,
// confidence, ruling or file attribute reaching the blind interpreter's view.

function everyString(value: unknown, out: string[] = []): string[] {
  if (typeof value === 'string') out.push(value);
  else if (value instanceof Map) for (const v of value.values()) everyString(v, out);
  else if (Array.isArray(value)) for (const v of value) everyString(v, out);
  else if (value && typeof value === 'object') for (const v of Object.values(value)) everyString(v, out);
  return out;
}

describe('blindView', () => {
  it('leaves the site as it is when no blind pass runs', async () => {
    const b = await blindSite();
    expect(blindView(b.state, 'ana')).toBe(b.state);
    expect(blindView(b.state, 'ben')).toBe(b.state);
  });

  it('shows the blind interpreter only the pass patches and their own calls', async () => {
    const b = await blindSite();
    await b.rule('R1', 'P3', { kind: 'accept', passId: 'a' });
    await startPass(b, { id: 'blind-1', interpreter: 'ben', blind: true, patchIds: ['P4', 'P2', 'P6'] });
    await b.tag('P4', 'blind-1', 'PIEX', 'ben', 'likely', 'own note');
    const view = blindView(b.state, 'ben');
    expect([...view.patches.keys()]).toEqual(['P4', 'P2', 'P6']);
    expect([...view.tags.values()].map((t) => [t.patchId, t.species, t.interpreter])).toEqual([['P4', 'PIEX', 'ben']]);
    expect([...view.passes.keys()]).toEqual(['blind-1']);
    expect(view.rulings.size).toBe(0);
    // The field file's species column and notes are calls too: gone.
    expect(view.patches.get('P2')!.source).toEqual({ kind: 'import', importId: 'imp-1', featureIndex: 1, attributes: {} });
    expect(view.imports.get('imp-1')!.mapping).toBeNull();
    const text = everyString({ patches: view.patches, tags: view.tags, passes: view.passes, imports: view.imports, references: view.references });
    expect(text).not.toContain('field call');
    expect(text).not.toContain('note on P4');
    expect(text).not.toContain('unsure'); // P6 was called unsure in pass a
    expect(text).not.toContain('sure');
    expect(text).not.toContain('ABFI');
    expect(text).toContain('own note');
    // The raw state still holds everything.
    expect(b.state.tags.size).toBe(31);
  });

  it('hides an open blind pass from everyone else, and shows it once ended', async () => {
    const b = await blindSite();
    await startPass(b, { id: 'blind-1', interpreter: 'ben', blind: true, patchIds: ['P4'] });
    await b.tag('P4', 'blind-1', 'PIEX', 'ben');
    const anaView = blindView(b.state, 'ana');
    expect([...anaView.tags.values()].some((t) => t.passId === 'blind-1')).toBe(false);
    expect(anaView.patches.size).toBe(30);
    await b.commit({ kind: 'pass.ended', payload: { passId: 'blind-1', time: b.time() } }, 'ben');
    expect(blindView(b.state, 'ana')).toBe(b.state);
    // Ben, out of his blind pass, now sees the desk again (the pass is over).
    expect(openBlindPassOf(b.state, 'ben')).toBeNull();
    expect(blindView(b.state, 'ben').tags.size).toBe(31);
  });

  it('in an independent delineation shows only the outlines drawn in it, and hides them from others', async () => {
    const b = await blindSite();
    const pass = await startPass(b, { id: 'draw-1', interpreter: 'ben', blind: true, patchIds: [] });
    expect(isDelineationPass(pass)).toBe(true);
    await b.commit({ kind: 'patch.added', payload: { patch: { id: 'B1', geometry: square(493020, 4429000, 6), source: { kind: 'drawn' }, createdAt: b.time(), createdBy: 'ben' }, tags: [] } }, 'ben');
    await b.tag('B1', 'draw-1', 'ABFI', 'ben');
    const benView = blindView(b.state, 'ben');
    expect([...benView.patches.keys()]).toEqual(['B1']);
    const anaView = blindView(b.state, 'ana');
    expect(anaView.patches.has('B1')).toBe(false);
    expect(anaView.patches.size).toBe(30);
    expect([...anaView.tags.values()].every((t) => t.passId === 'a')).toBe(true);
  });
});
