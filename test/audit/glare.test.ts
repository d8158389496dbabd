/**
 * The glare stage end to end on invented scenes (OBJ text + project object → loadProject →
 * runAuditWithState): reflected sun off a glazed wall onto a terrace and two viewpoints, the same
 * wall made matte, the MRT wiring of the reflected beams, and a concave façade of thin glass facets
 * that focuses the sun.
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { loadProject } from '../../src/audit/load.ts';
import { runAuditWithState, type AuditState } from '../../src/audit/pipeline.ts';
import type { Results } from '../../src/audit/results.ts';
import { summarizeResults, type Summary } from '../../src/audit/summary.ts';
import { runTimeSteps } from '../../src/audit/stages/timeStep.ts';
import { glareStage, glareCategoryCode, retinalIrradianceWcm2, afterImageThresholdWcm2, retinalBurnThresholdWcm2, GLARE_CATEGORIES } from '../../src/audit/stages/glare.ts';
import { paneStackReflectance } from '../../src/physics/fresnel.ts';
import { projectedAreaFactor, BODY_ABSORPTANCE_SHORTWAVE, BODY_EMISSIVITY_LONGWAVE } from '../../src/physics/mrt.ts';
import { STEFAN_BOLTZMANN_W_M2K4 as SIGMA, KELVIN_AT_0C } from '../../src/physics/constants.ts';
import { InputError } from '../../src/physics/errors.ts';
import { parseProjectText } from '../../src/audit/project.ts';
import { ObjScene, sceneProject, inMemoryReader } from '../helpers/auditScenes.ts';

const DEG = Math.PI / 180;

async function run(objText: string, project: Record<string, unknown>): Promise<{ results: Results; state: AuditState; summary: Summary }> {
  const loaded = await loadProject(JSON.stringify(project), 'test.json', inMemoryReader(objText));
  const { results, state } = await runAuditWithState(loaded, { now: () => new Date(0) });
  return { results, state, summary: summarizeResults(results, { stepHours: 1 }) };
}

/** Unit vector toward the sun from Results.sun (altitude, azimuth clockwise from north). */
function sunVector(r: Results, t: number): [number, number, number] {
  const a = r.sun[t]!.altitudeDeg * DEG, z = r.sun[t]!.azimuthDeg * DEG;
  return [Math.cos(a) * Math.sin(z), Math.cos(a) * Math.cos(z), Math.sin(a)];
}

