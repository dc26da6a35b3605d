import { describe, expect, it } from 'vitest';
import { breakdownBy } from '../../../src/core/agreement/breakdown.ts';
import { cohenKappa } from '../../../src/core/agreement/cohenKappa.ts';
import { confusionMatrix } from '../../../src/core/agreement/confusionMatrix.ts';
import type { PairedCall } from '../../../src/core/agreement/pairedCall.ts';

const pairs: PairedCall[] = [
  { id: '1', first: 'larix', second: 'larix', confidence: 'sure', group: 'conifer' },
  { id: '2', first: 'pinus', second: 'pinus', confidence: 'sure', group: 'conifer' },
  { id: '3', first: 'salix', second: 'alnus', confidence: 'unsure', group: 'shrub' },
  { id: '4', first: 'alnus', second: 'alnus', confidence: 'unsure', group: 'shrub' },
  { id: '5', first: 'larix', second: 'pinus', confidence: 'likely', group: 'conifer' },
  { id: '6', first: 'salix', second: 'salix' },
];
const classes = ['alnus', 'larix', 'pinus', 'salix'];

describe('breakdownBy', () => {
  it('measures each group on its own pairs, in the order asked for', () => {
    const groups = breakdownBy(pairs, (p) => p.confidence, classes, ['sure', 'likely', 'unsure']);
    expect(groups.map((g) => [g.key, g.n])).toEqual([['sure', 2], ['likely', 1], ['unsure', 2]]);
    const unsure = pairs.filter((p) => p.confidence === 'unsure');
    const direct = cohenKappa(confusionMatrix(unsure.map((p) => p.first), unsure.map((p) => p.second), classes));
    expect(groups[2].figures).toEqual(direct);
    expect(groups[0].figures.observed.value).toBe(1);
  });

  it('leaves out pairs without a key and empty groups', () => {
    const groups = breakdownBy(pairs, (p) => p.group, classes, ['shrub', 'forb']);
    expect(groups.map((g) => g.key)).toEqual(['shrub', 'conifer']);
    expect(groups.reduce((s, g) => s + g.n, 0)).toBe(5);
  });
});
