import { describe, it, expect } from 'vitest';
import { coolWarmTable, morelandDiverging, COOL_WARM_ENDS } from '../../src/app/colour/moreland.ts';
import { COOL_WARM_RGB } from '../../src/app/colour/coolWarmTable.ts';
import { colourDifferences, sampleCoolWarm, symmetricHalfRange } from '../../src/app/colour/diverging.ts';
import { differenceValues, designTable, glareHoursValues, pathsAtStep } from '../../src/app/compute/designView.ts';
import { compareDesigns, type DesignRun } from '../../src/audit/options.ts';
import type { Results, SensorResult } from '../../src/audit/results.ts';
import { makeDevice, moveDevice, setDeviceNumber, deviceNumbers, designDevices, setOwnDevices } from '../../src/app/state/designDoc.ts';
import { buildDeviceView } from '../../src/app/compute/deviceView.ts';
import { toResultsView } from '../../src/app/compute/resultColumns.ts';
import type { ProjectDoc } from '../../src/app/state/projectDoc.ts';

const to255 = (v: number) => Math.round(v * 255);

describe('cool-warm diverging scale', () => {
  it('reproduces Moreland\'s published 33-entry cool-warm table', () => {
    // source: K. Moreland, "Diverging Color Maps for Scientific Visualization", ISVC 2009, table of the
    // cool-warm map (33 entries, 8-bit sRGB); entries 0, 1, 2, 16 and 32. Tolerance ±1 (8-bit rounding).
    const t = coolWarmTable(33);
    const expected: [number, number[]][] = [[0, [59, 76, 192]], [1, [68, 90, 204]], [2, [77, 104, 215]], [16, [221, 221, 221]], [32, [180, 4, 38]]];
    for (const [i, rgb] of expected) {
      for (let k = 0; k < 3; k++) expect(Math.abs(to255(t[i * 3 + k]!) - rgb[k]!)).toBeLessThanOrEqual(1);
    }
  });

  it('the stored 256-entry table is the generator\'s output', () => {
    const gen = coolWarmTable(256);
    expect(COOL_WARM_RGB.length).toBe(256 * 3);
    for (let i = 0; i < gen.length; i++) expect(Math.abs(COOL_WARM_RGB[i]! - gen[i]!)).toBeLessThan(1e-6);
  });

  it('is blue below zero, neutral at zero and red above, with lightness peaking at the middle', () => {
    const c = [0, 0, 0];
    sampleCoolWarm(0.5, c);
    expect(Math.abs(c[0]! - c[1]!)).toBeLessThan(0.01); // neutral grey (common practice for a diverging map's middle)
    const rgb = colourDifferences([-2, 0, 2, NaN], 2);
    expect(rgb[2]!).toBeGreaterThan(rgb[0]!); // −2 K: blue > red
    expect(rgb[6]!).toBeGreaterThan(rgb[8]!); // +2 K: red > blue
    expect(to255(rgb[0]!)).toBe(COOL_WARM_ENDS.cool[0]);
    expect(to255(rgb[6]!)).toBe(COOL_WARM_ENDS.warm[0]);
    // luminance (Rec. 709 weights on sRGB as a monotonic proxy) rises to the middle then falls
    const lum = (i: number) => 0.2126 * COOL_WARM_RGB[i * 3]! + 0.7152 * COOL_WARM_RGB[i * 3 + 1]! + 0.0722 * COOL_WARM_RGB[i * 3 + 2]!;
    for (let i = 1; i < 120; i++) expect(lum(i)).toBeGreaterThan(lum(i - 1));
    for (let i = 137; i < 256; i++) expect(lum(i)).toBeLessThan(lum(i - 1));
  });

  it('symmetric half range rounds up to a nice step and keeps a floor', () => {
    expect(symmetricHalfRange([-1.87, 0.3])).toBe(2);
    expect(symmetricHalfRange([0.1, -0.2])).toBe(0.5);
    expect(symmetricHalfRange([3.2, NaN])).toBe(4);
    expect(morelandDiverging([0, 0, 1], [1, 0, 0], 0).map(to255)).toEqual([0, 0, 255]);
  });
});