describe('a glazed west wall reflecting the afternoon sun onto a terrace', () => {
  // A 10 m deep, 30 m long, 12 m tall block whose west face (x = 20) looks over a terrace
  // x 2–16, y −5…5. 45° N, 21 June, 12:00–20:00 (clock noon ≈ solar noon at 0° E, +00:00).
  const obj = new ObjScene().box('wall', 'wall-finish', [20, -15, 0], [30, 15, 12]).text();
  const project = (wallMaterial: string) => ({
    ...sceneProject({
      materials: { wall: wallMaterial },
      zones: [{ name: 'terrace', polygon: [[2, -5], [16, -5], [16, 5], [2, 5]], spacingM: 2, posture: 'seated' }],
      firstHour: 12,
      lastHour: 20,
      sampling: { skyRaysPerPatch: 1, viewRays: 16 },
    }),
    viewpoints: [
      { name: 'facing the wall', position: [10, 0, 1.2], viewDirectionDeg: 90, fieldDeg: 30 },
      { name: 'facing away', position: [10, 0, 1.2], viewDirectionDeg: 270, fieldDeg: 30 },
    ],
  });
  let glass: Awaited<ReturnType<typeof run>>;
  let matte: Awaited<ReturnType<typeof run>>;
  beforeAll(async () => {
    glass = await run(obj, project('glass-clear'));
    matte = await run(obj, project('concrete-light'));
  }, 120_000);

  it('the glass reflects the sun onto the terrace and gives glare hours; the matte wall gives none', () => {
    const g = glass.summary.zones[0]!.glare!;
    expect(g.glareHours.maxHours).toBeGreaterThan(0);
    expect(g.peakReflected!.valueWm2).toBeGreaterThan(50);
    const m = matte.summary.zones[0]!.glare!;
    expect(m.glareHours.meanHours).toBe(0);
    expect(m.glareHours.maxHours).toBe(0);
    expect(m.peakReflected).toBeNull();
    for (const s of matte.results.zones[0]!.sensors) {
      expect(s.reflectedBeamWm2!.every((e) => e === 0)).toBe(true);
      expect(s.glare!.every((c) => c === 'none')).toBe(true);
    }
    expect(matte.results.reflectionPaths!.step.length).toBe(0);
    expect(matte.summary.viewpoints!.every((v) => v.glareHours === 0)).toBe(true);
  });

  it('every path starts on the glass, and its line of sight is the mirror image of the sun', () => {
    // source: law of reflection (Hecht 2017, sec. 4.3): off the vertical plane x = 20 (n = −x) the
    // line of sight toward the image is d = (−s_x, s_y, s_z): its elevation is the sun's altitude and
    // its azimuth the sun's mirrored in the wall. Tolerance 0.5°: the image point is the most
    // central visible part of the 0.53° disc.
    const r = glass.results, P = r.reflectionPaths!;
    expect(P.step.length).toBeGreaterThan(10);
    for (let i = 0; i < P.step.length; i++) {
      const pt = P.point[i]!;
      expect(Math.abs(pt[0] - 20)).toBeLessThan(1e-3);
      expect(pt[2]).toBeGreaterThanOrEqual(-1e-6);
      expect(pt[2]).toBeLessThanOrEqual(12 + 1e-6);
      const recv = P.zone[i]! >= 0 ? r.zones[P.zone[i]!]!.sensors[P.receiver[i]!]!.position : r.viewpoints![P.receiver[i]!]!.position;
      const d = [pt[0] - recv[0], pt[1] - recv[1], pt[2] - recv[2]];
      const len = Math.hypot(d[0]!, d[1]!, d[2]!);
      const s = sunVector(r, P.step[i]!);
      expect(Math.abs(Math.acos((d[0]! * -s[0] + d[1]! * s[1] + d[2]! * s[2]) / len) / DEG)).toBeLessThan(0.5);
      expect(r.surfaces[P.patch[i]!]!.surface).toBe('wall');
    }
  });

  it('a sensor that sees the whole image gets DNI × the double-pane Fresnel reflectance at that incidence', () => {
    // source: reflected beam = DNI·ρ(θi) for a flat mirror filled by the sun's image
    // (REFERENCE-VALUES §11 [derived/cp]); ρ of two uncoated panes, n = 1.52 (Duffie & Beckman
    // sec. 5.1, per polarisation). Tolerance 1 %: the sun angles in Results are rounded to 0.01°.
    const r = glass.results, P = r.reflectionPaths!;
    let checked = 0;
    r.zones[0]!.sensors.forEach((s, k) => {
      for (let t = 0; t < r.times.length; t++) {
        let frac = 0;
        for (let i = 0; i < P.step.length; i++) if (P.step[i] === t && P.zone[i] === 0 && P.receiver[i] === k) frac += P.discFraction[i]!;
        if (Math.abs(frac - 1) > 1e-6) continue;
        const sv = sunVector(r, t);
        const thetaDeg = Math.acos(-sv[0]) / DEG; // n = (−1, 0, 0)
        const want = r.weather.dniWm2[t]! * paneStackReflectance(thetaDeg, 1.52, 2);
        expect(Math.abs(s.reflectedBeamWm2![t]! / want - 1)).toBeLessThan(0.01);
        checked++;
      }
    });
    expect(checked).toBeGreaterThan(5);
  });

  it('glare is flagged only where an image lies within the field of view, by the retinal-irradiance criterion', () => {
    const r = glass.results, P = r.reflectionPaths!;
    let flagged = 0, outOfView = 0;
    r.zones[0]!.sensors.forEach((s, k) => {
      for (let t = 0; t < r.times.length; t++) {
        const offs: number[] = [];
        for (let i = 0; i < P.step.length; i++) if (P.step[i] === t && P.zone[i] === 0 && P.receiver[i] === k) offs.push(P.offAxisDeg[i]!);
        const inView = offs.some((o) => o <= 30);
        if (s.glare![t] !== 'none') { expect(inView).toBe(true); flagged++; }
        else if (offs.length > 0) { expect(inView).toBe(false); outOfView++; }
        // the elevation of a vertical mirror's image is the sun's altitude (law of reflection)
        for (const o of offs) expect(Math.abs(o - r.sun[t]!.altitudeDeg)).toBeLessThan(0.5);
      }
    });
    expect(flagged).toBeGreaterThan(0);
    expect(outOfView).toBeGreaterThan(0); // high afternoon sun: the image is above the 30° field
    // The two viewpoints at the same spot see the same beams; only the one facing the wall has glare.
    const [toward, away] = r.viewpoints!;
    expect(toward!.reflectedBeamWm2).toEqual(away!.reflectedBeamWm2);
    expect(toward!.reflectedBeamWm2.some((e) => e > 0)).toBe(true);
    expect(toward!.glare.some((c) => c === 'after-image')).toBe(true);
    expect(away!.glare.every((c) => c === 'none')).toBe(true);
    const vs = glass.summary.viewpoints!;
    expect(vs[0]!.glareHours).toBeGreaterThan(0);
    expect(vs[1]!.glareHours).toBe(0);
  });

  it('the reflected beams enter the MRT as Σ fp·E with fp of the beam altitude (and only once)', () => {
    // source: six-directional MRT with a direct beam, S = α(Σ W K + fp·I) + ε Σ W L (VDI 3787-2;
    // Thorsson et al. 2007): adding beams E_p from altitude β_p adds α·Σ fp(β_p)·E_p to S. For a
    // vertical mirror β is the sun's altitude. Tolerance 0.05 W/m² (MRT stored as float32).
    const { state, results: r } = glass;
    const g = glareStage(state.model, state.steps, state.geometry, []);
    const withBeams = runTimeSteps(state.model, state.steps, state.geometry, undefined, g.sensorBeamTermWm2);
    const without = runTimeSteps(state.model, state.steps, state.geometry, undefined);
    const T = r.times.length;
    const S = (c: number) => BODY_EMISSIVITY_LONGWAVE * SIGMA * (c + KELVIN_AT_0C) ** 4;
    let checked = 0;
    r.zones[0]!.sensors.forEach((s, k) => {
      for (let t = 0; t < T; t++) {
        const e = s.reflectedBeamWm2![t]!;
        const term = g.sensorBeamTermWm2[k * T + t]!;
        if (e === 0) { expect(term).toBe(0); continue; }
        const fp = projectedAreaFactor('seated', r.sun[t]!.altitudeDeg);
        expect(Math.abs(term - fp * e)).toBeLessThan(0.01 * fp * e + 0.1);
        const dS = S(withBeams.mrtC[k * T + t]!) - S(without.mrtC[k * T + t]!);
        expect(Math.abs(dS - BODY_ABSORPTANCE_SHORTWAVE * term)).toBeLessThan(0.05);
        checked++;
      }
    });
    expect(checked).toBeGreaterThan(5);
    // The audit's own MRT is the one with the beams.
    const k0 = r.zones[0]!.sensors.findIndex((s) => s.reflectedBeamWm2!.some((e) => e > 0));
    const t0 = r.zones[0]!.sensors[k0]!.reflectedBeamWm2!.findIndex((e) => e > 0);
    expect(Math.abs(r.zones[0]!.sensors[k0]!.mrtC[t0]! - withBeams.mrtC[k0 * T + t0]!)).toBeLessThan(0.006);
    expect(withBeams.mrtC[k0 * T + t0]!).toBeGreaterThan(without.mrtC[k0 * T + t0]!);
  });
});

