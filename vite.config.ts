import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';

// Cross-origin isolation (so the page has SharedArrayBuffer and the audit can trace on a pool of
// Web Workers): the viewer loads nothing from other origins, so these headers cost nothing.
const isolation = { 'Cross-Origin-Opener-Policy': 'same-origin', 'Cross-Origin-Embedder-Policy': 'require-corp' };

// The viewer lives in src/app; the demo scene and project are served from public/.
export default defineConfig({
  root: 'src/app',
  publicDir: '../../public',
  plugins: [react()],
  worker: { format: 'es' },
  server: { headers: isolation },
  preview: { headers: isolation },
  build: { target: 'es2022', outDir: '../../dist', emptyOutDir: true, chunkSizeWarningLimit: 2000 },
  test: {
    root: '.',
    environment: 'node',
    include: ['test/**/*.test.ts'],
    setupFiles: ['test/setup.ts'],
    testTimeout: 30000,
  },
});
