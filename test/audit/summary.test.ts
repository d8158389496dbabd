import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { summarizeResults, percentileStreamed, DEFAULT_MRT_THRESHOLD_C } from '../../src/audit/summary.ts';
import type { Results, SensorResult, SurfaceResult } from '../../src/audit/results.ts';
import { UTCI_CATEGORIES, type UtciCategoryId } from '../../src/physics/utci.ts';
import { InputError } from '../../src/physics/errors.ts';

// Invented numbers: these tests check bookkeeping (counting, peaks, percentiles), not physics.

const TIMES = ['2026-07-21T12:00:00+02:00', '2026-07-21T12:30:00+02:00', '2026-07-21T13:00:00+02:00', '2026-07-21T13:30:00+02:00'];

function sensor(position: [number, number, number], svf: number, mrtC: number[], utciC: number[], category: UtciCategoryId[]): SensorResult {
  return { position, skyViewFactor: svf, sunlit: mrtC.map((m) => m > 40), mrtC, utciC, category };
}

function surface(id: string, material: string, temps: number[]): SurfaceResult {
  return {
    id, surface: id.replace(/-\d+$/, ''), material, centroid: [0, 0, 0], normal: [0, 0, 1], areaM2: 1,
    incidentShortwaveWm2: temps.map(() => 500), surfaceTempC: temps, longwaveEmissionWm2: temps.map(() => 450),
  };
}

function example(): Results {
  return {
    sunfacet: 1,
    project: 'test terrace',
    timeConvention: 'interval midpoint',
    times: TIMES,
    sun: TIMES.map(() => ({ altitudeDeg: 50, azimuthDeg: 180 })),
    weather: { airTempC: [30, 31, 32, 31], relativeHumidityPct: [40, 40, 40, 40], windMs: [2, 2, 2, 2], dniWm2: [800, 800, 800, 800], dhiWm2: [100, 100, 100, 100], ghiWm2: [700, 700, 700, 700], skyLongwaveWm2: [380, 380, 380, 380] },
    zones: [
      {
        name: 'patio', posture: 'standing', sensorHeightM: 1.1, droppedSensors: 2,
        sensors: [
          sensor([1.004, 2.006, 1.1], 0.8, [45, 55, 58.04, 49], [25, 30, 35, 31], ['no-stress', 'moderate-heat', 'strong-heat', 'moderate-heat']),
          sensor([2, 2, 1.1], 0.6, [40, 52, 58.04, 60.2], [24, 23, 30, 40], ['no-stress', 'no-stress', 'moderate-heat', 'very-strong-heat']),
          sensor([3, 2, 1.1], 0.3, [NaN, 30, 31, 32], [NaN, 20, 20, 20], ['no-stress', 'no-stress', 'no-stress', 'no-stress']),
        ],
      },
      { name: 'empty, corner', posture: 'seated', sensorHeightM: 0.6, droppedSensors: 5, sensors: [] },
    ],
    surfaces: [
      surface('wall-s-0', 'steel-dark-painted', [40, 61.26, 55, NaN]),
      surface('wall-s-1', 'steel-dark-painted', [41, 62.3, 62.3, 50]),
      surface('ground-0', 'concrete', [30, 35, 38, 36]),
    ],
    warnings: ['a', 'b', 'c'],
    run: {},
  };
}

