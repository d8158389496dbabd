/**
 * Pure read-outs for the design-option and glare views: the per-sensor difference map between two
 * designs (from `compareDesigns`), the table of zones × options, the glare hours per sensor and
 * the reflection paths at one step. No three.js, no React.
 */
import type { Comparison } from '../../audit/options.ts';
import { GLARE_HOURS_FROM } from '../../audit/stages/glare.ts';
import { GLARE_CATEGORY_IDS, type ResultsView } from './resultColumns.ts';
import { sensorCount, stepHoursOf } from '../colour/layers.ts';

/** Which difference to show: the mean over the period's daylight steps, or one step. */
export type DifferenceMode = { kind: 'daylightMean' } | { kind: 'step'; step: number };

/**
 * One value per sensor of the reference design (zones in order, sensors in order): option minus
 * reference MRT [K] of the comparison's first option. NaN where the option has no matching sensor,
 * and, for one step, where the comparison kept no per-step values (periods over 31 days).
 * @param pair a comparison whose baseline is the reference design (its zones follow the reference's)
 * @param reference the reference design's results (for the sensor count per zone)
 */
export function differenceValues(pair: Comparison, reference: { zones: readonly { name: string; sensorCount: number }[] }, mode: DifferenceMode, target?: Float32Array): Float32Array {
  const out = target ?? new Float32Array(sensorCount(reference));
  out.fill(NaN);
  const option = pair.options[0];
  let k = 0;
  reference.zones.forEach((z, zi) => {
    const ch = option?.zones[zi];
    for (let s = 0; s < z.sensorCount; s++, k++) {
      if (!ch || ch.name !== z.name) continue;
      const v = mode.kind === 'daylightMean' ? ch.sensorMeanMrtChangeK[s] : ch.sensorMrtChangeK?.[s]?.[mode.step];
      if (typeof v === 'number') out[k] = v;
    }
  });
  return out;
}

/** True when the comparison holds per-step differences (periods of at most 31 days). */
export function hasStepDifferences(pair: Comparison): boolean {
  return pair.options.some((o) => o.zones.some((z) => z.sensorMrtChangeK !== undefined));
}

export interface DesignTableRow {
  zone: string;
  option: string;
  meanMrtChangeK: number;
  peakMrtChangeK: number;
  /** Change of the mean hours per sensor in strong heat stress or worse [h]. */
  strongHeatHoursChange: number;
  unmatchedSensors: number;
}

/** UTCI categories counted as "strong heat stress or worse" (src/physics/utci.ts ids). */
export const STRONG_HEAT_OR_WORSE = ['strong-heat', 'very-strong-heat', 'extreme-heat'] as const;

/** The zones × options table of a comparison (rows zone-major, options in project order). */
export function designTable(c: Comparison): DesignTableRow[] {
  const rows: DesignTableRow[] = [];
  const zoneNames = c.options[0]?.zones.map((z) => z.name) ?? [];
  for (const zone of zoneNames) {
    for (const o of c.options) {
      const z = o.zones.find((x) => x.name === zone);
      if (!z) continue;
      let h = 0;
      for (const id of STRONG_HEAT_OR_WORSE) h += z.hoursByCategoryChange[id] ?? 0;
      rows.push({ zone, option: o.name, meanMrtChangeK: z.meanMrtChangeK, peakMrtChangeK: z.peakMrtChangeK, strongHeatHoursChange: Math.round(h * 100) / 100, unmatchedSensors: z.unmatchedSensors });
    }
  }
  return rows;
}

/**
 * Hours per sensor (zones in order) whose glare category is `from` or worse (default: after-image
 * possible, the results' `glare.glareHoursFrom`). NaN for sensors without glare values.
 */
export function glareHoursValues(results: ResultsView, target?: Float32Array): Float32Array {
  const out = target ?? new Float32Array(sensorCount(results));
  const from = GLARE_CATEGORY_IDS.indexOf(results.glare?.glareHoursFrom ?? GLARE_HOURS_FROM);
  const stepH = stepHoursOf(results);
  const steps = results.steps;
  let k = 0;
  for (const z of results.zones) {
    for (let i = 0; i < z.sensorCount; i++) {
      const g = z.glare;
      if (!g) {
        out[k++] = NaN;
        continue;
      }
      let n = 0;
      // codes rank the categories, least severe first; NO_CODE (255) is a missing value
      for (let t = i * steps, e = t + steps; t < e; t++) if (g[t]! >= from && g[t]! < GLARE_CATEGORY_IDS.length) n++;
      out[k++] = n * stepH;
    }
  }
  return out;
}

export interface PathsAtStep {
  /** 6 floats per path: patch point x, y, z, receiver x, y, z [m], engine frame. */
  segments: Float32Array;
  /** Per path: 1 when it reaches a viewpoint, 0 for a zone sensor. */
  toViewpoint: Uint8Array;
  /** Distinct sensors and viewpoints reached. */
  sensorsReached: number;
  viewpointsReached: number;
}

/**
 * The reflection paths of step `t` (entries with step[i] === t), each a line from the point on the
 * reflecting patch to the sensor (zones[zone].sensors[receiver]) or viewpoint (zone −1) it reaches.
 * Entries whose receiver is missing are skipped.
 */
export function pathsAtStep(results: ResultsView, t: number): PathsAtStep {
  const p = results.paths;
  const seg: number[] = [];
  const vp: number[] = [];
  const sensors = new Set<string>();
  const viewpoints = new Set<number>();
  if (p) {
    for (let i = 0; i < p.count; i++) {
      if (p.step[i] !== t) continue;
      const zone = p.zone[i]!, rec = p.receiver[i]!;
      let to: ArrayLike<number> | undefined;
      if (zone === -1) to = results.viewpoints[rec]?.position;
      else {
        const z = results.zones[zone];
        if (z && rec >= 0 && rec < z.sensorCount) to = z.positions.subarray(rec * 3, rec * 3 + 3);
      }
      if (!to || !Number.isFinite(p.point[i * 3]!)) continue;
      seg.push(p.point[i * 3]!, p.point[i * 3 + 1]!, p.point[i * 3 + 2]!, to[0]!, to[1]!, to[2]!);
      vp.push(zone === -1 ? 1 : 0);
      if (zone === -1) viewpoints.add(rec);
      else sensors.add(`${zone}:${rec}`);
    }
  }
  return { segments: new Float32Array(seg), toViewpoint: Uint8Array.from(vp), sensorsReached: sensors.size, viewpointsReached: viewpoints.size };
}
