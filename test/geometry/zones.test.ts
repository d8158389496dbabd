import { describe, it, expect } from 'vitest';
import {
  isInsideByParity,
  pointInPolygon,
  polygonCentroid,
  sensorGridForPolygon,
  sensorGridOnSurface,
} from '../../src/geometry/zones.ts';
import { importObj } from '../../src/geometry/import/obj.ts';
import { InputError } from '../../src/physics/errors.ts';
import { boxObj } from '../helpers/models.ts';

const rect = (w: number, h: number, x0 = 0, y0 = 0): number[][] => [[x0, y0], [x0 + w, y0], [x0 + w, y0 + h], [x0, y0 + h]];

describe('sensorGridForPolygon', () => {
  it('an 8 m × 4 m rectangle at 1 m spacing: 32 sensors at half-metre offsets, at floor + height', () => {
    const g = sensorGridForPolygon({ name: 'patio', polygon: rect(8, 4), floorZ: 0.5, sensorHeightM: 1.1, spacingM: 1 });
    expect(g.count).toBe(32);
    expect(g.zoneName).toBe('patio');
    expect(Array.from(g.positions.subarray(0, 3))).toEqual([0.5, 0.5, 1.6]);
    expect(Array.from(g.positions.subarray(93, 96))).toEqual([7.5, 3.5, 1.6]);
    expect(g.droppedInsideSolid).toBe(0);
    expect(g.usedFallbackPoint).toBe(false);
  });

  it('a rectangle not a multiple of the spacing: points only where x < maxX', () => {
    // 8.2 × 4.6 at 1 m: x 0.5..7.5 (8), y 0.5..4.5 (5).
    expect(sensorGridForPolygon({ name: 'r', polygon: rect(8.2, 4.6, 10, 20), floorZ: 0, sensorHeightM: 1.1, spacingM: 1 }).count).toBe(40);
    // 0.5 m spacing on 8 × 4: 16 × 8.
    expect(sensorGridForPolygon({ name: 'r', polygon: rect(8, 4), floorZ: 0, sensorHeightM: 1.1, spacingM: 0.5 }).count).toBe(128);
  });

  it('an L-shape: 6 × 2 bar plus a 2 × 3 leg gives 12 + 6 = 18 sensors, either winding', () => {
    const L = [[0, 0], [6, 0], [6, 2], [2, 2], [2, 5], [0, 5]];
    const g = sensorGridForPolygon({ name: 'L', polygon: L, floorZ: 0, sensorHeightM: 1.1, spacingM: 1 });
    expect(g.count).toBe(18);
    for (let k = 0; k < g.count; k++) {
      const x = g.positions[k * 3]!, y = g.positions[k * 3 + 1]!;
      expect(y < 2 || x < 2).toBe(true);
    }
    expect(sensorGridForPolygon({ name: 'L', polygon: [...L].reverse(), floorZ: 0, sensorHeightM: 1.1, spacingM: 1 }).count).toBe(18);
  });

  it('a polygon smaller than the spacing gets one sensor at its centroid', () => {
    const g = sensorGridForPolygon({ name: 'tiny', polygon: [[3, 3], [3.4, 3], [3.4, 3.2]], floorZ: 0, sensorHeightM: 0.6, spacingM: 1 });
    expect(g.count).toBe(1);
    expect(g.usedFallbackPoint).toBe(true);
    expect(g.positions[0]).toBeCloseTo((3 + 3.4 + 3.4) / 3, 12);
    expect(g.positions[1]).toBeCloseTo((3 + 3 + 3.2) / 3, 12);
    expect(g.positions[2]).toBeCloseTo(0.6, 12);
  });

  it('a small thin C-shape whose centroid is outside still gets one sensor inside it', () => {
    const C = [[0, 0], [0.9, 0], [0.9, 0.1], [0.1, 0.1], [0.1, 0.8], [0.9, 0.8], [0.9, 0.9], [0, 0.9]];
    const [cx, cy] = polygonCentroid(C.flat());
    expect(pointInPolygon(cx, cy, C.flat())).toBe(false);
    const g = sensorGridForPolygon({ name: 'C', polygon: C, floorZ: 0, sensorHeightM: 1, spacingM: 2 });
    expect(g.count).toBe(1);
    expect(pointInPolygon(g.positions[0]!, g.positions[1]!, C.flat())).toBe(true);
  });

  it('drops and counts sensors inside a solid box (brute-force parity test)', () => {
    // A 2 × 2 × 3 m box standing on the patio at x ∈ [2, 4], y ∈ [1, 3].
    const box = importObj(boxObj([2, 2, 3], [2, 1, 0]), 'kiosk.obj');
    const g = sensorGridForPolygon(
      { name: 'patio', polygon: rect(8, 4), floorZ: 0, sensorHeightM: 1.1, spacingM: 1 },
      { isInsideSolid: (x, y, z) => isInsideByParity(box, x, y, z) },
    );
    // Grid points with x ∈ {2.5, 3.5} and y ∈ {1.5, 2.5} are inside: 4 dropped.
    expect(g.droppedInsideSolid).toBe(4);
    expect(g.count).toBe(28);
    // Above the box nothing is dropped.
    const high = sensorGridForPolygon(
      { name: 'patio', polygon: rect(8, 4), floorZ: 3.2, sensorHeightM: 1.1, spacingM: 1 },
      { isInsideSolid: (x, y, z) => isInsideByParity(box, x, y, z) },
    );
    expect(high.droppedInsideSolid).toBe(0);
  });

  it('bad zones throw InputError naming the key', () => {
    const base = { name: 'z', polygon: rect(2, 2), floorZ: 0, sensorHeightM: 1.1, spacingM: 1 };
    const err = (z: object): InputError => {
      try {
        sensorGridForPolygon({ ...base, ...z } as typeof base, { place: 'zones[0]', file: 'p.json' });
      } catch (e) {
        return e as InputError;
      }
      throw new Error('no error');
    };
    expect(err({ spacingM: 0 }).place).toBe('zones[0].spacingM');
    expect(err({ polygon: [[0, 0], [1, 1]] }).place).toBe('zones[0].polygon');
    expect(err({ polygon: [[0, 0], [1, 0], [1, 'a']] }).place).toBe('zones[0].polygon[2]');
    expect(err({ polygon: [[0, 0], [1, 0], [2, 0]] }).problem).toBe('polygon has zero area');
    expect(err({ floorZ: NaN }).message).toMatch(/^p\.json: zones\[0\]\.floorZ/);
  });
});

