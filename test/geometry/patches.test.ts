import { describe, it, expect } from 'vitest';
import { buildPatches } from '../../src/geometry/patches.ts';
import type { SceneArrays } from '../../src/geometry/sceneArrays.ts';
import { importObj } from '../../src/geometry/import/obj.ts';
import { boxObj } from '../helpers/models.ts';

/** A scene from triangles given as corner lists, one surface per entry. */
function sceneOf(surfaces: { name: string; tris: number[][][]; material?: number }[]): SceneArrays {
  const positions: number[] = [], indices: number[] = [], surfaceIds: number[] = [], materialIds: number[] = [];
  surfaces.forEach((s, sid) => {
    for (const tri of s.tris) {
      for (const p of tri) {
        indices.push(positions.length / 3);
        positions.push(p[0]!, p[1]!, p[2]!);
      }
      surfaceIds.push(sid);
      materialIds.push(s.material ?? 0);
    }
  });
  return {
    positions: Float32Array.from(positions),
    indices: Uint32Array.from(indices),
    surfaceIds: Uint32Array.from(surfaceIds),
    materialIds: Uint32Array.from(materialIds),
    surfaceNames: surfaces.map((s) => s.name),
    materialNames: ['m0', 'm1'],
    warnings: [],
  };
}

/** 10 m × 3 m wall in the x–z plane at y = 0, wound so that its normal is −y (facing south). */
const southWall = (): SceneArrays =>
  sceneOf([{ name: 'wall', tris: [[[0, 0, 0], [10, 0, 0], [10, 0, 3]], [[0, 0, 0], [10, 0, 3], [0, 0, 3]]] }]);

function sceneTriangleArea(s: SceneArrays, t: number): number {
  const p = s.positions, ix = s.indices;
  const a = ix[t * 3]! * 3, b = ix[t * 3 + 1]! * 3, c = ix[t * 3 + 2]! * 3;
  const e1 = [p[b]! - p[a]!, p[b + 1]! - p[a + 1]!, p[b + 2]! - p[a + 2]!];
  const e2 = [p[c]! - p[a]!, p[c + 1]! - p[a + 1]!, p[c + 2]! - p[a + 2]!];
  return Math.hypot(e1[1]! * e2[2]! - e1[2]! * e2[1]!, e1[2]! * e2[0]! - e1[0]! * e2[2]!, e1[0]! * e2[1]! - e1[1]! * e2[0]!) / 2;
}

