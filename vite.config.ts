import { defineConfig } from 'vite';
import { svelte } from '@sveltejs/vite-plugin-svelte';

// The renderer: one page, relative asset paths so the same build is served by the
// Electron custom scheme and by the plain local web server.
export default defineConfig({
  root: '.',
  base: './',
  publicDir: 'static',
  plugins: [svelte()],
  worker: { format: 'es' },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    target: 'es2022',
    sourcemap: true,
  },
  server: { host: '127.0.0.1' },
});
