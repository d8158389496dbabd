/**
 * Stage 3: the geometry pass, traced once per geometry (DESIGN §1): sun visibility for every
 * distinct sun direction of the period, sky-patch visibility and surface views for every patch and
 * for the six directions of every sensor. Nothing here depends on the weather or the materials, so
 * changing those never re-traces.
 *
 * Tree crowns in the sky and the views (issue 6): the beam through a crown is traced per sun
 * direction with the leafiness of that direction's day, but sky visibility and surface views are
 * traced once per geometry, so they take every crown's MEAN transmittance over the period's days
 * with the sun up (`crownExtinctionForPeriod`): exact for a design day, the period's average
 * leafiness for longer periods. In the views a crown counts as seen at air temperature (it joins
 * `otherFraction`, which the time stepping already gives σT_air⁴ and no shortwave).
 *
 * Random streams of patches (`GeometryPassOptions.patchStreams`, from retrace.ts
 * `designPatchStreams`): device patches sit between the model's and the ground apron's, so adding
 * a device shifts the apron's indices; keyed streams keep every patch's numbers when devices are
 * added, which lets an option re-trace only what its new devices can change (retrace.ts).
 */
import type { PreparedModel } from './model.ts';
import type { Steps } from './steps.ts';
import type { TraceExecutor, TraceRunOptions } from '../../trace/pool/types.ts';
import type { SurfaceViewsInput, SurfaceViewsResult } from '../../trace/queries/surfaceViews.ts';
import type { SkyVisibilityInput } from '../../trace/queries/skyVisibility.ts';
import { SIX_DIRECTIONS } from '../../trace/queries/surfaceViews.ts';
import { skySubdivision } from '../../physics/skySubdivision.ts';
import { sunTransmittance, type SunTransmittanceInput } from '../../trace/queries/sunTransmittance.ts';
import { crownExtinctionForDay } from '../../trace/crowns.ts';
import { CROWN_SHAPE_FLOATS, type CrownSet } from '../../geometry/generators/tree.ts';
import { crownExtinctionPerM } from '../../physics/vegetation.ts';
import { dayOfYearLocal } from '../../physics/vegetation.ts';
import { zoneOffsetMinutes } from '../../physics/time.ts';
import type { SamplingSpec } from '../project.ts';

export const SKY_LEVEL = 1;
/**
 * Trace the audit's rays through the batch kernel (WebAssembly SIMD where available): the same rays
 * in the same order, stored as float32 — about 1.7× faster; a ray grazing an edge may fall on the
 * other side than with the float64 per-ray path (measured: none on the demo).
 */
export const BATCH_RAYS = true;

export interface GeometryData {
  /** Per step: index of its sun direction, or −1 when the sun is down. */
  sunIndexOfStep: Int32Array;
  sunCount: number;
  /** P × S and N × S: 1 = the ray to the sun is unobstructed (or only semi-transparent). */
  patchSun: Uint8Array;
  sensorSun: Uint8Array;
  /** With fabric devices or trees: the beam's transmittance along those rays [0, 1] (else absent: 0/1). */
  patchSunTransmittance?: Float32Array;
  sensorSunTransmittance?: Float32Array;
  /** Sky bands of the subdivision (radiance is uniform within a band), and per receiver Σ P_k over each band [sr]. */
  bandCount: number;
  patchSkyBand: Float32Array;
  /** (N·6) × bands, rows sensor-major in the order up, down, east, south, west, north. */
  sensorSkyBand: Float32Array;
  /** Per sensor: Oke's ψ_s of an upward horizontal plane at the sensor. */
  sensorSkyViewFactor: Float32Array;
  patchViews: SurfaceViewsResult;
  sensorViews: SurfaceViewsResult;
  /** The receivers these arrays cover (the whole model unless this is a shard's partial). */
  slice: GeometrySlice;
  timings: Record<string, number>;
}

/** Receiver points of all sensors, concatenated zone by zone. */
export function sensorPoints(model: PreparedModel): Float64Array {
  const n = model.sensors.reduce((a, s) => a + s.positions.length / 3, 0);
  const out = new Float64Array(3 * n);
  let o = 0;
  for (const s of model.sensors) {
    out.set(s.positions, o);
    o += s.positions.length;
  }
  return out;
}