describe('buildPatches', () => {
  it('a 10 m × 3 m wall at 1 m² gives 30 patches of 1 m², summing to 30 m², all facing south', () => {
    const p = buildPatches(southWall());
    expect(p.count).toBe(30);
    let sum = 0;
    for (let i = 0; i < p.count; i++) {
      sum += p.areasM2[i]!;
      expect(p.areasM2[i]).toBeCloseTo(1, 9);
      expect([p.normals[i * 3], p.normals[i * 3 + 1], p.normals[i * 3 + 2]].map((v) => v! + 0)).toEqual([0, -1, 0]);
    }
    expect(sum).toBeCloseTo(30, 10); // exact up to float64 rounding
    // Centroids on the 1 m grid: (i + ½, 0, j + ½).
    const cents = new Set<string>();
    for (let i = 0; i < p.count; i++) cents.add([0, 1, 2].map((c) => p.centroids[i * 3 + c]!.toFixed(6)).join(','));
    for (let x = 0; x < 10; x++) for (let z = 0; z < 3; z++) expect(cents.has(`${(x + 0.5).toFixed(6)},0.000000,${(z + 0.5).toFixed(6)}`)).toBe(true);
    expect(p.ids[0]).toBe('wall-0');
    expect(p.ids[29]).toBe('wall-29');
    expect(new Set(p.ids).size).toBe(30);
  });

  it('the returned scene agrees with the patches triangle for triangle', () => {
    const p = buildPatches(southWall());
    const triCount = p.scene.indices.length / 3;
    expect(p.triangleOffsets[p.count]).toBe(triCount);
    expect(p.patchOfTriangle.length).toBe(triCount);
    for (let i = 0; i < p.count; i++) {
      let a = 0;
      for (let t = p.triangleOffsets[i]!; t < p.triangleOffsets[i + 1]!; t++) {
        expect(p.patchOfTriangle[t]).toBe(i);
        a += sceneTriangleArea(p.scene, t);
      }
      expect(a).toBeCloseTo(p.areasM2[i]!, 5); // float32 storage of the clipped corners
    }
  });

  it('a box: 6 planar regions, outward normals, total area kept', () => {
    const scene = importObj(boxObj([2, 3, 4]), 'box.obj');
    const p = buildPatches(scene);
    expect(new Set(p.regionIds).size).toBe(6);
    let sum = 0;
    for (let i = 0; i < p.count; i++) {
      sum += p.areasM2[i]!;
      const out = [p.centroids[i * 3]! - 1, p.centroids[i * 3 + 1]! - 1.5, p.centroids[i * 3 + 2]! - 2];
      const dot = out[0]! * p.normals[i * 3]! + out[1]! * p.normals[i * 3 + 1]! + out[2]! * p.normals[i * 3 + 2]!;
      expect(dot).toBeGreaterThan(0);
      expect(p.areasM2[i]).toBeGreaterThan(0.5);
      expect(p.areasM2[i]).toBeLessThan(2);
    }
    expect(sum).toBeCloseTo(52, 9);
    // 2×3 faces → 6 patches each, 3×4 → 12, 2×4 → 8: 2(6 + 12 + 8) = 52.
    expect(p.count).toBe(52);
  });

  it('different surfaces, materials or planes are never merged into one patch', () => {
    const quad = (x0: number, z: number): number[][][] => [[[x0, 0, z], [x0 + 0.5, 0, z], [x0 + 0.5, 0.5, z]], [[x0, 0, z], [x0 + 0.5, 0.5, z], [x0, 0.5, z]]];
    const s = sceneOf([
      { name: 'a', tris: quad(0, 0) },
      { name: 'b', tris: quad(0.5, 0) }, // touches a, coplanar, other surface
      { name: 'c', tris: [...quad(0, 1), ...quad(0.5, 1).map((t) => t.map((v) => [v[0]!, v[1]!, v[2]! + v[0]! - 0.5]))] }, // folded
    ]);
    const p = buildPatches(s);
    expect(p.ids).toEqual(['a-0', 'b-0', 'c-0', 'c-1']);
  });

  it('an oblique edge: a 4 m × 4 m right triangle gives 10 cells, slivers merge when asked', () => {
    const s = sceneOf([{ name: 'roof', tris: [[[0, 0, 5], [4, 0, 5], [0, 4, 5]]] }]);
    const p = buildPatches(s);
    // Floor grid 4 × 4 of 1 m²: 6 full cells under the hypotenuse and 4 half cells on it.
    expect(p.count).toBe(10);
    expect(Array.from(p.areasM2).reduce((a, b) => a + b, 0)).toBeCloseTo(8, 10);
    expect(Array.from(p.areasM2).filter((a) => Math.abs(a - 0.5) < 1e-9).length).toBe(4);
    for (let i = 0; i < p.count; i++) expect(p.normals[i * 3 + 2]).toBeCloseTo(1, 12);
    const merged = buildPatches(s, { mergeBelowFraction: 0.6 });
    expect(merged.count).toBe(6);
    expect(Array.from(merged.areasM2).reduce((a, b) => a + b, 0)).toBeCloseTo(8, 10);
  });

  it('a narrow strip gets patches of about the target area, not slivers', () => {
    const s = sceneOf([{ name: 'ledge', tris: [[[0, 0, 0], [20, 0, 0], [20, 0.25, 0]], [[0, 0, 0], [20, 0.25, 0], [0, 0.25, 0]]] }]);
    const p = buildPatches(s);
    expect(p.count).toBe(5); // 5 m² in patches of 1 m²
    for (const a of p.areasM2) expect(a).toBeCloseTo(1, 9);
  });

  it('random planar triangulations keep their area and give the same result twice (deterministic)', () => {
    let seed = 12345;
    const rnd = (): number => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    for (let trial = 0; trial < 10; trial++) {
      // A fan of random triangles in a tilted plane through (0,0,0) with normal ~ (0.3, −0.4, 0.866).
      const tris: number[][][] = [];
      const u = [0.8, 0.6, 0], w = [-0.5196, 0.6928, 0.5];
      const pt = (a: number, b: number): number[] => [a * u[0]! + b * w[0]!, a * u[1]! + b * w[1]!, a * u[2]! + b * w[2]!];
      const n = 3 + Math.floor(rnd() * 6);
      const r = Array.from({ length: n }, () => 2 + rnd() * 6);
      for (let k = 0; k < n; k++) {
        const a0 = (2 * Math.PI * k) / n, a1 = (2 * Math.PI * (k + 1)) / n;
        tris.push([pt(0, 0), pt(r[k]! * Math.cos(a0), r[k]! * Math.sin(a0)), pt(r[(k + 1) % n]! * Math.cos(a1), r[(k + 1) % n]! * Math.sin(a1))]);
      }
      const s = sceneOf([{ name: 'x', tris }]);
      let area = 0;
      for (let t = 0; t < tris.length; t++) area += sceneTriangleArea(s, t);
      const target = 0.5 + rnd() * 2;
      const p = buildPatches(s, { targetAreaM2: target });
      const sum = Array.from(p.areasM2).reduce((a, b) => a + b, 0);
      expect(Math.abs(sum - area) / area).toBeLessThan(1e-12);
      expect(new Set(p.regionIds).size).toBe(1);
      // Mean patch area near the target (edge cells are partial): within a factor 2.
      expect(area / p.count).toBeGreaterThan(target / 2);
      expect(area / p.count).toBeLessThan(target * 2);
      const again = buildPatches(s, { targetAreaM2: target });
      expect(Array.from(again.centroids)).toEqual(Array.from(p.centroids));
      expect(Array.from(again.scene.positions)).toEqual(Array.from(p.scene.positions));
    }
  });

  it('rejects a non-positive target area', () => {
    expect(() => buildPatches(southWall(), { targetAreaM2: 0 })).toThrow(/targetAreaM2/);
  });
});
