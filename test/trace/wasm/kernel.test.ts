import { describe, it, expect, afterAll } from 'vitest';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import type { BvhData } from '../../../src/trace/bvh/build.ts';
import { isOccluded, isOccludedMasked, intersectClosest, makeClosestHit } from '../../../src/trace/bvh/query.ts';
import { occludedBatch, occludedBatchMasked, closestBatch } from '../../../src/trace/bvh/batch.ts';
import { setRayKernel, getRayKernel, loadWasmKernel, loadWasmKernelAsync, wasmKernelFor, CHUNK_RAYS } from '../../../src/trace/wasm/loader.ts';
import { makeRandom, randomTriangles, randomBoxes, coplanarAndDegenerate, bruteClosest, randomRays } from '../bvh/oracle.ts';
import type { Mesh } from '../bvh/oracle.ts';

// The wasm kernel is checked two ways (STYLE §9): against the brute-force oracle over the original
// positions, and ray by ray against the JavaScript kernel, which it must equal exactly (occlusion,
// t as stored in a Float32Array, original triangle index; tolerance 0).

afterAll(() => { setRayKernel('auto'); });

interface Results { occ: Uint8Array; t: Float32Array; tri: Int32Array; hitsA: number; hitsC: number }

function runBatch(kernel: 'js' | 'wasm', bvh: BvhData, rays: Float32Array, tMin: number, tMax: number, skip?: Uint8Array): Results {
  setRayKernel(kernel);
  const n = rays.length / 6;
  const occ = new Uint8Array(n), t = new Float32Array(n), tri = new Int32Array(n);
  const hitsA = skip === undefined ? occludedBatch(bvh, rays, tMin, tMax, occ) : occludedBatchMasked(bvh, rays, tMin, tMax, occ, skip);
  const hitsC = closestBatch(bvh, rays, tMin, tMax, t, tri);
  setRayKernel('auto');
  return { occ, t, tri, hitsA, hitsC };
}

/** Rays that graze the scene: in box-face planes, through vertices, far away, with tiny components. */
function grazingRays(m: Mesh, count: number, rnd: () => number): Float32Array {
  const P = m.positions, nv = P.length / 3;
  const rays = new Float32Array(count * 6);
  for (let i = 0; i < count; i++) {
    const o = i * 6;
    const a = Math.floor(rnd() * nv) * 3, b = Math.floor(rnd() * nv) * 3;
    const kind = i % 6;
    let ox = P[a]!, oy = P[a + 1]!, oz = P[a + 2]!;
    let dx = P[b]! - ox, dy = P[b + 1]! - oy, dz = P[b + 2]! - oz;
    if (kind === 0) { ox -= dx; oy -= dy; oz -= dz; } // through two vertices (along edges and faces)
    else if (kind === 1) { oz = P[a + 2]!; dz = 0; } // horizontal in the plane of a vertex (roofs, ground)
    else if (kind === 2) { ox = P[a]!; dx = 0; oy -= 50 * dy; } // in an x = const plane (walls)
    else if (kind === 3) { ox += 5000; oy -= 3000; dx = P[b]! - ox; dy = P[b + 1]! - oy; dz = P[b + 2]! - oz; } // far origin
    else if (kind === 4) { dx = 1e-30; dy = (rnd() - 0.5) * 1e-38; dz = -1; oz += 20; } // tiny and denormal components
    else { dx = rnd() - 0.5; dy = rnd() - 0.5; dz = 0; oz = 0; } // on the ground plane
    if (dx === 0 && dy === 0 && dz === 0) dz = 1;
    rays[o] = ox; rays[o + 1] = oy; rays[o + 2] = oz; rays[o + 3] = dx; rays[o + 4] = dy; rays[o + 5] = dz;
  }
  return rays;
}

