/**
 * The review report and the results glTF, on one tiny invented scene audited once (a sunlit
 * courtyard between two blocks, one day): numbers in the HTML equal summary.json's, the HTML
 * renders in headless Chromium without console errors, the PDF has the expected pages and the zone
 * names, and the glTF validates and re-imports with the same triangle count.
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { mkdtemp, writeFile, readFile } from 'node:fs/promises';
import { execFileSync } from 'node:child_process';
import os from 'node:os';
import path from 'node:path';
import { createRequire } from 'node:module';
import { ObjScene, sceneProject, inMemoryReader } from '../helpers/auditScenes.ts';
import { loadProject } from '../../src/audit/load.ts';
import { runAuditWithState, type RunRecord } from '../../src/audit/pipeline.ts';
import { summarizeResults, type Summary } from '../../src/audit/summary.ts';
import type { Results } from '../../src/audit/results.ts';
import { prepareModel, type PreparedModel } from '../../src/audit/stages/model.ts';
import { buildReportHtml, CAUTIONS } from '../../src/report/html.ts';
import { resultsGlb, pickStep } from '../../src/report/gltfResults.ts';
import { contactGroupOf } from '../../src/report/contactBurn.ts';
import { zoneUtciSeries, sensorMetric } from '../../src/report/zoneData.ts';
import { importGltf } from '../../src/geometry/import/index.ts';
import { htmlToPdf } from '../../src/cli/pdf.ts';

const require = createRequire(import.meta.url);

const obj = new ObjScene()
  .box('block-west', 'cladding', [0, 0, 0], [4, 10, 8])
  .box('block-east', 'render', [10, 0, 0], [14, 10, 6])
  .text();
const project = sceneProject({
  name: 'invented courtyard',
  materials: { cladding: 'steel-dark-painted', render: 'concrete-light' },
  ground: { material: 'stone-paving' },
  zones: [
    { name: 'courtyard north', polygon: [[5, 6], [9, 6], [9, 9], [5, 9]], spacingM: 1 },
    { name: 'courtyard south', polygon: [[5, 1], [9, 1], [9, 4], [5, 4]], spacingM: 1, posture: 'seated', sensorHeightM: 0.6 },
  ],
  airTempC: { min: 20, max: 33 },
});

let results: Results, summary: Summary, record: RunRecord, model: PreparedModel, html: string;

beforeAll(async () => {
  const loaded = await loadProject(JSON.stringify(project), 'test.json', inMemoryReader(obj));
  const r = await runAuditWithState(loaded, { now: () => new Date('2026-06-22T08:00:00Z') });
  // Through JSON, as the CLI reads it back from results.json / summary.json.
  results = JSON.parse(JSON.stringify(r.results));
  record = r.record;
  summary = JSON.parse(JSON.stringify(summarizeResults(results, { stepHours: 1 })));
  model = await prepareModel(loaded);
  html = await buildReportHtml({ results, summary, run: record, madeAt: '2026-06-22T09:00:00Z' });
}, 120_000);

/** Value at a dotted path ("zones.0.peakMrt.valueC") of an object. */
function at(obj: unknown, p: string): unknown {
  return p.split('.').reduce<unknown>((o, k) => (o === null || o === undefined ? undefined : (o as Record<string, unknown>)[k]), obj);
}

