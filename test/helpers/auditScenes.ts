/**
 * Small invented audit scenes built in memory: an OBJ model (z up, one `o` per box, `usemtl`
 * names), a project object with sensible defaults, and a runner that feeds both through
 * `loadProject` and `runAudit` without touching the file system. Used by test/audit/scenes.test.ts.
 */
import { loadProject } from '../../src/audit/load.ts';
import { runAudit, type AuditOptions } from '../../src/audit/pipeline.ts';
import type { Results, SurfaceResult } from '../../src/audit/results.ts';
import { boxCornersZUp } from './models.ts';

/** The six faces of an axis-aligned box, in the order of `boxCornersZUp`'s quads. */
export type BoxFace = 'bottom' | 'top' | 'south' | 'east' | 'north' | 'west';
const FACE_ORDER: readonly BoxFace[] = ['bottom', 'top', 'south', 'east', 'north', 'west'];

/** Accumulates boxes into one OBJ text (z up, outward CCW quads). */
export class ObjScene {
  private readonly lines: string[] = ['# invented test scene (Sunfacet audit scene tests)'];
  private vertexCount = 0;
  private triangles = 0;

  /**
   * Adds the box [x0,x1]×[y0,y1]×[z0,z1] [m] as object `name` with material `material`.
   * @param omit faces left out (e.g. 'bottom' for a building standing on the ground)
   */
  box(name: string, material: string, min: [number, number, number], max: [number, number, number], omit: readonly BoxFace[] = ['bottom']): this {
    const { v, quads } = boxCornersZUp(min[0], min[1], min[2], max[0], max[1], max[2]);
    this.lines.push(`o ${name}`, `usemtl ${material}`);
    for (const p of v) this.lines.push(`v ${p[0]} ${p[1]} ${p[2]}`);
    quads.forEach((q, i) => {
      if (omit.includes(FACE_ORDER[i]!)) return;
      this.lines.push(`f ${q.map((k) => k + 1 + this.vertexCount).join(' ')}`);
      this.triangles += 2;
    });
    this.vertexCount += v.length;
    return this;
  }

  get triangleCount(): number {
    return this.triangles;
  }

  text(): string {
    return this.lines.join('\n') + '\n';
  }
}

export interface ZoneInput {
  name: string;
  polygon: [number, number][];
  spacingM?: number;
  sensorHeightM?: number;
  posture?: 'standing' | 'seated';
}

export interface SceneProjectInput {
  name?: string;
  latitudeDeg?: number;
  longitudeDeg?: number;
  /** Local date of the one-day period, YYYY-MM-DD (UTC offset +00:00 at longitude 0: clock noon ≈ solar noon). */
  date?: string;
  /** First and last hour of the day (default 0 and 23). */
  firstHour?: number;
  lastHour?: number;
  /** Minutes past `lastHour` of the last step (e.g. 30 for a half-hourly day ending 23:30). */
  lastMinute?: number;
  stepMinutes?: number;
  airTempC?: number | { min: number; max: number };
  relativeHumidityPct?: number;
  windMs?: number;
  materials?: Record<string, unknown>;
  defaultMaterial?: string;
  /** An infinite ground with a 1 m apron around the model (omit for the analytic far ground only). */
  ground?: { material: string; z?: number };
  zones: ZoneInput[];
  sampling?: { seed?: number; skyRaysPerPatch?: number; viewRays?: number };
}

const pad2 = (n: number) => String(n).padStart(2, '0');

