/**
 * Per-zone figures the report draws that summary.json does not hold: the zone's median and
 * hottest-sensor UTCI per step, and one value per sensor for the plan view. Pure.
 */
import type { Results, ZoneResult } from '../audit/results.ts';
import type { UtciCategoryId } from '../physics/utci.ts';

/** What colours the sensors of a plan view. */
export type PlanMetricId = 'heatHours' | 'peakMrt' | 'skyView';

export interface PlanMetric {
  id: PlanMetricId;
  /** Legend title. */
  label: string;
  unit: string;
  decimals: number;
}

export const PLAN_METRICS: Record<PlanMetricId, PlanMetric> = {
  heatHours: { id: 'heatHours', label: 'hours of strong heat stress or worse (UTCI > 32 °C)', unit: 'h', decimals: 1 },
  peakMrt: { id: 'peakMrt', label: 'highest MRT over the period', unit: '°C', decimals: 1 },
  skyView: { id: 'skyView', label: 'sky view factor', unit: '', decimals: 2 },
};

/** The categories counted as "strong heat stress or worse" (UTCI above 32 °C; Bröde et al. 2012). */
export const STRONG_HEAT_OR_WORSE: readonly UtciCategoryId[] = ['strong-heat', 'very-strong-heat', 'extreme-heat'];

/**
 * One value per sensor of the zone for the plan view.
 * @param stepHours Length of one step [h].
 */
export function sensorMetric(zone: ZoneResult, metric: PlanMetricId, stepHours: number): number[] {
  return zone.sensors.map((s) => {
    if (metric === 'skyView') return s.skyViewFactor;
    if (metric === 'peakMrt') {
      let best = -Infinity;
      for (const v of s.mrtC) if (Number.isFinite(v) && v > best) best = v;
      return best === -Infinity ? NaN : best;
    }
    let n = 0;
    for (const c of s.category) if (STRONG_HEAT_OR_WORSE.includes(c)) n++;
    return n * stepHours;
  });
}

export interface ZoneSeries {
  /** Median over the zone's sensors per step [°C] (NaN where no sensor has a finite value). */
  medianUtciC: number[];
  /** Highest value over the zone's sensors per step [°C]: the hottest sensor at that step. */
  worstUtciC: number[];
}

/** The zone's median and hottest-sensor UTCI per step. */
export function zoneUtciSeries(zone: ZoneResult, steps: number): ZoneSeries {
  const medianUtciC: number[] = [];
  const worstUtciC: number[] = [];
  const col: number[] = [];
  for (let t = 0; t < steps; t++) {
    col.length = 0;
    for (const s of zone.sensors) {
      const v = s.utciC[t] ?? NaN;
      if (Number.isFinite(v)) col.push(v);
    }
    if (col.length === 0) {
      medianUtciC.push(NaN);
      worstUtciC.push(NaN);
      continue;
    }
    col.sort((a, b) => a - b);
    const mid = col.length >> 1;
    medianUtciC.push(col.length % 2 ? col[mid]! : (col[mid - 1]! + col[mid]!) / 2);
    worstUtciC.push(col[col.length - 1]!);
  }
  return { medianUtciC, worstUtciC };
}

/** Estimated sensor spacing [m]: the median nearest-neighbour distance in plan (1 m with one sensor). */
export function sensorSpacingM(zone: ZoneResult): number {
  const p = zone.sensors.map((s) => s.position);
  if (p.length < 2) return 1;
  const nearest: number[] = [];
  for (let i = 0; i < p.length; i++) {
    let best = Infinity;
    for (let j = 0; j < p.length; j++) {
      if (i === j) continue;
      const d = Math.hypot(p[i]![0] - p[j]![0], p[i]![1] - p[j]![1]);
      if (d > 1e-6 && d < best) best = d;
    }
    if (Number.isFinite(best)) nearest.push(best);
  }
  nearest.sort((a, b) => a - b);
  return nearest[nearest.length >> 1] ?? 1;
}

/** True when the period spans more than 31 days (the report then draws a month × hour calendar). */
export function isLongPeriod(results: Pick<Results, 'times'>): boolean {
  const a = Date.parse(results.times[0] ?? '');
  const b = Date.parse(results.times[results.times.length - 1] ?? '');
  return Number.isFinite(a) && Number.isFinite(b) && b - a > 31 * 86400e3;
}
