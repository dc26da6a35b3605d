// Agreement benchmarks (DESIGN.md contract): kappa over many paired tags, and IoU
// matching of two delineations, each beside a naive baseline in the same process.
import { cohenKappa } from '../src/core/agreement/cohenKappa.ts';
import { confusionMatrix } from '../src/core/agreement/confusionMatrix.ts';
import { allPairsCandidates, matchByIou, type Outline } from '../src/core/agreement/iouMatch.ts';
import { pabak } from '../src/core/agreement/pabak.ts';
import { sharedArea } from '../src/core/agreement/sharedArea.ts';
import { intersectionArea } from '../src/core/geometry/overlay.ts';
import type { Position } from '../src/core/geometry/types.ts';
import { result, seeded, time, type Benchmark } from './harness.ts';

const SPECIES = ['abies', 'alnus', 'betula', 'juniperus', 'larix', 'picea', 'pinus', 'salix', 'sorbus', 'vaccinium'];

/** Paired tags: the second interpreter agrees 70 % of the time, else calls at random. */
function pairedTags(n: number, random: () => number): [string[], string[]] {
  const first: string[] = [];
  const second: string[] = [];
  for (let i = 0; i < n; i++) {
    // Skewed shares, as in a real roster: a few common species, a long tail.
    const a = SPECIES[Math.min(SPECIES.length - 1, Math.floor(-Math.log(1 - random()) * 3))];
    first.push(a);
    second.push(random() < 0.7 ? a : SPECIES[Math.floor(random() * SPECIES.length)]);
  }
  return [first, second];
}

/** The obvious version: counts in string-keyed maps, figures from those maps. */
function naiveKappa(first: string[], second: string[]) {
  const cells = new Map<string, number>();
  const rows = new Map<string, number>();
  const columns = new Map<string, number>();
  for (let i = 0; i < first.length; i++) {
    const key = `${first[i]}\u0000${second[i]}`;
    cells.set(key, (cells.get(key) ?? 0) + 1);
    rows.set(first[i], (rows.get(first[i]) ?? 0) + 1);
    columns.set(second[i], (columns.get(second[i]) ?? 0) + 1);
  }
  const classes = [...new Set([...rows.keys(), ...columns.keys()])].sort();
  const n = first.length;
  const p = (a: string, b: string) => (cells.get(`${a}\u0000${b}`) ?? 0) / n;
  const r = (a: string) => (rows.get(a) ?? 0) / n;
  const c = (a: string) => (columns.get(a) ?? 0) / n;
  let po = 0;
  let pe = 0;
  for (const a of classes) {
    po += p(a, a);
    pe += r(a) * c(a);
  }
  const kappa = (po - pe) / (1 - pe);
  let variance = 0;
  for (const a of classes) {
    variance += p(a, a) * (1 - (r(a) + c(a)) * (1 - kappa)) ** 2;
    for (const b of classes) if (a !== b) variance += (1 - kappa) ** 2 * p(a, b) * (c(a) + r(b)) ** 2;
  }
  variance = (variance - (kappa - pe * (1 - kappa)) ** 2) / ((1 - pe) ** 2 * n);
  const k = classes.length;
  return { kappa, se: Math.sqrt(variance), pabak: (k * po - 1) / (k - 1) };
}

/** A star-shaped outline (simple by construction) of `vertices` points around a centre. */
function blob(cx: number, cy: number, radius: number, vertices: number, random: () => number): Position[] {
  const ring: Position[] = [];
  const turn = random() * Math.PI * 2;
  for (let v = 0; v < vertices; v++) {
    const angle = turn + (v / vertices) * Math.PI * 2;
    const r = radius * (0.8 + 0.4 * random());
    ring.push([cx + r * Math.cos(angle), cy + r * Math.sin(angle)]);
  }
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

/** Two delineations of the same crowns: the second jittered, a tenth missed, a few extra. */
function delineations(n: number, random: () => number): [Outline[], Outline[]] {
  const side = Math.ceil(Math.sqrt(n));
  const first: Outline[] = [];
  const second: Outline[] = [];
  for (let i = 0; i < n; i++) {
    const cx = 500000 + (i % side) * 8 + random() * 2;
    const cy = 5100000 + Math.floor(i / side) * 8 + random() * 2;
    const radius = 1.5 + random() * 2;
    first.push({ id: `a${i}`, rings: [[blob(cx, cy, radius, 10, random)]] });
    if (random() < 0.9) {
      second.push({ id: `b${i}`, rings: [[blob(cx + (random() - 0.5), cy + (random() - 0.5), radius * (0.9 + 0.2 * random()), 10, random)]] });
    } else {
      second.push({ id: `b${i}`, rings: [[blob(cx + 4, cy + 4, 1, 8, random)]] });
    }
  }
  return [first, second];
}

export const benchmarks: Benchmark[] = [
  {
    name: 'agree.kappa',
    async run(size) {
      const n = size === 'large' ? 1_000_000 : 100_000;
      const [first, second] = pairedTags(n, seeded(6));
      const ours = () => {
        const m = confusionMatrix(first, second);
        return [cohenKappa(m), pabak(m)];
      };
      const check = cohenKappa(confusionMatrix(first, second)).kappa.value!;
      const naive = naiveKappa(first, second);
      if (Math.abs(check - naive.kappa) > 1e-12) throw new Error(`agree.kappa: baseline disagrees (${check} vs ${naive.kappa})`);
      const timing = await time(ours, { runs: 15, warmup: 3 });
      const base = await time(() => naiveKappa(first, second), { runs: 15, warmup: 3 });
      return [result('agree.kappa', n, timing, 'string-keyed maps', base, { classes: SPECIES.length, target_ms: 50 })];
    },
  },
  {
    name: 'agree.match',
    async run(size) {
      const n = size === 'large' ? 20_000 : 5_000;
      const [first, second] = delineations(n, seeded(9));
      let matched = 0;
      const timing = await time(() => {
        matched = matchByIou(first, second).pairs.length;
      }, { runs: 5, warmup: 1 });
      let baselineMatched = 0;
      const base = await time(() => {
        baselineMatched = matchByIou(first, second, { candidatesOf: allPairsCandidates }).pairs.length;
      }, { runs: 5, warmup: 1 });
      if (matched !== baselineMatched) throw new Error(`agree.match: baseline matched ${baselineMatched}, ours ${matched}`);
      return [result('agree.match', n, timing, 'all-pairs', base, { matched, target_ms: 2000 })];
    },
  },
  {
    // Why the matcher measures overlaps itself: the clipping library on the same pairs.
    name: 'agree.shared-area',
    async run(size) {
      const n = size === 'large' ? 5_000 : 1_000;
      const [first, second] = delineations(n, seeded(10));
      let ours = 0;
      let theirs = 0;
      const timing = await time(() => {
        ours = 0;
        for (let i = 0; i < n; i++) ours += sharedArea(first[i].rings, second[i].rings);
      });
      const base = await time(() => {
        theirs = 0;
        for (let i = 0; i < n; i++) theirs += intersectionArea(first[i].rings, second[i].rings);
      });
      if (Math.abs(ours - theirs) > 1e-6 * theirs) throw new Error(`agree.shared-area: totals differ (${ours} vs ${theirs})`);
      return [result('agree.shared-area', n, timing, 'polyclip-ts intersection', base)];
    },
  },
];
