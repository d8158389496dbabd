import { describe, it, expect } from 'vitest';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import { isOccluded, isOccludedMasked, intersectClosest, intersectClosestMasked, makeClosestHit } from '../../../src/trace/bvh/query.ts';
import { makeRandom, randomTriangles, randomBoxes, coplanarAndDegenerate, bruteClosest, triangleT, randomRays, type Mesh } from './oracle.ts';

// Oracle: the BVH must answer exactly what a loop over all triangles answers (common practice:
// three-mesh-bvh test/RandomRaycasts.test.js; pbrt two-implementation tests). The kernel and the
// loop use the same float64 Möller–Trumbore on the same float32 vertices, so answers are expected
// to agree exactly; t is still checked with the 1e-5 relative tolerance of the issue.
const T_REL = 1e-5;

function sameT(a: number, b: number): boolean {
  if (a === b) return true;
  return Math.abs(a - b) <= T_REL * Math.max(Math.abs(a), Math.abs(b), 1e-9);
}

function checkScene(name: string, mesh: Mesh, rays: Float32Array, rnd: () => number, maxLeafSize?: number): void {
  const bvh = buildBvh(mesh.positions, mesh.indices, maxLeafSize === undefined ? undefined : { maxLeafSize });
  const hit = makeClosestHit();
  const n = rays.length / 6;
  let hits = 0, occluded = 0, limited = 0;
  const triCount = mesh.indices.length / 3;
  const skip = new Uint8Array(triCount);
  for (let i = 0; i < triCount; i++) skip[i] = rnd() < 0.3 ? 1 : 0;
  for (let i = 0; i < n; i++) {
    const o = i * 6;
    const ox = rays[o]!, oy = rays[o + 1]!, oz = rays[o + 2]!, dx = rays[o + 3]!, dy = rays[o + 4]!, dz = rays[o + 5]!;
    // limits: half the rays unlimited, the others a random [tMin, tMax] window
    const tMin = i % 2 === 0 ? 0 : rnd() * 3;
    const tMax = i % 2 === 0 ? Infinity : tMin + rnd() * 8;
    const ref = bruteClosest(mesh, ox, oy, oz, dx, dy, dz, tMin, tMax);
    const got = intersectClosest(bvh, ox, oy, oz, dx, dy, dz, tMin, tMax, hit);
    expect(got, `${name} ray ${i}: closest found`).toBe(ref.triangle >= 0);
    if (ref.triangle >= 0) {
      hits++;
      expect(sameT(hit.t, ref.t), `${name} ray ${i}: t ${hit.t} vs ${ref.t}`).toBe(true);
      if (hit.triangle !== ref.triangle) {
        // only an exact tie may differ: the reported triangle must be hit at the same t
        expect(sameT(triangleT(mesh, hit.triangle, ox, oy, oz, dx, dy, dz), ref.t), `${name} ray ${i}: tie`).toBe(true);
      }
      expect(hit.u).toBeGreaterThanOrEqual(0);
      expect(hit.v).toBeGreaterThanOrEqual(0);
      expect(hit.u + hit.v).toBeLessThanOrEqual(1);
    } else {
      expect(hit.triangle).toBe(-1);
    }
    const occ = isOccluded(bvh, ox, oy, oz, dx, dy, dz, tMin, tMax);
    expect(occ, `${name} ray ${i}: occluded`).toBe(ref.triangle >= 0);
    if (occ) occluded++;
    if (i % 2 === 1) limited++;
    // masked variants
    const refM = bruteClosest(mesh, ox, oy, oz, dx, dy, dz, tMin, tMax, skip);
    expect(isOccludedMasked(bvh, ox, oy, oz, dx, dy, dz, tMin, tMax, skip), `${name} ray ${i}: masked occluded`).toBe(refM.triangle >= 0);
    intersectClosestMasked(bvh, ox, oy, oz, dx, dy, dz, tMin, tMax, hit, skip);
    expect(hit.triangle >= 0).toBe(refM.triangle >= 0);
    if (refM.triangle >= 0) {
      expect(sameT(hit.t, refM.t)).toBe(true);
      expect(skip[hit.triangle]).toBe(0);
    }
  }
  // the scenes must exercise both outcomes, or the comparison proves little
  expect(hits).toBeGreaterThan(n * 0.1);
  expect(hits).toBeLessThan(n * 0.95);
  expect(occluded).toBe(hits);
  expect(limited).toBeGreaterThan(0);
}