/** Distinct sun directions (rounded to 1e-5 rad, ≈ 0.0006°) of the steps with the sun up. */
export function distinctSunDirections(steps: Steps, perDay = false): { sunIndexOfStep: Int32Array; directions: Float64Array; stepOfSun: Int32Array } {
  const index = new Int32Array(steps.count).fill(-1);
  const seen = new Map<string, number>();
  const dirs: number[] = [];
  const firstStep: number[] = [];
  for (let i = 0; i < steps.count; i++) {
    if (!(steps.sunAltitudeDeg[i]! > 0)) continue;
    const x = steps.sunDir[3 * i]!, y = steps.sunDir[3 * i + 1]!, z = steps.sunDir[3 * i + 2]!;
    // With trees the crowns' leafiness depends on the day, so a direction is only shared within a day.
    const day = perDay ? `,${Math.floor(steps.timeMs[i]! / 86400000)}` : '';
    const key = `${Math.round(x * 1e5)},${Math.round(y * 1e5)},${Math.round(z * 1e5)}${day}`;
    let k = seen.get(key);
    if (k === undefined) {
      k = dirs.length / 3;
      seen.set(key, k);
      dirs.push(x, y, z);
      firstStep.push(i);
    }
    index[i] = k;
  }
  return { sunIndexOfStep: index, directions: Float64Array.from(dirs), stepOfSun: Int32Array.from(firstStep) };
}

export interface GeometryPassOptions {
  onStage?: (stage: string, done: number, total: number) => void;
  signal?: AbortSignal;
  /** Trace only patches [p0, p1) and sensors [s0, s1) (a shard); default everything. */
  slice?: GeometrySlice;
  /** Random stream per patch (retrace.ts `designPatchStreams`); default the patch index. */
  patchStreams?: Uint32Array | undefined;
}

/**
 * Extinction per crown [1/m] for the sky and the views: from each crown's mean seasonal
 * transmittance over the distinct local days of the steps with the sun up (all steps if none),
 * k = −ln(τ̄)/H (vegetation.ts convention).
 */
export function crownExtinctionForPeriod(crowns: CrownSet, steps: Steps, siteTimeZone: string): Float64Array {
  const C = crowns.count;
  const out = new Float64Array(C);
  if (C === 0) return out;
  const days = new Set<number>();
  for (let pass = 0; pass < 2 && days.size === 0; pass++) {
    for (let i = 0; i < steps.count; i++) {
      if (pass === 0 && !(steps.sunAltitudeDeg[i]! > 0)) continue;
      days.add(dayOfYearLocal(steps.timeMs[i]!, zoneOffsetMinutes(siteTimeZone, steps.timeMs[i]!)));
    }
  }
  const sumTau = new Float64Array(C), kDay = new Float64Array(C);
  for (const d of [...days].sort((a, b) => a - b)) {
    crownExtinctionForDay(crowns, d, kDay);
    for (let c = 0; c < C; c++) sumTau[c]! += Math.exp(-kDay[c]! * 2 * crowns.ellipsoids[c * CROWN_SHAPE_FLOATS + 5]!);
  }
  for (let c = 0; c < C; c++) {
    const h = 2 * crowns.ellipsoids[c * CROWN_SHAPE_FLOATS + 5]!;
    out[c] = crownExtinctionPerM(Math.min(1, Math.max(1e-12, sumTau[c]! / Math.max(1, days.size))), h);
  }
  return out;
}

export interface GeometrySlice {
  patches: [number, number];
  sensors: [number, number];
}

/** The K-th (1-based) of N slices of the receivers: contiguous ranges of patches and of sensors. */
export function shardSlice(index: number, count: number, patchCount: number, sensorCount: number): GeometrySlice {
  const cut = (n: number, k: number) => Math.floor((n * k) / count);
  return { patches: [cut(patchCount, index - 1), cut(patchCount, index)], sensors: [cut(sensorCount, index - 1), cut(sensorCount, index)] };
}

