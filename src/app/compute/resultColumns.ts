/**
 * The page's form of the audit's Results: flat typed-array columns, built in the audit worker and
 * moved to the page with comlink's `transfer` (no structured clone of millions of small arrays,
 * nothing to parse on the main thread). The full Results object stays in the worker for
 * "Export results". Per-step columns are sensor-major / patch-major: the value of item i at step t
 * is `column[i * steps + t]`, so one item's whole period is a `subarray`.
 *
 * Category columns hold codes: the index of the category in `UTCI_CATEGORY_IDS` (UTCI) or
 * `GLARE_CATEGORY_IDS` (glare); `NO_CODE` where the Results had none.
 */
import type { GlareInfo, Results, StepWeather } from '../../audit/results.ts';
import { UTCI_CATEGORIES, type UtciCategoryId } from '../../physics/utci.ts';
import { GLARE_CATEGORIES, type GlareCategoryId } from '../../audit/stages/glare.ts';

/** Code of a missing category value. */
export const NO_CODE = 255;
/** UTCI category ids in code order. */
export const UTCI_CATEGORY_IDS: readonly UtciCategoryId[] = UTCI_CATEGORIES.map((c) => c.id);
/** Glare category ids in code order (least to most severe). */
export const GLARE_CATEGORY_IDS: readonly GlareCategoryId[] = GLARE_CATEGORIES.map((c) => c.id);

export interface ZoneColumns {
  name: string;
  posture: 'standing' | 'seated';
  sensorHeightM: number;
  droppedSensors: number;
  sensorCount: number;
  /** x, y, z per sensor [m], engine frame. */
  positions: Float32Array;
  skyViewFactor: Float32Array;
  /** [sensors × steps] [°C]. */
  mrtC: Float32Array;
  /** [sensors × steps] [°C]. */
  utciC: Float32Array;
  /** [sensors × steps] UTCI category codes. */
  category: Uint8Array;
  /** [sensors × steps] 1 = in sun. */
  sunlit: Uint8Array;
  /** [sensors × steps] glare category codes, or null without the glare stage. */
  glare: Uint8Array | null;
}

export interface SurfaceColumns {
  count: number;
  ids: string[];
  surface: string[];
  material: string[];
  areaM2: Float32Array;
  /** [patches × steps] incident shortwave [W/m²]. */
  shortwave: Float32Array;
  /** [patches × steps] surface temperature [°C]. */
  surfaceTemp: Float32Array;
  /** [patches × steps] emitted longwave [W/m²]. */
  longwave: Float32Array;
}

export interface PathColumns {
  count: number;
  step: Int32Array;
  zone: Int32Array;
  receiver: Int32Array;
  /** x, y, z per path [m] (where the sun's image is seen on the patch). */
  point: Float32Array;
}

export interface ColumnRange {
  min: number;
  max: number;
}

export interface ResultsView {
  project: string;
  steps: number;
  times: string[];
  sun: { altitudeDeg: number; azimuthDeg: number }[];
  weather: StepWeather;
  warnings: string[];
  glare?: GlareInfo;
  viewpoints: { name: string; position: [number, number, number]; viewDirectionDeg: number | null; fieldDeg: number }[];
  zones: ZoneColumns[];
  surfaces: SurfaceColumns;
  paths: PathColumns | null;
  /** Automatic ranges over every step and item (null when all values are missing), computed where the view is built. */
  ranges: { shortwave: ColumnRange | null; surfaceTemp: ColumnRange | null; longwave: ColumnRange | null; mrt: ColumnRange | null; utci: ColumnRange | null };
}

/** Min/max of a column, skipping non-finite values; a single value becomes a ±0.5 range. */
export function columnRange(col: ArrayLike<number>): ColumnRange | null {
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < col.length; i++) {
    const v = col[i]!;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (!(min <= max) || !Number.isFinite(min) || !Number.isFinite(max)) return null;
  if (min === max) return { min: min - 0.5, max: max + 0.5 };
  return { min, max };
}

function mergeRanges(rs: (ColumnRange | null)[]): ColumnRange | null {
  let out: ColumnRange | null = null;
  for (const r of rs) {
    if (!r) continue;
    out = out ? { min: Math.min(out.min, r.min), max: Math.max(out.max, r.max) } : { ...r };
  }
  return out;
}

function fill(target: Float32Array, row: number, steps: number, values: readonly number[] | undefined): void {
  const o = row * steps;
  for (let t = 0; t < steps; t++) {
    const v = values?.[t];
    target[o + t] = v === undefined || v === null ? NaN : v;
  }
}

function codes(target: Uint8Array, row: number, steps: number, values: readonly string[] | undefined, index: Map<string, number>): void {
  const o = row * steps;
  for (let t = 0; t < steps; t++) {
    const v = values?.[t];
    target[o + t] = v === undefined ? NO_CODE : (index.get(v) ?? NO_CODE);
  }
}

