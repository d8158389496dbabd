/**
 * Result layers: which column of the Results a colour view shows, and the pure mapping from a
 * Results object (DESIGN §4) to one value per surface patch or per sensor at a time step. The
 * React tree only reads what these functions return.
 */
import type { Results } from '../../audit/results.ts';
import type { UtciCategoryId } from '../../physics/utci.ts';
import type { Quantity } from './units.ts';
import { sampleScale, valueFraction, type ScaleId } from './scales.ts';
import type { ValueRange } from './legend.ts';
import { autoRange } from './legend.ts';

export type SurfaceLayerId = 'shortwave' | 'surfaceTemp' | 'longwave';
export type SensorLayerId = 'mrt' | 'utci' | 'categoryHours';

export interface LayerInfo<Id extends string> {
  id: Id;
  label: string;
  quantity: Quantity;
  /** Whether the layer changes with the time step (false for counts over the period). */
  perStep: boolean;
}

export const SURFACE_LAYERS: readonly LayerInfo<SurfaceLayerId>[] = [
  { id: 'shortwave', label: 'Incident shortwave', quantity: 'irradiance', perStep: true },
  { id: 'surfaceTemp', label: 'Surface temperature', quantity: 'temperature', perStep: true },
  { id: 'longwave', label: 'Longwave emission', quantity: 'irradiance', perStep: true },
];

export const SENSOR_LAYERS: readonly LayerInfo<SensorLayerId>[] = [
  { id: 'mrt', label: 'Mean radiant temperature (MRT)', quantity: 'temperature', perStep: true },
  { id: 'utci', label: 'UTCI', quantity: 'temperature', perStep: true },
  { id: 'categoryHours', label: 'Hours in a UTCI category', quantity: 'hours', perStep: false },
];

function surfaceColumn(layer: SurfaceLayerId, s: Results['surfaces'][number]): readonly number[] {
  return layer === 'shortwave' ? s.incidentShortwaveWm2 : layer === 'surfaceTemp' ? s.surfaceTempC : s.longwaveEmissionWm2;
}

/** Hours each step stands for, from the spacing of the first two time stamps (1 if one step). */
export function stepHoursOf(results: Pick<Results, 'times'>): number {
  if (results.times.length < 2) return 1;
  const a = Date.parse(results.times[0]!);
  const b = Date.parse(results.times[1]!);
  const h = (b - a) / 3_600_000;
  return Number.isFinite(h) && h > 0 ? h : 1;
}

/** Number of sensors over all zones. */
export function sensorCount(results: Pick<Results, 'zones'>): number {
  let n = 0;
  for (const z of results.zones) n += z.sensors.length;
  return n;
}

/** One value per surface patch (in `results.surfaces` order) at step `timeIndex` [SI units]. */
export function surfaceValues(results: Results, layer: SurfaceLayerId, timeIndex: number, target?: Float32Array): Float32Array {
  const out = target ?? new Float32Array(results.surfaces.length);
  results.surfaces.forEach((s, i) => {
    const v = surfaceColumn(layer, s)[timeIndex];
    out[i] = v === undefined ? NaN : v;
  });
  return out;
}

/**
 * One value per sensor (zones in order, sensors in order) at step `timeIndex` [SI units]; for
 * 'categoryHours' the hours over the whole period whose UTCI category is `categoryId`.
 */
export function sensorValues(
  results: Results,
  layer: SensorLayerId,
  timeIndex: number,
  categoryId: UtciCategoryId,
  target?: Float32Array,
): Float32Array {
  const out = target ?? new Float32Array(sensorCount(results));
  const stepH = stepHoursOf(results);
  let k = 0;
  for (const z of results.zones) {
    for (const s of z.sensors) {
      if (layer === 'categoryHours') {
        let n = 0;
        for (const c of s.category) if (c === categoryId) n++;
        out[k++] = n * stepH;
      } else {
        const v = (layer === 'mrt' ? s.mrtC : s.utciC)[timeIndex];
        out[k++] = v === undefined ? NaN : v;
      }
    }
  }
  return out;
}

