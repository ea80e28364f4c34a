import { defineConfig } from 'vite';

/**
 * The app is a static bundle: every asset is local, the worker is bundled as an ES module,
 * and `dist/` works from any static file server (relative base).
 */
export default defineConfig({
  base: './',
  root: '.',
  publicDir: 'public',
  server: { host: '127.0.0.1', port: 5173, strictPort: false },
  preview: { host: '127.0.0.1', port: 4173 },
  worker: { format: 'es' },
  build: { outDir: 'dist', target: 'es2022', sourcemap: false, chunkSizeWarningLimit: 2000 },
});
