/**
 * End-to-end, design options and glare: the demo opens, every design is audited once (the run is
 * shared by the tests below), "tree row" is compared with "as designed" on a diverging map, the
 * trees are drawn, a device is added by clicking, and the glare layer and reflection paths show.
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

async function shot(name: string, whole = false): Promise<Buffer> {
  const buf = whole ? await page.screenshot() : await page.locator('.view canvas').screenshot();
  writeFileSync(join(SHOTS, `${name}.png`), buf);
  return buf;
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
    if (m.type() !== 'error' || HARMLESS_CONSOLE.some((re) => re.test(m.text()))) return;
    problems.push(`console: ${m.text()}`);
  });
  page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await app?.close();
}, 30_000);

describe('design options and glare (built app in headless Chromium)', () => {
  it('runs all designs and shows "tree row" against "as designed" on a cooler/hotter map', async () => {
    await page.goto(app.url);
    await page.getByTestId('run-done').waitFor({ state: 'visible', timeout: 90_000 });
    const designs = page.getByRole('radiogroup', { name: 'Design shown' });
    for (const n of ['as designed', 'timber screen', 'tree row', 'pale cladding']) await expect.poll(() => designs.getByLabel(n).count()).toBe(1);
    const t0 = Date.now();
    await page.getByTestId('run-designs').click();
    await page.getByTestId('designs-progress').waitFor({ state: 'visible', timeout: 10_000 });
    await expect.poll(async () => (await page.getByTestId('designs-progress').textContent()) ?? '', { timeout: 60_000 }).toMatch(/Design [2-4] of 4/);
    await page.getByTestId('designs-done').waitFor({ state: 'visible', timeout: 120_000 });
    console.log(`all designs: ${(Date.now() - t0) / 1000} s`);

    await page.locator('#cmp-option').selectOption('tree row');
    await page.locator('#cmp-reference').selectOption('as designed');
    const legend = page.getByTestId('legend-difference');
    await legend.waitFor({ state: 'visible', timeout: 10_000 });
    const lt = (await legend.textContent()) ?? '';
    expect(lt).toContain('cooler');
    expect(lt).toContain('hotter');
    expect(lt).toContain('[K]');
    expect(lt).toContain('tree row − as designed');
    // The table: the tree row cools the café terrace on the daylight mean.
    const row = page.getByTestId('design-table').locator('tr', { hasText: 'café terrace' }).filter({ hasText: 'tree row' });
    const cells = await row.locator('td').allTextContents();
    expect(cells[2]).toMatch(/^−/);
    // Trees drawn: the view with the option's devices differs from the baseline design's view.
    await setSliderTo(14);
    const withTrees = decodePng(await shot('20-difference-tree-row-1400'));
    expect(pixelStats(withTrees).distinctColours).toBeGreaterThan(40);
    await page.screenshot({ path: join(SHOTS, '21-page-difference-tree-row.png') });
    await page.getByRole('button', { name: 'Daylight mean' }).click();
    await page.waitForTimeout(300);
    await shot('22-difference-daylight-mean');
    expect((await legend.textContent()) ?? '').toContain('mean over daylight hours');
    expect((await page.getByTestId('compare-note').textContent()) ?? '').toContain('devices drawn are those of “tree row”');
    expect(problems).toEqual([]);
  }, 240_000);

  it('adds a tree to an option by clicking the ground and edits its size', async () => {
    await page.getByRole('radiogroup', { name: 'Design shown' }).getByLabel('tree row').check();
    const before = decodePng(await shot('23-before-new-tree'));
    await page.locator('#device-type').selectOption('tree');
    await page.getByRole('button', { name: /Place: click the ground/ }).click();
    const box = (await page.locator('.view canvas').boundingBox())!;
    await page.mouse.click(box.x + box.width * 0.5, box.y + box.height * 0.82);
    const editor = page.getByTestId('device-editor');
    await editor.waitFor({ state: 'visible', timeout: 5_000 });
    expect((await editor.textContent()) ?? '').toContain('tree-1');
    await page.waitForTimeout(300);
    const after = decodePng(await shot('24-new-tree'));
    expect(meanAbsDiff(before, after)).toBeGreaterThan(0.2);
    const radius = editor.getByLabel('crownRadiusM');
    await radius.fill('4');
    await radius.press('Enter');
    await page.waitForTimeout(300);
    const bigger = decodePng(await shot('25-new-tree-bigger'));
    expect(meanAbsDiff(after, bigger)).toBeGreaterThan(0.1);
    // The option's devices in the saved project (autosave, debounced).
    await expect.poll(async () => {
      const saved = await page.evaluate(() => JSON.parse(localStorage.getItem('sunfacet.autosave.v1') ?? '{}'));
      const treeRow = saved.doc?.options?.find((o: { name: string }) => o.name === 'tree row');
      return treeRow?.devices?.some((d: { name?: string; crownRadiusM?: number }) => d.name === 'tree-1' && d.crownRadiusM === 4) ?? false;
    }, { timeout: 5_000 }).toBe(true);
    await page.getByRole('button', { name: 'Remove device' }).click();
    expect(problems).toEqual([]);
  }, 60_000);

  it('shows glare hours on the café terrace and the reflection paths at 19:00', async () => {
    await page.getByRole('radiogroup', { name: 'Design shown' }).getByLabel('as designed').check();
    await page.locator('#sensor-layer').selectOption('glareHours');
    const legend = page.getByTestId('legend-glare');
    await legend.waitFor({ state: 'visible', timeout: 5_000 });
    // choosing the glare layer turns the paths on
    expect(await page.getByLabel('Reflections reaching sensors at the time shown').isChecked()).toBe(true);
    expect((await page.locator('.glare .caution').textContent()) ?? '').toMatch(/licensed professional/);
    // Non-zero glare hours on the café terrace (read from the results the page shows).
    const zones = (await page.getByTestId('glare-zones').textContent()) ?? '';
    expect(Number(/café terrace: up to ([\d.]+) h/.exec(zones)?.[1])).toBeGreaterThan(0);
    const noPaths = decodePng(await shot('26-glare-hours-1400'));
    await setSliderTo(19);
    const summary = (await page.getByTestId('paths-summary').textContent()) ?? '';
    expect(summary).toMatch(/At 19:00: [1-9]\d* path/);
    const paths = decodePng(await shot('27-glare-paths-1900'));
    await page.getByLabel('Reflections reaching sensors at the time shown').uncheck();
    await page.waitForTimeout(300);
    const hidden = decodePng(await shot('27b-glare-1900-no-paths'));
    expect(meanAbsDiff(paths, hidden)).toBeGreaterThan(0.05);
    await page.getByLabel('Reflections reaching sensors at the time shown').check();
    expect(meanAbsDiff(noPaths, paths)).toBeGreaterThan(0.05);
    await page.screenshot({ path: join(SHOTS, '28-page-glare-1900.png') });
    await page.getByRole('button', { name: /About/ }).click();
    expect((await page.getByTestId('about-glare-caution').textContent()) ?? '').toMatch(/licensed professional/);
    await page.screenshot({ path: join(SHOTS, '29-about.png') });
    await page.keyboard.press('Escape');
    expect(problems).toEqual([]);
  }, 60_000);
});