/** A project object (DESIGN §4) for a one-day clear-sky audit of `model.obj`. */
export function sceneProject(p: SceneProjectInput): Record<string, unknown> {
  const date = p.date ?? '2026-06-21';
  return {
    sunfacet: 1,
    name: p.name ?? 'invented test scene',
    site: { latitudeDeg: p.latitudeDeg ?? 45, longitudeDeg: p.longitudeDeg ?? 0, elevationM: 0, timeZone: '+00:00', northDeg: 0 },
    model: { file: 'model.obj', upAxis: 'z' },
    materials: p.materials ?? {},
    defaultMaterial: p.defaultMaterial ?? 'concrete-light',
    ...(p.ground ? { ground: { material: p.ground.material, z: p.ground.z ?? 0 } } : {}),
    zones: p.zones.map((z) => ({
      name: z.name,
      polygon: z.polygon,
      spacingM: z.spacingM ?? 1,
      ...(z.sensorHeightM === undefined ? {} : { sensorHeightM: z.sensorHeightM }),
      posture: z.posture ?? 'standing',
    })),
    period: {
      start: `${date}T${pad2(p.firstHour ?? 0)}:00:00+00:00`,
      end: `${date}T${pad2(p.lastHour ?? 23)}:${pad2(p.lastMinute ?? 0)}:00+00:00`,
      stepMinutes: p.stepMinutes ?? 60,
    },
    weather: {
      source: 'clear-sky',
      airTempC: p.airTempC ?? { min: 18, max: 30 },
      relativeHumidityPct: p.relativeHumidityPct ?? 50,
      windMs: p.windMs ?? 2,
    },
    sampling: { seed: 1, skyRaysPerPatch: 9, viewRays: 64, ...(p.sampling ?? {}) },
  };
}

/** A reader of files relative to the project that knows only `model.obj`. */
export function inMemoryReader(objText: string): (rel: string) => Promise<Uint8Array> {
  const bytes = new TextEncoder().encode(objText);
  return async (rel: string) => {
    if (rel === 'model.obj') return bytes;
    throw Object.assign(new Error(`no such file: ${rel}`), { code: 'ENOENT' });
  };
}

/** Loads the project from its JSON text (as the CLI would) and runs the audit. */
export async function runScene(objText: string, project: Record<string, unknown>, opts: AuditOptions = {}): Promise<Results> {
  const loaded = await loadProject(JSON.stringify(project), 'test.json', inMemoryReader(objText));
  return runAudit(loaded, { now: () => new Date(0), ...opts });
}

/** Index of the step whose label starts with `prefix` (e.g. "2026-06-21T12:00"). */
export function stepIndex(r: Results, prefix: string): number {
  const i = r.times.findIndex((t) => t.startsWith(prefix));
  if (i < 0) throw new Error(`no step ${prefix} in ${r.times[0]} … ${r.times[r.times.length - 1]}`);
  return i;
}

/** Patches of a surface (OBJ object) whose normal is within ~8° of `normal`. */
export function patchesFacing(r: Results, surface: string, normal: [number, number, number]): SurfaceResult[] {
  const out = r.surfaces.filter((s) => s.surface === surface && s.normal[0] * normal[0] + s.normal[1] * normal[1] + s.normal[2] * normal[2] > 0.99);
  if (out.length === 0) throw new Error(`no patch of ${surface} faces ${normal.join(',')}`);
  return out;
}

/** Area-weighted mean of a per-step column over patches, at step t. */
export function areaMean(patches: SurfaceResult[], column: 'incidentShortwaveWm2' | 'surfaceTempC' | 'longwaveEmissionWm2', t: number): number {
  let s = 0, a = 0;
  for (const p of patches) {
    s += p.areaM2 * p[column][t]!;
    a += p.areaM2;
  }
  return s / a;
}

/** Area-weighted mean temperature per step over patches [°C]. */
export function areaMeanSeries(patches: SurfaceResult[], column: 'incidentShortwaveWm2' | 'surfaceTempC'): number[] {
  const T = patches[0]![column].length;
  return Array.from({ length: T }, (_, t) => areaMean(patches, column, t));
}

/** Index of the largest value. */
export function argMax(xs: readonly number[]): number {
  let best = 0;
  for (let i = 1; i < xs.length; i++) if (xs[i]! > xs[best]!) best = i;
  return best;
}

/** Results as JSON without run-record fields that may differ between runs (date, timings, worker count), should they be present. */
export function comparableJson(r: Results): string {
  const run = { ...r.run };
  delete run.date;
  delete run.timingsMs;
  delete run.workers;
  return JSON.stringify({ ...r, run });
}
