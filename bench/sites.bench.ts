// sites.reopen: opening a stored site's imagery check on the desktop, through the main
// process's real handlers over a real file on disk (the IPC hop in process). Ours: the
// files found again where they were picked, unchanged since their last check, so taken
// from the fingerprints kept on this machine. Baseline: what every open did before, the
// file given again and hashed through (SHA-256 on the calling thread, read in 4 MiB pieces).
import { open, mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { checkSiteImagery, verifiedFiles } from '../src/app/sites/checkImagery.ts';
import { inlineHasher } from '../src/app/sites/fileHash.ts';
import { fingerprint } from '../src/app/sites/fingerprint.ts';
import { FingerprintsInMemory } from '../src/app/sites/fingerprintCache.ts';
import { checkRecalled } from '../src/app/sites/recalledImagery.ts';
import type { SceneRef } from '../src/core/site/index.ts';
import { ElectronPlatform } from '../src/platform/electron.ts';
import { inProcessBridge } from '../test/platform/inProcessBridge.ts';
import { result, seeded, time, type Benchmark } from './harness.ts';

async function writeScene(path: string, bytes: number): Promise<void> {
  const random = seeded(7);
  const piece = new Uint8Array(16 * 1024 * 1024).map(() => Math.floor(random() * 256));
  const file = await open(path, 'w');
  for (let at = 0; at < bytes; at += piece.length) await file.write(piece, 0, Math.min(piece.length, bytes - at), at);
  await file.close();
}

export const benchmarks: Benchmark[] = [
  {
    name: 'sites.reopen',
    async run(size) {
      const bytes = (size === 'large' ? 2048 : 256) * 1024 * 1024;
      const dir = await mkdtemp(join(tmpdir(), 'fellfield-bench-reopen-'));
      try {
        const path = join(dir, 'scene-pan.tif');
        await writeScene(path, bytes);
        const hasher = inlineHasher();
        const cache = new FingerprintsInMemory();
        const first = new ElectronPlatform(inProcessBridge({ dir, pick: () => [path] }));
        const [picked] = await first.pickFiles({ title: 'scene', extensions: ['tif'], remember: true });
        const [{ sha256 }] = await fingerprint(first, [picked], { hasher });
        const scenes: SceneRef[] = [{ id: 's', date: '2025-07-01', epsg: 32633, files: [{ role: 'pan', name: 'scene-pan.tif', size: bytes, sha256 }] }];
        const made = await checkSiteImagery(first, scenes, [picked], { hasher, cache });
        await first.imageryMemory.remember('site-bench', verifiedFiles(made));

        const ours = await time(async () => {
          const run = new ElectronPlatform(inProcessBridge({ dir }));
          const check = await checkRecalled(run, scenes, await run.imageryMemory.recall('site-bench'), { hasher, cache });
          if (check.files[0].how !== 'earlier') throw new Error('the kept fingerprint was not used');
        });
        const baseline = await time(async () => {
          const run = new ElectronPlatform(inProcessBridge({ dir, pick: () => [path] }));
          const given = await run.pickFiles({ title: 'scene', extensions: ['tif'] });
          const check = await checkSiteImagery(run, scenes, given, { hasher });
          if (check.files[0].status !== 'verified') throw new Error('the file did not prove the same');
        }, { warmup: 0 });
        return [result('sites.reopen', bytes, ours, 'hash-every-open', baseline, { mb_per_s_hashing: Math.round(bytes / 1048576 / (baseline.median / 1000)) })];
      } finally {
        await rm(dir, { recursive: true, force: true });
      }
    },
  },
];
