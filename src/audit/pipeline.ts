/**
 * The audit pipeline (DESIGN §1): project → Scene → patches + sensors → geometry pass (tracer) →
 * per-step surface heat balance → person radiation → MRT → UTCI → Results. The CLI and the viewer
 * both call `runAudit`; they differ only in the tracer they hand it (Node worker threads, browser
 * Web Workers, or in-process).
 */
import type { LoadedProject } from './load.ts';
import type { Results, SensorResult, SurfaceResult, ZoneResult } from './results.ts';
import { buildSteps, type Steps } from './stages/steps.ts';
import { prepareModel, type PreparedModel } from './stages/model.ts';
import { geometryPass, shardSlice, type GeometryData } from './stages/geometryPass.ts';
import { encodeGeometryPartial, decodeGeometryPartial, mergeGeometry, type PartialMeta } from './shard.ts';
import { sensorPoints } from './stages/geometryPass.ts';
import { InputError } from '../physics/errors.ts';
import { designPatchStreams } from './stages/retrace.ts';
import { runTimeSteps, type TimeStepOutput } from './stages/timeStep.ts';
import { glareStage, GLARE_CATEGORIES, GLARE_CRITERION, GLARE_CAUTION, GLARE_HOURS_FROM, DEFAULT_GLARE_FIELD_DEG, type GlareData } from './stages/glare.ts';
import type { TraceExecutor } from '../trace/pool/types.ts';
import { createInProcessExecutor } from '../trace/pool/workerPool.ts';

export const SOFTWARE_VERSION = '0.1.0';

export interface AuditProgress {
  /** Plain stage name, e.g. "sky seen by surfaces", "surface heat balance". */
  stage: string;
  done: number;
  total: number;
}

export interface AuditOptions {
  /** The tracer to use (default: in-process). The caller owns it and closes it. */
  tracer?: TraceExecutor;
  onProgress?: (p: AuditProgress) => void;
  signal?: AbortSignal;
  /** Injected clock and date for reproducible run records (tests). */
  now?: () => Date;
}

/** What the stages produced, kept for re-runs that reuse the geometry pass (viewer). */
export interface AuditState {
  model: PreparedModel;
  steps: Steps;
  geometry: GeometryData;
}

export async function runAudit(loaded: LoadedProject, opts: AuditOptions = {}): Promise<Results> {
  return (await runAuditWithState(loaded, opts)).results;
}

/**
 * What varies from run to run without changing a number (kept out of results.json so the same
 * project gives byte-identical results with any worker count or sharding): written as run.json.
 */
export interface RunRecord {
  date: string;
  workers: number;
  timingsMs: Record<string, number>;
}

export async function runAuditWithState(loaded: LoadedProject, opts: AuditOptions = {}, reuse?: { model: PreparedModel; geometry: GeometryData }): Promise<{ results: Results; state: AuditState; record: RunRecord }> {
  const t0 = performance.now();
  const progress = (stage: string, done: number, total: number) => opts.onProgress?.({ stage, done, total });
  const abort = () => {
    if (opts.signal?.aborted) throw opts.signal.reason ?? new Error('cancelled');
  };
  progress('reading the model', 0, 1);
  const model = reuse?.model ?? (await prepareModel(loaded));
  abort();
  const steps = buildSteps(loaded.project, loaded.weather);
  const tracer = opts.tracer ?? createInProcessExecutor();
  let geometry: GeometryData;
  const tGeo = performance.now();
  try {
    if (reuse?.geometry) geometry = reuse.geometry;
    else {
      const patchStreams = designPatchStreams(model, loaded.project.devices);
      geometry = await geometryPass(model, steps, loaded.project.sampling, tracer, { onStage: progress, ...(opts.signal ? { signal: opts.signal } : {}), ...(patchStreams ? { patchStreams } : {}) }, loaded.project.site.timeZone);
    }
  } finally {
    if (!opts.tracer) await tracer.close();
  }
  abort();
  // Reflected sun (glare.ts): traced before the time stepping, whose MRT takes its beams.
  progress('reflected sun', 0, 1);
  const glare = glareStage(model, steps, geometry, loaded.project.viewpoints ?? []);
  abort();
  const tHeat = performance.now();
  const ts = runTimeSteps(model, steps, geometry, (done, total) => progress('surface heat balance and comfort', done, total), glare.sensorBeamTermWm2);
  const tEnd = performance.now();
  const results = assembleResults(loaded, model, steps, geometry, ts, glare);
  const record: RunRecord = {
    date: (opts.now ?? (() => new Date()))().toISOString(),
    workers: tracer.workerCount,
    timingsMs: { ...geometry.timings, prepare: Math.round(tGeo - t0), geometryPass: Math.round(tHeat - tGeo - glare.timingMs), glare: glare.timingMs, timeStepping: Math.round(tEnd - tHeat) },
  };
  return { results, state: { model, steps, geometry }, record };
}

