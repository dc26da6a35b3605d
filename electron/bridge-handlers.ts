// The main-process side of the bridge, as plain functions over their dependencies (the
// dialogs, the handle registry, the demo folder), so tests drive them with real files.
// `createBridgeRouter` adds the sender check and turns every failure into data.

import { stat, writeFile } from 'node:fs/promises';
import type { BridgeResult, ChannelKey, Response } from '../src/platform/channels.ts';
import { CHANNELS, MAX_RANGE_BYTES } from '../src/platform/channels.ts';
import { PlatformError } from '../src/platform/errors.ts';
import { checkRangeArguments } from '../src/platform/range.ts';
import type { FileRef } from '../src/platform/types.ts';
import { createAppFilesHandlers } from './app-files.ts';
import { createImageryMemoryHandlers } from './imagery-memory.ts';
import { findDemoFile } from './policy/demo-lookup.ts';
import { readFileRange } from './read-file-range.ts';
import type { FileHandleRegistry } from './policy/file-handles.ts';
import { parseDemoFile, parsePickOptions, parseReadRange, parseSaveFile } from './policy/payloads.ts';
import { checkSender, type FrameIdentity } from './policy/sender.ts';

export interface OpenDialogRequest {
  title: string;
  extensions: string[];
  multiple: boolean;
}

export interface BridgeDependencies {
  registry: FileHandleRegistry;
  /** The demo folder, or undefined when there is none. */
  demoDir: string | undefined;
  /** Shows the open dialog; resolves to the chosen absolute paths, [] when cancelled. */
  showOpenDialog(request: OpenDialogRequest): Promise<string[]>;
  /** Shows the save dialog; resolves to the chosen absolute path, undefined when cancelled. */
  showSaveDialog(suggestedName: string): Promise<string | undefined>;
  /** The folder of the app's own files (see electron/app-files.ts). */
  appFilesDir: string;
  /** The folder of the imagery memory (see electron/imagery-memory.ts); never the app files' folder. */
  imageryMemoryDir: string;
  /** Where a damaged imagery memory is reported. */
  log?(message: string): void;
}

export type BridgeHandlers = { [K in ChannelKey]: (payload: unknown) => Promise<Response<K>> };

export function createBridgeHandlers(deps: BridgeDependencies): BridgeHandlers {
  return {
    ...createAppFilesHandlers(deps.appFilesDir),
    ...createImageryMemoryHandlers(deps.imageryMemoryDir, deps.registry, { log: deps.log }),

    async pickFiles(payload) {
      const options = parsePickOptions(payload);
      const paths = await deps.showOpenDialog({ title: options.title, extensions: options.extensions, multiple: options.multiple === true });
      const picked: FileRef[] = [];
      for (const chosen of paths.slice(0, options.multiple ? paths.length : 1)) {
        const info = await stat(chosen).catch(() => undefined);
        if (!info?.isFile()) throw new PlatformError('not-found', 'is not a readable file', chosen.split(/[/\\]/).pop());
        picked.push(deps.registry.add(chosen, info.size, 'picked', info.mtimeMs));
      }
      return picked;
    },

    async readRange(payload) {
      const request = parseReadRange(payload);
      const handle = deps.registry.get(request.id);
      const name = handle.ref.name;
      checkRangeArguments(request.offset, request.length, name, MAX_RANGE_BYTES);
      return readFileRange(handle.path, request.offset, request.length, name);
    },

    async saveFile(payload) {
      const request = parseSaveFile(payload);
      const target = await deps.showSaveDialog(request.suggestedName);
      if (!target) return false;
      try {
        await writeFile(target, request.data);
      } catch (error) {
        throw new PlatformError('io', `could not be written (${(error as NodeJS.ErrnoException).code ?? 'error'})`, target.split(/[/\\]/).pop());
      }
      return true;
    },

    async openDemoFile(payload) {
      const request = parseDemoFile(payload);
      const found = await findDemoFile(deps.demoDir, request.name);
      return deps.registry.add(found.path, found.size, 'demo');
    },
  };
}

export interface RouterOptions {
  handlers: BridgeHandlers;
  /** The identity of our window's main frame right now, or undefined if it is closed. */
  mainFrame(): FrameIdentity | undefined;
  /** Where refusals and unexpected failures are reported (main-process log). */
  log?(message: string): void;
}

export type BridgeRouter = <K extends ChannelKey>(
  key: K,
  sender: FrameIdentity | null | undefined,
  payload: unknown,
) => Promise<BridgeResult<Response<K>>>;

/** Checks the sender, runs the handler, and returns its result or failure as data. */
export function createBridgeRouter(options: RouterOptions): BridgeRouter {
  return async (key, sender, payload) => {
    const verdict = checkSender(sender, options.mainFrame());
    if (!verdict.ok) {
      options.log?.(`refused ${CHANNELS[key]}: ${verdict.reason}`);
      return { ok: false, error: { code: 'refused', message: `refused: ${verdict.reason}` } };
    }
    try {
      const handler = options.handlers[key] as (p: unknown) => Promise<Response<typeof key>>;
      return { ok: true, value: await handler(payload) };
    } catch (error) {
      if (error instanceof PlatformError) {
        return { ok: false, error: { code: error.code, message: error.detail, ...(error.file ? { file: error.file } : {}) } };
      }
      options.log?.(`${CHANNELS[key]} failed: ${error instanceof Error ? error.message : String(error)}`);
      return { ok: false, error: { code: 'io', message: 'the file could not be read or written' } };
    }
  };
}
