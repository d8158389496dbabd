import { describe, it, expect } from 'vitest';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import { childIsLeaf, childNode, childFirstSlot, childTriangleCount, childBound, NODE_WIDTH, NODE_WORDS, TRI_FLOATS } from '../../../src/trace/bvh/layout.ts';
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
      // walk the 4-wide tree: [node, depth, parent child box (6 numbers) or null for the root]
      const stack: Array<[number, number, number[] | null]> = [[0, 0, null]];
      const visitedNodes = new Set<number>();
      let maxDepth = 0, leaves = 0, usedSlots = 0;
      while (stack.length > 0) {
        const [node, depth, parentBox] = stack.pop()!;
        expect(visitedNodes.has(node)).toBe(false); // a tree, not a graph
        visitedNodes.add(node);
        expect(node).toBeLessThan(bvh.nodeCount);
        for (let c = 0; c < NODE_WIDTH; c++) {
          const box = [0, 1, 2, 3, 4, 5].map((k) => childBound(bvh.nodes, node, c, k));
          if (childIsLeaf(bvh.nodeInts, node, c) && childTriangleCount(bvh.nodeInts, node, c) === 0) {
            // unused slot: an empty box no ray can hit
            for (let k = 0; k < 3; k++) expect(box[k]! > box[3 + k]!).toBe(true);
            continue;
          }
          usedSlots++;
          if (parentBox !== null) {
            for (let k = 0; k < 3; k++) {
              expect(box[k]).toBeGreaterThanOrEqual(parentBox[k]!);
              expect(box[3 + k]).toBeLessThanOrEqual(parentBox[3 + k]!);
            }
          }
          if (childIsLeaf(bvh.nodeInts, node, c)) {
            leaves++;
            maxDepth = Math.max(maxDepth, depth + 1);
            const first = childFirstSlot(bvh.nodeInts, node, c), count = childTriangleCount(bvh.nodeInts, node, c);
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
                  expect(p).toBeGreaterThanOrEqual(box[k]!);
                  expect(p).toBeLessThanOrEqual(box[3 + k]!);
                }
              }
            }
          } else {
            stack.push([childNode(bvh.nodeInts, node, c), depth + 1, box]);
          }
        }
      }
      expect(covered.every((c) => c === 1)).toBe(true);
      expect(visitedNodes.size).toBe(bvh.nodeCount);
      expect(bvh.depth).toBe(maxDepth);
      expect(bvh.nodes.length).toBe(bvh.nodeCount * NODE_WORDS);
      // the collapse fills nodes: on average well over 2 used child slots per node
      if (n > 64) expect(usedSlots / bvh.nodeCount).toBeGreaterThan(3);
      expect(leaves).toBeGreaterThan(0);
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
