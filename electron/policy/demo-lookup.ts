// The demo folder is the one root besides the user's picks. A demo file is found by
// looking its name up in directory listings, one segment at a time; nothing the
// renderer sends is ever joined onto a path unseen. Links are not followed.

import { readdir, stat } from 'node:fs/promises';
import path from 'node:path';
import { demoNameSegments } from '../../src/platform/demo-name.ts';
import { PlatformError } from '../../src/platform/errors.ts';

export interface DemoFile {
  path: string;
  size: number;
}

export async function findDemoFile(demoDir: string | undefined, name: unknown): Promise<DemoFile> {
  const segments = demoNameSegments(name);
  const label = segments.join('/');
  if (!demoDir) throw new PlatformError('not-found', 'there is no demo folder (run `npm run demo:data`)', label);
  let dir = path.resolve(demoDir);
  for (const [index, segment] of segments.entries()) {
    const last = index === segments.length - 1;
    let entries;
    try {
      entries = await readdir(dir, { withFileTypes: true });
    } catch {
      throw new PlatformError('not-found', 'the demo folder is missing (run `npm run demo:data`)', label);
    }
    const entry = entries.find((e) => e.name === segment && (last ? e.isFile() : e.isDirectory()));
    if (!entry) throw new PlatformError('not-found', 'not found in the demo folder', label);
    dir = path.join(dir, entry.name);
  }
  const info = await stat(dir);
  return { path: dir, size: info.size };
}
