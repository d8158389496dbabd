/**
 * Result layers: which column of the Results a colour view shows, and the pure mapping from a
 * Results view (the columns of src/app/compute/resultColumns.ts) to one value per surface patch or per sensor at a time step. The
 * React tree only reads what these functions return.
 */
import type { Results } from '../../audit/results.ts';
import { UTCI_CATEGORY_IDS, type ResultsView } from '../compute/resultColumns.ts';
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

function surfaceColumn(layer: SurfaceLayerId, s: ResultsView['surfaces']): Float32Array {
  return layer === 'shortwave' ? s.shortwave : layer === 'surfaceTemp' ? s.surfaceTemp : s.longwave;
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
export function sensorCount(results: { zones: readonly { sensorCount: number }[] }): number {
  let n = 0;
  for (const z of results.zones) n += z.sensorCount;
  return n;
}

/** One value per surface patch (in `results.surfaces` order) at step `timeIndex` [SI units]. */
export function surfaceValues(results: ResultsView, layer: SurfaceLayerId, timeIndex: number, target?: Float32Array): Float32Array {
  const n = results.surfaces.count;
  const out = target ?? new Float32Array(n);
  const col = surfaceColumn(layer, results.surfaces);
  const steps = results.steps;
  const inside = timeIndex >= 0 && timeIndex < steps;
  for (let i = 0; i < n; i++) out[i] = inside ? col[i * steps + timeIndex]! : NaN;
  return out;
}

/** Hours over the period that one sensor spends in UTCI category `code` (a code of UTCI_CATEGORY_IDS). */
function hoursInCode(codes: Uint8Array, sensor: number, steps: number, code: number, stepH: number): number {
  let n = 0;
  const o = sensor * steps;
  for (let t = 0; t < steps; t++) if (codes[o + t] === code) n++;
  return n * stepH;
}

/**
 * One value per sensor (zones in order, sensors in order) at step `timeIndex` [SI units]; for
 * 'categoryHours' the hours over the whole period whose UTCI category is `categoryId`.
 */
export function sensorValues(
  results: ResultsView,
  layer: SensorLayerId,
  timeIndex: number,
  categoryId: UtciCategoryId,
  target?: Float32Array,
): Float32Array {
  const out = target ?? new Float32Array(sensorCount(results));
  const stepH = stepHoursOf(results);
  const steps = results.steps;
  const code = UTCI_CATEGORY_IDS.indexOf(categoryId);
  const inside = timeIndex >= 0 && timeIndex < steps;
  let k = 0;
  for (const z of results.zones) {
    const col = layer === 'mrt' ? z.mrtC : z.utciC;
    for (let i = 0; i < z.sensorCount; i++) {
      if (layer === 'categoryHours') out[k++] = hoursInCode(z.category, i, steps, code, stepH);
      else out[k++] = inside ? col[i * steps + timeIndex]! : NaN;
    }
  }
  return out;
}

const rangeCache = new WeakMap<object, Map<string, ValueRange | null>>();

function cached(results: ResultsView, key: string, compute: () => ValueRange | null): ValueRange | null {
  let m = rangeCache.get(results);
  if (!m) rangeCache.set(results, (m = new Map()));
  if (!m.has(key)) m.set(key, compute());
  return m.get(key)!;
}

/** Automatic range of a surface layer over every step and patch (so colours compare across time); computed with the columns. */
export function surfaceLayerRange(results: ResultsView, layer: SurfaceLayerId): ValueRange | null {
  return results.ranges[layer];
}

/** Automatic range of a sensor layer over every step and sensor (0 to the most hours of any sensor, for hours). */
export function sensorLayerRange(results: ResultsView, layer: SensorLayerId, categoryId: UtciCategoryId): ValueRange | null {
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
  return results.ranges[layer];
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
