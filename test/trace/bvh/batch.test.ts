import { describe, it, expect } from 'vitest';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import { isOccluded, isOccludedMasked, intersectClosest, makeClosestHit } from '../../../src/trace/bvh/query.ts';
import { occludedBatch, occludedBatchMasked, closestBatch, SORT_MIN_RAYS } from '../../../src/trace/bvh/batch.ts';
import { makeRandom, randomBoxes, randomRays } from './oracle.ts';

// Batch = scalar, ray by ray, both below and above the size where rays are re-ordered for coherence.
describe('batch queries equal the scalar queries', () => {
  const rnd = makeRandom(21);
  const mesh = randomBoxes(200, rnd);
  const bvh = buildBvh(mesh.positions, mesh.indices, { shared: true });
  const n = SORT_MIN_RAYS * 2 + 37;
  const rays = randomRays(n, rnd, 0, 40);
  for (let i = 0; i < n; i++) rays[i * 6 + 2] = rays[i * 6 + 2]! * 0.3;

  it('uses SharedArrayBuffer when asked', () => {
    expect(bvh.nodes.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(bvh.tris.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(bvh.triIndex.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(bvh.nodeInts.buffer).toBe(bvh.nodes.buffer);
  });

  for (const [start, end] of [[0, n], [5, 105], [SORT_MIN_RAYS - 3, n - 11]] as const) {
    it(`rays [${start}, ${end})`, () => {
      const occ = new Uint8Array(n).fill(7), outT = new Float32Array(n).fill(-5), outTri = new Int32Array(n).fill(-7);
      const tMax = 30;
      const hitsA = occludedBatch(bvh, rays, 0.01, tMax, occ, start, end);
      const hitsC = closestBatch(bvh, rays, 0.01, tMax, outT, outTri, start, end);
      const hit = makeClosestHit();
      let expectA = 0, expectC = 0;
      for (let i = 0; i < n; i++) {
        const o = i * 6;
        if (i < start || i >= end) { // outside the range: untouched
          expect(occ[i]).toBe(7); expect(outT[i]).toBe(-5); expect(outTri[i]).toBe(-7);
          continue;
        }
        const a = isOccluded(bvh, rays[o]!, rays[o + 1]!, rays[o + 2]!, rays[o + 3]!, rays[o + 4]!, rays[o + 5]!, 0.01, tMax);
        const c = intersectClosest(bvh, rays[o]!, rays[o + 1]!, rays[o + 2]!, rays[o + 3]!, rays[o + 4]!, rays[o + 5]!, 0.01, tMax, hit);
        expect(occ[i]).toBe(a ? 1 : 0);
        expect(outTri[i]).toBe(hit.triangle);
        expect(outT[i]).toBe(c ? Math.fround(hit.t) : Infinity);
        if (a) expectA++;
        if (c) expectC++;
      }
      expect(hitsA).toBe(expectA);
      expect(hitsC).toBe(expectC);
      expect(expectA).toBeGreaterThan(0);
      expect(expectA).toBeLessThan(end - start);
    });
  }

  it('masked batch equals masked scalar', () => {
    const skip = new Uint8Array(mesh.indices.length / 3);
    for (let i = 0; i < skip.length; i++) skip[i] = i % 3 === 0 ? 1 : 0;
    const occ = new Uint8Array(n);
    const hits = occludedBatchMasked(bvh, rays, 0, Infinity, occ, skip);
    let expected = 0;
    for (let i = 0; i < n; i++) {
      const o = i * 6;
      const a = isOccludedMasked(bvh, rays[o]!, rays[o + 1]!, rays[o + 2]!, rays[o + 3]!, rays[o + 4]!, rays[o + 5]!, 0, Infinity, skip);
      expect(occ[i]).toBe(a ? 1 : 0);
      if (a) expected++;
    }
    expect(hits).toBe(expected);
  });

  it('rejects bad ranges and short outputs', () => {
    expect(() => occludedBatch(bvh, rays, 0, Infinity, new Uint8Array(n), 10, 5)).toThrow(/start\/end/);
    expect(() => occludedBatch(bvh, rays, 0, Infinity, new Uint8Array(3))).toThrow(/out\.length/);
    expect(() => closestBatch(bvh, new Float32Array(7), 0, Infinity, new Float32Array(1), new Int32Array(1))).toThrow(/rays\.length/);
  });
});
