/**
 * End-to-end: the built viewer in headless Chromium (Debian's /usr/bin/chromium via
 * playwright-core). Builds with Vite's JS API into a temporary folder, serves it with `vite
 * preview` on 127.0.0.1, and checks what a user does: the demo opens and is drawn, the audit
 * colours it and the colours follow the time slider, a drawn zone gets sensor values, an OBJ opens
 * (a broken one gives a readable error and the model stays), and a reload restores the project.
 * Screenshots go to test-results/ (git-ignored).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { generateCity } from '../bench/sceneGen.ts';
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

type LongTask = { start: number; ms: number };
const longTasks = (): Promise<LongTask[]> => page.evaluate(() => (window as unknown as { sunfacetLongTasks: LongTask[] }).sunfacetLongTasks);
const longest = (xs: LongTask[]) => xs.reduce((m, x) => Math.max(m, x.ms), 0);
/** The long tasks as "start:duration" in ms, for the log. */
const listed = (xs: LongTask[]) => xs.map((x) => `${x.start.toFixed(0)}:${x.ms.toFixed(0)}`).join(' ');

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
  // Long tasks on the main thread (> 50 ms by definition), kept with their start time.
  await page.addInitScript(() => {
    const w = window as unknown as { sunfacetLongTasks: { start: number; ms: number }[] };
    w.sunfacetLongTasks = [];
    new PerformanceObserver((list) => {
      for (const e of list.getEntries()) w.sunfacetLongTasks.push({ start: e.startTime, ms: e.duration });
    }).observe({ type: 'longtask', buffered: true });
  });
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