describe('BVH queries equal brute force', () => {
  it('random triangles', () => {
    const rnd = makeRandom(11);
    const mesh = randomTriangles(3000, rnd);
    checkScene('random', mesh, randomRays(1500, rnd, -1, 11), rnd);
  });

  it('random triangles, leaves of 1 and of 8', () => {
    const rnd = makeRandom(12);
    const mesh = randomTriangles(800, rnd);
    checkScene('leaf1', mesh, randomRays(500, rnd, -1, 11), rnd, 1);
    checkScene('leaf8', mesh, randomRays(500, rnd, -1, 11), rnd, 8);
  });

  it('random boxes on a ground quad, rays starting inside and outside the boxes', () => {
    const rnd = makeRandom(13);
    const mesh = randomBoxes(300, rnd);
    const rays = randomRays(2000, rnd, 0, 40);
    // lower the origins so many start inside boxes (heights up to 12.5 m)
    for (let i = 0; i < rays.length / 6; i++) rays[i * 6 + 2] = rays[i * 6 + 2]! * 0.3;
    checkScene('boxes', mesh, rays, rnd);
  });

  it('coplanar, duplicate and degenerate triangles, rays in and across the planes', () => {
    const rnd = makeRandom(14);
    const mesh = coplanarAndDegenerate(1500, rnd);
    const rays = randomRays(1500, rnd, -0.5, 8.5);
    // some rays lie in a triangle plane (z = 1, horizontal): edge-on, never a hit
    for (let i = 0; i < 100; i++) { rays[i * 6 + 2] = 1; rays[i * 6 + 5] = 0; const L = Math.hypot(rays[i * 6 + 3]!, rays[i * 6 + 4]!) || 1; rays[i * 6 + 3] = rays[i * 6 + 3]! / L; rays[i * 6 + 4] = rays[i * 6 + 4]! / L; }
    checkScene('coplanar', mesh, rays, rnd);
  });

  it('axis-parallel rays through known geometry, with tMin / tMax limits', () => {
    // one square (two triangles) at z = 2 spanning x, y in [0, 1]
    const positions = new Float32Array([0, 0, 2, 1, 0, 2, 1, 1, 2, 0, 1, 2]);
    const indices = new Uint32Array([0, 1, 2, 0, 2, 3]);
    const bvh = buildBvh(positions, indices);
    const hit = makeClosestHit();
    expect(intersectClosest(bvh, 0.7, 0.2, 0, 0, 0, 1, 0, Infinity, hit)).toBe(true); // straight up, zero x/y
    expect(hit.t).toBeCloseTo(2, 12);
    expect(hit.triangle).toBe(0); // x > y lies in triangle 0 (0,1,2)
    expect(intersectClosest(bvh, 0.2, 0.7, 5, 0, 0, -1, 0, Infinity, hit)).toBe(true); // down, back face
    expect(hit.t).toBeCloseTo(3, 12);
    expect(hit.triangle).toBe(1);
    expect(isOccluded(bvh, 0.7, 0.2, 0, 0, 0, 1, 0, 1.99)).toBe(false); // tMax short of the square
    expect(isOccluded(bvh, 0.7, 0.2, 0, 0, 0, 1, 2.01, Infinity)).toBe(false); // tMin past it
    expect(isOccluded(bvh, 0.7, 0.2, 0, 0, 0, 1, 1.99, 2.01)).toBe(true);
    expect(isOccluded(bvh, 1.5, 0.2, 0, 0, 0, 1, 0, Infinity)).toBe(false); // beside it
    expect(isOccluded(bvh, 0.5, 0.5, 2, 1, 0, 0, 0, Infinity)).toBe(false); // in its plane: edge-on
  });

  it('empty scene and bad input', () => {
    const bvh = buildBvh(new Float32Array(0), new Uint32Array(0));
    const hit = makeClosestHit();
    expect(isOccluded(bvh, 0, 0, 0, 0, 0, 1, 0, Infinity)).toBe(false);
    expect(intersectClosest(bvh, 0, 0, 0, 0, 0, 1, 0, Infinity, hit)).toBe(false);
    expect(hit.triangle).toBe(-1);
    expect(() => buildBvh(new Float32Array(9), new Uint32Array([0, 1]))).toThrow(/indices/);
    expect(() => buildBvh(new Float32Array(9), new Uint32Array([0, 1, 3]))).toThrow(/indices\[2\]/);
    expect(() => buildBvh(new Float32Array([0, 0, NaN, 1, 0, 0, 0, 1, 0]), new Uint32Array([0, 1, 2]))).toThrow(/positions\[2\]/);
  });
});