export async function geometryPass(model: PreparedModel, steps: Steps, sampling: SamplingSpec, tracer: TraceExecutor, opts: GeometryPassOptions = {}, siteTimeZone = '+00:00'): Promise<GeometryData> {
  const timings: Record<string, number> = {};
  const { patches, bvh } = model;
  const ground = model.hasGroundPlane ? { z: model.groundZ } : null;
  const P = patches.count;
  const sensors = sensorPoints(model);
  const N = sensors.length / 3;
  const sky = skySubdivision(SKY_LEVEL);
  const B = sky.bandStart.length;
  const { sunIndexOfStep, directions, transmittanceBase } = sunSetup(model, steps, siteTimeZone);
  const S = directions.length / 3;
  const slice = opts.slice ?? { patches: [0, P] as [number, number], sensors: [0, N] as [number, number] };
  const run = (stage: string, range?: readonly [number, number]): TraceRunOptions => ({
    onProgress: (done, total) => opts.onStage?.(stage, done, total),
    ...(opts.signal ? { signal: opts.signal } : {}),
    ...(range ? { range } : {}),
  });
  const pr = slice.patches, sr = slice.sensors;
  const sr6: [number, number] = [6 * sr[0], 6 * sr[1]];
  const nP = pr[1] - pr[0], nS = sr[1] - sr[0];
  const time = async <T>(name: string, f: () => Promise<T>): Promise<T> => {
    const t0 = performance.now();
    opts.onStage?.(name, 0, 1);
    const r = await f();
    timings[name] = Math.round(performance.now() - t0);
    return r;
  };
  let patchSun: Uint8Array, sensorSun: Uint8Array;
  let patchSunTransmittance: Float32Array | undefined, sensorSunTransmittance: Float32Array | undefined;
  if (transmittanceBase) {
    // Fabric sheets and tree crowns attenuate the beam: trace transmittances (in this thread).
    const base = transmittanceBase;
    patchSunTransmittance = await time('sun through devices on surfaces', async () => sunTransmittance(bvh, { ...base, points: patches.centroids, normals: patches.normals }, pr[0], pr[1]));
    sensorSunTransmittance = await time('sun through devices on sensors', async () => sunTransmittance(bvh, { ...base, points: sensors }, sr[0], sr[1]));
    patchSun = Uint8Array.from(patchSunTransmittance, (x) => (x > 0 ? 1 : 0));
    sensorSun = Uint8Array.from(sensorSunTransmittance, (x) => (x > 0 ? 1 : 0));
  } else {
    patchSun = S > 0 && nP > 0 ? await time('sun on surfaces', () => tracer.sunVisibility(bvh, { points: patches.centroids, normals: patches.normals, sunDirections: directions, ground, batchRays: BATCH_RAYS }, run('sun on surfaces', pr))) : new Uint8Array(0);
    sensorSun = S > 0 && nS > 0 ? await time('sun on sensors', () => tracer.sunVisibility(bvh, { points: sensors, sunDirections: directions, ground, batchRays: BATCH_RAYS }, run('sun on sensors', sr))) : new Uint8Array(0);
  }
  const inputs = geometryQueryInputs(model, steps, sampling, siteTimeZone, opts.patchStreams);
  const patchSky = await time('sky seen by surfaces', () => tracer.skyVisibility(bvh, inputs.patchSky, run('sky seen by surfaces', pr)));
  const sensorSky = await time('sky seen by sensors', () => tracer.skyVisibility(bvh, inputs.sensorSky, run('sky seen by sensors', sr6)));
  const patchViews = await time('surface views of surfaces', () => tracer.surfaceViews(bvh, inputs.patchViews, run('surface views of surfaces', pr)));
  const sensorViews = await time('surface views of sensors', () => tracer.surfaceViews(bvh, inputs.sensorViews, run('surface views of sensors', sr)));
  const sensorSkyBand = toBands(sensorSky.patchProjectedSr, nS * 6, sky.count, sky.bandStart, sky.bandCount);
  const sensorSkyViewFactor = skyViewFactorsFromBands(sensorSkyBand, nS, B);
  return {
    sunIndexOfStep, sunCount: S, patchSun, sensorSun, bandCount: B,
    patchSkyBand: toBands(patchSky.patchProjectedSr, nP, sky.count, sky.bandStart, sky.bandCount),
    sensorSkyBand, sensorSkyViewFactor,
    patchViews, sensorViews, slice, timings,
    ...(patchSunTransmittance ? { patchSunTransmittance } : {}),
    ...(sensorSunTransmittance ? { sensorSunTransmittance } : {}),
  };
}

/** What the sun part of the pass traces: the distinct directions and, with fabric or crowns, the transmittance input. */
export interface SunSetup {
  sunIndexOfStep: Int32Array;
  directions: Float64Array;
  stepOfSun: Int32Array;
  transmittanceBase?: Omit<SunTransmittanceInput, 'points' | 'normals'>;
}

