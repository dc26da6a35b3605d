import { join } from 'node:path';
import { createServer, type ViteDevServer } from 'vite';

// Serves the store harness page with Vite's dev server, apart from the app's build.
const repo = join(import.meta.dirname, '..', '..');

export async function startHarnessServer(): Promise<{ url: string; close(): Promise<void> }> {
  const server: ViteDevServer = await createServer({
    configFile: false,
    root: join(repo, 'e2e', 'harness'),
    logLevel: 'warn',
    server: { host: '127.0.0.1', port: 0, strictPort: false, fs: { allow: [repo] }, hmr: false },
    optimizeDeps: { include: ['dexie', 'proj4', 'fflate', 'shpjs', 'papaparse', '@xmldom/xmldom', '@tmcw/togeojson'] },
  });
  await server.listen();
  const address = server.httpServer!.address();
  const port = typeof address === 'object' && address ? address.port : 0;
  return { url: `http://127.0.0.1:${port}/store.html`, close: () => server.close() };
}