describe('a concave façade of thin vertical glass facets focuses the sun near R/2', () => {
  // source: paraxial focus of a concave cylindrical mirror at half its radius, f = R/2 (Hecht 2017,
  // sec. 5.4, spherical mirrors; the same in the plane of a cylinder's cross-section). With a
  // ±30° aperture the marginal facets cross the axis at R − R/(2 cos 30°) = 0.42 R from the mirror,
  // so the brightest point lies between 0.42 R and 0.5 R: the test allows |d − R/2| ≤ 0.1 R.
  const R = 16;
  const C: [number, number] = [0.5, 0.5];
  const FACETS = 48;
  const objText = (() => {
    const lines = ['# invented test scene: concave glass façade (arc of thin vertical facets)'];
    let v = 0;
    for (let k = 0; k < FACETS; k++) {
      const a0 = (60 + (60 * k) / FACETS) * DEG, a1 = (60 + (60 * (k + 1)) / FACETS) * DEG;
      const p0 = [C[0] + R * Math.cos(a0), C[1] + R * Math.sin(a0)], p1 = [C[0] + R * Math.cos(a1), C[1] + R * Math.sin(a1)];
      // An arc north of its centre C, ±30° about due north; corners ordered so the normal points
      // toward C (the concave side faces south, toward the noon sun).
      lines.push(`o facet-${k}`, 'usemtl glass');
      for (const [x, y, z] of [[p1[0], p1[1], 0], [p0[0], p0[1], 0], [p0[0], p0[1], 20], [p1[0], p1[1], 20]]) lines.push(`v ${x} ${y} ${z}`);
      lines.push(`f ${v + 1} ${v + 2} ${v + 3} ${v + 4}`);
      v += 4;
    }
    return lines.join('\n') + '\n';
  })();
  let res: Awaited<ReturnType<typeof run>>;
  beforeAll(async () => {
    // 36.6° N on 25 December at clock noon (equation of time ≈ 0): the sun due south at ≈ 30°.
    const p = sceneProject({
      latitudeDeg: 36.6,
      date: '2026-12-25',
      firstHour: 12,
      lastHour: 12,
      materials: { glass: 'glass-clear' },
      ground: { material: 'stone-paving' },
      zones: [{ name: 'focus', polygon: [[-2.75, 2.75], [3.75, 2.75], [3.75, 14.25], [-2.75, 14.25]], spacingM: 0.5, posture: 'standing' }],
      sampling: { skyRaysPerPatch: 1, viewRays: 16 },
    });
    (p.zones as Record<string, unknown>[])[0]!.floorZ = 6.9; // sensors at 8 m, in the band the reflected rays cross at the focus
    res = await run(objText, p);
  }, 120_000);

  it('the peak reflected irradiance exceeds the DNI and lies within 0.1 R of R/2 from the mirror', () => {
    const r = res.results;
    const dni = r.weather.dniWm2[0]!;
    expect(r.sun[0]!.altitudeDeg).toBeGreaterThan(25);
    expect(r.sun[0]!.altitudeDeg).toBeLessThan(35);
    expect(dni).toBeGreaterThan(300);
    const spots = r.concentration!;
    expect(spots.length).toBeGreaterThan(0);
    const sensorSpots = spots.filter((s) => s.kind === 'sensor');
    const worst = sensorSpots[0]!;
    expect(worst.peakWm2).toBeGreaterThan(dni);
    expect(worst.patches).toBeGreaterThan(5);
    expect(worst.surfaces.length).toBeGreaterThan(5); // many facets contribute
    expect(worst.surfaces.every((s) => s.surface.startsWith('facet-'))).toBe(true);
    // Distance from the mirror along the radius through the peak: R − |peak − C| (horizontal).
    const dist = R - Math.hypot(worst.position[0] - C[0], worst.position[1] - C[1]);
    expect(Math.abs(dist - R / 2)).toBeLessThanOrEqual(0.1 * R);
    // and near the focal line through F = C − (R/2)·û_sun (half-way from C to the mirror, for
    // sunlight arriving along −û_sun).
    const az = r.sun[0]!.azimuthDeg * DEG;
    const fx = C[0] - (R / 2) * Math.sin(az), fy = C[1] - (R / 2) * Math.cos(az);
    expect(Math.hypot(worst.position[0] - fx, worst.position[1] - fy)).toBeLessThanOrEqual(0.1 * R);
    // Same peak seen per sensor in the results.
    const zone = r.zones[0]!;
    expect(Math.max(...zone.sensors.map((s) => s.reflectedBeamWm2![0]!))).toBeCloseTo(worst.peakWm2, 0);
    // The summary names the worst concentration.
    expect(res.summary.worstConcentration!.peakWm2).toBe(spots[0]!.peakWm2);
    expect(res.summary.concentrationPoints).toBe(spots.length);
  });

  it('the ground under the focal line is flagged too', () => {
    const ground = res.results.concentration!.filter((s) => s.kind === 'ground');
    expect(ground.length).toBeGreaterThan(0);
    const g = ground[0]!;
    expect(g.peakWm2).toBeGreaterThan(g.dniWm2);
    expect(g.where.startsWith('ground-')).toBe(true);
    const dist = R - Math.hypot(g.position[0] - C[0], g.position[1] - C[1]);
    expect(Math.abs(dist - R / 2)).toBeLessThanOrEqual(0.1 * R + 0.75); // + the 1 m apron cell's half-diagonal
  });
});

