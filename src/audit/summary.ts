/**
 * `summary.json`: the figures a designer reads first, derived from the columnar Results (DESIGN §4).
 * Pure and deterministic: the same Results give the same Summary, key order included.
 *
 * Conventions used throughout:
 * - Hours are step counts × `stepHours` (each step stands for its interval).
 * - Temperatures and hours are rounded to 0.1 for humans; sky view factors to 0.01 (a fraction,
 *   where 0.1 would hide real differences); positions to 0.01 m.
 * - Non-finite values (NaN, ±Infinity) in the per-step arrays are skipped, never counted as peaks.
 * - Ties go to the first occurrence: the lowest sensor (or patch) index, then the earliest step.
 */
import type { ConcentrationResult, Results } from './results.ts';
import { GLARE_CATEGORIES, GLARE_HOURS_FROM, GLARE_CAUTION, type GlareCategoryId } from './stages/glare.ts';
import { UTCI_CATEGORIES, type UtciCategoryId } from '../physics/utci.ts';
import { InputError } from '../physics/errors.ts';

/**
 * Default MRT threshold [°C] for "hours with MRT above". Our screening choice, not a published
 * limit: in shade MRT stays within a few kelvin of air temperature, while a person standing in
 * summer sun beside sunlit walls reaches 50–70 °C, so hours above 50 °C pick out "sitting in the
 * sun with hot surroundings". Override with `mrtThresholdC`.
 */
export const DEFAULT_MRT_THRESHOLD_C = 50;

export interface SummaryCategory {
  id: UtciCategoryId;
  label: string;
  /** Lower bound [°C], exclusive; null for the coldest band (−∞). */
  lowerC: number | null;
  /** Upper bound [°C], inclusive; null for the hottest band (+∞). */
  upperC: number | null;
}

export interface CategoryHours {
  id: UtciCategoryId;
  label: string;
  /** Hours in this category per sensor, averaged over the zone's sensors [h]. */
  meanHours: number;
  /** Hours in this category at the sensor with the most of them [h]. */
  maxHours: number;
}

export interface SensorPeak {
  /** The peak value [°C]. */
  valueC: number;
  /** The step's time stamp, as in `Results.times`. */
  time: string;
  /** Index of the sensor in its zone's `sensors`. */
  sensor: number;
  /** Sensor position [m] (x east, y north, z up). */
  position: [number, number, number];
}

export interface ZoneSummary {
  name: string;
  posture: 'standing' | 'seated';
  sensorHeightM: number;
  /** Sensors kept (with results). */
  sensors: number;
  /** Sensors dropped because they fell inside solid geometry. */
  droppedSensors: number;
  /** One entry per UTCI category, hottest first (the order of UTCI_CATEGORIES). */
  categoryHours: CategoryHours[];
  /** Highest MRT over sensors and steps; null when the zone has no finite value. */
  peakMrt: SensorPeak | null;
  /** Highest UTCI over sensors and steps; null when the zone has no finite value. */
  peakUtci: SensorPeak | null;
  /** Hours with MRT strictly above `thresholdC`, mean over sensors and at the worst sensor [h]. */
  mrtAbove: { thresholdC: number; meanHours: number; maxHours: number };
  /** Median of the sensors' sky view factors; null when the zone has no sensor. */
  medianSkyViewFactor: number | null;
  /** Reflected sun (present when the results carry glare per sensor). */
  glare?: ZoneGlareSummary;
}

/** Glare hours: steps in a category × stepHours, per sensor, mean over the zone and at the worst sensor. */
export interface GlareHours {
  id: GlareCategoryId;
  label: string;
  meanHours: number;
  maxHours: number;
}

export interface ZoneGlareSummary {
  /** Hours with glare (category `glareHoursFrom` or worse), mean over sensors and at the worst sensor [h]. */
  glareHours: { meanHours: number; maxHours: number };
  /** Hours per category other than 'none'. */
  categoryHours: GlareHours[];
  /** The worst sensor by glare hours (first on ties); null when no sensor has any. */
  worstSensor: { sensor: number; position: [number, number, number]; glareHours: number } | null;
  /** Highest reflected beam irradiance at a sensor [W/m²]; null when none arrives. */
  peakReflected: { valueWm2: number; time: string; sensor: number; position: [number, number, number] } | null;
}