describe('summarizeResults', () => {
  const s = summarizeResults(example(), { stepHours: 0.5 });
  const patio = s.zones[0]!;

  it('gives the period, project, warning count and the category table with JSON-safe bounds', () => {
    expect(s.project).toBe('test terrace');
    expect(s.period).toEqual({ first: TIMES[0], last: TIMES[3], steps: 4, stepHours: 0.5 });
    expect(s.warnings).toBe(3);
    expect(s.categories.map((c) => c.id)).toEqual(UTCI_CATEGORIES.map((c) => c.id));
    expect(s.categories[0]).toMatchObject({ id: 'extreme-heat', lowerC: 46, upperC: null });
    expect(s.categories[9]).toMatchObject({ id: 'extreme-cold', lowerC: null, upperC: -40 });
    // Must survive JSON (no Infinity turned into null silently elsewhere).
    expect(JSON.parse(JSON.stringify(s))).toEqual(s);
  });

  it('counts category hours per sensor: mean over sensors and the worst sensor, in UTCI_CATEGORIES order', () => {
    expect(patio.sensors).toBe(3);
    expect(patio.droppedSensors).toBe(2);
    expect(patio.categoryHours.map((c) => c.id)).toEqual(UTCI_CATEGORIES.map((c) => c.id));
    const byId = Object.fromEntries(patio.categoryHours.map((c) => [c.id, c]));
    // no-stress: 1, 2, 4 steps of 0.5 h → mean 7/3·0.5 = 1.1667 → 1.2; max 2.0
    expect(byId['no-stress']).toMatchObject({ label: 'no thermal stress', meanHours: 1.2, maxHours: 2 });
    // moderate-heat: 2, 1, 0 steps → mean 0.5; max 1.0
    expect(byId['moderate-heat']).toMatchObject({ meanHours: 0.5, maxHours: 1 });
    // strong-heat 1,0,0 → 0.1667 → 0.2; very-strong-heat the same
    expect(byId['strong-heat']).toMatchObject({ meanHours: 0.2, maxHours: 0.5 });
    expect(byId['very-strong-heat']).toMatchObject({ meanHours: 0.2, maxHours: 0.5 });
    expect(byId['extreme-heat']).toMatchObject({ meanHours: 0, maxHours: 0 });
  });

  it('category mean hours add up to the period length, within the rounding of each entry', () => {
    const one = summarizeResults(example(), { stepHours: 1 });
    const nonZero = one.zones[0]!.categoryHours.filter((c) => c.meanHours > 0);
    const sum = nonZero.reduce((a, c) => a + c.meanHours, 0);
    // each mean is rounded to 0.1, so each may be off by 0.05
    expect(Math.abs(sum - 4)).toBeLessThanOrEqual(0.05 * nonZero.length + 1e-9);
  });

  it('finds the peak MRT and UTCI with time, sensor and position; ties go to the first sensor', () => {
    // 60.2 at sensor 1, step 3 beats the tied 58.04s.
    expect(patio.peakMrt).toEqual({ valueC: 60.2, time: TIMES[3], sensor: 1, position: [2, 2, 1.1] });
    expect(patio.peakUtci).toEqual({ valueC: 40, time: TIMES[3], sensor: 1, position: [2, 2, 1.1] });
    const r = example();
    r.zones[0]!.sensors[1]!.mrtC[3] = 10;
    const tie = summarizeResults(r, { stepHours: 1 }).zones[0]!.peakMrt!;
    expect(tie).toEqual({ valueC: 58, time: TIMES[2], sensor: 0, position: [1, 2.01, 1.1] });
  });

  it('counts hours with MRT above the threshold (default and custom), skipping NaN', () => {
    expect(DEFAULT_MRT_THRESHOLD_C).toBe(50);
    // > 50: sensor 0 → 2 steps, sensor 1 → 3 steps, sensor 2 → 0 → mean 5/3·0.5 = 0.833 → 0.8; max 1.5
    expect(patio.mrtAbove).toEqual({ thresholdC: 50, meanHours: 0.8, maxHours: 1.5 });
    const t30 = summarizeResults(example(), { stepHours: 1, mrtThresholdC: 30 }).zones[0]!.mrtAbove;
    // > 30: 4, 4, 2 (31, 32; NaN and 30 not counted) → mean 3.333 → 3.3, max 4
    expect(t30).toEqual({ thresholdC: 30, meanHours: 3.3, maxHours: 4 });
  });

  it('takes the median sky view factor (odd and even counts)', () => {
    expect(patio.medianSkyViewFactor).toBe(0.6);
    const r = example();
    r.zones[0]!.sensors.pop();
    expect(summarizeResults(r, { stepHours: 1 }).zones[0]!.medianSkyViewFactor).toBe(0.7);
  });

  it('handles a zone without sensors', () => {
    const empty = s.zones[1]!;
    expect(empty).toMatchObject({ name: 'empty, corner', posture: 'seated', sensors: 0, droppedSensors: 5, peakMrt: null, peakUtci: null, medianSkyViewFactor: null });
    expect(empty.categoryHours.every((c) => c.meanHours === 0 && c.maxHours === 0)).toBe(true);
  });

  it('summarises materials: peak surface temperature with time and patch, and the 95th percentile', () => {
    expect(s.materials.map((m) => m.material)).toEqual(['concrete', 'steel-dark-painted']);
    const steel = s.materials[1]!;
    expect(steel.patches).toBe(2);
    // 62.3 occurs at wall-s-1 steps 1 and 2: the first wins.
    expect(steel.peakSurfaceTemp).toEqual({ valueC: 62.3, time: TIMES[1], patch: 'wall-s-1' });
    // finite values sorted: 40 41 50 55 61.26 62.3 62.3 → h = 6·0.95 = 5.7 → 62.3 (x5 = x6)
    expect(steel.p95SurfaceTempC).toBe(62.3);
    // concrete 30 35 36 38 → h = 2.85 → 36 + 0.85·2 = 37.7
    expect(s.materials[0]!.p95SurfaceTempC).toBe(37.7);
  });

  it('is deterministic and refuses a bad step length', () => {
    expect(summarizeResults(example(), { stepHours: 0.5 })).toEqual(s);
    expect(() => summarizeResults(example(), { stepHours: 0 })).toThrow(InputError);
    expect(() => summarizeResults(example(), { stepHours: NaN })).toThrow(/stepHours/);
    expect(() => summarizeResults(example(), { stepHours: 1, mrtThresholdC: Infinity })).toThrow(/mrtThresholdC/);
  });
});