const UTCI_INDEX = new Map<string, number>(UTCI_CATEGORY_IDS.map((id, i) => [id, i]));
const GLARE_INDEX = new Map<string, number>(GLARE_CATEGORY_IDS.map((id, i) => [id, i]));

/**
 * Builds the columns of a Results object; `buffers` lists every typed array's buffer (each its
 * own), ready for `transfer`.
 */
export function toResultsView(r: Results): { view: ResultsView; buffers: ArrayBuffer[] } {
  const steps = r.times.length;
  const buffers: ArrayBuffer[] = [];
  const own = <T extends Float32Array | Uint8Array | Int32Array>(a: T): T => {
    buffers.push(a.buffer as ArrayBuffer);
    return a;
  };
  const zones: ZoneColumns[] = r.zones.map((z) => {
    const n = z.sensors.length;
    const positions = own(new Float32Array(n * 3));
    const svf = own(new Float32Array(n));
    const mrtC = own(new Float32Array(n * steps));
    const utciC = own(new Float32Array(n * steps));
    const category = own(new Uint8Array(n * steps));
    const sunlit = own(new Uint8Array(n * steps));
    const hasGlare = z.sensors.some((s) => s.glare !== undefined);
    const glare = hasGlare ? own(new Uint8Array(n * steps)) : null;
    z.sensors.forEach((s, i) => {
      positions.set(s.position, i * 3);
      svf[i] = s.skyViewFactor ?? NaN;
      fill(mrtC, i, steps, s.mrtC);
      fill(utciC, i, steps, s.utciC);
      codes(category, i, steps, s.category, UTCI_INDEX);
      for (let t = 0; t < steps; t++) sunlit[i * steps + t] = s.sunlit?.[t] ? 1 : 0;
      if (glare) codes(glare, i, steps, s.glare, GLARE_INDEX);
    });
    return { name: z.name, posture: z.posture, sensorHeightM: z.sensorHeightM, droppedSensors: z.droppedSensors, sensorCount: n, positions, skyViewFactor: svf, mrtC, utciC, category, sunlit, glare };
  });
  const m = r.surfaces.length;
  const surfaces: SurfaceColumns = {
    count: m,
    ids: r.surfaces.map((s) => s.id),
    surface: r.surfaces.map((s) => s.surface),
    material: r.surfaces.map((s) => s.material),
    areaM2: own(Float32Array.from(r.surfaces, (s) => s.areaM2)),
    shortwave: own(new Float32Array(m * steps)),
    surfaceTemp: own(new Float32Array(m * steps)),
    longwave: own(new Float32Array(m * steps)),
  };
  r.surfaces.forEach((s, i) => {
    fill(surfaces.shortwave, i, steps, s.incidentShortwaveWm2);
    fill(surfaces.surfaceTemp, i, steps, s.surfaceTempC);
    fill(surfaces.longwave, i, steps, s.longwaveEmissionWm2);
  });
  let paths: PathColumns | null = null;
  const p = r.reflectionPaths;
  if (p) {
    const k = p.step.length;
    paths = { count: k, step: own(Int32Array.from(p.step)), zone: own(Int32Array.from(p.zone)), receiver: own(Int32Array.from(p.receiver)), point: own(new Float32Array(k * 3)) };
    for (let i = 0; i < k; i++) {
      const a = p.point[i];
      if (a) paths.point.set(a, i * 3);
      else paths.point.fill(NaN, i * 3, i * 3 + 3);
    }
  }
  const view: ResultsView = {
    project: r.project,
    steps,
    times: r.times,
    sun: r.sun,
    weather: r.weather,
    warnings: r.warnings,
    ...(r.glare ? { glare: r.glare } : {}),
    viewpoints: (r.viewpoints ?? []).map((v) => ({ name: v.name, position: v.position, viewDirectionDeg: v.viewDirectionDeg, fieldDeg: v.fieldDeg })),
    zones,
    surfaces,
    paths,
    ranges: {
      shortwave: columnRange(surfaces.shortwave),
      surfaceTemp: columnRange(surfaces.surfaceTemp),
      longwave: columnRange(surfaces.longwave),
      mrt: mergeRanges(zones.map((z) => columnRange(z.mrtC))),
      utci: mergeRanges(zones.map((z) => columnRange(z.utciC))),
    },
  };
  return { view, buffers };
}

/** One sensor's whole period of a per-step column (a view, no copy). */
export function sensorSeries(z: ZoneColumns, column: 'mrtC' | 'utciC', sensor: number, steps: number): Float32Array {
  return z[column].subarray(sensor * steps, (sensor + 1) * steps);
}

/** One patch's whole period of a per-step column (a view, no copy). */
export function patchSeries(s: SurfaceColumns, column: 'shortwave' | 'surfaceTemp' | 'longwave', patch: number, steps: number): Float32Array {
  return s[column].subarray(patch * steps, (patch + 1) * steps);
}
