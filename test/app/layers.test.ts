import { describe, it, expect } from 'vitest';
import type { Results } from '../../src/audit/results.ts';
import {
  colourValues, matchPatchIds, sensorCount, sensorLayerRange, sensorValues, stepHoursOf, stepNearestHour, surfaceLayerRange, surfaceValues, MISSING_RGB,
} from '../../src/app/colour/layers.ts';
import { sampleScale } from '../../src/app/colour/scales.ts';
import { matchPatchesToResults } from '../../src/app/compute/patchMatch.ts';
import { toResultsView } from '../../src/app/compute/resultColumns.ts';

/** A synthetic two-step, two-patch, three-sensor Results object (test fixture, invented numbers). */
function fixture(): Results {
  const surface = (id: string, surface: string, c: [number, number, number], sw: number[], t: number[]) => ({
    id, surface, material: 'concrete-light', centroid: c, normal: [0, 0, 1] as [number, number, number], areaM2: 1,
    incidentShortwaveWm2: sw, surfaceTempC: t, longwaveEmissionWm2: t.map((x) => 400 + x),
  });
  const sensor = (mrt: number[], utci: number[], cat: Results['zones'][number]['sensors'][number]['category']) => ({
    position: [0, 0, 1.1] as [number, number, number], skyViewFactor: 0.8, sunlit: [false, true], mrtC: mrt, utciC: utci, category: cat,
  });
  return {
    sunfacet: 1, project: 'fixture', timeConvention: 'instant', times: ['2026-07-15T08:00:00+02:00', '2026-07-15T08:30:00+02:00'],
    sun: [{ altitudeDeg: 20, azimuthDeg: 90 }, { altitudeDeg: 25, azimuthDeg: 95 }],
    weather: { airTempC: [20, 21], relativeHumidityPct: [50, 50], windMs: [2, 2], dniWm2: [0, 0], dhiWm2: [0, 0], ghiWm2: [0, 0], skyLongwaveWm2: [300, 300] },
    zones: [
      { name: 'a', posture: 'standing', sensorHeightM: 1.1, droppedSensors: 0, sensors: [sensor([30, 40], [25, 33], ['no-stress', 'strong-heat']), sensor([31, 50], [27, 39], ['moderate-heat', 'very-strong-heat'])] },
      { name: 'b', posture: 'seated', sensorHeightM: 0.6, droppedSensors: 0, sensors: [sensor([28, 29], [33, 34], ['strong-heat', 'strong-heat'])] },
    ],
    surfaces: [surface('wall-0', 'wall', [0, 0, 1], [100, 600], [22, 45]), surface('wall-1', 'wall', [2, 0, 1], [50, NaN], [21, 30])],
    warnings: [], run: {},
  };
}

/** The fixture as the page receives it: typed-array columns built by the worker. */
const view = () => toResultsView(fixture()).view;

describe('result layers', () => {
  it('picks one value per patch at a step', () => {
    const r = view();
    expect(Array.from(surfaceValues(r, 'shortwave', 1))).toEqual([600, NaN]);
    expect(Array.from(surfaceValues(r, 'surfaceTemp', 0))).toEqual([22, 21]);
    expect(Array.from(surfaceValues(r, 'longwave', 1))).toEqual([445, 430]);
    expect(Array.from(surfaceValues(r, 'shortwave', 5))).toEqual([NaN, NaN]);
  });

  it('ranges over all steps so colours compare across time', () => {
    const r = view();
    expect(surfaceLayerRange(r, 'shortwave')).toEqual({ min: 50, max: 600 });
    expect(sensorLayerRange(r, 'mrt', 'strong-heat')).toEqual({ min: 28, max: 50 });
    expect(sensorLayerRange(r, 'categoryHours', 'strong-heat')).toEqual({ min: 0, max: 1 });
  });

  it('flattens sensors over zones and counts hours in a category', () => {
    const r = view();
    expect(sensorCount(r)).toBe(3);
    expect(stepHoursOf(r)).toBe(0.5);
    expect(Array.from(sensorValues(r, 'utci', 1, 'strong-heat'))).toEqual([33, 39, 34]);
    // 30-minute steps: one step in the category = 0.5 h.
    expect(Array.from(sensorValues(r, 'categoryHours', 0, 'strong-heat'))).toEqual([0.5, 0, 1]);
  });

  it('colours values through a scale and greys out missing ones', () => {
    const rgb = colourValues([0, 10, NaN], { min: 0, max: 10 }, 'viridis');
    const lo = [0, 0, 0], hi = [0, 0, 0];
    sampleScale('viridis', 0, lo);
    sampleScale('viridis', 1, hi);
    expect(Array.from(rgb.slice(0, 3))).toEqual(lo.map(Math.fround));
    expect(Array.from(rgb.slice(3, 6))).toEqual(hi.map(Math.fround));
    expect(Array.from(rgb.slice(6, 9))).toEqual(MISSING_RGB.map(Math.fround));
  });

  it('finds the step nearest an hour', () => {
    expect(stepNearestHour(fixture().times, 8.4)).toBe(1);
    expect(stepNearestHour(['2026-07-15T00:00:00+02:00', '2026-07-15T01:00:00+02:00', '2026-07-15T02:00:00+02:00'], 1.2)).toBe(1);
  });

  it('links display patches to result surfaces by id, else by nearest centroid on the same surface', () => {
    const r = fixture();
    expect(Array.from(matchPatchIds(['wall-1', 'x', 'wall-0'], r.surfaces.map((s) => s.id)))).toEqual([1, -1, 0]);
    const m = matchPatchesToResults(
      { ids: ['wall-0', 'wall-7', 'roof-0'], surfaces: ['wall', 'wall', 'roof'], centroids: [0, 0, 1, 1.9, 0.1, 1, 0, 0, 0] },
      r.surfaces,
    );
    expect(Array.from(m)).toEqual([0, 1, -1]);
  });
});
