// The handler of the app:// scheme: serves the built renderer from the bundle folder
// (dist/) with the security headers, and nothing outside it. Written against the Fetch
// API's Request and Response, which is what Electron's protocol.handle passes and wants.

import { readFile, stat } from 'node:fs/promises';
import path from 'node:path';
import { appUrlSegments, joinWithin, realPathWithin } from './policy/bundle-path.ts';
import { contentTypeFor, securityHeaders } from './policy/csp.ts';

export interface AppProtocolOptions {
  /** The bundle folder, e.g. <app>/dist. */
  root: string;
  /** Told about each refused request (the main-process log). */
  log?(message: string): void;
}

export function createAppProtocolHandler(options: AppProtocolOptions): (request: Request) => Promise<Response> {
  const root = path.resolve(options.root);
  return async (request) => {
    if (request.method !== 'GET' && request.method !== 'HEAD') return plain(405, 'method not allowed');
    const verdict = appUrlSegments(request.url);
    if (!verdict.ok) {
      options.log?.(`refused ${request.url}: ${verdict.reason}`);
      return plain(verdict.reason === 'not the app origin' ? 403 : 400, 'refused');
    }
    const segments = verdict.segments.length === 0 ? ['index.html'] : verdict.segments;
    if (verdict.directory && verdict.segments.length > 0) return plain(404, 'not found');
    const candidate = joinWithin(root, segments);
    const real = await realPathWithin(root, candidate);
    if (!real) return plain(404, 'not found');
    const info = await stat(real);
    if (!info.isFile()) return plain(404, 'not found');
    const headers = {
      ...securityHeaders(),
      'Content-Type': contentTypeFor(real),
      'Content-Length': String(info.size),
      'Cache-Control': 'no-cache',
    };
    if (request.method === 'HEAD') return new Response(null, { status: 200, headers });
    return new Response(new Uint8Array(await readFile(real)), { status: 200, headers });
  };
}

function plain(status: number, text: string): Response {
  return new Response(text, { status, headers: { ...securityHeaders(), 'Content-Type': 'text/plain; charset=utf-8' } });
}