function sensor(x: number, mrt: number[], glare?: string[]): SensorResult {
  return { position: [x, 0, 1.1], mrtC: mrt, utciC: mrt.map((m) => m - 10), category: mrt.map(() => 'no-stress'), ...(glare ? { glare } : {}) } as unknown as SensorResult;
}

function results(sensors: SensorResult[], extra: Partial<Results> = {}): Results {
  return {
    sunfacet: 1, project: 't', timeConvention: '', times: ['2026-07-15T12:00:00+02:00', '2026-07-15T13:00:00+02:00', '2026-07-15T22:00:00+02:00'],
    sun: [{ altitudeDeg: 50, azimuthDeg: 180 }, { altitudeDeg: 45, azimuthDeg: 200 }, { altitudeDeg: -10, azimuthDeg: 320 }],
    weather: { airTempC: [], relativeHumidityPct: [], windMs: [], dniWm2: [], dhiWm2: [], ghiWm2: [], skyLongwaveWm2: [] },
    zones: [{ name: 'terrace', posture: 'seated', sensorHeightM: 1.1, sensors, droppedSensors: 0 }],
    surfaces: [], warnings: [], run: { stepHours: 1 }, ...extra,
  } as unknown as Results;
}

const run = (name: string, r: Results): DesignRun => ({ name, results: r, record: {} as DesignRun['record'], reusedGeometry: false });

describe('difference between two designs', () => {
  const ref = results([sensor(0, [50, 48, 20]), sensor(1, [40, 42, 20]), sensor(2, [45, 45, 20])]);
  // option: sensor 1 lost (inside a trunk), sensor 0 cooler by 6/4 K, sensor 2 hotter by 1 K
  const opt = results([sensor(0, [44, 44, 20]), sensor(2, [46, 46, 20])]);
  const pair = compareDesigns([run('ref', ref), run('opt', opt)], 'ref');

  it('per step and daylight mean, on the reference sensors, NaN where unmatched', () => {
    const step0 = differenceValues(pair, toResultsView(ref).view, { kind: 'step', step: 0 });
    expect(Array.from(step0)).toEqual([-6, NaN, 1]);
    const mean = differenceValues(pair, toResultsView(ref).view, { kind: 'daylightMean' });
    // daylight steps 0 and 1 only (sun above the horizon): (−6 − 4)/2 = −5; (1 + 1)/2 = 1
    expect(mean[0]).toBeCloseTo(-5, 6);
    expect(Number.isNaN(mean[1]!)).toBe(true);
    expect(mean[2]).toBeCloseTo(1, 6);
  });

  it('the zones × options table carries mean and peak change', () => {
    const rows = designTable(pair);
    expect(rows).toHaveLength(1);
    expect(rows[0]!.option).toBe('opt');
    expect(rows[0]!.meanMrtChangeK).toBeCloseTo(-2, 2); // mean of −5 and +1
    expect(rows[0]!.peakMrtChangeK).toBeCloseTo(46 - 50, 2);
    expect(rows[0]!.unmatchedSensors).toBe(1);
  });
});

