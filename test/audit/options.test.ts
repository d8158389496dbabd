/**
 * Design options and devices through the whole audit (invented test scenes): a fin array's beam
 * shade, a tree's seasonal transmittance, options run alone or together.
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { loadProject } from '../../src/audit/load.ts';
import { runDesigns, compareDesigns, type DesignRun } from '../../src/audit/options.ts';
import { prepareModel } from '../../src/audit/stages/model.ts';
import { buildSteps } from '../../src/audit/stages/steps.ts';
import { geometryPass } from '../../src/audit/stages/geometryPass.ts';
import { createInProcessExecutor } from '../../src/trace/pool/workerPool.ts';
import { projectedAreaFactor, BODY_ABSORPTANCE_SHORTWAVE, BODY_EMISSIVITY_LONGWAVE } from '../../src/physics/mrt.ts';
import { STEFAN_BOLTZMANN_W_M2K4, KELVIN_AT_0C } from '../../src/physics/constants.ts';
import { ObjScene, sceneProject, inMemoryReader, stepIndex } from '../helpers/auditScenes.ts';
import { ellipsoidChordM } from '../../src/trace/crowns.ts';

// A far marker box (the model needs a triangle); the fins stand free on a line along x at y = 0.
const obj = new ObjScene().box('marker', 'render', [200, 0, 0], [201, 1, 1]).text();

function finProject(extra: Record<string, unknown> = {}) {
  return {
    ...sceneProject({
      date: '2026-06-21',
      firstHour: 9,
      lastHour: 15,
      zones: [
        { name: 'behind fins', polygon: [[-0.4, 0.3], [0.4, 0.3], [0.4, 0.7], [-0.4, 0.7]], sensorHeightM: 1.1 },
        { name: 'in the open', polygon: [[39.6, 0.3], [40.4, 0.3], [40.4, 0.7], [39.6, 0.7]], sensorHeightM: 1.1 },
      ],
      sampling: { skyRaysPerPatch: 9, viewRays: 64 },
    }),
    baselineName: 'open',
    options: [
      {
        name: 'fins',
        devices: [{ type: 'fins', name: 'fin-array', from: [-4, 0], to: [4, 0], outside: 'right', bottomM: 0, topM: 3.2, depthM: 4, spacingM: 0.3, thicknessM: 0.02, angleDeg: 45, material: 'timber' }],
      },
      { name: 'white marker', materials: { render: 'paint-white' } },
    ],
    ...extra,
  };
}

describe('a fin array that blocks the noon beam', () => {
  let runs: DesignRun[];
  beforeAll(async () => {
    const loaded = await loadProject(JSON.stringify(finProject()), 'fins.json', inMemoryReader(obj));
    runs = await runDesigns(loaded, { now: () => new Date(0) });
  }, 60000);

  it('shades the sensor behind it and lowers its MRT by about the direct-beam term; the open sensor is unchanged', () => {
    const base = runs.find((r) => r.name === 'open')!.results;
    const fins = runs.find((r) => r.name === 'fins')!.results;
    const noon = stepIndex(base, '2026-06-21T12:00');
    const b = base.zones[0]!.sensors[0]!, f = fins.zones[0]!.sensors[0]!;
    expect(b.sunlit[noon]).toBe(true);
    expect(f.sunlit[noon]).toBe(false);
    // Hand calculation (six-directional method, VDI 3787-2; linearised): removing the beam
    // α·fp·I from the absorbed flux lowers MRT by ΔT ≈ α·fp·I / (4·ε·σ·T³), T the open MRT [K].
    // I = DNI (+ the circumsolar part, a few %), fp from the ASHRAE 55 table (mrt.ts).
    const dni = base.weather.dniWm2[noon]!;
    const fp = projectedAreaFactor('standing', base.sun[noon]!.altitudeDeg);
    const tK = b.mrtC[noon]! + KELVIN_AT_0C;
    const beamK = (BODY_ABSORPTANCE_SHORTWAVE * fp * dni) / (4 * BODY_EMISSIVITY_LONGWAVE * STEFAN_BOLTZMANN_W_M2K4 * tK ** 3);
    const drop = b.mrtC[noon]! - f.mrtC[noon]!;
    // The fins also replace part of the sensor's view of the sunlit sky and hot open ground with
    // their own cooler faces. That part is measured at 09:00, when the fins do not block the sun
    // (the sensor is sunlit in both designs), and scaled to noon by the global irradiance that
    // drives it (common practice for this screening check): expected = beam term + that part.
    const nine = stepIndex(base, '2026-06-21T09:00');
    expect(b.sunlit[nine] && f.sunlit[nine]).toBe(true);
    const otherAtNine = b.mrtC[nine]! - f.mrtC[nine]!;
    const other = otherAtNine * (base.weather.ghiWm2[noon]! / base.weather.ghiWm2[nine]!);
    // Tolerance 20 %: the circumsolar part of the beam (a few %), the scaling of the view part.
    expect(drop).toBeGreaterThan(beamK);
    expect(Math.abs(drop - (beamK + other))).toBeLessThan(0.2 * (beamK + other));
    // The sensor 40 m away: same sun, same sky; within sampling noise (0.3 K).
    const bo = base.zones[1]!.sensors[0]!, fo = fins.zones[1]!.sensors[0]!;
    expect(fo.sunlit[noon]).toBe(true);
    expect(Math.abs(fo.mrtC[noon]! - bo.mrtC[noon]!)).toBeLessThan(0.3);
  });

  it('options give identical results run alone or with the others', async () => {
    for (const name of ['fins', 'white marker']) {
      const loaded = await loadProject(JSON.stringify(finProject()), 'fins.json', inMemoryReader(obj));
      const alone = await runDesigns(loaded, { now: () => new Date(0) }, ['open', name]);
      const together = runs.find((r) => r.name === name)!;
      expect(JSON.stringify(alone.find((r) => r.name === name)!.results)).toBe(JSON.stringify(together.results));
    }
  }, 60000);

  it('compare.json holds the changes against the baseline', () => {
    const c = compareDesigns(runs, 'open');
    expect(c.baseline).toBe('open');
    const fins = c.options.find((o) => o.name === 'fins')!;
    const behind = fins.zones.find((z) => z.name === 'behind fins')!;
    expect(behind.meanMrtChangeK).toBeLessThan(0);
    expect(Object.keys(behind.hoursByCategoryChange)).toHaveLength(10);
    expect(c.options.find((o) => o.name === 'white marker')!.reusedGeometry).toBe(true);
  });
});

describe('a tree crown over a sensor', () => {
  // source: issue check — leaf-off passes the winter transmittance within 2 %, leaf-on the summer one
  // (Heisler 1986 ranges for the preset values; vegetation.ts).
  for (const [date, season] of [['2026-07-01', 'summer'], ['2026-01-15', 'winter']] as const) {
    it(`passes the ${season} transmittance of the beam to a sensor under its centre`, async () => {
      const summerT = 0.3, winterT = 0.68;
      const p = {
        ...sceneProject({
          date,
          firstHour: 12,
          lastHour: 12,
          zones: [{ name: 'under tree', polygon: [[0.8, -0.2], [1.2, -0.2], [1.2, 0.2], [0.8, 0.2]], sensorHeightM: 1.1 }],
        }),
        devices: [{ type: 'tree', name: 'oak', points: [[0, 0]], crownBaseM: 3, crownHeightM: 40, crownRadiusM: 60, trunkWidthM: 0.1, summerTransmittance: summerT, winterTransmittance: winterT, leafOnDate: '05-01', leafOffDate: '11-01' }],
      };
      const loaded = await loadProject(JSON.stringify(p), 'tree.json', inMemoryReader(obj));
      const model = await prepareModel(loaded);
      const steps = buildSteps(loaded.project);
      const geo = await geometryPass(model, steps, loaded.project.sampling, createInProcessExecutor(), {}, loaded.project.site.timeZone);
      const tau = geo.sensorSunTransmittance![0]!;
      // The stated τ holds for the vertical chord through the crown's centre (its height H, the
      // Beer–Lambert convention of vegetation.ts), so along the noon ray τ_ray = τ^(L/H) with L the
      // ray's chord through the ellipsoid (closed form, ellipsoidChordM).
      const [px, py, pz] = [model.sensors[0]!.positions[0]!, model.sensors[0]!.positions[1]!, model.sensors[0]!.positions[2]!];
      const L = ellipsoidChordM(0, 0, 23, 60, 60, 20, px, py, pz, steps.sunDir[0]!, steps.sunDir[1]!, steps.sunDir[2]!, Infinity);
      const stated = season === 'summer' ? summerT : winterT;
      const expected = Math.pow(stated, L / 40);
      expect(geo.sensorSun[0]).toBe(1);
      expect(Math.abs(tau - expected) / expected).toBeLessThan(0.02);
      // and through the crown's centre vertically the stated value itself (exp(−k·H) = τ)
      expect(Math.pow(stated, ellipsoidChordM(0, 0, 23, 60, 60, 20, 0, 0, 1, 0, 0, 1, Infinity) / 40)).toBeCloseTo(stated, 10);
    }, 30000);
  }
});