describe('wasm kernel loads', () => {
  it('compiles here (WebAssembly SIMD), sync and async give the one cached instance', async () => {
    const k = loadWasmKernel();
    expect(await loadWasmKernelAsync()).toBe(k);
    const bvh = buildBvh(new Float32Array([0, 0, 0, 1, 0, 0, 0, 1, 0]), new Uint32Array([0, 1, 2]));
    setRayKernel('js');
    expect(wasmKernelFor(bvh)).toBeNull();
    setRayKernel('wasm');
    expect(wasmKernelFor(bvh)).toBe(k);
    setRayKernel('auto');
    expect(getRayKernel()).toBe('auto');
    expect(() => setRayKernel('gpu' as never)).toThrow(/not auto, js or wasm/);
  });
});

describe('both kernels equal brute force', () => {
  const rnd = makeRandom(7);
  const scenes: [string, Mesh, number, number, number][] = [
    ['random triangles', randomTriangles(300, rnd), -2, 12, 4],
    ['boxes on a ground quad', randomBoxes(60, rnd), -5, 45, 4],
    ['coplanar and degenerate', coplanarAndDegenerate(250, rnd), -1, 9, 1],
    ['boxes, leaves of 8', randomBoxes(40, rnd), -5, 45, 8],
  ];
  for (const [name, mesh, lo, hi, leaf] of scenes) {
    for (const kernel of ['js', 'wasm'] as const) {
      it(`${name} (${kernel}), tMin 0.01, tMax 25, and a mask`, () => {
        const bvh = buildBvh(mesh.positions, mesh.indices, { maxLeafSize: leaf });
        const rays = randomRays(2500, rnd, lo, hi); // above SORT_MIN_RAYS: the coherent order is used
        const skip = new Uint8Array(mesh.indices.length / 3);
        for (let i = 0; i < skip.length; i++) skip[i] = i % 4 === 1 ? 1 : 0;
        const r = runBatch(kernel, bvh, rays, 0.01, 25);
        const rm = runBatch(kernel, bvh, rays, 0.01, 25, skip);
        let hits = 0;
        for (let i = 0; i < rays.length / 6; i++) {
          const o = i * 6;
          const b = bruteClosest(mesh, rays[o]!, rays[o + 1]!, rays[o + 2]!, rays[o + 3]!, rays[o + 4]!, rays[o + 5]!, 0.01, 25);
          const bm = bruteClosest(mesh, rays[o]!, rays[o + 1]!, rays[o + 2]!, rays[o + 3]!, rays[o + 4]!, rays[o + 5]!, 0.01, 25, skip);
          expect(r.occ[i]).toBe(b.triangle >= 0 ? 1 : 0);
          expect(r.tri[i]).toBe(b.triangle);
          expect(r.t[i]).toBe(b.triangle >= 0 ? Math.fround(b.t) : Infinity);
          expect(rm.occ[i]).toBe(bm.triangle >= 0 ? 1 : 0);
          if (b.triangle >= 0) hits++;
        }
        expect(r.hitsC).toBe(hits);
        expect(r.hitsA).toBe(hits);
        expect(hits).toBeGreaterThan(50); // the check can fail: rays do hit
        expect(hits).toBeLessThan(2500);
      });
    }
  }
});

