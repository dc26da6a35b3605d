// The imagery memory of the desktop app: for each site, the absolute paths of the files
// the user picked for it, with their size and modification time, in one small JSON file
// of the main process (userData/imagery-memory/sites.json). That folder is not the folder
// of app files, which the renderer may read by name: the paths stay in this process. The
// renderer names picked files by their ids and gets ids back; a path never crosses the
// bridge. A kept file is handed out again only while it is where it was, with the size
// and modification time it had when it was picked (and so when it was fingerprinted).

import * as nodeFs from 'node:fs/promises';
import path from 'node:path';
import { PlatformError } from '../src/platform/errors.ts';
import type { RecalledFile } from '../src/platform/types.ts';
import { writeAtomically, type AppFilesFs } from './app-files.ts';
import type { FileHandleRegistry } from './policy/file-handles.ts';
import { parseRecallImagery, parseRememberImagery } from './policy/payloads.ts';

/** The file of the memory, in imageryMemoryDir(userData). */
export const MEMORY_FILE = 'sites.json';
/** Sites kept at most; past it the ones remembered longest ago are dropped (they ask for their files again). */
export const MAX_REMEMBERED_SITES = 1000;
const FORMAT = 'fellfield-imagery-memory';

/** One kept file: where it is and what it was when picked. */
interface KeptFile {
  path: string;
  size: number;
  /** modification time as stat gave it (ms with its fraction), compared exactly */
  mtimeMs: number;
}

interface MemoryDocument {
  format: typeof FORMAT;
  version: 1;
  /** by site id: when it was last remembered (ms since 1970) and its files */
  sites: Record<string, { at: number; files: KeptFile[] }>;
}

export interface ImageryMemoryHandlers {
  rememberImagery(payload: unknown): Promise<null>;
  recallImagery(payload: unknown): Promise<RecalledFile[]>;
}

export interface ImageryMemoryOptions {
  fs?: AppFilesFs;
  now?: () => number;
  /** where a damaged memory file is reported (main-process log) */
  log?: (message: string) => void;
}

/** The folder of the memory inside Electron's userData folder. */
export function imageryMemoryDir(userData: string): string {
  return path.join(userData, 'imagery-memory');
}

export function createImageryMemoryHandlers(dir: string, registry: FileHandleRegistry, options: ImageryMemoryOptions = {}): ImageryMemoryHandlers {
  const { fs = nodeFs, now = Date.now, log = () => {} } = options;
  // One change at a time, so two remembers in a row both land.
  let queue: Promise<unknown> = Promise.resolve();
  const serially = <T>(work: () => Promise<T>): Promise<T> => {
    const run = queue.then(work, work);
    queue = run.catch(() => undefined);
    return run;
  };

  return {
    async rememberImagery(payload) {
      const request = parseRememberImagery(payload);
      const files = new Map<string, KeptFile>();
      for (const id of request.ids) {
        const handle = registry.get(id);
        if (handle.source !== 'picked' || handle.mtimeMs === undefined) {
          throw new PlatformError('bad-request', 'only files the user picked are remembered', handle.ref.name);
        }
        files.set(handle.path, { path: handle.path, size: handle.ref.size, mtimeMs: handle.mtimeMs });
      }
      await serially(async () => {
        const memory = await load(fs, dir, log);
        if (files.size === 0) delete memory.sites[request.siteId];
        else memory.sites[request.siteId] = { at: now(), files: [...files.values()] };
        const sites = Object.entries(memory.sites).sort((a, b) => b[1].at - a[1].at).slice(0, MAX_REMEMBERED_SITES);
        await writeAtomically(fs, dir, MEMORY_FILE, JSON.stringify({ ...memory, sites: Object.fromEntries(sites) }));
      });
      return null;
    },

    async recallImagery(payload) {
      const request = parseRecallImagery(payload);
      const kept = (await serially(() => load(fs, dir, log))).sites[request.siteId]?.files ?? [];
      const recalled: RecalledFile[] = [];
      for (const file of kept) {
        const name = path.basename(file.path);
        let info;
        try {
          info = await fs.stat(file.path);
        } catch (error) {
          const code = (error as NodeJS.ErrnoException)?.code;
          recalled.push({ name, state: code === 'EACCES' || code === 'EPERM' ? 'not-allowed' : 'missing' });
          continue;
        }
        if (!info.isFile()) recalled.push({ name, state: 'missing' });
        else if (info.size !== file.size || info.mtimeMs !== file.mtimeMs) recalled.push({ name, state: 'changed' });
        else recalled.push({ name, state: 'ready', file: registry.add(file.path, info.size, 'picked', info.mtimeMs) });
      }
      return recalled;
    },
  };
}

/** The memory as kept, or an empty one when there is none yet; a damaged file is reported and read as empty. */
async function load(fs: AppFilesFs, dir: string, log: (message: string) => void): Promise<MemoryDocument> {
  const empty: MemoryDocument = { format: FORMAT, version: 1, sites: {} };
  let text: string;
  try {
    text = await fs.readFile(path.join(dir, MEMORY_FILE), 'utf8');
  } catch (error) {
    if ((error as NodeJS.ErrnoException)?.code !== 'ENOENT') log(`the imagery memory cannot be read (${(error as Error).message}); sites ask for their files`);
    return empty;
  }
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch {
    log(`${MEMORY_FILE} in ${dir} is damaged (not JSON); it is started afresh`);
    return empty;
  }
  const d = doc as Partial<MemoryDocument>;
  if (d?.format !== FORMAT || d.version !== 1 || typeof d.sites !== 'object' || d.sites === null) {
    log(`${MEMORY_FILE} in ${dir} is not an imagery memory of this version; it is started afresh`);
    return empty;
  }
  const memory: MemoryDocument = { format: FORMAT, version: 1, sites: {} };
  for (const [siteId, site] of Object.entries(d.sites)) {
    const files = Array.isArray(site?.files) ? site.files.filter(isKeptFile) : [];
    if (files.length && typeof site.at === 'number') memory.sites[siteId] = { at: site.at, files };
  }
  return memory;
}

function isKeptFile(value: unknown): value is KeptFile {
  const f = value as KeptFile;
  return typeof f?.path === 'string' && path.isAbsolute(f.path) && Number.isSafeInteger(f.size) && f.size >= 0 && Number.isFinite(f.mtimeMs);
}