const r1 = (x: number) => Math.round(x * 10) / 10;
const r2 = (x: number) => Math.round(x * 100) / 100;
const r3 = (x: number) => Math.round(x * 1000) / 1000;

/** FNV-1a 32-bit hash of the model bytes (identifies the model file in the run record). */
export function fnv1a32Hex(bytes: Uint8Array): string {
  let h = 0x811c9dc5;
  for (let i = 0; i < bytes.length; i++) {
    h ^= bytes[i]!;
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h.toString(16).padStart(8, '0');
}

function assembleResults(
  loaded: LoadedProject,
  model: PreparedModel,
  steps: Steps,
  geo: GeometryData,
  ts: TimeStepOutput,
  glare: GlareData,
): Results {
  const T = steps.count;
  const p = model.patches;
  const surfaces: SurfaceResult[] = [];
  for (let i = 0; i < p.count; i++) {
    const o = i * T;
    surfaces.push({
      id: p.ids[i]!,
      surface: p.scene.surfaceNames[p.surfaceIds[i]!]!,
      material: model.materialLabels[model.patchMaterial[i]!]!,
      centroid: [r3(p.centroids[3 * i]!), r3(p.centroids[3 * i + 1]!), r3(p.centroids[3 * i + 2]!)],
      normal: [r3(p.normals[3 * i]!), r3(p.normals[3 * i + 1]!), r3(p.normals[3 * i + 2]!)],
      areaM2: r3(p.areasM2[i]!),
      incidentShortwaveWm2: Array.from(ts.incidentShortwaveWm2.subarray(o, o + T), r1),
      surfaceTempC: Array.from(ts.surfaceTempC.subarray(o, o + T), r2),
      longwaveEmissionWm2: Array.from(ts.longwaveEmissionWm2.subarray(o, o + T), r1),
    });
  }
  const zones: ZoneResult[] = [];
  let k0 = 0;
  for (const set of model.sensors) {
    const count = set.positions.length / 3;
    const sensors: SensorResult[] = [];
    for (let k = k0; k < k0 + count; k++) {
      const o = k * T;
      const q = 3 * (k - k0);
      sensors.push({
        position: [r3(set.positions[q]!), r3(set.positions[q + 1]!), r3(set.positions[q + 2]!)],
        skyViewFactor: Math.round(geo.sensorSkyViewFactor[k]! * 1e4) / 1e4,
        sunlit: Array.from(ts.sensorSunlit.subarray(o, o + T), (v) => v === 1),
        mrtC: Array.from(ts.mrtC.subarray(o, o + T), r2),
        utciC: Array.from(ts.utciC.subarray(o, o + T), r2),
        category: ts.category[k]!,
        reflectedBeamWm2: Array.from(glare.reflectedWm2.subarray(o, o + T), r1),
        glare: Array.from(glare.glare.subarray(o, o + T), (c) => GLARE_CATEGORIES[c]!.id),
        reflectingPatches: Array.from(glare.reflectingPatches.subarray(o, o + T)),
      });
    }
    zones.push({ name: set.zone.name, posture: set.zone.posture, sensorHeightM: set.zone.sensorHeightM, sensors, droppedSensors: set.dropped });
    k0 += count;
  }
  const warnings = [...model.warnings, ...steps.warnings];
  if (ts.stats.utciClampedSensorSteps > 0) {
    const what = Object.entries(ts.stats.utciClampedInputs).map(([k, v]) => `${k} ${v}×`).join(', ');
    warnings.push(`UTCI inputs outside the polynomial's validity were clamped in ${ts.stats.utciClampedSensorSteps} sensor-steps (${what}); the UTCI there is the value at the range's edge`);
  }
  if (ts.stats.unconvergedSteps > 0) {
    warnings.push(`surface temperatures did not settle within 0.1 K in ${ts.stats.unconvergedSteps} steps after the maximum number of longwave passes`);
  }
  if (glare.concentration.length > 0) {
    const c = glare.concentration[0]!;
    warnings.push(`reflections from several mirror patches exceed the direct normal irradiance at ${glare.concentration.length} points (a focusing façade); the worst: ${c.peakWm2} W/m² against a DNI of ${c.dniWm2} W/m² at ${c.kind === 'sensor' ? `zone "${c.where}" sensor ${c.sensor}` : `ground cell ${c.where}`}, ${steps.labels[c.step]}`);
  }
  const pr = loaded.project;
  return {
    sunfacet: 1,
    project: pr.name,
    timeConvention: steps.timeConvention,
    times: steps.labels,
    sun: Array.from({ length: T }, (_, i) => ({ altitudeDeg: r2(steps.sunAltitudeDeg[i]!), azimuthDeg: r2(steps.sunAzimuthDeg[i]!) })),
    weather: {
      airTempC: Array.from(steps.airTempC, r2),
      relativeHumidityPct: Array.from(steps.relativeHumidityPct, r1),
      windMs: Array.from(steps.wind10mMs, r2),
      dniWm2: Array.from(steps.dniWm2, r1),
      dhiWm2: Array.from(steps.dhiWm2, r1),
      ghiWm2: Array.from(steps.ghiWm2, r1),
      skyLongwaveWm2: Array.from(steps.skyLongwaveWm2, r1),
    },
    zones,
    surfaces,
    glare: {
      categories: GLARE_CATEGORIES.map((c) => ({ id: c.id, label: c.label, description: c.description })),
      criterion: GLARE_CRITERION,
      zoneFieldDeg: DEFAULT_GLARE_FIELD_DEG,
      glareHoursFrom: GLARE_HOURS_FROM,
      mirrorPatches: glare.mirrorPatches,
      caution: GLARE_CAUTION,
    },
    viewpoints: glare.viewpoints.map((v, i) => {
      const o = (glare.sensorCount + i) * T;
      return {
        name: v.name,
        position: v.position,
        viewDirectionDeg: v.viewDirectionDeg ?? null,
        fieldDeg: v.fieldDeg,
        reflectedBeamWm2: Array.from(glare.reflectedWm2.subarray(o, o + T), r1),
        glare: Array.from(glare.glare.subarray(o, o + T), (c) => GLARE_CATEGORIES[c]!.id),
        reflectingPatches: Array.from(glare.reflectingPatches.subarray(o, o + T)),
      };
    }),
    reflectionPaths: {
      step: glare.paths.step, patch: glare.paths.patch, zone: glare.paths.zone, receiver: glare.paths.receiver,
      point: glare.paths.point, irradianceWm2: glare.paths.irradianceWm2, discFraction: glare.paths.discFraction, offAxisDeg: glare.paths.offAxisDeg,
    },
    concentration: glare.concentration.slice(0, 200).map((c) => ({ ...c, time: steps.labels[c.step]! })),
    warnings,
    run: {
      software: `sunfacet ${SOFTWARE_VERSION}`,
      site: pr.site,
      modelFile: pr.model.file,
      modelHashFnv1a32: fnv1a32Hex(model.modelBytes),
      weatherSource: steps.weatherSource,
      stepHours: steps.stepHours,
      patches: p.count,
      sensors: k0,
      triangles: p.scene.indices.length / 3,
      distinctSunDirections: geo.sunCount,
      sampling: pr.sampling,
      energyBalanceMaxResidualPct: Math.round(ts.stats.maxEnergyResidualPct * 1e4) / 1e4,
      longwavePassesMax: ts.stats.passesMax,
      longwavePassesMean: r2(ts.stats.passesMean),
      spinUpSteps: ts.stats.spinUpSteps,
      models: {
        sun: 'suncalc 2.0.2 with SPA refraction (checked against Reda & Andreas 2004)',
        clearSky: 'Ineichen & Perez 2002',
        sky: 'Perez et al. 1990 over the Tregenza subdivision (145 patches)',
        convection: 'McAdams 1954 (h = 5.7 + 3.8 v), local wind by the log law (z0 = 0.01 m)',
        skyLongwave: 'weather file horizontal infrared, else Berdahl & Martin 1984',
        mrt: 'six-directional (VDI 3787-2; Thorsson et al. 2007), α 0.7, ε 0.97',
        utci: 'Bröde et al. 2012 operational polynomial, inputs clamped to its validity',
        reflection: `diffuse part ρ·(1 − specularFraction), ${2} bounces, two bands (ASTM G173 split); specular part traced to sensors as beams (glazing: Fresnel pane stack, Duffie & Beckman 5.1; water: Fresnel interface; metal and paint: Schlick 1994)`,
        glare: GLARE_CRITERION,
      },
    },
  };
}

/** Identifies a project for shards: its validated content and the model bytes. */
export function projectHash(loaded: LoadedProject, model: PreparedModel): string {
  const text = new TextEncoder().encode(JSON.stringify(loaded.project));
  return `${fnv1a32Hex(text)}-${fnv1a32Hex(model.modelBytes)}`;
}

/**
 * Shard K of N: traces only its slice of patches and sensors and returns the geometry partial
 * (bytes to write); `runAuditFromPartials` joins all N and finishes the audit.
 */
export async function runAuditShard(loaded: LoadedProject, shard: { index: number; count: number }, opts: AuditOptions = {}): Promise<{ partial: Uint8Array; meta: PartialMeta }> {
  const progress = (stage: string, done: number, total: number) => opts.onProgress?.({ stage, done, total });
  const model = await prepareModel(loaded);
  const steps = buildSteps(loaded.project, loaded.weather);
  const sensorCount = sensorPoints(model).length / 3;
  const slice = shardSlice(shard.index, shard.count, model.patches.count, sensorCount);
  const tracer = opts.tracer ?? createInProcessExecutor();
  let geo: GeometryData;
  try {
    const patchStreams = designPatchStreams(model, loaded.project.devices);
    geo = await geometryPass(model, steps, loaded.project.sampling, tracer, { onStage: progress, slice, ...(opts.signal ? { signal: opts.signal } : {}), ...(patchStreams ? { patchStreams } : {}) }, loaded.project.site.timeZone);
  } finally {
    if (!opts.tracer) await tracer.close();
  }
  const meta: PartialMeta = { projectHash: projectHash(loaded, model), shard, patchCount: model.patches.count, sensorCount, stepCount: steps.count };
  return { partial: encodeGeometryPartial(geo, meta), meta };
}

/** Joins the partials of all shards and runs the time stepping: the same Results as `runAudit`. */
export async function runAuditFromPartials(loaded: LoadedProject, partials: { bytes: Uint8Array; file: string }[], opts: AuditOptions = {}): Promise<{ results: Results; record: RunRecord }> {
  const model = await prepareModel(loaded);
  const hash = projectHash(loaded, model);
  const parts = partials.map((p) => ({ ...decodeGeometryPartial(p.bytes, p.file), file: p.file }));
  for (const p of parts) {
    if (p.meta.projectHash !== hash) {
      throw new InputError({ file: p.file, problem: 'this partial was computed for another version of the project or model', expected: `a partial of project ${hash}`, value: p.meta.projectHash });
    }
  }
  const geometry = mergeGeometry(parts);
  const { results, record } = await runAuditWithState(loaded, { ...opts, tracer: opts.tracer ?? ({ workerCount: 0 } as TraceExecutor) }, { model, geometry });
  return { results, record };
}