/** A 200 k-triangle invented city (test/bench/sceneGen.ts) as OBJ text, z up. */
function benchObj(): string {
  const sc = generateCity(200_000, 7);
  const lines: string[] = ['# invented benchmark city (test/bench/sceneGen.ts)', 'o city'];
  for (let i = 0; i < sc.positions.length; i += 3) lines.push(`v ${sc.positions[i]!.toFixed(3)} ${sc.positions[i + 1]!.toFixed(3)} ${sc.positions[i + 2]!.toFixed(3)}`);
  for (let i = 0; i < sc.indices.length; i += 3) lines.push(`f ${sc.indices[i]! + 1} ${sc.indices[i + 1]! + 1} ${sc.indices[i + 2]! + 1}`);
  return lines.join('\n');
}

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
    const startTasks = await longTasks();
    console.log(`start-up long tasks (page load to the first results shown): ${startTasks.length}, longest ${longest(startTasks).toFixed(0)} ms (${listed(startTasks)})`);
    // Demand rendering: nothing draws while nothing changes.
    const idle0 = await page.evaluate(() => (window as { sunfacetFramesDrawn?: number }).sunfacetFramesDrawn ?? 0);
    await page.waitForTimeout(1000);
    const idle1 = await page.evaluate(() => (window as { sunfacetFramesDrawn?: number }).sunfacetFramesDrawn ?? 0);
    console.log(`frames drawn in 1 s with nothing changing: ${idle1 - idle0}`);
    expect(idle1 - idle0).toBeLessThanOrEqual(2);
    // Served with COOP/COEP: the page is cross-origin isolated and traced on the worker pool.
    expect(await page.evaluate(() => crossOriginIsolated)).toBe(true);
    expect(await text('[data-testid="run-done"]')).toContain('traced on 2 workers');
    console.log(`demo run (2 trace workers): ${await text('[data-testid="run-done"]')}`);
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
    // The stark morning colours get contrast from the step's own range.
    await page.getByRole('button', { name: 'This time step' }).click();
    await setSliderTo(8);
    const morningStep = decodePng(await shot('04b-results-0800-step-range'));
    expect(meanAbsDiff(morning, morningStep)).toBeGreaterThan(2);
    expect(await text('[data-testid="legend-surfaces"]')).toContain('range at this time step');
    await page.getByRole('button', { name: 'Whole period' }).click();
    // The sun path overlay with its hour marks.
    await page.getByLabel('Sun path').check();
    await page.waitForTimeout(300);
    const withPath = decodePng(await shot('04c-sun-path'));
    expect(meanAbsDiff(morning, withPath)).toBeGreaterThan(0.2);
    await page.getByLabel('Sun path').uncheck();
    expect(problems).toEqual([]);
    expect(foreignRequests).toEqual([]);
  }, 150_000);

  it('re-runs after a weather change and a material change reusing the geometry pass; the main thread stays free', async () => {
    const firstDone = await text('[data-testid="run-done"]');
    const firstS = Number(/Finished in ([\d.]+) s/.exec(firstDone)?.[1]);
    const air = page.getByTestId('air-max');
    await air.fill('34');
    await air.press('Enter');
    const t0 = await page.evaluate(() => performance.now());
    await page.getByRole('button', { name: /^Run/ }).click();
    await expect.poll(async () => (await page.locator('[data-testid="progress"], [data-testid="run-done"]').first().textContent()) ?? '', { timeout: 20_000 }).toMatch(/reusing the geometry pass|reused the geometry pass/);
    await waitForRunDone();
    const t1 = await page.evaluate(() => performance.now());
    const reDone = await text('[data-testid="run-done"]');
    expect(reDone).toContain('reused the geometry pass');
    const reS = Number(/Finished in ([\d.]+) s/.exec(reDone)?.[1]);
    console.log(`geometry reuse in the browser (weather change): first run ${firstS} s, re-run ${reS} s`);
    // A material change: edit the light render's reflectance.
    await page.locator('#surface-list').selectOption({ index: 1 });
    await page.locator('.material-editor summary').click();
    const rv = page.getByTestId('override-reflectanceVisible');
    await rv.fill('0.15');
    await rv.press('Enter');
    await expect.poll(async () => (await page.locator('.material-editor summary').textContent()) ?? '').toContain('edited');
    await page.screenshot({ path: join(SHOTS, '04d-page-material-editor.png') });
    await page.getByRole('button', { name: /^Run/ }).click();
    await waitForRunDone();
    const matDone = await text('[data-testid="run-done"]');
    console.log(`geometry reuse in the browser (material change): ${matDone}`);
    expect(matDone).toContain('reused the geometry pass');
    const t2 = await page.evaluate(() => performance.now());
    const tasks = await longTasks();
    const during = tasks.filter((x) => x.start >= t0 && x.start <= t2);
    console.log(`long tasks: ${tasks.length} in all, longest ${longest(tasks).toFixed(0)} ms; during the two re-runs ${during.length}, longest ${longest(during).toFixed(0)} ms (first re-run ends at ${(t1 - t0).toFixed(0)} ms)`);
    expect(problems).toEqual([]);
  }, 120_000);

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
    // Edit a corner: pick its handle's row, type a new east coordinate; the outline follows.
    await page.locator('fieldset.zone').last().getByRole('button', { name: 'Edit corners' }).click();
    const corners = page.locator('fieldset.zone').last().locator('.corners');
    await corners.waitFor({ state: 'visible' });
    const east = corners.locator('input').first();
    const before = Number(await east.inputValue());
    await east.fill(String(before - 2));
    await east.press('Enter');
    await page.waitForTimeout(200);
    await shot('05b-editing-corners');
    await page.keyboard.press('Escape');
    await page.keyboard.press('Escape');
    expect(await corners.count()).toBe(0);
    // A zone on a named surface.
    const zonesNow = await page.locator('fieldset.zone').count();
    await page.locator('#zone-on-surface').selectOption({ index: 1 });
    await expect.poll(() => page.locator('fieldset.zone').count()).toBe(zonesNow + 1);
    expect(await page.locator('fieldset.zone').last().textContent()).toContain('on the surface');
    await page.locator('fieldset.zone').last().getByRole('button', { name: /^Remove zone/ }).click();
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

  it('runs a whole year from a weather file: day and time sliders, hours in a UTCI category', async () => {
    const epw = readFileSync(join(REPO, 'test/fixtures/weather/tmy-45.000N-8.000E-2005-2023.epw'));
    const obj = readFileSync(join(REPO, 'test/fixtures/models/box.obj'));
    const project = {
      sunfacet: 1, name: 'box, a year', site: { latitudeDeg: 45, longitudeDeg: 8, elevationM: 250, timeZone: '+01:00' },
      model: { file: 'box.obj', upAxis: 'z' }, defaultMaterial: 'concrete-light',
      zones: [{ name: 'south side', polygon: [[0, -4], [4, -4], [4, -0.5], [0, -0.5]], floorZ: 0, spacingM: 1 }],
      period: 'year', weather: { source: 'file', file: 'tmy.epw' },
    };
    await page.getByTestId('open-files').setInputFiles([
      { name: 'year.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(project)) },
      { name: 'box.obj', mimeType: 'text/plain', buffer: obj },
      { name: 'tmy.epw', mimeType: 'text/plain', buffer: epw },
    ]);
    await expect.poll(() => page.getByTestId('period-kind').inputValue(), { timeout: 20_000 }).toBe('year');
    const y0 = await page.evaluate(() => performance.now());
    await page.getByRole('button', { name: /^Run/ }).click();
    await waitForRunDone(60_000);
    await page.waitForTimeout(300);
    const yearTasks = (await longTasks()).filter((x) => x.start >= y0);
    console.log(`a year's run: long tasks ${yearTasks.length}, longest ${longest(yearTasks).toFixed(0)} ms (run started at ${y0.toFixed(0)} ms; ${listed(yearTasks)})`);
    const day = page.getByTestId('day-slider');
    await day.waitFor({ state: 'visible' });
    expect(await day.getAttribute('max')).toBe('364');
    expect(await page.getByTestId('time-slider').getAttribute('max')).toBe('23');
    // Mid-July, 13:30 (weather-file stamps sit at the half hour).
    await day.focus();
    await page.keyboard.press('Home');
    for (let i = 0; i < 195; i++) await page.keyboard.press('ArrowRight');
    const hour = page.getByTestId('time-slider');
    await hour.focus();
    await page.keyboard.press('Home');
    for (let i = 0; i < 13; i++) await page.keyboard.press('ArrowRight');
    await expect.poll(async () => (await page.getByTestId('time-label').textContent()) ?? '').toMatch(/13:30.*07-15/);
    await page.locator('#sensor-layer').selectOption('categoryHours');
    await page.locator('#utci-category').selectOption({ index: 6 });
    await page.waitForTimeout(300);
    const legend = await text('[data-testid="legend-zones"]');
    expect(legend).toMatch(/hours of/i);
    // Hours over a year: the legend reaches hundreds or thousands of hours, not a day's 24.
    const top = Math.max(...(legend.match(/\d+/g) ?? ['0']).map(Number));
    expect(top).toBeGreaterThan(24);
    await page.screenshot({ path: join(SHOTS, '10-page-year.png') });
    expect(problems).toEqual([]);
  }, 90_000);

  it('opens the 200 k-triangle benchmark scene and orbits it (frames per second logged)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'sunfacet-e2e-bench-'));
    try {
      const file = join(dir, 'city-200k.obj');
      writeFileSync(file, benchObj());
      const o0 = await page.evaluate(() => performance.now());
      await page.getByTestId('open-files').setInputFiles(file);
      await expect.poll(async () => (await page.locator('#h-model + p').textContent()) ?? '', { timeout: 60_000 }).toContain('city-200k.obj');
      expect(await text('#h-model + p')).toMatch(/(19\d|200)\s?\d{3} triangles/);
      await page.waitForTimeout(500);
      const openTasks = (await longTasks()).filter((x) => x.start >= o0);
      console.log(`opening the 200 k-triangle OBJ: long tasks ${openTasks.length}, longest ${longest(openTasks).toFixed(0)} ms (${listed(openTasks)})`);
      const box = (await page.locator('.view canvas').boundingBox())!;
      const cx = box.x + box.width / 2, cy = box.y + box.height / 2;
      const frames0 = await page.evaluate(() => (window as { sunfacetFramesDrawn?: number }).sunfacetFramesDrawn ?? 0);
      const t0 = Date.now();
      await page.mouse.move(cx, cy);
      await page.mouse.down();
      let k = 0;
      while (Date.now() - t0 < 3000) {
        k++;
        await page.mouse.move(cx + Math.sin(k / 10) * box.width * 0.3, cy + Math.cos(k / 13) * 40, { steps: 1 });
      }
      await page.mouse.up();
      const frames1 = await page.evaluate(() => (window as { sunfacetFramesDrawn?: number }).sunfacetFramesDrawn ?? 0);
      const s = (Date.now() - t0) / 1000;
      console.log(`orbiting the 200 k-triangle scene: ${((frames1 - frames0) / s).toFixed(1)} frames/s (${frames1 - frames0} frames in ${s.toFixed(1)} s, ${k} pointer moves; software WebGL)`);
      await shot('11-bench-200k');
      expect(frames1 - frames0).toBeGreaterThan(0);
      expect(problems).toEqual([]);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 90_000);

  it('without cross-origin isolation the audit traces inside its worker', async () => {
    const p2 = await browser.context.newPage();
    // Strip the isolation headers from the page itself: no SharedArrayBuffer, no trace pool.
    await p2.route(app.url, async (route) => {
      const resp = await route.fetch();
      const headers = { ...resp.headers() };
      delete headers['cross-origin-opener-policy'];
      delete headers['cross-origin-embedder-policy'];
      await route.fulfill({ response: resp, headers });
    });
    await p2.goto(app.url);
    await p2.evaluate(() => localStorage.clear());
    await p2.reload();
    expect(await p2.evaluate(() => crossOriginIsolated)).toBe(false);
    await p2.getByTestId('run-done').waitFor({ state: 'visible', timeout: 90_000 });
    const done = (await p2.getByTestId('run-done').textContent()) ?? '';
    console.log(`demo run in-process (not isolated): ${done}`);
    expect(done).not.toContain('workers');
    await p2.close();
  }, 120_000);
});
