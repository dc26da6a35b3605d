// The benchmark contract (DESIGN.md): one JSON object per line, medians of at least
// five runs after a warm-up, each beside a baseline measured in the same process.

export type BenchSize = 'small' | 'large';

export interface BenchResult {
  bench: string;
  n: number;
  ms: number;
  p95_ms?: number;
  baseline: string;
  baseline_ms: number;
  /** baseline_ms / ms */
  ratio: number;
  [extra: string]: unknown;
}

export interface Benchmark {
  name: string;
  /** Runs the benchmark and returns its result lines (usually one). */
  run(size: BenchSize): Promise<BenchResult[]>;
}

export interface Timing {
  median: number;
  p95: number;
  min: number;
  samples: number[];
}

/** Times fn: `warmup` untimed calls, then `runs` timed ones (at least five). */
export async function time(fn: () => unknown, options: { runs?: number; warmup?: number } = {}): Promise<Timing> {
  const runs = Math.max(5, options.runs ?? 5);
  const warmup = options.warmup ?? 1;
  for (let i = 0; i < warmup; i++) await fn();
  const samples: number[] = [];
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    await fn();
    samples.push(performance.now() - start);
  }
  return summarize(samples);
}

export function summarize(samples: number[]): Timing {
  const sorted = [...samples].sort((a, b) => a - b);
  const at = (q: number) => sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];
  const median = sorted.length % 2
    ? sorted[(sorted.length - 1) / 2]
    : (sorted[sorted.length / 2 - 1] + sorted[sorted.length / 2]) / 2;
  return { median, p95: at(0.95), min: sorted[0], samples };
}

const round = (ms: number) => Math.round(ms * 100) / 100;

/** Builds one result line from our timing and the baseline's. */
export function result(
  bench: string,
  n: number,
  ours: Timing,
  baseline: string,
  base: Timing,
  extra: Record<string, unknown> = {},
): BenchResult {
  return {
    bench,
    n,
    ms: round(ours.median),
    p95_ms: round(ours.p95),
    baseline,
    baseline_ms: round(base.median),
    ratio: Math.round((base.median / ours.median) * 1000) / 1000,
    ...extra,
  };
}

/** A small seeded generator (mulberry32) so benchmark data is the same every run. */
export function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
