// The viewer's worker API called in-process (no Worker), as STYLE §10 asks.
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { createAuditApi, makeReadRelative } from '../../src/app/compute/auditApi.ts';
import { sensorSeries, UTCI_CATEGORY_IDS, type ResultsView } from '../../src/app/compute/resultColumns.ts';
import type { Results } from '../../src/audit/results.ts';

/** Every typed array's buffer in a results view (what the worker transfers). */
function viewBuffers(v: ResultsView): ArrayBufferLike[] {
  const out: ArrayBufferLike[] = [];
  for (const z of v.zones) for (const a of [z.positions, z.skyViewFactor, z.mrtC, z.utciC, z.category, z.sunlit, z.glare]) if (a) out.push(a.buffer);
  for (const a of [v.surfaces.areaM2, v.surfaces.shortwave, v.surfaces.surfaceTemp, v.surfaces.longwave]) out.push(a.buffer);
  if (v.paths) for (const a of [v.paths.step, v.paths.zone, v.paths.receiver, v.paths.point]) out.push(a.buffer);
  return out;
}

const text = readFileSync(new URL('../../public/demo/project.json', import.meta.url), 'utf8');
const glb = new Uint8Array(readFileSync(new URL('../../public/demo/demo-terrace.glb', import.meta.url)));
const job = { projectText: text, projectFile: 'project.json', files: { 'demo-terrace.glb': glb } };

describe('audit worker API (in-process)', () => {
  it('opens the demo model in the model frame with its surfaces and bounds', async () => {
    const m = await createAuditApi().openModel(glb.slice(), 'demo-terrace.glb', { upAxis: 'y' });
    expect(m.surfaceNames.length).toBeGreaterThan(5);
    expect(m.indices.length % 3).toBe(0);
    // The invented demo is 45 m × 30 m × 21 m (src/geometry/demoModel.ts); 1 mm tolerance.
    expect(m.bounds[3] - m.bounds[0]).toBeCloseTo(45, 3);
    expect(m.bounds[5] - m.bounds[2]).toBeCloseTo(21, 3);
  });

  it('refuses a broken OBJ with a message naming the file and line', async () => {
    await expect(createAuditApi().openModel(new TextEncoder().encode('v 0 0 0\nf 1 2 3\n'), 'bad.obj', {})).rejects.toThrow(/bad\.obj: line 2/);
  });

  it('gives one sun position per step of the period', async () => {
    const sp = await createAuditApi().sunPath(job);
    expect(sp.times.length).toBe(24);
    expect(sp.sun.length).toBe(24);
    expect(sp.times[0]).toBe('2026-07-15T00:00:00+02:00');
  });

  it('says which file is missing, and cancels a running audit', async () => {
    const api = createAuditApi();
    await expect(api.sunPath({ ...job, files: {} })).resolves.toBeDefined(); // clear-sky: the model is not read
    await expect(makeReadRelative({}, undefined)('scene.glb')).rejects.toThrow(/scene\.glb was not opened with the project/);
    let cancelled = false;
    const run = api.runAudit(7, job, () => {
      if (!cancelled) {
        cancelled = true;
        api.cancel(7);
      }
    });
    await expect(run).rejects.toThrow(/cancel|abort/i);
  }, 60_000);
});

describe('re-running reuses the geometry pass', () => {
  const doc = JSON.parse(text) as Record<string, unknown> & { weather: Record<string, unknown>; materials: Record<string, unknown> };
  const jobOf = (d: unknown) => ({ projectText: JSON.stringify(d), projectFile: 'project.json', files: { 'demo-terrace.glb': glb } });

  it('reuses model and geometry after a weather change, the geometry after a material change, and equals a fresh run', async () => {
    const api = createAuditApi();
    const stages: string[] = [];
    const first = await api.runAudit(1, jobOf(doc), (p) => stages.push(p.stage));
    expect(first.reused).toBe('none');
    expect(stages).not.toContain('reusing the geometry pass');

    const warmer = { ...doc, weather: { ...doc.weather, airTempC: { min: 20, max: 35 }, windMs: 1 } };
    const s2: string[] = [];
    const second = await api.runAudit(2, jobOf(warmer), (p) => s2.push(p.stage));
    expect(second.reused).toBe('model and geometry');
    expect(s2).toContain('reusing the geometry pass');
    expect(s2.filter((s) => /sky seen|sun on|surface views/.test(s))).toEqual([]);
    // The reused run equals a run from scratch of the same project (same seed, deterministic).
    const fresh = await createAuditApi().runAudit(3, jobOf(warmer));
    expect(fresh.reused).toBe('none');
    expect(second.results).toEqual(fresh.results);
    // …and differs from the first run (warmer air).
    const utci0 = (r: ResultsView) => Array.from(sensorSeries(r.zones[0]!, 'utciC', 0, r.steps));
    expect(utci0(second.results)).not.toEqual(utci0(first.results));
    console.log(`geometry reuse (weather change): first ${first.timingsMs.total} ms, re-run ${second.timingsMs.total} ms`);

    const darker = { ...warmer, materials: { ...doc.materials, 'render-light': { preset: 'concrete-light', reflectanceVisible: 0.2, reflectanceNir: 0.25 } } };
    const third = await api.runAudit(4, jobOf(darker));
    expect(third.reused).toBe('geometry');
    const fresh3 = await createAuditApi().runAudit(5, jobOf(darker));
    expect(third.results).toEqual(fresh3.results);
    const at14 = (r: ResultsView) => Array.from({ length: r.surfaces.count }, (_, i) => r.surfaces.surfaceTemp[i * r.steps + 14]);
    expect(at14(third.results)).not.toEqual(at14(second.results));
    console.log(`geometry reuse (material change): fresh ${fresh3.timingsMs.total} ms, re-run ${third.timingsMs.total} ms`);

    // The page gets typed-array columns, each on its own buffer (so all can be transferred);
    // the full Results stay in the worker and come back as the CLI's results.json text.
    const bufs = viewBuffers(third.results);
    expect(new Set(bufs).size).toBe(bufs.length);
    expect(bufs.every((b) => b instanceof ArrayBuffer)).toBe(true);
    const full = JSON.parse(new TextDecoder().decode(await api.exportResults())) as Results;
    expect(full.sunfacet).toBe(1);
    expect(full.times).toEqual(third.results.times);
    const z0 = full.zones[0]!, v0 = third.results.zones[0]!;
    expect(v0.sensorCount).toBe(z0.sensors.length);
    // Float32 columns: equal to the full values within float32 rounding (relative 1e-7, common practice)
    z0.sensors.forEach((s, i) => s.mrtC.forEach((m, t) => expect(Math.abs(v0.mrtC[i * third.results.steps + t]! - m)).toBeLessThanOrEqual(Math.abs(m) * 1.2e-7 + 1e-12)));
    z0.sensors.forEach((s, i) => s.category.forEach((c, t) => expect(UTCI_CATEGORY_IDS[v0.category[i * third.results.steps + t]!]).toBe(c)));
    expect(third.results.surfaces.ids).toEqual(full.surfaces.map((s) => s.id));

    // Moving north changes the sun directions in the model: nothing is reused.
    const turned = { ...darker, site: { ...(doc.site as object), northDeg: 10 } };
    expect((await api.runAudit(6, jobOf(turned))).reused).toBe('none');
  }, 180_000);
});
