/**
 * Incremental re-trace of added devices (stages/retrace.ts) and tree crowns in the sky and view
 * queries (invented test scenes).
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { loadProject, type LoadedProject } from '../../src/audit/load.ts';
import { runDesigns, designProjects, type DesignRun } from '../../src/audit/options.ts';
import { prepareModel, type PreparedModel } from '../../src/audit/stages/model.ts';
import { buildSteps } from '../../src/audit/stages/steps.ts';
import { geometryPass, type GeometryData } from '../../src/audit/stages/geometryPass.ts';
import { addedDeviceBoxes, designPatchStreams, retraceGeometry, DEVICE_STREAM_BASE, type RetraceStats } from '../../src/audit/stages/retrace.ts';
import { createInProcessExecutor } from '../../src/trace/pool/workerPool.ts';
import { surfaceViews } from '../../src/trace/queries/surfaceViews.ts';
import { ellipsoidChordM } from '../../src/trace/crowns.ts';
import { ObjScene, sceneProject, inMemoryReader } from '../helpers/auditScenes.ts';

// A block with a south wall at y = 10, two small markers that fix the model's footprint (so the
// ground apron does not change when the fins are added), a terrace in front and a yard behind.
const obj = new ObjScene()
  .box('block', 'render', [0, 10, 0], [12, 16, 8])
  .box('marker-sw', 'render', [-6, -6, 0], [-5.8, -5.8, 0.2])
  .box('marker-ne', 'render', [18, 22, 0], [18.2, 22.2, 0.2])
  .text();

function project(): Record<string, unknown> {
  return {
    ...sceneProject({
      date: '2026-06-21',
      firstHour: 8,
      lastHour: 16,
      ground: { material: 'stone-paving' },
      zones: [
        { name: 'terrace', polygon: [[2, 4], [10, 4], [10, 8], [2, 8]], sensorHeightM: 1.1, spacingM: 2 },
        { name: 'yard', polygon: [[2, 18], [10, 18], [10, 21], [2, 21]], sensorHeightM: 1.1, spacingM: 2 },
      ],
      sampling: { skyRaysPerPatch: 4, viewRays: 16 },
    }),
    baselineName: 'as built',
    options: [
      { name: 'fins', devices: [{ type: 'fins', name: 'fin-array', from: [1, 10], to: [11, 10], outside: 'right', bottomM: 0.5, topM: 6, depthM: 0.5, spacingM: 1, thicknessM: 0.04, angleDeg: 20, material: 'timber' }] },
      { name: 'tree', devices: [{ type: 'tree', name: 'lime', points: [[6, 2.5]], crownBaseM: 2.5, crownHeightM: 3, crownRadiusM: 1.5, trunkWidthM: 0.2, crown: 'deciduous-dense' }] },
    ],
  };
}

function expectSameGeometry(a: GeometryData, b: GeometryData): void {
  expect(a.sunCount).toBe(b.sunCount);
  expect(Array.from(a.sunIndexOfStep)).toEqual(Array.from(b.sunIndexOfStep));
  for (const key of ['patchSun', 'sensorSun', 'patchSkyBand', 'sensorSkyBand', 'sensorSkyViewFactor', 'patchSunTransmittance', 'sensorSunTransmittance'] as const) {
    const x = a[key], y = b[key];
    expect(x === undefined, key).toBe(y === undefined);
    if (x && y) expect(Buffer.from(x.buffer, x.byteOffset, x.byteLength).equals(Buffer.from(y.buffer, y.byteOffset, y.byteLength)), key).toBe(true);
  }
  for (const v of ['patchViews', 'sensorViews'] as const) {
    for (const key of ['rowStart', 'patchIndex', 'fraction', 'skyFraction', 'groundFraction', 'otherFraction'] as const) {
      const x = a[v][key], y = b[v][key];
      expect(Buffer.from(x.buffer, x.byteOffset, x.byteLength).equals(Buffer.from(y.buffer, y.byteOffset, y.byteLength)), `${v}.${key}`).toBe(true);
    }
  }
}

describe('incremental re-trace of added devices', () => {
  let loaded: LoadedProject;
  let base: { model: PreparedModel; geometry: GeometryData; patchStreams: Uint32Array | undefined };
  beforeAll(async () => {
    loaded = await loadProject(JSON.stringify(project()), 'retrace.json', inMemoryReader(obj));
    const model = await prepareModel(loaded);
    const steps = buildSteps(loaded.project);
    const geometry = await geometryPass(model, steps, loaded.project.sampling, createInProcessExecutor(), {}, '+00:00');
    base = { model, geometry, patchStreams: undefined };
  }, 60000);

  for (const name of ['fins', 'tree']) {
    it(`the "${name}" option re-traced on the baseline equals its full trace bit for bit, and traces less`, async () => {
      const d = designProjects(loaded.project).find((x) => x.name === name)!;
      const sub: LoadedProject = { ...loaded, project: d.project };
      const model = await prepareModel(sub);
      const steps = buildSteps(d.project);
      const streams = designPatchStreams(model, d.project.devices);
      expect(streams).toBeDefined();
      // device patches sit before the apron's in the list; the apron keeps its baseline streams
      const firstGround = model.patches.ids.findIndex((id) => id.startsWith('ground'));
      const devicePatches = model.patches.count - base.model.patches.count;
      expect(devicePatches).toBeGreaterThan(0);
      expect(streams![firstGround]).toBe(firstGround - devicePatches);
      expect(streams![firstGround - 1]).toBeGreaterThanOrEqual(DEVICE_STREAM_BASE);
      const tracer = createInProcessExecutor();
      const t0 = performance.now();
      const full = await geometryPass(model, steps, d.project.sampling, tracer, { patchStreams: streams }, '+00:00');
      const fullMs = performance.now() - t0;
      const t1 = performance.now();
      const inc = await retraceGeometry({ base, model, patchStreams: streams, addedBoxes: addedDeviceBoxes(d.project.devices, 0), steps, sampling: d.project.sampling, tracer, siteTimeZone: '+00:00' });
      const incMs = performance.now() - t1;
      expect(inc.reason).toBeUndefined();
      expectSameGeometry(inc.geometry!, full);
      const s: RetraceStats = inc.stats!;
      // New patches are always traced; the yard behind the block never sees the devices.
      expect(s.traced.patchViews).toBeGreaterThanOrEqual(s.newPatches);
      expect(s.shareOfRaysTraced).toBeGreaterThan(0);
      expect(s.shareOfRaysTraced).toBeLessThan(0.8);
      const yard0 = model.sensors[0]!.positions.length / 3;
      expect(s.traced.sensorViews).toBeLessThanOrEqual(yard0);
      console.log(`retrace ${name}: ${s.patches} patches (${s.newPatches} new), ${s.sensors} sensors; rays traced ${(100 * s.shareOfRaysTraced).toFixed(1)} % of ${s.rays.full}; full ${fullMs.toFixed(0)} ms, incremental ${incMs.toFixed(0)} ms (probe ${s.timingsMs.probe} ms)`);
    }, 60000);
  }

  it('runDesigns gives byte-identical results with and without the incremental re-trace', async () => {
    const inc: DesignRun[] = await runDesigns(loaded, { now: () => new Date(0) });
    const full: DesignRun[] = await runDesigns(loaded, { now: () => new Date(0), fullTrace: true });
    for (const name of ['as built', 'fins', 'tree']) {
      const a = inc.find((r) => r.name === name)!, b = full.find((r) => r.name === name)!;
      expect(JSON.stringify(a.results), name).toBe(JSON.stringify(b.results));
    }
    expect(inc.find((r) => r.name === 'fins')!.retrace).toBeDefined();
    expect(full.find((r) => r.name === 'fins')!.retrace).toBeUndefined();
  }, 120000);
});

describe('tree crowns in the sky and the views', () => {
  // A wide crown over the sensor (as in options.test.ts): centre z = 23 m, semi-axes 60, 60, 20 m.
  const marker = new ObjScene().box('marker', 'render', [200, 0, 0], [201, 1, 1]).text();
  const summerT = 0.3;
  const tree = { type: 'tree', name: 'oak', points: [[0, 0]], crownBaseM: 3, crownHeightM: 40, crownRadiusM: 60, trunkWidthM: 0.1, summerTransmittance: summerT, winterTransmittance: 0.68, leafOnDate: '05-01', leafOffDate: '11-01' };
  const p = (devices: unknown[]) => ({
    ...sceneProject({ date: '2026-07-01', firstHour: 12, lastHour: 12, zones: [{ name: 'under', polygon: [[0.8, -0.2], [1.2, -0.2], [1.2, 0.2], [0.8, 0.2]], sensorHeightM: 1.1 }], sampling: { skyRaysPerPatch: 16, viewRays: 1024 } }),
    devices,
  });
  async function pass(devices: unknown[]) {
    const loaded = await loadProject(JSON.stringify(p(devices)), 'tree.json', inMemoryReader(marker));
    const model = await prepareModel(loaded);
    const steps = buildSteps(loaded.project);
    return { model, geo: await geometryPass(model, steps, loaded.project.sampling, createInProcessExecutor(), {}, '+00:00') };
  }

  it('a sensor under the crown sees the sky through it: ψ_s drops to the cosine-weighted mean crown transmittance, and its view rows sum to 1', async () => {
    const open = await pass([]);
    const shaded = await pass([tree]);
    const [px, py, pz] = Array.from(shaded.model.sensors[0]!.positions.subarray(0, 3));
    // Beer–Lambert per direction with k = −ln τ / H (vegetation.ts), τ(ω) = τ^(L(ω)/H), L the chord
    // through the ellipsoid (closed form); ψ_s = (1/π) ∫ τ(ω) cos θ dω by midpoint quadrature.
    // source: Beer–Lambert law for canopies, Campbell & Norman 1998 ch. 15 (from memory); ψ_s per DESIGN §4.
    let sum = 0;
    const nT = 400, nA = 360;
    for (let i = 0; i < nT; i++) {
      const th = ((i + 0.5) / nT) * (Math.PI / 2);
      for (let j = 0; j < nA; j++) {
        const ph = ((j + 0.5) / nA) * 2 * Math.PI;
        const dx = Math.sin(th) * Math.cos(ph), dy = Math.sin(th) * Math.sin(ph), dz = Math.cos(th);
        const L = ellipsoidChordM(0, 0, 23, 60, 60, 20, px!, py!, pz!, dx, dy, dz, Infinity);
        sum += Math.pow(summerT, L / 40) * Math.cos(th) * Math.sin(th) * (Math.PI / 2 / nT) * (2 * Math.PI / nA);
      }
    }
    const expected = sum / Math.PI;
    expect(open.geo.sensorSkyViewFactor[0]).toBeCloseTo(1, 3);
    // the crown covers nearly the whole sky: ψ_s ≈ the mean τ, below the vertical τ (longer slant chords)
    expect(expected).toBeLessThan(summerT);
    expect(expected).toBeGreaterThan(0.05);
    // tolerance: sky sampling with 16 rays per patch (±0.01) and the trunk in the view (±0.005)
    expect(Math.abs(shaded.geo.sensorSkyViewFactor[0]! - expected)).toBeLessThan(0.02);
    const v = shaded.geo.sensorViews;
    for (let r = 0; r < 6; r++) {
      let s = v.skyFraction[r]! + v.groundFraction[r]! + v.otherFraction[r]!;
      for (let e = v.rowStart[r]!; e < v.rowStart[r + 1]!; e++) s += v.fraction[e]!;
      expect(Math.abs(s - 1)).toBeLessThan(1e-5);
    }
    // upward view: the sky part is the transmitted part (same integral, 1024 samples: ±0.03),
    // the crown part (in otherFraction, at air temperature) the rest
    expect(Math.abs(v.skyFraction[0]! - expected)).toBeLessThan(0.03);
    expect(Math.abs(v.otherFraction[0]! - (1 - expected))).toBeLessThan(0.03);
    // the open sensor's upward view is all sky
    expect(open.geo.sensorViews.skyFraction[0]).toBeCloseTo(1, 5);
  }, 60000);

  it('surfaceViews reports the crown part separately, inside otherFraction; without crowns the numbers are unchanged', async () => {
    const shaded = await pass([tree]);
    const m = shaded.model;
    const crowns = m.transmission!.crowns;
    const pts = m.sensors[0]!.positions.subarray(0, 3);
    const input = { points: Float64Array.from(pts), directions: 'six' as const, trianglePatch: Int32Array.from(m.patches.patchOfTriangle), patchCount: m.patches.count, samplesPerDirection: 256, seed: 7 };
    const k = Float64Array.from({ length: crowns.count }, () => -Math.log(summerT) / 40);
    const withC = surfaceViews(m.bvh, { ...input, crowns, crownExtinctionPerM: k });
    const without = surfaceViews(m.bvh, input);
    const noCrowns = surfaceViews(m.bvh, { ...input, crowns: { ...crowns, count: 0 }, crownExtinctionPerM: new Float64Array(0) });
    expect(withC.crownFraction).toBeDefined();
    expect(withC.crownFraction![0]!).toBeGreaterThan(0.5);
    for (let r = 0; r < 6; r++) {
      expect(withC.otherFraction[r]!).toBeGreaterThanOrEqual(withC.crownFraction![r]! - 1e-6);
      // the crown part is what is missing from sky, ground and surfaces
      const seen = (x: typeof withC) => { let s = x.skyFraction[r]! + x.groundFraction[r]!; for (let e = x.rowStart[r]!; e < x.rowStart[r + 1]!; e++) s += x.fraction[e]!; return s + x.otherFraction[r]! - (x.crownFraction?.[r] ?? 0); };
      expect(Math.abs(seen(withC) + withC.crownFraction![r]! - 1)).toBeLessThan(1e-5);
      expect(withC.skyFraction[r]!).toBeLessThanOrEqual(without.skyFraction[r]! + 1e-7);
    }
    expect(JSON.stringify(noCrowns)).toBe(JSON.stringify(without));
  }, 60000);
});
