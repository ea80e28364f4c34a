import { defineConfig } from 'vite';

/**
 * The app is a static bundle: every asset is local, the worker is bundled as an ES module,
 * and `dist/` works from any static file server (relative base).
 *
 * Cross-origin isolation (so compute workers can share the file's arrays in SharedArrayBuffers): the dev
 * and preview servers send the two headers below; a plain static server gets them from the service worker
 * in public/isolation-sw.js (src/app/isolation.ts registers it).
 */
const ISOLATION_HEADERS = { 'Cross-Origin-Opener-Policy': 'same-origin', 'Cross-Origin-Embedder-Policy': 'require-corp' };

export default defineConfig({
  base: './',
  root: '.',
  publicDir: 'public',
  server: { host: '127.0.0.1', port: 5173, strictPort: false, headers: ISOLATION_HEADERS },
  preview: { host: '127.0.0.1', port: 4173, headers: ISOLATION_HEADERS },
  worker: { format: 'es' },
  build: { outDir: 'dist', target: 'es2022', sourcemap: false, chunkSizeWarningLimit: 2000 },
});