describe('sensorGridOnSurface', () => {
  it('sensors over the roof of a box, at the height above it; walls and floor are not upward', () => {
    const box = importObj(boxObj([4, 2, 3]), 'b.obj');
    const g = sensorGridOnSurface(box, { name: 'roof', surfaceName: 'box', sensorHeightM: 1.1, spacingM: 1 });
    expect(g.count).toBe(8);
    for (let k = 0; k < g.count; k++) expect(g.positions[k * 3 + 2]).toBeCloseTo(4.1, 6);
  });

  it('follows a sloped surface and falls back to one sensor on a small one', () => {
    // A 4 m × 2 m ramp rising 1 m over x (slope ≈ 14°).
    const text = ['v 0 0 0', 'v 4 0 1', 'v 4 2 1', 'v 0 2 0', 'o ramp', 'f 1 2 3 4', 'o step', 'v 10 0 0', 'v 10.3 0 0', 'v 10 0.3 0', 'f 5 6 7'].join('\n');
    const scene = importObj(text, 'r.obj');
    const g = sensorGridOnSurface(scene, { name: 'ramp', surfaceName: 'ramp', sensorHeightM: 1, spacingM: 1 });
    expect(g.count).toBe(8);
    for (let k = 0; k < g.count; k++) expect(g.positions[k * 3 + 2]).toBeCloseTo(g.positions[k * 3]! / 4 + 1, 6);
    const small = sensorGridOnSurface(scene, { name: 's', surfaceName: 'step', sensorHeightM: 0.6, spacingM: 1 });
    expect(small.count).toBe(1);
    expect(small.usedFallbackPoint).toBe(true);
    expect(() => sensorGridOnSurface(scene, { name: 'x', surfaceName: 'nope', sensorHeightM: 1, spacingM: 1 })).toThrow(/surfaceName: no surface of that name/);
    expect(() => sensorGridOnSurface(scene, { name: 'x', surfaceName: 'ramp', sensorHeightM: 1, spacingM: 1, maxSlopeDeg: 5 })).toThrow(/no upward-facing/);
  });
});

describe('isInsideByParity', () => {
  it('agrees with the box bounds on a grid of points', () => {
    const box = importObj(boxObj([2, 3, 4], [1, 1, 1]), 'b.obj');
    let checked = 0;
    for (let x = -0.25; x < 4.5; x += 0.5) for (let y = -0.25; y < 4.5; y += 0.5) for (let z = -0.25; z < 5.5; z += 0.5) {
      const inside = x > 1 && x < 3 && y > 1 && y < 4 && z > 1 && z < 5;
      expect(isInsideByParity(box, x, y, z)).toBe(inside);
      checked++;
    }
    expect(checked).toBeGreaterThan(1000);
  });
});