describe('percentileStreamed', () => {
  /** Type-7 percentile by sorting everything: the slow oracle. */
  const oracle = (values: number[], p: number): number | null => {
    if (values.length === 0) return null;
    const v = [...values].sort((a, b) => a - b);
    const h = (v.length - 1) * p;
    const k = Math.floor(h);
    const x0 = v[k]!, x1 = v[Math.min(k + 1, v.length - 1)]!;
    return x0 + (h - k) * (x1 - x0);
  };
  const run = (values: number[], p: number): number | null => percentileStreamed((visit) => values.forEach(visit), p);

  it('gives the textbook value on 1..101', () => {
    const v = Array.from({ length: 101 }, (_, i) => i + 1);
    expect(run(v, 0.95)).toBe(96); // h = 100·0.95 = 95 → the 96th value
    expect(run(v, 0.5)).toBe(51);
    expect(run(v, 0)).toBe(1);
    expect(run(v, 1)).toBe(101);
  });

  it('handles empty, single and constant inputs', () => {
    expect(run([], 0.95)).toBeNull();
    expect(run([7], 0.95)).toBe(7);
    expect(run([3, 3, 3], 0.95)).toBe(3);
  });

  it('equals the sort-everything oracle on random data with duplicates and clusters', () => {
    fc.assert(
      fc.property(
        fc.array(fc.oneof(fc.double({ min: -50, max: 90, noNaN: true }), fc.constantFrom(20, 20.5, 60)), { minLength: 1, maxLength: 400 }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (values, p) => {
          const got = run(values, p)!;
          const want = oracle(values, p)!;
          expect(Math.abs(got - want)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(want)));
        },
      ),
      { numRuns: 300 },
    );
  });

  it('handles a span of denormals (regression: [0, 5e-324] gave NaN)', () => {
    expect(run([0, 5e-324], 0)).toBe(0);
    expect(run([0, 5e-324], 1)).toBe(5e-324);
  });

  it('is exact on a large set spread over few bins and an outlier (many values per bin)', () => {
    const v: number[] = [];
    for (let i = 0; i < 200_000; i++) v.push(30 + ((i * 7919) % 1000) / 1e6); // all in one bin
    v.push(1e6);
    expect(run(v, 0.95)).toBe(oracle(v, 0.95));
  });
});
