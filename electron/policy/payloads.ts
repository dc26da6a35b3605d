// IPC payloads are checked at the boundary: the renderer is not trusted to send the
// shapes its types promise. Each parser returns the typed request or throws a
// 'bad-request' PlatformError that says which field is wrong.

import { checkAppFileName } from '../../src/platform/app-file-name.ts';
import {
  MAX_APP_FILE_BYTES, MAX_RANGE_BYTES, MAX_REMEMBERED_FILES, MAX_SITE_ID, type AppFileNameRequest, type AppFileReadRequest,
  type AppFileWriteRequest, type DemoFileRequest, type ReadRangeRequest, type RecallImageryRequest, type RememberImageryRequest,
  type SaveFileRequest,
} from '../../src/platform/channels.ts';
import { PlatformError } from '../../src/platform/errors.ts';
import { checkRangeArguments } from '../../src/platform/range.ts';
import type { PickOptions } from '../../src/platform/types.ts';

const EXTENSION = /^[A-Za-z0-9]{1,16}$/;
/** A site id: printable ASCII without spaces (ids are made by the app: 'site-<uuid>', 'blind-pkg-…', 'demo'). */
const SITE_ID = /^[\x21-\x7e]+$/;
const MAX_SAVE_BYTES = 2 * 1024 * 1024 * 1024;

function bad(message: string): never {
  throw new PlatformError('bad-request', message);
}

function record(value: unknown, what: string): Record<string, unknown> {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) bad(`${what} must be an object`);
  return value as Record<string, unknown>;
}

export function parsePickOptions(value: unknown): PickOptions {
  const v = record(value, 'pick options');
  if (typeof v.title !== 'string' || v.title.length > 200) bad('pick options: title must be a string of at most 200 characters');
  if (!Array.isArray(v.extensions) || v.extensions.length > 32) bad('pick options: extensions must be a list of at most 32');
  const extensions = v.extensions.map((ext) => {
    if (typeof ext !== 'string' || !EXTENSION.test(ext.replace(/^\./, ''))) bad(`pick options: ${JSON.stringify(ext)} is not a file extension`);
    return ext.replace(/^\./, '').toLowerCase();
  });
  if (v.multiple !== undefined && typeof v.multiple !== 'boolean') bad('pick options: multiple must be true or false');
  return { title: v.title, extensions, multiple: v.multiple === true };
}

export function parseReadRange(value: unknown): ReadRangeRequest {
  const v = record(value, 'read request');
  if (typeof v.id !== 'string') bad('read request: id must be a string');
  if (typeof v.offset !== 'number' || typeof v.length !== 'number') bad('read request: offset and length must be numbers');
  return { id: v.id, offset: v.offset, length: v.length };
}

export function parseSaveFile(value: unknown): SaveFileRequest {
  const v = record(value, 'save request');
  const name = v.suggestedName;
  if (typeof name !== 'string' || name.length === 0 || name.length > 255 || /[/\\\0]/.test(name) || name === '.' || name === '..') {
    bad('save request: suggestedName must be a plain file name (no folders)');
  }
  const data = v.data;
  if (typeof data === 'string') {
    if (data.length > MAX_SAVE_BYTES / 4) bad('save request: the text is too long to save in one go');
  } else if (data instanceof Uint8Array) {
    if (data.byteLength > MAX_SAVE_BYTES) bad('save request: the data is too large to save in one go');
  } else {
    bad('save request: data must be text or bytes');
  }
  return { suggestedName: name, data };
}

export function parseDemoFile(value: unknown): DemoFileRequest {
  const v = record(value, 'demo request');
  if (typeof v.name !== 'string') bad('demo request: name must be a string');
  return { name: v.name };
}

export function parseAppFileName(value: unknown): AppFileNameRequest {
  const v = record(value, 'app file request');
  return { name: checkAppFileName(v.name) };
}

export function parseAppFileWrite(value: unknown): AppFileWriteRequest {
  const v = record(value, 'app file write');
  const name = checkAppFileName(v.name);
  const data = v.data;
  if (typeof data === 'string') {
    if (data.length > MAX_APP_FILE_BYTES / 3) bad(`app file write: the text of ${name} is too long to write in one go`);
  } else if (data instanceof Uint8Array) {
    if (data.byteLength > MAX_APP_FILE_BYTES) bad(`app file write: ${name} is too large to write in one go`);
  } else {
    bad('app file write: data must be text or bytes');
  }
  return { name, data };
}

export function parseAppFileRead(value: unknown): AppFileReadRequest {
  const v = record(value, 'app file read');
  const name = checkAppFileName(v.name);
  if (v.offset === undefined && v.length === undefined) return { name };
  if (typeof v.offset !== 'number' || typeof v.length !== 'number') bad('app file read: offset and length must both be numbers, or both absent');
  checkRangeArguments(v.offset, v.length, name, MAX_RANGE_BYTES);
  return { name, offset: v.offset, length: v.length };
}

export function parseNothing(value: unknown): Record<string, never> {
  if (value !== undefined && value !== null && Object.keys(record(value, 'request')).length > 0) bad('this request takes no fields');
  return {};
}

function siteId(value: unknown, what: string): string {
  if (typeof value !== 'string' || value.length === 0 || value.length > MAX_SITE_ID || !SITE_ID.test(value)) {
    bad(`${what}: siteId must be a site's id (printable, no spaces, at most ${MAX_SITE_ID} characters)`);
  }
  return value;
}

export function parseRememberImagery(value: unknown): RememberImageryRequest {
  const v = record(value, 'imagery to remember');
  const id = siteId(v.siteId, 'imagery to remember');
  if (!Array.isArray(v.ids) || v.ids.length > MAX_REMEMBERED_FILES) bad(`imagery to remember: ids must be a list of at most ${MAX_REMEMBERED_FILES}`);
  const ids = v.ids.map((x) => {
    if (typeof x !== 'string' || x.length === 0 || x.length > 100) bad('imagery to remember: every id must be a file reference handed out before');
    return x;
  });
  return { siteId: id, ids };
}

export function parseRecallImagery(value: unknown): RecallImageryRequest {
  const v = record(value, 'imagery to recall');
  return { siteId: siteId(v.siteId, 'imagery to recall') };
}
