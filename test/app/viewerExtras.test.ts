// Reducers and helpers added for periods, weather files, material overrides, zone corners, the
// day/time sliders and the sun-path overlay.
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import {
  checkDoc, materialEntryOf, moveZoneCorner, parseProjectDoc, periodKindOf, removeZoneCorner, setDateRange, setMaterialOverrides, setWeatherFile, setWholeYear,
} from '../../src/app/state/projectDoc.ts';
import { daySplit, stepIndexOf, stepsPerDayOf } from '../../src/app/ui/timeSteps.ts';
import { localMidnightMs, sunArc } from '../../src/app/scene/sunArcs.ts';
import { stepRange } from '../../src/app/colour/layers.ts';
import { effectiveRange } from '../../src/app/ui/ranges.ts';

const demo = () => parseProjectDoc(readFileSync(new URL('../../public/demo/project.json', import.meta.url), 'utf8'), 'project.json');

describe('periods and weather files', () => {
  it('makes a date range of whole days and refuses a reversed one', () => {
    const d = setDateRange(demo(), '2026-07-10', '2026-07-16');
    expect(d.period).toEqual({ start: '2026-07-10T00:00:00+02:00', end: '2026-07-16T23:00:00+02:00', stepMinutes: 60 });
    expect(periodKindOf(d)).toBe('range');
    expect(checkDoc(d).ok).toBe(true);
    expect(() => setDateRange(demo(), '2026-07-16', '2026-07-10')).toThrow(/last day/);
  });

  it('allows the whole year only with a weather file', () => {
    expect(() => setWholeYear(demo())).toThrow(/weather file/);
    const d = setWholeYear(setWeatherFile(demo(), 'tmy.epw'));
    expect(d.period).toBe('year');
    expect(d.weather).toEqual({ source: 'file', file: 'tmy.epw' });
    expect(checkDoc(d).ok).toBe(true);
  });
});

describe('material overrides', () => {
  it('writes { preset, ...overrides }, back to the plain id when nothing is overridden', () => {
    let d = setMaterialOverrides(demo(), 'render-light', 'concrete-light', { reflectanceVisible: 0.2, emissivity: 0.85 });
    expect(d.materials?.['render-light']).toEqual({ preset: 'concrete-light', reflectanceVisible: 0.2, emissivity: 0.85 });
    expect(materialEntryOf(d, 'render-light')).toEqual({ preset: 'concrete-light', overrides: { reflectanceVisible: 0.2, emissivity: 0.85 } });
    expect(checkDoc(d).ok).toBe(true);
    d = setMaterialOverrides(d, 'render-light', 'concrete-light', {});
    expect(d.materials?.['render-light']).toBe('concrete-light');
    expect(() => setMaterialOverrides(d, 'x', 'concrete-light', { emissivity: 1.2 })).toThrow(/emissivity/);
  });
});

describe('zone corners', () => {
  it('moves and removes corners, keeping at least three', () => {
    let d = moveZoneCorner(demo(), 0, 1, 25, 2);
    expect(d.zones![0]!.polygon![1]).toEqual([25, 2]);
    expect(d.zones![0]!.polygon![0]).toEqual([3, 3]);
    d = removeZoneCorner(d, 0, 0);
    expect(d.zones![0]!.polygon).toHaveLength(3);
    expect(removeZoneCorner(d, 0, 0).zones![0]!.polygon).toHaveLength(3);
  });
});

describe('day and time-of-day sliders', () => {
  const hourly = (n: number) => Array.from({ length: n }, (_, i) => new Date(Date.UTC(2018, 0, 1, 0, 30) + i * 3_600_000).toISOString());
  it('splits a year of hours into 365 days of 24', () => {
    const t = hourly(8760);
    expect(stepsPerDayOf(t)).toBe(24);
    expect(daySplit(t)).toEqual({ perDay: 24, days: 365 });
    expect(stepIndexOf(daySplit(t), 195, 13, t.length)).toBe(195 * 24 + 13);
    expect(stepIndexOf(daySplit(t), 400, 0, t.length)).toBe(8759);
  });
  it('keeps one slider for a day', () => {
    expect(daySplit(hourly(24))).toEqual({ perDay: 24, days: 1 });
  });
});

describe('sun-path overlay', () => {
  it("reaches the solstice noon altitude at 45° N", () => {
    // source: common practice — solar noon altitude = 90° − latitude + declination (23.44° at the June solstice); tolerance 0.4°.
    const arc = sunArc(localMidnightMs('2026-06-21T12:00:00+00:00'), { latitudeDeg: 45, longitudeDeg: 0 }, [0, 0, 0], 10, 5);
    let maxZ = 0;
    for (let i = 2; i < arc.points.length; i += 3) maxZ = Math.max(maxZ, arc.points[i]!);
    expect((Math.asin(maxZ / 10) * 180) / Math.PI).toBeCloseTo(68.44, 0);
    expect(Math.abs((Math.asin(maxZ / 10) * 180) / Math.PI - 68.44)).toBeLessThan(0.4);
    // Hour marks only while the sun is up: about 15.4 h of day at 45° N in June (common practice), so 15 or 16 marks.
    expect(arc.hours.length).toBeGreaterThanOrEqual(15);
    expect(arc.hours.length).toBeLessThanOrEqual(16);
    expect(arc.hours).toContain(12);
    expect(arc.hours).not.toContain(2);
  });
});

describe("this step's range", () => {
  it('uses the values at the step, else the period range', () => {
    expect(stepRange([3, NaN, 7])).toEqual({ min: 3, max: 7 });
    expect(effectiveRange('step', undefined, { min: 0, max: 50 }, stepRange([3, 7]))).toEqual({ min: 3, max: 7 });
    expect(effectiveRange('step', undefined, { min: 0, max: 50 }, null)).toEqual({ min: 0, max: 50 });
  });
});
