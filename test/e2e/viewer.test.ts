/**
 * End-to-end: the built viewer in headless Chromium (Debian's /usr/bin/chromium via
 * playwright-core). Builds with Vite's JS API into a temporary folder, serves it with `vite
 * preview` on 127.0.0.1, and checks what a user does: the demo opens and is drawn, the audit
 * colours it and the colours follow the time slider, a drawn zone gets sensor values, an OBJ opens
 * (a broken one gives a readable error and the model stays), and a reload restores the project.
 * Screenshots go to test-results/ (git-ignored).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { buildAndServe, launchBrowser, HARMLESS_CONSOLE, REPO, type Browser, type ServedApp } from './helpers/app.ts';
import { decodePng, meanAbsDiff, pixelStats } from './helpers/png.ts';

const SHOTS = join(REPO, 'test-results');
let app: ServedApp;
let browser: Browser;
let page: Page;
const problems: string[] = [];
const foreignRequests: string[] = [];

async function shot(name: string): Promise<Buffer> {
  const buf = await page.locator('.view canvas').screenshot();
  writeFileSync(join(SHOTS, `${name}.png`), buf);
  return buf;
}

/** Text of the first match ('' if none). */
async function text(selector: string): Promise<string> {
  return (await page.locator(selector).first().textContent()) ?? '';
}

async function waitForRunDone(timeoutMs = 90_000): Promise<void> {
  await page.getByTestId('run-done').waitFor({ state: 'visible', timeout: timeoutMs });
}

async function setSliderTo(hour: number): Promise<void> {
  const slider = page.getByTestId('time-slider');
  await slider.focus();
  await page.keyboard.press('Home');
  for (let i = 0; i < hour; i++) await page.keyboard.press('ArrowRight');
  await expect.poll(async () => (await page.getByTestId('time-label').textContent()) ?? '').toContain(`${String(hour).padStart(2, '0')}:00`);
  await page.waitForTimeout(300);
}

beforeAll(async () => {
  mkdirSync(SHOTS, { recursive: true });
  app = await buildAndServe();
  browser = await launchBrowser();
  page = await browser.context.newPage();
  page.on('console', (m) => {
    if (m.type() !== 'error') return;
    if (HARMLESS_CONSOLE.some((re) => re.test(m.text()))) return;
    problems.push(`console: ${m.text()}`);
  });
  page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
  page.on('request', (r) => {
    const u = r.url();
    if (!u.startsWith(app.url) && !u.startsWith('blob:') && !u.startsWith('data:')) foreignRequests.push(u);
  });
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await app?.close();
}, 30_000);

