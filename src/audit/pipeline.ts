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
import { geometryPass, type GeometryData } from './stages/geometryPass.ts';
import { runTimeSteps, type TimeStepOutput } from './stages/timeStep.ts';
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

export async function runAuditWithState(loaded: LoadedProject, opts: AuditOptions = {}, reuse?: { model: PreparedModel; geometry: GeometryData }): Promise<{ results: Results; state: AuditState }> {
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
    geometry = reuse?.geometry ?? (await geometryPass(model, steps, loaded.project.sampling, tracer, { onStage: progress, ...(opts.signal ? { signal: opts.signal } : {}) }));
  } finally {
    if (!opts.tracer) await tracer.close();
  }
  abort();
  const tHeat = performance.now();
    const ts = runTimeSteps(model, steps, geometry, (done, total) => progress('surface heat balance and comfort', done, total));
  const tEnd = performance.now();
  const results = assembleResults(loaded, model, steps, geometry, ts, {
    timingsMs: { ...geometry.timings, prepare: Math.round(tGeo - t0), geometryPass: Math.round(tHeat - tGeo), timeStepping: Math.round(tEnd - tHeat) },
    workers: tracer.workerCount,
    date: (opts.now ?? (() => new Date()))().toISOString(),
  });
  return { results, state: { model, steps, geometry } };
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
  run: { timingsMs: Record<string, number>; workers: number; date: string },
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
    warnings,
    run: {
      software: `sunfacet ${SOFTWARE_VERSION}`,
      date: run.date,
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
      workers: run.workers,
      timingsMs: run.timingsMs,
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
        reflection: `diffuse, ${2} bounces, two bands (ASTM G173 split)`,
      },
    },
  };
}
