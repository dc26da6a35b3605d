import { describe, expect, it } from 'vitest';
import { TileWarmer } from '../../../src/ui/map/tileWarmer.ts';

// The read-ahead's rules (common practice for tiled viewers; no outside source): tiles the
// map asks for come first, read-ahead runs two at a time while nothing is asked for, a
// tile read ahead is handed over once, and letting one go aborts its work.

interface Job { key: string; resolve: (v: string) => void; reject: (e: Error) => void; signal: AbortSignal }

function loader() {
  const jobs: Job[] = [];
  const load = (z: number, x: number, y: number, signal: AbortSignal) => new Promise<string>((resolve, reject) => {
    jobs.push({ key: `${z}/${x}/${y}`, resolve, reject, signal });
  });
  return { jobs, load };
}
const tick = () => new Promise((r) => setTimeout(r, 0));
const signal = () => new AbortController().signal;

describe('read-ahead of tiles', () => {
  it('reads ahead two at a time, in the order given, and hands a made tile over once', async () => {
    const { jobs, load } = loader();
    const warmer = new TileWarmer(load);
    warmer.warm([[3, 1, 1], [3, 2, 1], [3, 3, 1]]);
    expect(jobs.map((j) => j.key)).toEqual(['3/1/1', '3/2/1']);
    jobs[0].resolve('a');
    await tick();
    expect(jobs.map((j) => j.key)).toEqual(['3/1/1', '3/2/1', '3/3/1']);
    await expect(warmer.load(3, 1, 1, signal())).resolves.toBe('a');
    expect(jobs).toHaveLength(3); // no new work for a tile read ahead
    const again = warmer.load(3, 1, 1, signal()); // handed over once: the map keeps it from here
    expect(jobs.at(-1)!.key).toBe('3/1/1');
    jobs.at(-1)!.resolve('a2');
    await expect(again).resolves.toBe('a2');
    warmer.dispose();
  });

  it('holds read-ahead back while a tile the map asked for is being made', async () => {
    const { jobs, load } = loader();
    const warmer = new TileWarmer(load);
    const asked = warmer.load(5, 0, 0, signal());
    warmer.warm([[5, 1, 0], [5, 2, 0]]);
    expect(jobs.map((j) => j.key)).toEqual(['5/0/0']);
    jobs[0].resolve('asked');
    await asked;
    await tick();
    expect(jobs.map((j) => j.key)).toEqual(['5/0/0', '5/1/0', '5/2/0']);
    warmer.dispose();
  });

  it('makes a queued tile at once when the map asks for it, and lets go what the view no longer wants', async () => {
    const { jobs, load } = loader();
    const warmer = new TileWarmer(load, 3);
    warmer.warm([[2, 0, 0], [2, 1, 0], [2, 2, 0]]);
    const asked = warmer.load(2, 2, 0, signal()); // queued, not started: made now as asked
    expect(jobs.map((j) => j.key)).toEqual(['2/0/0', '2/1/0', '2/2/0']);
    warmer.warm([[2, 1, 0], [2, 3, 0], [2, 4, 0], [2, 5, 0]]); // the view moved on: what it no longer wants goes, its work aborted
    expect(jobs[0].signal.aborted).toBe(true);
    expect(jobs[1].signal.aborted).toBe(false); // still wanted: kept as it is
    expect(warmer.size).toBe(3); // the least wanted beyond capacity are not taken
    jobs[2].resolve('c');
    await expect(asked).resolves.toBe('c');
    warmer.dispose();
    expect(jobs[1].signal.aborted).toBe(true);
    expect(warmer.size).toBe(0);
  });

  it('forgets a failed read-ahead, so the map asks again and hears the failure itself', async () => {
    const { jobs, load } = loader();
    const warmer = new TileWarmer(load);
    warmer.warm([[1, 0, 0]]);
    jobs[0].reject(new Error('broken block'));
    await tick();
    expect(warmer.size).toBe(0);
    const asked = warmer.load(1, 0, 0, signal());
    jobs[1].reject(new Error('broken block'));
    await expect(asked).rejects.toThrow('broken block');
    warmer.dispose();
  });
});