describe('the glare criterion (after Ho, Ghanbari & Diver 2011; thresholds from memory)', () => {
  it('the retinal irradiance of the sun itself is ≈ 8 W/cm² and the categories follow the thresholds', () => {
    // from memory: REFERENCE-VALUES §11 — E_r of the direct sun ≈ 8 W/cm² with DNI 1000 W/m²,
    // burn threshold 0.118/ω ≈ 12.7 W/cm² at 9.3 mrad. Tolerance 0.1 W/cm².
    expect(Math.abs(retinalIrradianceWcm2(1000, 0.0093) - 8.0)).toBeLessThan(0.1);
    expect(Math.abs(retinalBurnThresholdWcm2(0.0093) - 12.7)).toBeLessThan(0.1);
    expect(afterImageThresholdWcm2(0.0093)).toBeLessThan(retinalIrradianceWcm2(1000, 0.0093));
    expect(glareCategoryCode(0, 1)).toBe(0);
    expect(GLARE_CATEGORIES[glareCategoryCode(20, 1)]!.id).toBe('dim'); // 2 % of the sun
    expect(GLARE_CATEGORIES[glareCategoryCode(150, 1)]!.id).toBe('after-image'); // a pane's reflection
    expect(GLARE_CATEGORIES[glareCategoryCode(2000, 1)]!.id).toBe('retinal-risk'); // two suns in one spot
    // A partial image keeps its retinal irradiance but subtends less, so it needs more to count.
    expect(glareCategoryCode(45, 1)).toBeLessThan(glareCategoryCode(45 * 10, 1));
  });

  it('viewpoints are validated with clear errors', () => {
    const base = sceneProject({ zones: [{ name: 'z', polygon: [[0, 0], [1, 0], [1, 1]] }] });
    const parse = (vp: unknown) => parseProjectText(JSON.stringify({ ...base, viewpoints: vp }), 'p.json');
    expect(parse([{ name: 'driver', position: [1, 2, 1.2], viewDirectionDeg: 0 }]).viewpoints[0]).toEqual({ name: 'driver', position: [1, 2, 1.2], viewDirectionDeg: 0, fieldDeg: 30 });
    expect(() => parse([{ name: 'a', position: [1, 2] }])).toThrow(/viewpoints\[0\]\.position.*\[x, y, z\]/);
    expect(() => parse([{ name: 'a', position: [1, 2, 3], fieldDeg: 0 }])).toThrow(/viewpoints\[0\]\.fieldDeg/);
    expect(() => parse([{ name: 'a', position: [1, 2, 3], viewDirection: 5 }])).toThrow(/viewDirectionDeg/);
    expect(() => parse([{ name: 'a', position: [1, 2, 3] }, { name: 'a', position: [0, 0, 1] }])).toThrow(/duplicate viewpoint/);
    expect(() => parse({ name: 'a' })).toThrow(InputError);
  });
});
