#!/usr/bin/env node
// `npm start`: makes sure the demo site and the builds exist, then opens the Electron
// window on the demo. Where Electron's binary cannot be had (or there is no display),
// it says so in one line and serves the same app to a browser on 127.0.0.1 instead.
// `npm run web` (`--web`) goes straight to the browser.
//
// Options: --web, --port N (default 5217), --rebuild (build even when up to date),
// --no-build, --no-download (do not try to fetch Electron), --dist DIR, --demo DIR.
// FELLFIELD_ELECTRON_DIR points at another copy of the electron package.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readFileSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const repo = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const DOWNLOAD_TIMEOUT_MS = 120_000;
const EARLY_EXIT_MS = 15_000;

/** The Electron executable if it is installed, else undefined. */
export function electronBinary(electronPackageDir = process.env.FELLFIELD_ELECTRON_DIR || path.join(repo, 'node_modules', 'electron')) {
  const pathFile = path.join(electronPackageDir, 'path.txt');
  if (!existsSync(pathFile)) return undefined;
  const binary = path.join(electronPackageDir, 'dist', readFileSync(pathFile, 'utf8').trim());
  return existsSync(binary) ? binary : undefined;
}

/** Newest modification time (ms) of the files under the given paths (0 if none exist). */
export function newestMtime(paths) {
  let newest = 0;
  const visit = (p) => {
    let info;
    try {
      info = statSync(p);
    } catch {
      return;
    }
    if (info.isDirectory()) {
      for (const entry of readdirSync(p)) if (entry !== 'node_modules') visit(path.join(p, entry));
    } else {
      newest = Math.max(newest, info.mtimeMs);
    }
  };
  paths.forEach(visit);
  return newest;
}

/** True when `output` is missing or older than any of the inputs. */
export function isStale(output, inputs) {
  if (!existsSync(output)) return true;
  return statSync(output).mtimeMs < newestMtime(inputs);
}

/** Why a desktop window cannot be shown here, or undefined when it can. */
export function displayProblem(env = process.env, platform = process.platform) {
  if (platform !== 'linux') return undefined;
  return env.DISPLAY || env.WAYLAND_DISPLAY ? undefined : 'there is no display for a desktop window';
}

function parseArgs(argv) {
  const value = (name) => {
    const index = argv.indexOf(name);
    return index >= 0 ? argv[index + 1] : undefined;
  };
  return {
    web: argv.includes('--web'),
    rebuild: argv.includes('--rebuild'),
    build: !argv.includes('--no-build'),
    download: !argv.includes('--no-download'),
    port: value('--port') === undefined ? undefined : Number(value('--port')),
    dist: path.resolve(value('--dist') ?? path.join(repo, 'dist')),
    demo: path.resolve(value('--demo') ?? path.join(repo, 'demo')),
  };
}

function run(command, args, what) {
  const result = spawnSync(command, args, { cwd: repo, stdio: 'inherit' });
  if (result.status !== 0) {
    console.error(`Fellfield: ${what} failed (exit ${result.status ?? result.signal}).`);
    process.exit(1);
  }
}

function ensureDemo(demoDir) {
  if (existsSync(path.join(demoDir, 'manifest.json'))) return;
  const scripts = JSON.parse(readFileSync(path.join(repo, 'package.json'), 'utf8')).scripts ?? {};
  if (!scripts['demo:data']) {
    console.log('Fellfield: there is no demo generator yet (`npm run demo:data` is not defined); starting without the demo site.');
    return;
  }
  console.log('Fellfield: generating the demo site (first start only)...');
  const npm = process.platform === 'win32' ? 'npm.cmd' : 'npm';
  const result = spawnSync(npm, ['run', '--silent', 'demo:data'], { cwd: repo, stdio: 'inherit' });
  if (result.status !== 0) {
    console.log(`Fellfield: the demo generator failed (\`npm run demo:data\` exited ${result.status ?? result.signal}); starting without the demo site.`);
  }
}