export interface ViewpointGlareSummary {
  name: string;
  /** Hours with glare (`glareHoursFrom` or worse) [h]. */
  glareHours: number;
  /** Hours per category other than 'none' [h]. */
  categoryHours: { id: GlareCategoryId; label: string; hours: number }[];
  /** Highest reflected beam irradiance [W/m²] and its time; null when none arrives. */
  peakReflected: { valueWm2: number; time: string } | null;
}

export interface MaterialSummary {
  /** Preset id (or "custom"). */
  material: string;
  /** Number of patches with this material. */
  patches: number;
  /** Hottest surface temperature over its patches and steps; null when none is finite. */
  peakSurfaceTemp: { valueC: number; time: string; patch: string } | null;
  /**
   * 95th percentile of surface temperature over all (patch, step) values [°C], linear
   * interpolation between order statistics (h = (N−1)·0.95, the common "type 7" definition).
   */
  p95SurfaceTempC: number | null;
}

export interface Summary {
  sunfacet: 1;
  project: string;
  period: { first: string | null; last: string | null; steps: number; stepHours: number };
  /** The UTCI categories used in `categoryHours`, with bounds (the `category` ids of Results). */
  categories: SummaryCategory[];
  zones: ZoneSummary[];
  /** One entry per material, sorted by id. */
  materials: MaterialSummary[];
  /** Number of entries in `Results.warnings`. */
  warnings: number;
  /** Glare categories, the first counted as glare hours, and the caution (when the results carry glare). */
  glare?: { categories: { id: GlareCategoryId; label: string }[]; glareHoursFrom: GlareCategoryId; caution: string };
  /** Glare per viewpoint (when the results carry viewpoints). */
  viewpoints?: ViewpointGlareSummary[];
  /** The worst concentration of reflected sun (Results.concentration[0]), or null when none was found. */
  worstConcentration?: ConcentrationResult | null;
  /** Number of points flagged for concentration. */
  concentrationPoints?: number;
}

const round1 = (v: number): number => Math.round(v * 10) / 10 + 0; // + 0 turns −0 into 0
const round2 = (v: number): number => Math.round(v * 100) / 100 + 0;

/**
 * Summarises the audit results per zone and per material.
 *
 * @param results The audit's results.
 * @param opts.stepHours Length of one time step [h] (stepMinutes / 60), > 0.
 * @param opts.mrtThresholdC MRT threshold for `mrtAbove` [°C]; default DEFAULT_MRT_THRESHOLD_C.
 * @throws InputError when stepHours is not a positive finite number or mrtThresholdC is not finite.
 * @example summarizeResults(results, { stepHours: 1 }).zones[0].categoryHours[0] // → { id: 'extreme-heat', label: …, meanHours, maxHours }
 */
export function summarizeResults(results: Results, opts: { stepHours: number; mrtThresholdC?: number }): Summary {
  const { stepHours } = opts;
  if (!(Number.isFinite(stepHours) && stepHours > 0)) {
    throw new InputError({ problem: 'not a positive number', place: 'stepHours', value: stepHours, expected: 'the step length in hours, > 0' });
  }
  const thresholdC = opts.mrtThresholdC ?? DEFAULT_MRT_THRESHOLD_C;
  if (!Number.isFinite(thresholdC)) {
    throw new InputError({ problem: 'not a finite number', place: 'mrtThresholdC', value: thresholdC, expected: 'an MRT threshold in °C' });
  }
  const times = results.times;
  const steps = times.length;
  return {
    sunfacet: 1,
    project: results.project,
    period: { first: times[0] ?? null, last: times[steps - 1] ?? null, steps, stepHours },
    categories: UTCI_CATEGORIES.map((c) => ({
      id: c.id,
      label: c.label,
      lowerC: Number.isFinite(c.lowerC) ? c.lowerC : null,
      upperC: Number.isFinite(c.upperC) ? c.upperC : null,
    })),
    zones: results.zones.map((z) => summarizeZone(z, times, stepHours, thresholdC)),
    materials: summarizeMaterials(results),
    warnings: results.warnings.length,
    ...glareSummary(results, stepHours),
  };
}