describe('wasm kernel equals the JavaScript kernel exactly', () => {
  const rnd = makeRandom(99);
  it('grazing rays: in face planes, through vertices and edges, far origins, tiny components', () => {
    const mesh = randomBoxes(150, rnd);
    const bvh = buildBvh(mesh.positions, mesh.indices);
    const rays = grazingRays(mesh, 12_000, rnd);
    for (const [tMin, tMax] of [[0, Infinity], [1e-3, 30], [0.5, 1e4]] as const) {
      const js = runBatch('js', bvh, rays, tMin, tMax);
      const wa = runBatch('wasm', bvh, rays, tMin, tMax);
      let differ = 0;
      for (let i = 0; i < rays.length / 6; i++) {
        if (js.occ[i] !== wa.occ[i] || js.tri[i] !== wa.tri[i] || !Object.is(js.t[i], wa.t[i])) differ++;
      }
      expect(differ).toBe(0);
      expect(wa.hitsA).toBe(js.hitsA);
      expect(wa.hitsC).toBe(js.hitsC);
      expect(js.hitsA).toBeGreaterThan(1000);
    }
  });

  it('matches the scalar queries ray by ray, masked too, on sub-ranges; outside the range untouched', () => {
    const mesh = randomBoxes(100, rnd);
    const bvh = buildBvh(mesh.positions, mesh.indices, { shared: true });
    const n = 5000;
    const rays = randomRays(n, rnd, 0, 40);
    const skip = new Uint8Array(mesh.indices.length / 3);
    for (let i = 0; i < skip.length; i++) skip[i] = i % 3 === 0 ? 1 : 0;
    setRayKernel('wasm');
    const hit = makeClosestHit();
    for (const [start, end] of [[0, n], [3, 40], [100, 4321]] as const) {
      const occ = new Uint8Array(n).fill(7), occM = new Uint8Array(n).fill(7), t = new Float32Array(n).fill(-5), tri = new Int32Array(n).fill(-7);
      occludedBatch(bvh, rays, 0.01, 30, occ, start, end);
      occludedBatchMasked(bvh, rays, 0.01, 30, occM, skip, start, end);
      closestBatch(bvh, rays, 0.01, 30, t, tri, start, end);
      for (let i = 0; i < n; i++) {
        if (i < start || i >= end) {
          expect(occ[i]).toBe(7); expect(occM[i]).toBe(7); expect(t[i]).toBe(-5); expect(tri[i]).toBe(-7);
          continue;
        }
        const o = i * 6;
        const [ox, oy, oz, dx, dy, dz] = [rays[o]!, rays[o + 1]!, rays[o + 2]!, rays[o + 3]!, rays[o + 4]!, rays[o + 5]!];
        expect(occ[i]).toBe(isOccluded(bvh, ox, oy, oz, dx, dy, dz, 0.01, 30) ? 1 : 0);
        expect(occM[i]).toBe(isOccludedMasked(bvh, ox, oy, oz, dx, dy, dz, 0.01, 30, skip) ? 1 : 0);
        const c = intersectClosest(bvh, ox, oy, oz, dx, dy, dz, 0.01, 30, hit);
        expect(tri[i]).toBe(hit.triangle);
        expect(t[i]).toBe(c ? Math.fround(hit.t) : Infinity);
      }
    }
    setRayKernel('auto');
  });

  it('switches scenes (each copied in on first use) and traces ranges longer than one chunk', () => {
    const a = randomBoxes(30, rnd), b = randomTriangles(200, rnd, 40, 6);
    const bvhA = buildBvh(a.positions, a.indices), bvhB = buildBvh(b.positions, b.indices);
    const n = CHUNK_RAYS + 1000;
    const rays = randomRays(n, rnd, 0, 40);
    for (const bvh of [bvhA, bvhB, bvhA]) {
      const js = runBatch('js', bvh, rays, 0, Infinity);
      const wa = runBatch('wasm', bvh, rays, 0, Infinity);
      let differ = 0;
      for (let i = 0; i < n; i++) if (js.occ[i] !== wa.occ[i] || js.tri[i] !== wa.tri[i] || !Object.is(js.t[i], wa.t[i])) differ++;
      expect(differ).toBe(0);
      expect(js.hitsA).toBeGreaterThan(n / 20);
    }
  });

  it('an empty scene and a one-triangle scene (root is a leaf)', () => {
    const empty = buildBvh(new Float32Array(0), new Uint32Array(0));
    const one = buildBvh(new Float32Array([0, 0, 0, 1, 0, 0, 0, 1, 0]), new Uint32Array([0, 1, 2]));
    const rays = new Float32Array([0.2, 0.2, 1, 0, 0, -1, 2, 2, 1, 0, 0, -1, 0.2, 0.2, -1, 0, 0, -1]);
    const e = runBatch('wasm', empty, rays, 0, Infinity);
    expect(Array.from(e.occ)).toEqual([0, 0, 0]);
    expect(Array.from(e.tri)).toEqual([-1, -1, -1]);
    const r = runBatch('wasm', one, rays, 0, Infinity);
    expect(Array.from(r.occ)).toEqual([1, 0, 0]);
    expect(Array.from(r.tri)).toEqual([0, -1, -1]);
    expect(r.t[0]).toBe(1); // exact: from z = 1 straight down onto z = 0
  });
});