/** Min/max over arrays of numbers, skipping non-finite values (plain loops: a year is tens of millions). */
function rangeOfColumns(columns: Iterable<readonly number[]>): ValueRange | null {
  let min = Infinity;
  let max = -Infinity;
  for (const col of columns) {
    for (let i = 0; i < col.length; i++) {
      const v = col[i]!;
      if (v < min) min = v;
      if (v > max) max = v;
    }
  }
  // NaN fails both comparisons; ±Infinity is not a value the audit writes.
  if (!(min <= max) || !Number.isFinite(min) || !Number.isFinite(max)) return null;
  if (min === max) return { min: min - 0.5, max: max + 0.5 };
  return { min, max };
}

const rangeCache = new WeakMap<object, Map<string, ValueRange | null>>();

function cached(results: Results, key: string, compute: () => ValueRange | null): ValueRange | null {
  let m = rangeCache.get(results);
  if (!m) rangeCache.set(results, (m = new Map()));
  if (!m.has(key)) m.set(key, compute());
  return m.get(key)!;
}

/** Automatic range of a surface layer over every step and patch (so colours compare across time); cached per Results. */
export function surfaceLayerRange(results: Results, layer: SurfaceLayerId): ValueRange | null {
  return cached(results, `s:${layer}`, () => rangeOfColumns(results.surfaces.map((s) => surfaceColumn(layer, s))));
}

/** Automatic range of a sensor layer over every step and sensor (0 to the most hours of any sensor, for hours); cached per Results. */
export function sensorLayerRange(results: Results, layer: SensorLayerId, categoryId: UtciCategoryId): ValueRange | null {
  if (layer === 'categoryHours') {
    if (sensorCount(results) === 0) return null;
    // 0 to the most hours any sensor spends in the category (over a year, the period's length
    // would leave every tile dark); one step at least, so the range is never empty.
    return cached(results, `h:${categoryId}`, () => {
      const hours = sensorValues(results, 'categoryHours', 0, categoryId);
      let max = 0;
      for (const h of hours) if (h > max) max = h;
      return { min: 0, max: Math.max(stepHoursOf(results), max) };
    });
  }
  return cached(results, `z:${layer}`, () => rangeOfColumns(results.zones.flatMap((z) => z.sensors.map((s) => (layer === 'mrt' ? s.mrtC : s.utciC)))));
}

/** Range of the values at one step (the "this step's range" legend option); null when all are missing. */
export function stepRange(values: ArrayLike<number>): ValueRange | null {
  return autoRange(Array.from(values));
}

/** Colour shown for a missing value (NaN): a mid grey that is on none of the scales. */
export const MISSING_RGB: readonly [number, number, number] = [0.55, 0.55, 0.55];

/** Writes r, g, b per value into `target` (3 per value) through a scale and a range. */
export function colourValues(values: ArrayLike<number>, range: ValueRange, scale: ScaleId, target?: Float32Array): Float32Array {
  const out = target ?? new Float32Array(values.length * 3);
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (Number.isFinite(v)) sampleScale(scale, valueFraction(v, range.min, range.max), out, i * 3);
    else {
      out[i * 3] = MISSING_RGB[0];
      out[i * 3 + 1] = MISSING_RGB[1];
      out[i * 3 + 2] = MISSING_RGB[2];
    }
  }
  return out;
}

/**
 * For each displayed patch id, the index of the result surface with the same id, or −1.
 * Display patches come from the same discretiser the audit uses, so ids normally all match.
 */
export function matchPatchIds(displayIds: readonly string[], resultIds: readonly string[]): Int32Array {
  const byId = new Map<string, number>();
  resultIds.forEach((id, i) => byId.set(id, i));
  const out = new Int32Array(displayIds.length);
  displayIds.forEach((id, i) => (out[i] = byId.get(id) ?? -1));
  return out;
}

/** The step whose time stamp is nearest to `hour` (local clock hour of the first day), or 0. */
export function stepNearestHour(times: readonly string[], hour: number): number {
  let best = 0;
  let bestD = Infinity;
  times.forEach((t, i) => {
    const m = /T(\d\d):(\d\d)/.exec(t);
    if (!m) return;
    const h = Number(m[1]) + Number(m[2]) / 60;
    const d = Math.abs(h - hour);
    if (d < bestD) {
      bestD = d;
      best = i;
    }
  });
  return best;
}