const GLARE_INDEX = new Map<string, number>(GLARE_CATEGORIES.map((c, i) => [c.id, i]));
const GLARE_FROM_INDEX = GLARE_INDEX.get(GLARE_HOURS_FROM)!;

/** Step counts per glare category (index) of one glare series. */
function glareCounts(series: readonly string[]): Float64Array {
  const c = new Float64Array(GLARE_CATEGORIES.length);
  for (const id of series) {
    const i = GLARE_INDEX.get(id);
    if (i !== undefined) c[i]! += 1;
  }
  return c;
}

function glareHoursOf(counts: Float64Array): number {
  let n = 0;
  for (let i = GLARE_FROM_INDEX; i < counts.length; i++) n += counts[i]!;
  return n;
}

/** The glare parts of the summary; nothing when the results carry no glare (older results). */
function glareSummary(results: Results, stepHours: number): Pick<Summary, 'glare' | 'viewpoints' | 'worstConcentration' | 'concentrationPoints'> {
  if (results.glare === undefined) return {};
  const viewpoints = (results.viewpoints ?? []).map((v): ViewpointGlareSummary => {
    const counts = glareCounts(v.glare);
    let best = 0, bestT = -1;
    v.reflectedBeamWm2.forEach((e, t) => { if (Number.isFinite(e) && e > best) { best = e; bestT = t; } });
    return {
      name: v.name,
      glareHours: round1(glareHoursOf(counts) * stepHours),
      categoryHours: GLARE_CATEGORIES.slice(1).map((c, i) => ({ id: c.id, label: c.label, hours: round1(counts[i + 1]! * stepHours) })),
      peakReflected: bestT < 0 ? null : { valueWm2: round1(best), time: results.times[bestT] as string },
    };
  });
  return {
    glare: { categories: GLARE_CATEGORIES.map((c) => ({ id: c.id, label: c.label })), glareHoursFrom: GLARE_HOURS_FROM, caution: results.glare.caution || GLARE_CAUTION },
    viewpoints,
    worstConcentration: results.concentration?.[0] ?? null,
    concentrationPoints: results.concentration?.length ?? 0,
  };
}

function summarizeZoneGlare(zone: Results['zones'][number], times: string[], stepHours: number): ZoneGlareSummary | undefined {
  if (!zone.sensors.some((s) => s.glare !== undefined)) return undefined;
  const nCat = GLARE_CATEGORIES.length;
  const sum = new Float64Array(nCat), max = new Float64Array(nCat);
  let glareSum = 0, glareMax = 0, worst = -1;
  let best = 0, bestSensor = -1, bestStep = -1;
  zone.sensors.forEach((s, si) => {
    const counts = glareCounts(s.glare ?? []);
    for (let c = 0; c < nCat; c++) {
      sum[c]! += counts[c]!;
      if (counts[c]! > max[c]!) max[c] = counts[c]!;
    }
    const g = glareHoursOf(counts);
    glareSum += g;
    if (g > glareMax) { glareMax = g; worst = si; }
    (s.reflectedBeamWm2 ?? []).forEach((e, t) => { if (Number.isFinite(e) && e > best) { best = e; bestSensor = si; bestStep = t; } });
  });
  const n = zone.sensors.length;
  const pos = (si: number): [number, number, number] => {
    const p = (zone.sensors[si] as Results['zones'][number]['sensors'][number]).position;
    return [round2(p[0]), round2(p[1]), round2(p[2])];
  };
  return {
    glareHours: { meanHours: n === 0 ? 0 : round1((glareSum * stepHours) / n), maxHours: round1(glareMax * stepHours) },
    categoryHours: GLARE_CATEGORIES.slice(1).map((c, i) => ({ id: c.id, label: c.label, meanHours: n === 0 ? 0 : round1((sum[i + 1]! * stepHours) / n), maxHours: round1(max[i + 1]! * stepHours) })),
    worstSensor: worst < 0 ? null : { sensor: worst, position: pos(worst), glareHours: round1(glareMax * stepHours) },
    peakReflected: bestSensor < 0 ? null : { valueWm2: round1(best), time: times[bestStep] as string, sensor: bestSensor, position: pos(bestSensor) },
  };
}

