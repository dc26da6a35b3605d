#!/usr/bin/env node
// A small static server for the built renderer (dist/) and the demo folder at /demo/,
// for `npm run web`, the browser fallback of `npm start`, and the e2e tests. It binds to
// 127.0.0.1 only, supports byte ranges (206, 416), sends the app's CSP on every
// response, lists no directories, and uses the desktop shell's path containment.
import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import http from 'node:http';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { tsImport } from 'tsx/esm/api';
import { parseRangeHeader } from './http-range.mjs';

const here = path.dirname(fileURLToPath(import.meta.url));
const repo = path.resolve(here, '..');
const { requestPathSegments, joinWithin, realPathWithin } = await tsImport('../electron/policy/bundle-path.ts', import.meta.url);
const { securityHeaders, contentTypeFor } = await tsImport('../electron/policy/csp.ts', import.meta.url);

export const DEFAULT_PORT = 5217;
const HOST = '127.0.0.1';

/**
 * Starts the server. Port 0 takes any free port; a busy port moves on to the next few.
 * @param {{ port?: number, root?: string, demoDir?: string, log?: (line: string) => void }} [options]
 * @returns {Promise<{ url: string, port: number, close: () => Promise<void> }>}
 */
export async function startServer(options = {}) {
  const root = path.resolve(options.root ?? path.join(repo, 'dist'));
  const demoDir = path.resolve(options.demoDir ?? path.join(repo, 'demo'));
  const server = http.createServer((request, response) => {
    handle(request, response, { root, demoDir }).catch((error) => {
      options.log?.(`serve: ${request.url}: ${error instanceof Error ? error.message : String(error)}`);
      if (!response.headersSent) send(response, 500, 'internal error');
      else response.destroy();
    });
  });
  const wanted = options.port ?? DEFAULT_PORT;
  const port = await listen(server, wanted, wanted === 0 ? 0 : 20);
  return {
    url: `http://${HOST}:${port}/`,
    port,
    close: () => new Promise((resolve) => {
      server.close(() => resolve());
      server.closeAllConnections();
    }),
  };
}

/** Listens on the port or, when it is taken, on one of the next `tries` ports. */
function listen(server, port, tries) {
  return new Promise((resolve, reject) => {
    const attempt = (candidate, left) => {
      const onError = (error) => {
        server.off('listening', onListening);
        if (error.code === 'EADDRINUSE' && left > 0) attempt(candidate + 1, left - 1);
        else reject(new Error(`cannot listen on ${HOST}:${candidate} (${error.code ?? error.message})`));
      };
      const onListening = () => {
        server.off('error', onError);
        resolve(server.address().port);
      };
      server.once('error', onError);
      server.once('listening', onListening);
      server.listen(candidate, HOST);
    };
    attempt(port, tries);
  });
}

async function handle(request, response, { root, demoDir }) {
  if (request.method !== 'GET' && request.method !== 'HEAD') {
    return send(response, 405, 'method not allowed', { Allow: 'GET, HEAD' });
  }
  // Only our own address may be asked for (a page on another site could otherwise
  // reach this server through a rebound DNS name).
  const host = request.headers.host ?? '';
  const port = request.socket.localPort;
  if (host !== `${HOST}:${port}` && host !== `localhost:${port}`) return send(response, 403, 'wrong host');

  const target = request.url ?? '/';
  const verdict = requestPathSegments(target.startsWith('/') ? target : '/');
  if (!verdict.ok) return send(response, 400, `bad path: ${verdict.reason}`);
  let base = root;
  let segments = verdict.segments;
  if (segments[0] === 'demo') {
    base = demoDir;
    segments = segments.slice(1);
    if (segments.length === 0) return send(response, 404, 'not found');
  } else if (segments.length === 0) {
    segments = ['index.html'];
  }
  if (verdict.directory && verdict.segments.length > 0) return send(response, 404, 'not found');
  const real = await realPathWithin(base, joinWithin(base, segments));
  const info = real ? await stat(real) : undefined;
  if (!real || !info?.isFile()) return send(response, 404, 'not found');

  const headers = {
    ...securityHeaders(),
    'Content-Type': contentTypeFor(real),
    'Accept-Ranges': 'bytes',
    'Cache-Control': 'no-cache',
  };
  // With If-Range and no validators of ours to compare, the whole file is the answer (RFC 9110, 13.1.5).
  const range = request.headers['if-range'] ? { kind: 'none' } : parseRangeHeader(request.headers.range, info.size);
  if (range.kind === 'unsatisfiable') {
    return send(response, 416, 'range not satisfiable', { 'Content-Range': `bytes */${info.size}` });
  }
  let status = 200;
  let start = 0;
  let end = info.size - 1;
  if (range.kind === 'range') {
    status = 206;
    ({ start, end } = range);
    headers['Content-Range'] = `bytes ${start}-${end}/${info.size}`;
  }
  headers['Content-Length'] = String(Math.max(0, end - start + 1));
  response.writeHead(status, headers);
  if (request.method === 'HEAD' || info.size === 0) return response.end();
  await new Promise((resolve, reject) => {
    const stream = createReadStream(real, { start, end });
    stream.on('error', reject);
    response.on('close', () => { stream.destroy(); resolve(); });
    stream.pipe(response);
  });
}

function send(response, status, text, extra = {}) {
  const body = `${text}\n`;
  response.writeHead(status, {
    ...securityHeaders(),
    'Content-Type': 'text/plain; charset=utf-8',
    'Content-Length': String(Buffer.byteLength(body)),
    ...extra,
  });
  response.end(body);
}

function argValue(argv, name) {
  const index = argv.indexOf(name);
  return index >= 0 ? argv[index + 1] : undefined;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const argv = process.argv.slice(2);
  const port = Number(argValue(argv, '--port') ?? DEFAULT_PORT);
  try {
    const server = await startServer({ port, root: argValue(argv, '--root'), demoDir: argValue(argv, '--demo'), log: console.error });
    console.log(`Fellfield is served at ${server.url} (open it in your browser; Ctrl+C stops it).`);
    const stop = () => server.close().then(() => process.exit(0));
    process.on('SIGINT', stop);
    process.on('SIGTERM', stop);
  } catch (error) {
    console.error(`Could not start the web server: ${error instanceof Error ? error.message : String(error)}`);
    process.exit(2);
  }
}
