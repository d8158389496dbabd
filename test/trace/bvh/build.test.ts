import { describe, it, expect } from 'vitest';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import { nodeIsLeaf, nodeLeftChild, nodeRightChild, nodeSplitAxis, leafFirstSlot, leafCount, nodeBound, TRI_FLOATS } from '../../../src/trace/bvh/layout.ts';
import { makeRandom, randomTriangles, randomBoxes } from './oracle.ts';

// Structural invariants of the layout documented in layout.ts (common practice).
describe('buildBvh structure', () => {
  for (const [name, maxLeafSize] of [['leaf 4', 4], ['leaf 1', 1], ['leaf 16', 16]] as const) {
    it(`every triangle in exactly one leaf, boxes contain their contents (${name})`, () => {
      const rnd = makeRandom(31);
      const mesh = name === 'leaf 4' ? randomBoxes(150, rnd) : randomTriangles(700, rnd);
      const bvh = buildBvh(mesh.positions, mesh.indices, { maxLeafSize });
      const n = mesh.indices.length / 3;
      expect(bvh.triangleCount).toBe(n);
      const seen = new Uint8Array(n);
      // triIndex is a permutation
      for (let s = 0; s < n; s++) { expect(seen[bvh.triIndex[s]!]).toBe(0); seen[bvh.triIndex[s]!] = 1; }
      const covered = new Uint8Array(n);
      const stack: Array<[number, number]> = [[0, 0]];
      let maxDepth = 0;
      while (stack.length > 0) {
        const [node, depth] = stack.pop()!;
        maxDepth = Math.max(maxDepth, depth);
        if (nodeIsLeaf(bvh.nodeInts, node)) {
          const first = leafFirstSlot(bvh.nodeInts, node), count = leafCount(bvh.nodeInts, node);
          expect(count).toBeLessThanOrEqual(maxLeafSize);
          for (let s = first; s < first + count; s++) {
            expect(covered[s]).toBe(0);
            covered[s] = 1;
            // pre-gathered vertices equal the scene's and lie inside the leaf box
            const t = bvh.triIndex[s]!;
            for (let v = 0; v < 3; v++) {
              for (let k = 0; k < 3; k++) {
                const p = mesh.positions[mesh.indices[t * 3 + v]! * 3 + k]!;
                expect(bvh.tris[s * TRI_FLOATS + v * 3 + k]).toBe(p);
                expect(p).toBeGreaterThanOrEqual(nodeBound(bvh.nodes, node, k));
                expect(p).toBeLessThanOrEqual(nodeBound(bvh.nodes, node, 3 + k));
              }
            }
          }
        } else {
          const l = nodeLeftChild(bvh.nodeInts, node), r = nodeRightChild(bvh.nodeInts, node);
          expect(r).toBe(l + 1);
          expect(l % 2).toBe(0); // pairs start at even indices
          expect([0, 1, 2]).toContain(nodeSplitAxis(bvh.nodeInts, node));
          for (const c of [l, r]) {
            for (let k = 0; k < 3; k++) {
              expect(nodeBound(bvh.nodes, c, k)).toBeGreaterThanOrEqual(nodeBound(bvh.nodes, node, k));
              expect(nodeBound(bvh.nodes, c, 3 + k)).toBeLessThanOrEqual(nodeBound(bvh.nodes, node, 3 + k));
            }
            stack.push([c, depth + 1]);
          }
        }
      }
      expect(covered.every((c) => c === 1)).toBe(true);
      expect(bvh.depth).toBe(maxDepth);
      expect(bvh.nodes.length).toBe(bvh.nodeCount * 8);
    });
  }

  it('splits a pile of identical triangles (all centroids equal)', () => {
    const positions = new Float32Array([0, 0, 0, 1, 0, 0, 0, 1, 0]);
    const indices = new Uint32Array(3 * 50);
    for (let i = 0; i < 50; i++) indices.set([0, 1, 2], i * 3);
    const bvh = buildBvh(positions, indices);
    expect(bvh.depth).toBeGreaterThan(2);
    expect(bvh.depth).toBeLessThan(10);
  });
});