describe('report HTML', () => {
  it('every tagged figure equals summary.json at its path (to the printed decimals)', () => {
    const tags = [...html.matchAll(/<span class="num" data-summary="([^"]+)">([^<]*)<\/span>/g)];
    expect(tags.length).toBeGreaterThan(60);
    const paths = new Set(tags.map((t) => t[1]));
    // Each zone's peak MRT, peak UTCI and every category's hours, and each material's peak and p95 are present.
    for (let z = 0; z < summary.zones.length; z++) {
      for (const k of ['peakMrt.valueC', 'peakUtci.valueC', 'mrtAbove.meanHours', 'medianSkyViewFactor']) expect(paths.has(`zones.${z}.${k}`)).toBe(true);
      for (let c = 0; c < 10; c++) expect(paths.has(`zones.${z}.categoryHours.${c}.meanHours`)).toBe(true);
    }
    for (let m = 0; m < summary.materials.length; m++) {
      expect(paths.has(`materials.${m}.peakSurfaceTemp.valueC`)).toBe(true);
      expect(paths.has(`materials.${m}.p95SurfaceTempC`)).toBe(true);
    }
    for (const [, p, text] of tags) {
      const expected = at(summary, p!);
      expect(typeof expected, p).toBe('number');
      // Printed with 0–2 decimals; summary values are already rounded to 0.1 (0.01 for sky view).
      expect(Math.abs(Number(text) - (expected as number)), `${p}: "${text}" vs ${expected}`).toBeLessThan(1e-9);
    }
  });

  it('carries the cautions, the zone names, the model hash and the glare hours', () => {
    for (const c of CAUTIONS) expect(html).toContain(c.replace(/'/g, '&#39;'));
    for (const z of summary.zones) expect(html).toContain(`Zone: ${z.name}`);
    expect(html).toContain(String(results.run.modelHashFnv1a32));
    // the audit now traces reflected sun: the zone pages carry glare hours (issue 7)
    expect(html).toContain('Glare hours');
    expect(html).not.toContain('not assessed in this run');
    expect(html).not.toContain('Design options'); // no options given
    expect(html).not.toMatch(/<script|https?:\/\/(?!www\.w3\.org)/); // self-contained, no network
  });

  it('colours one plan cell per sensor, with the per-sensor hours of strong heat stress or worse', () => {
    const zone = results.zones[0]!;
    const section = html.split('Zone: ')[1]!;
    const cells = [...section.matchAll(/class="sensor" data-sensor="(\d+)" data-value="([^"]*)"/g)];
    expect(cells.length).toBe(zone.sensors.length);
    const hot = new Set(['strong-heat', 'very-strong-heat', 'extreme-heat']);
    for (const [, i, v] of cells) {
      const s = zone.sensors[Number(i)]!;
      expect(Number(v)).toBe(s.category.filter((c) => hot.has(c)).length); // 1 h steps
    }
  });

  it('median and hottest-sensor series bound the zone: median ≤ hottest, hottest = max of sensors', () => {
    const zone = results.zones[0]!;
    const s = zoneUtciSeries(zone, results.times.length);
    for (let t = 0; t < results.times.length; t++) {
      expect(s.medianUtciC[t]!).toBeLessThanOrEqual(s.worstUtciC[t]!);
      expect(s.worstUtciC[t]).toBe(Math.max(...zone.sensors.map((x) => x.utciC[t]!)));
    }
    expect(Math.max(...sensorMetric(zone, 'peakMrt', 1))).toBeCloseTo(summary.zones[0]!.peakMrt!.valueC, 1);
  });

  it('shows the options section only when options are given, with a difference map per zone', async () => {
    const alt: Results = JSON.parse(JSON.stringify(results));
    for (const z of alt.zones) for (const s of z.sensors) s.category = s.category.map(() => 'no-stress');
    const altSummary = summarizeResults(alt, { stepHours: 1 });
    const withOpt = await buildReportHtml({ results, summary, run: record, options: [{ name: 'with canopy', results: alt, summary: altSummary }] });
    expect(withOpt).toContain('Design options');
    expect(withOpt).toContain('with canopy − base');
    expect((withOpt.match(/<figure class="diff">/g) ?? []).length).toBe(results.zones.length);
  });

  it('groups materials for the contact screening by preset name', () => {
    expect(contactGroupOf('steel-dark-painted')).toBe('metal');
    expect(contactGroupOf('glass-clear')).toBe('glass-mineral');
    expect(contactGroupOf('timber')).toBe('wood');
    expect(contactGroupOf('grass')).toBe('not-touched');
  });
});

describe('report in headless Chromium', () => {
  it('renders without console errors; the PDF has cover + one page per zone + materials + method, with the zone names', async () => {
    const { pdf, consoleErrors } = await htmlToPdf(html, 'invented courtyard · test');
    expect(consoleErrors).toEqual([]);
    const dir = await mkdtemp(path.join(os.tmpdir(), 'sunfacet-report-test-'));
    const file = path.join(dir, 'r.pdf');
    await writeFile(file, pdf);
    const info = execFileSync('pdfinfo', [file], { encoding: 'utf8' });
    expect(Number(/Pages:\s+(\d+)/.exec(info)?.[1])).toBe(3 + results.zones.length);
    const text = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
    for (const z of summary.zones) expect(text).toContain(`Zone: ${z.name}`);
    expect(text).toContain('does not certify');
  }, 60_000);
});

describe('results glTF', () => {
  it('validates with the Khronos glTF validator (no errors) and re-imports with the same triangle count', async () => {
    const step = pickStep(results, 'surfaceTempC', results.times[15]);
    expect(step).toBe(15);
    const bytes = resultsGlb(model.patches, results, { metric: 'surfaceTempC', stepIndex: step });
    const validator = require('gltf-validator') as { validateBytes: (b: Uint8Array, o?: object) => Promise<{ issues: { numErrors: number; messages: unknown[] } }> };
    const report = await validator.validateBytes(bytes, { maxIssues: 50 });
    expect(report.issues.numErrors, JSON.stringify(report.issues.messages.slice(0, 5))).toBe(0);
    const scene = await importGltf(bytes, 'results.glb');
    const triangles = model.patches.scene.indices.length / 3;
    expect(scene.indices.length / 3).toBe(triangles);
    // Engine frame round trip: the re-imported bounds equal the patches' bounds (within float32).
    const bounds = (p: ArrayLike<number>) => [0, 1, 2].map((k) => { let lo = Infinity, hi = -Infinity; for (let i = k; i < p.length; i += 3) { lo = Math.min(lo, p[i]!); hi = Math.max(hi, p[i]!); } return [lo, hi]; });
    const a = bounds(scene.positions), b = bounds(model.patches.scene.positions);
    for (let k = 0; k < 3; k++) for (let j = 0; j < 2; j++) expect(Math.abs(a[k]![j]! - b[k]![j]!)).toBeLessThan(1e-4);
  });

  it('puts each patch value in extras and a matching COLOR_0 per vertex', () => {
    const bytes = resultsGlb(model.patches, results, { metric: 'surfaceTempC', stepIndex: 15 });
    const dv = new DataView(bytes.buffer, bytes.byteOffset);
    const jsonLen = dv.getUint32(12, true);
    const json = JSON.parse(new TextDecoder().decode(bytes.subarray(20, 20 + jsonLen)));
    expect(json.extras.time).toBe(results.times[15]);
    const byId = new Map(results.surfaces.map((s) => [s.id, s.surfaceTempC[15]]));
    let n = 0;
    for (const node of json.nodes) {
      node.extras.patchIds.forEach((id: string, k: number) => { expect(node.extras.values[k]).toBe(byId.get(id)); n++; });
      expect(json.meshes[node.mesh].primitives[0].attributes.COLOR_0).toBeTypeOf('number');
    }
    expect(n).toBe(results.surfaces.length);
  });

  it('refuses patches of another model', () => {
    const other = { ...results, surfaces: results.surfaces.slice(1) };
    expect(() => resultsGlb(model.patches, other, { metric: 'surfaceTempC', stepIndex: 0 })).toThrow(/patches/);
  });
});