function summarizeZone(zone: Results['zones'][number], times: string[], stepHours: number, thresholdC: number): ZoneSummary {
  const steps = times.length;
  const nCat = UTCI_CATEGORIES.length;
  const catIndex = new Map<string, number>(UTCI_CATEGORIES.map((c, i) => [c.id, i]));
  const sumSteps = new Float64Array(nCat);
  const maxSteps = new Float64Array(nCat);
  const counts = new Float64Array(nCat);
  let aboveSum = 0;
  let aboveMax = 0;
  let mrtBest = -Infinity, mrtSensor = -1, mrtStep = -1;
  let utciBest = -Infinity, utciSensor = -1, utciStep = -1;
  const svf: number[] = [];

  zone.sensors.forEach((s, si) => {
    counts.fill(0);
    let above = 0;
    for (let t = 0; t < steps; t++) {
      const ci = catIndex.get(s.category[t] as string);
      if (ci !== undefined) counts[ci]! += 1;
      const m = s.mrtC[t] ?? NaN;
      if (Number.isFinite(m)) {
        if (m > thresholdC) above++;
        if (m > mrtBest) { mrtBest = m; mrtSensor = si; mrtStep = t; }
      }
      const u = s.utciC[t] ?? NaN;
      if (Number.isFinite(u) && u > utciBest) { utciBest = u; utciSensor = si; utciStep = t; }
    }
    for (let c = 0; c < nCat; c++) {
      sumSteps[c]! += counts[c]!;
      if (counts[c]! > maxSteps[c]!) maxSteps[c] = counts[c]!;
    }
    aboveSum += above;
    if (above > aboveMax) aboveMax = above;
    if (Number.isFinite(s.skyViewFactor)) svf.push(s.skyViewFactor);
  });

  const n = zone.sensors.length;
  const glareOf = summarizeZoneGlare(zone, times, stepHours);
  const mean = (totalSteps: number): number => (n === 0 ? 0 : round1((totalSteps * stepHours) / n));
  const peak = (valueC: number, si: number, t: number): SensorPeak | null => {
    if (si < 0) return null;
    const p = (zone.sensors[si] as Results['zones'][number]['sensors'][number]).position;
    return { valueC: round1(valueC), time: times[t] as string, sensor: si, position: [round2(p[0]), round2(p[1]), round2(p[2])] };
  };
  return {
    name: zone.name,
    posture: zone.posture,
    sensorHeightM: zone.sensorHeightM,
    sensors: n,
    droppedSensors: zone.droppedSensors,
    categoryHours: UTCI_CATEGORIES.map((c, i) => ({
      id: c.id,
      label: c.label,
      meanHours: mean(sumSteps[i]!),
      maxHours: round1(maxSteps[i]! * stepHours),
    })),
    peakMrt: peak(mrtBest, mrtSensor, mrtStep),
    peakUtci: peak(utciBest, utciSensor, utciStep),
    mrtAbove: { thresholdC, meanHours: mean(aboveSum), maxHours: round1(aboveMax * stepHours) },
    medianSkyViewFactor: svf.length === 0 ? null : round2(median(svf)),
    ...(glareOf === undefined ? {} : { glare: glareOf }),
  };
}

function median(values: number[]): number {
  const v = [...values].sort((a, b) => a - b);
  const mid = v.length >> 1;
  return v.length % 2 === 1 ? (v[mid] as number) : ((v[mid - 1] as number) + (v[mid] as number)) / 2;
}