export function sunSetup(model: PreparedModel, steps: Steps, siteTimeZone: string): SunSetup {
  const tr = model.transmission;
  const ground = model.hasGroundPlane ? { z: model.groundZ } : null;
  const { sunIndexOfStep, directions, stepOfSun } = distinctSunDirections(steps, tr !== undefined && tr.crowns.count > 0);
  if (!tr) return { sunIndexOfStep, directions, stepOfSun };
  const S = directions.length / 3;
  const C = tr.crowns.count;
  const k = new Float64Array(S * C);
  const kDay = new Float64Array(C);
  for (let s = 0; s < S; s++) {
    const t = stepOfSun[s]!;
    crownExtinctionForDay(tr.crowns, dayOfYearLocal(steps.timeMs[t]!, zoneOffsetMinutes(siteTimeZone, steps.timeMs[t]!)), kDay);
    k.set(kDay, s * C);
  }
  return {
    sunIndexOfStep, directions, stepOfSun,
    transmittanceBase: { sunDirections: directions, ground, triangleTransmittance: tr.triangleTransmittance, skipSemiTransparent: tr.skipSemiTransparent, skipOpaque: tr.skipOpaque, crowns: tr.crowns, crownExtinctionPerM: k },
  };
}

/** Oke's ψ_s per sensor: the upward-facing plane (direction 0 of the six) — Σ_k P_k / π. */
export function skyViewFactorsFromBands(sensorSkyBand: Float32Array, sensorCount: number, B: number): Float32Array {
  const out = new Float32Array(sensorCount);
  for (let k = 0; k < sensorCount; k++) {
    let sum = 0;
    for (let b = 0; b < B; b++) sum += sensorSkyBand[6 * k * B + b]!;
    out[k] = sum / Math.PI;
  }
  return out;
}

/**
 * The four sky and view query inputs of the geometry pass (shared with retrace.ts, which traces
 * subsets of the same receivers with the same settings and streams).
 */
export function geometryQueryInputs(model: PreparedModel, steps: Steps, sampling: SamplingSpec, siteTimeZone: string, patchStreams?: Uint32Array): {
  patchSky: SkyVisibilityInput; sensorSky: SkyVisibilityInput; patchViews: SurfaceViewsInput; sensorViews: SurfaceViewsInput;
} {
  const { patches } = model;
  const ground = model.hasGroundPlane ? { z: model.groundZ } : null;
  const sensors = sensorPoints(model);
  const N = sensors.length / 3;
  // Six receivers per sensor for the directional sky: the same point, six normals.
  const sixPoints = new Float64Array(N * 18);
  const sixNormals = new Float64Array(N * 18);
  for (let k = 0; k < N; k++) {
    for (let d = 0; d < 6; d++) {
      sixPoints.set(sensors.subarray(3 * k, 3 * k + 3), 18 * k + 3 * d);
      sixNormals.set(SIX_DIRECTIONS.slice(3 * d, 3 * d + 3), 18 * k + 3 * d);
    }
  }
  const trianglePatch = Int32Array.from(patches.patchOfTriangle);
  const seed = sampling.seed;
  const crowns = model.transmission?.crowns;
  const withCrowns = crowns !== undefined && crowns.count > 0
    ? { crowns, crownExtinctionPerM: crownExtinctionForPeriod(crowns, steps, siteTimeZone) }
    : {};
  const streams = patchStreams ? { streamIndex: patchStreams } : {};
  const P = patches.count;
  return {
    patchSky: { points: patches.centroids, normals: patches.normals, skyLevel: SKY_LEVEL, samplesPerPatch: sampling.skyRaysPerPatch, groundSamples: 1, ground, seed, batchRays: BATCH_RAYS, ...withCrowns, ...streams },
    sensorSky: { points: sixPoints, normals: sixNormals, skyLevel: SKY_LEVEL, samplesPerPatch: sampling.skyRaysPerPatch, groundSamples: 1, ground, seed: seed + 1, batchRays: BATCH_RAYS, ...withCrowns },
    patchViews: { points: patches.centroids, normals: patches.normals, directions: 'normal', trianglePatch, patchCount: P, samplesPerDirection: sampling.viewRays, ground, seed: seed + 3, batchRays: BATCH_RAYS, ...withCrowns, ...streams },
    sensorViews: { points: sensors, directions: 'six', trianglePatch, patchCount: P, samplesPerDirection: sampling.viewRays, ground, seed: seed + 4, batchRays: BATCH_RAYS, ...withCrowns },
  };
}

/** Sums each receiver's per-patch projected solid angles over the bands of the subdivision. */
export function toBands(perPatch: Float32Array, receivers: number, K: number, bandStart: Uint32Array, bandCount: Uint32Array): Float32Array {
  const B = bandStart.length;
  const out = new Float32Array(receivers * B);
  for (let r = 0; r < receivers; r++) {
    for (let b = 0; b < B; b++) {
      let s = 0;
      const k0 = r * K + bandStart[b]!;
      for (let k = 0; k < bandCount[b]!; k++) s += perPatch[k0 + k]!;
      out[r * B + b] = s;
    }
  }
  return out;
}