function buildRenderer(distDir, force) {
  const inputs = ['index.html', 'src', 'static', 'vite.config.ts', 'svelte.config.js'].map((p) => path.join(repo, p));
  if (!force && !isStale(path.join(distDir, 'index.html'), inputs)) return;
  console.log('Fellfield: building the app...');
  run(process.execPath, [path.join(repo, 'node_modules', 'vite', 'bin', 'vite.js'), 'build', '--logLevel', 'warn', '--outDir', distDir], 'the app build (vite build)');
}

function buildShell(force) {
  const inputs = ['electron', 'src/platform'].map((p) => path.join(repo, p));
  if (!force && !isStale(path.join(repo, 'dist-electron', 'main.js'), inputs)) return;
  run(process.execPath, [path.join(repo, 'scripts', 'build-electron.mjs')], 'the desktop shell build');
}

/** Tries Electron's own installer once, bounded in time; returns the binary or undefined. */
function tryDownloadElectron() {
  const installer = path.join(repo, 'node_modules', 'electron', 'install.js');
  if (!existsSync(installer)) return undefined;
  console.log('Fellfield: fetching Electron\'s desktop binary (once)...');
  spawnSync(process.execPath, [installer], { cwd: repo, stdio: 'ignore', timeout: DOWNLOAD_TIMEOUT_MS });
  return electronBinary();
}

async function serveForBrowser(options) {
  const { startServer, DEFAULT_PORT } = await import('./serve.mjs');
  const server = await startServer({ port: options.port ?? DEFAULT_PORT, root: options.dist, demoDir: options.demo, log: console.error });
  console.log(`Fellfield is served at ${server.url} (open it in your browser; Ctrl+C stops it).`);
  const stop = () => server.close().then(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

/**
 * Runs Electron on the app. Resolves with 'failed-early' when it exits with an error
 * within the first seconds (missing system libraries, no usable sandbox), so the
 * caller can fall back to the browser; otherwise this process ends with Electron.
 */
function launchElectron(binary, demoDir) {
  const env = { ...process.env, FELLFIELD_DEMO_DIR: demoDir };
  delete env.ELECTRON_RUN_AS_NODE;
  const started = Date.now();
  const child = spawn(binary, [repo], { cwd: repo, env, stdio: 'inherit' });
  const forward = (signal) => child.kill(signal);
  process.on('SIGINT', forward);
  process.on('SIGTERM', forward);
  return new Promise((resolve) => {
    const settle = (code) => {
      process.off('SIGINT', forward);
      process.off('SIGTERM', forward);
      if (code !== 0 && Date.now() - started < EARLY_EXIT_MS) resolve({ outcome: 'failed-early', code });
      else process.exit(code ?? 1);
    };
    child.on('error', () => settle(127));
    child.on('exit', (code, signal) => settle(code ?? (signal ? 1 : 0)));
  });
}

async function main() {
  const options = parseArgs(process.argv.slice(2));
  ensureDemo(options.demo);
  if (options.build) buildRenderer(options.dist, options.rebuild);
  if (options.web) return serveForBrowser(options);

  const noDisplay = displayProblem();
  let binary = electronBinary();
  // Without a display the window could not open anyway: no point fetching the binary now.
  if (!binary && options.download && !noDisplay) binary = tryDownloadElectron();
  if (!binary) {
    console.log('Electron\'s desktop binary is not available on this machine; serving Fellfield for your browser instead.');
    return serveForBrowser(options);
  }
  if (noDisplay) {
    console.log(`Fellfield: ${noDisplay}; serving Fellfield for your browser instead.`);
    return serveForBrowser(options);
  }
  if (options.build) buildShell(options.rebuild);
  const launch = await launchElectron(binary, options.demo);
  console.log(`The desktop window could not start (Electron exited with ${launch.code}); serving Fellfield for your browser instead.`);
  return serveForBrowser(options);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main().catch((error) => {
    console.error(`Fellfield could not start: ${error instanceof Error ? error.message : String(error)}`);
    process.exit(1);
  });
}
