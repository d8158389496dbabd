import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';

// The viewer lives in src/app; the demo scene and project are served from public/.
export default defineConfig({
  root: 'src/app',
  publicDir: '../../public',
  plugins: [react()],
  worker: { format: 'es' },
  build: { target: 'es2022', outDir: '../../dist', emptyOutDir: true, chunkSizeWarningLimit: 2000 },
  test: {
    root: '.',
    environment: 'node',
    include: ['test/**/*.test.ts'],
    testTimeout: 30000,
  },
});