describe('glare hours and reflection paths', () => {
  const r = toResultsView(results([sensor(0, [1, 1, 1], ['after-image', 'dim', 'retinal-risk']), sensor(5, [1, 1, 1], ['none', 'none', 'none'])], {
    viewpoints: [{ name: 'eye', position: [9, 9, 1.2], viewDirectionDeg: 0, fieldDeg: 30, reflectedBeamWm2: [], glare: [], reflectingPatches: [] }],
    reflectionPaths: {
      step: [0, 1, 1, 1, 2], patch: [0, 0, 1, 1, 0], zone: [0, 0, -1, 0, 0], receiver: [0, 0, 0, 7, 1],
      point: [[1, 1, 1], [2, 2, 2], [3, 3, 3], [4, 4, 4], [5, 5, 5]], irradianceWm2: [1, 1, 1, 1, 1], discFraction: [1, 1, 1, 1, 1], offAxisDeg: [0, 0, 0, 0, 0],
    },
  } as Partial<Results>)).view;

  it('counts hours at after-image or worse', () => {
    expect(Array.from(glareHoursValues(r))).toEqual([2, 0]);
  });

  it('keeps only the picked step, ends at the receiver, skips missing receivers', () => {
    const p = pathsAtStep(r, 1);
    expect(p.toViewpoint.length).toBe(2); // receiver 7 does not exist
    const want = [2, 2, 2, 0, 0, 1.1, 3, 3, 3, 9, 9, 1.2];
    expect(p.segments.length).toBe(want.length);
    want.forEach((w, i) => expect(p.segments[i]).toBeCloseTo(w, 5)); // Float32 storage
    expect(Array.from(p.toViewpoint)).toEqual([0, 1]);
    expect(p.sensorsReached).toBe(1);
    expect(p.viewpointsReached).toBe(1);
    expect(pathsAtStep(r, 2).sensorsReached).toBe(1);
    expect(pathsAtStep(r, 5).segments.length).toBe(0);
  });
});

describe('device editing', () => {
  const doc = { sunfacet: 1, site: { latitudeDeg: 50, longitudeDeg: 8, timeZone: '+01:00' }, model: { file: 'm.glb' }, period: 'year', weather: { source: 'clear-sky', airTempC: 20 },
    devices: [{ type: 'umbrella', name: 'u', points: [[0, 0]], radiusM: 1 }], baselineName: 'base', options: [{ name: 'opt', devices: [] }] } as unknown as ProjectDoc;

  it('a tree placed on a floor and an overhang on a wall build into geometry', () => {
    const tree = makeDevice('tree', 'tree-1', { kind: 'floor', point: [5, 6, 0] }, { crownRadiusM: 2 });
    const over = makeDevice('overhang', 'o-1', { kind: 'wall', point: [0, 3, 2], normal: [0, -1] }, { lengthM: 4, projectionM: 1, heightM: 3 });
    expect(over.from).toEqual([-2, 3]);
    expect(over.to).toEqual([2, 3]);
    const d = setOwnDevices(doc, 'opt', [tree, over]);
    expect(designDevices(d, 'opt').map((x) => x.name)).toEqual(['u', 'tree-1', 'o-1']);
    const v = buildDeviceView(designDevices(d, 'opt'), 50);
    expect(v.ok).toBe(true);
    if (!v.ok) return;
    expect(v.view.crowns.length).toBe(6);
    expect(v.view.crowns[0]).toBeCloseTo(5, 6);
    expect(v.view.crowns[3]).toBeCloseTo(2, 6); // crown radius
    // overhang triangles lie on the wall's outside (y < 3)
    let minY = Infinity;
    for (let t = 0; t < v.view.triangleDevice.length; t++) if (v.view.triangleDevice[t] === 2) for (let k = 0; k < 3; k++) minY = Math.min(minY, v.view.positions[t * 9 + k * 3 + 1]!);
    expect(minY).toBeCloseTo(2, 1);
  });

  it('moves and resizes through numeric fields; bad sizes give a readable message', () => {
    const tree = makeDevice('tree', 'tree-1', { kind: 'floor', point: [5, 6, 0] }, {});
    const moved = moveDevice(tree, 1, -0.5);
    expect(moved.points).toEqual([[6, 5.5, 0]]);
    const f = deviceNumbers(moved).find((x) => x.label === 'crownRadiusM')!;
    const big = setDeviceNumber(moved, f.path, 4);
    expect(big.crownRadiusM).toBe(4);
    expect(tree.crownRadiusM).toBe(2.5); // unchanged original
    const bad = buildDeviceView([setDeviceNumber(big, ['crownRadiusM'], -1)], 50, 'opt');
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.message).toMatch(/crownRadiusM/);
  });
});
