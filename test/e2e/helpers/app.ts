/**
 * Builds the viewer with Vite's JS API into a temporary folder (never the repo's dist/), serves it
 * with `vite preview` on 127.0.0.1 and a free port, and drives Debian's Chromium headless
 * through playwright-core (TOOLCHAIN.md §5).
 */
import { mkdtempSync, rmSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { createServer } from 'node:net';
import { build, preview, type PreviewServer } from 'vite';
import { chromium, type BrowserContext } from 'playwright-core';

export const REPO = resolve(import.meta.dirname, '../../..');
export const CHROMIUM = '/usr/bin/chromium';

export function freePort(): Promise<number> {
  return new Promise((ok, fail) => {
    const s = createServer();
    s.once('error', fail);
    s.listen(0, '127.0.0.1', () => {
      const a = s.address();
      const port = typeof a === 'object' && a ? a.port : 0;
      s.close(() => ok(port));
    });
  });
}

export interface ServedApp {
  url: string;
  server: PreviewServer;
  outDir: string;
  close(): Promise<void>;
}

export async function buildAndServe(): Promise<ServedApp> {
  const outDir = mkdtempSync(join(tmpdir(), 'sunfacet-e2e-dist-'));
  const configFile = join(REPO, 'vite.config.ts');
  await build({ configFile, root: join(REPO, 'src/app'), logLevel: 'error', build: { outDir, emptyOutDir: true } });
  const port = await freePort();
  const server = await preview({ configFile, root: join(REPO, 'src/app'), logLevel: 'error', build: { outDir }, preview: { host: '127.0.0.1', port, strictPort: true, open: false } });
  return {
    url: `http://127.0.0.1:${port}/`,
    server,
    outDir,
    async close() {
      await new Promise<void>((ok) => server.httpServer.close(() => ok()));
      rmSync(outDir, { recursive: true, force: true });
    },
  };
}

export interface Browser {
  context: BrowserContext;
  profileDir: string;
  close(): Promise<void>;
}

export async function launchBrowser(): Promise<Browser> {
  if (!existsSync(CHROMIUM)) throw new Error(`${CHROMIUM} is missing: apt-get update && apt-get install -y chromium`);
  const profileDir = mkdtempSync(join(tmpdir(), 'sunfacet-e2e-profile-'));
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: CHROMIUM,
    headless: true,
    viewport: { width: 1400, height: 860 },
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--enable-unsafe-swiftshader'],
  });
  return {
    context,
    profileDir,
    async close() {
      await context.close();
      rmSync(profileDir, { recursive: true, force: true });
    },
  };
}

/** Console messages known to be harmless (TOOLCHAIN.md §5). */
export const HARMLESS_CONSOLE = [/favicon/i, /THREE\.Clock: This module has been deprecated/, /GPU stall due to ReadPixels/i, /Automatic fallback to software WebGL/i, /WebGL.*software/i];
