/**
 * HTML → PDF through the system's headless Chromium (/usr/bin/chromium), driven by playwright-core.
 * A fresh, throw-away profile folder per call; no network access is needed (the report is
 * self-contained). Also reports what the page logged as errors, so callers and tests can require a
 * clean render.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { chromium } from 'playwright-core';

export const CHROMIUM_PATH = process.env.SUNFACET_CHROMIUM ?? '/usr/bin/chromium';

const ARGS = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic'];

export interface PdfResult {
  pdf: Uint8Array;
  /** Console messages of type "error" and uncaught page errors. */
  consoleErrors: string[];
}

/**
 * Prints `html` to an A4 PDF with a footer line (`footerText`, page n of m).
 * @param footerText plain text shown at the foot of every page
 */
export async function htmlToPdf(html: string, footerText: string): Promise<PdfResult> {
  const profile = await mkdtemp(path.join(os.tmpdir(), 'sunfacet-pdf-'));
  const context = await chromium.launchPersistentContext(profile, { executablePath: CHROMIUM_PATH, headless: true, args: ARGS, offline: true });
  const consoleErrors: string[] = [];
  try {
    const page = await context.newPage();
    page.on('console', (m) => { if (m.type() === 'error') consoleErrors.push(m.text()); });
    page.on('pageerror', (e) => consoleErrors.push(String(e)));
    await page.setContent(html, { waitUntil: 'load' });
    await page.emulateMedia({ media: 'print' });
    const esc = footerText.replace(/[&<>"]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]!);
    const pdf = await page.pdf({
      format: 'A4',
      printBackground: true,
      preferCSSPageSize: true,
      displayHeaderFooter: true,
      headerTemplate: '<span></span>',
      footerTemplate: `<div style="font-family: Helvetica, Arial, sans-serif; font-size: 7.5pt; color: #666; width: 100%; padding: 0 13mm; display: flex; justify-content: space-between;"><span>${esc}</span><span>page <span class="pageNumber"></span> of <span class="totalPages"></span></span></div>`,
    });
    return { pdf: new Uint8Array(pdf), consoleErrors };
  } finally {
    await context.close();
    await rm(profile, { recursive: true, force: true });
  }
}