function summarizeMaterials(results: Results): MaterialSummary[] {
  const steps = results.times.length;
  const byMaterial = new Map<string, number[]>();
  results.surfaces.forEach((s, i) => {
    const list = byMaterial.get(s.material);
    if (list) list.push(i);
    else byMaterial.set(s.material, [i]);
  });
  const ids = [...byMaterial.keys()].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  return ids.map((material) => {
    const patchIdx = byMaterial.get(material) as number[];
    let best = -Infinity, bestPatch = -1, bestStep = -1;
    const forEachValue = (visit: (v: number) => void): void => {
      for (const pi of patchIdx) {
        const temps = (results.surfaces[pi] as Results['surfaces'][number]).surfaceTempC;
        for (let t = 0; t < steps; t++) {
          const v = temps[t] ?? NaN;
          if (Number.isFinite(v)) visit(v);
        }
      }
    };
    for (const pi of patchIdx) {
      const temps = (results.surfaces[pi] as Results['surfaces'][number]).surfaceTempC;
      for (let t = 0; t < steps; t++) {
        const v = temps[t] ?? NaN;
        if (Number.isFinite(v) && v > best) { best = v; bestPatch = pi; bestStep = t; }
      }
    }
    const p95 = percentileStreamed(forEachValue, 0.95);
    return {
      material,
      patches: patchIdx.length,
      peakSurfaceTemp:
        bestPatch < 0
          ? null
          : { valueC: round1(best), time: results.times[bestStep] as string, patch: (results.surfaces[bestPatch] as Results['surfaces'][number]).id },
      p95SurfaceTempC: p95 === null ? null : round1(p95),
    };
  });
}

const HISTOGRAM_BINS = 65536;

/**
 * Exact percentile (type 7: h = (N−1)·p, linear between the order statistics ⌊h⌋ and ⌊h⌋+1) of
 * the finite values a visitor yields, without holding them all: one pass for count and range, one
 * to histogram, one to collect just the bins holding the two wanted ranks, which are then sorted.
 * A year of hourly values on thousands of patches is tens of millions of numbers; this keeps the
 * memory to the histogram plus a couple of bins.
 *
 * @param forEachValue Calls `visit` once per finite value, in the same order on every call.
 * @param p Fraction in [0, 1].
 * @returns The percentile, or null when there is no value.
 */
export function percentileStreamed(forEachValue: (visit: (v: number) => void) => void, p: number): number | null {
  let n = 0, lo = Infinity, hi = -Infinity;
  forEachValue((v) => { n++; if (v < lo) lo = v; if (v > hi) hi = v; });
  if (n === 0) return null;
  if (lo === hi) return lo;
  const h = (n - 1) * p;
  const k0 = Math.floor(h);
  const k1 = Math.min(k0 + 1, n - 1);
  const frac = h - k0;
  // Divide by the span (not multiply by BINS/span): a span of a few denormals would make that
  // factor infinite and 0·∞ NaN (found by the property test: [0, 5e-324]).
  const span = hi - lo;
  const binOf = (v: number): number => Math.min(HISTOGRAM_BINS - 1, Math.floor(((v - lo) / span) * HISTOGRAM_BINS));
  const hist = new Uint32Array(HISTOGRAM_BINS);
  forEachValue((v) => { hist[binOf(v)]! += 1; });
  // Find the bins holding ranks k0 and k1 and the rank where each bin starts.
  let b0 = -1, b1 = -1, start0 = 0, start1 = 0, acc = 0;
  for (let b = 0; b < HISTOGRAM_BINS && b1 < 0; b++) {
    const c = hist[b]!;
    if (b0 < 0 && k0 < acc + c) { b0 = b; start0 = acc; }
    if (b1 < 0 && k1 < acc + c) { b1 = b; start1 = acc; }
    acc += c;
  }
  const in0: number[] = [];
  const in1: number[] = [];
  forEachValue((v) => {
    const b = binOf(v);
    if (b === b0) in0.push(v);
    else if (b === b1) in1.push(v);
  });
  in0.sort((a, b) => a - b);
  const x0 = in0[k0 - start0] as number;
  let x1: number;
  if (b1 === b0) x1 = in0[k1 - start0] as number;
  else {
    in1.sort((a, b) => a - b);
    x1 = in1[k1 - start1] as number;
  }
  return x0 + frac * (x1 - x0);
}