describe('viewer (built app in headless Chromium)', () => {
  it('opens the demo, draws it, and colours it when the audit is done; colours follow the time slider', async () => {
    await page.goto(app.url);
    await page.locator('.view canvas').waitFor({ state: 'visible', timeout: 30_000 });
    await expect.poll(async () => (await page.locator('#h-model + p').textContent()) ?? '', { timeout: 30_000 }).toContain('demo-terrace.glb');
    await page.waitForTimeout(800);
    const first = pixelStats(decodePng(await shot('01-demo-model')));
    // A blank or single-colour canvas has a handful of colours and no contrast.
    expect(first.distinctColours).toBeGreaterThan(40);
    expect(first.lumaStd).toBeGreaterThan(10);

    await waitForRunDone();
    await page.getByTestId('legend-surfaces').waitFor({ state: 'visible', timeout: 5_000 });
    await page.getByTestId('legend-zones').waitFor({ state: 'visible', timeout: 5_000 });
    await setSliderTo(8);
    const morning = decodePng(await shot('02-results-0800'));
    await setSliderTo(16);
    const afternoon = decodePng(await shot('03-results-1600'));
    // The sun moves from the east to the west: surface colours must change visibly.
    expect(meanAbsDiff(morning, afternoon)).toBeGreaterThan(2);
    expect(pixelStats(afternoon).distinctColours).toBeGreaterThan(40);
    await page.screenshot({ path: join(SHOTS, '04-page-results.png') });
    expect(problems).toEqual([]);
    expect(foreignRequests).toEqual([]);
  }, 150_000);

  it('draws a zone on the ground, runs, and shows a sensor value', async () => {
    const zonesBefore = await page.locator('fieldset.zone').count();
    await page.getByRole('button', { name: 'Draw a zone' }).click();
    const box = (await page.locator('.view canvas').boundingBox())!;
    // Ground south of the lawn strip in the first view (camera from the south-south-west).
    const pts: [number, number][] = [[0.3, 0.78], [0.52, 0.78], [0.52, 0.9], [0.3, 0.9]];
    for (const [fx, fy] of pts) await page.mouse.click(box.x + box.width * fx, box.y + box.height * fy);
    await page.waitForTimeout(200);
    await shot('05-drawing-zone');
    await page.keyboard.press('Enter');
    await expect.poll(() => page.locator('fieldset.zone').count()).toBe(zonesBefore + 1);
    await page.getByRole('button', { name: /^Run/ }).click();
    await waitForRunDone();
    await page.waitForTimeout(300);
    // Click the middle of the new zone: a sensor tile.
    await page.mouse.click(box.x + box.width * 0.41, box.y + box.height * 0.84);
    await page.getByTestId('inspector').waitFor({ state: 'visible', timeout: 10_000 });
    const heading = (await page.locator('[data-testid="inspector"] h3').textContent()) ?? '';
    expect(heading).toMatch(/zone 1, sensor \d+/);
    const mrt = (await page.getByTestId('inspector-mrt').textContent()) ?? '';
    const mrtC = Number(/(-?\d+(\.\d+)?)\s*°C/.exec(mrt)?.[1]);
    // Sanity bounds only (a finite value an outdoor MRT can take), not a physics check.
    expect(Number.isFinite(mrtC)).toBe(true);
    expect(mrtC).toBeGreaterThan(-30);
    expect(mrtC).toBeLessThan(100);
    // The drawn zone sits on the ground (ground z = 0 in the demo), not on the drawn plane below it.
    expect(await page.locator('fieldset.zone').last().locator('input').nth(1).inputValue()).toBe('0');
    await page.screenshot({ path: join(SHOTS, '06-page-zone-sensor.png') });
    // Assignments view and IP units, for the record.
    await page.getByRole('button', { name: 'Colour by material' }).click();
    await page.getByRole('button', { name: '°F · ft' }).click();
    await page.waitForTimeout(300);
    await page.screenshot({ path: join(SHOTS, '06b-page-materials-ip.png') });
    await page.getByRole('button', { name: '°C · m' }).click();
    expect(problems).toEqual([]);
  }, 150_000);

  it('opens a small OBJ from the file input; a broken OBJ shows its error and the model stays', async () => {
    const obj = [
      'o box',
      'v 0 0 0', 'v 4 0 0', 'v 4 3 0', 'v 0 3 0', 'v 0 0 2.5', 'v 4 0 2.5', 'v 4 3 2.5', 'v 0 3 2.5',
      'f 1 4 3 2', 'f 5 6 7 8', 'f 1 2 6 5', 'f 2 3 7 6', 'f 3 4 8 7', 'f 4 1 5 8',
    ].join('\n');
    await page.getByTestId('open-files').setInputFiles({ name: 'box.obj', mimeType: 'text/plain', buffer: Buffer.from(obj) });
    await expect.poll(async () => (await page.locator('#h-model + p').textContent()) ?? '', { timeout: 20_000 }).toContain('box.obj');
    expect(await text('#h-model + p')).toContain('12 triangles');
    await page.waitForTimeout(500);
    const boxShot = pixelStats(decodePng(await shot('07-obj-box')));
    expect(boxShot.lumaStd).toBeGreaterThan(3);

    await page.getByTestId('open-files').setInputFiles({ name: 'broken.obj', mimeType: 'text/plain', buffer: Buffer.from('v 0 0 0\nv 1 0 0\nf 1 2 7\n') });
    const err = page.getByTestId('notice-error');
    await err.waitFor({ state: 'visible', timeout: 20_000 });
    const message = (await err.textContent()) ?? '';
    // The InputError names the file and the place (the face's line).
    expect(message).toContain('broken.obj');
    expect(message).toMatch(/line 3/);
    expect(await text('#h-model + p')).toContain('box.obj');
    await page.screenshot({ path: join(SHOTS, '08-page-broken-obj.png') });
    expect(problems).toEqual([]);
  }, 60_000);

  it('restores the autosaved project after a reload', async () => {
    const lat = page.getByTestId('latitude');
    await lat.fill('40.25');
    await lat.press('Enter');
    await page.waitForTimeout(800); // autosave is debounced
    await page.reload();
    await expect.poll(async () => (await page.locator('#h-model + p').textContent()) ?? '', { timeout: 30_000 }).toContain('box.obj');
    await expect.poll(() => page.getByTestId('latitude').inputValue(), { timeout: 10_000 }).toBe('40.25');
    await page.screenshot({ path: join(SHOTS, '09-page-restored.png') });
    expect(problems).toEqual([]);
    expect(foreignRequests).toEqual([]);
  }, 60_000);
});
