/**
 * The BVH's flat memory layout, declared once, with tiny accessors (STYLE §5). The traversal kernels
 * in `query.ts` inline these reads by hand for speed; everything else should use the accessors.
 *
 * The tree is 4-wide: the binned-SAH binary tree (build.ts) is collapsed so that each node holds up
 * to 4 child boxes side by side (structure of arrays). One node is 128 bytes (`NODE_WORDS` = 32
 * words of 4 bytes), i.e. two cache lines that the hardware prefetcher fetches together, and a ray
 * visits about half as many nodes as in the binary tree (measured on the 200 k city: binary 32-byte
 * nodes 0.90 → 4-wide see batch.ts / the report). Node 0 is the root. Two views share one buffer:
 * `nodes` (Float32Array) and `nodeInts` (Int32Array).
 *
 * | words  | view | content                                                                 |
 * | ------ | ---- | ----------------------------------------------------------------------- |
 * | 0..3   | f32  | box min x of children 0..3 [m]                                          |
 * | 4..7   | f32  | box min y of children 0..3 [m]                                          |
 * | 8..11  | f32  | box min z of children 0..3 [m]                                          |
 * | 12..15 | f32  | box max x of children 0..3 [m]                                          |
 * | 16..19 | f32  | box max y of children 0..3 [m]                                          |
 * | 20..23 | f32  | box max z of children 0..3 [m]                                          |
 * | 24..27 | i32  | per child: node index (interior child) or first triangle slot (leaf)    |
 * | 28..31 | i32  | per child: `CHILD_INTERIOR` (-1) or the leaf's triangle count (>= 0)    |
 *
 * An unused child slot is an empty leaf (count 0) with an empty box (min +Infinity, max -Infinity),
 * which no slab test hits. Boxes are padded outward by a relative 2^-20 (plus 1e-9 m) so that float
 * rounding in the slab test never culls a triangle lying on a face.
 *
 * Triangles: `tris` holds `TRI_FLOATS` = 9 floats per kernel slot, the vertices v0, v1, v2 (x, y, z
 * each) copied from the scene's positions in leaf order, so a leaf's triangles are one contiguous
 * read. The edges are formed in float64 in the kernel, which keeps the answers bit-identical to a
 * brute-force loop over the original positions. `triIndex[slot]` is the original triangle index.
 */

/** Children per node. */
export const NODE_WIDTH = 4;
/** 32-bit words per node. */
export const NODE_WORDS = 32;
/** Bytes per node. */
export const BYTES_PER_NODE = NODE_WORDS * 4;
/** Word offset of the children's min x (min y, min z follow, each NODE_WIDTH words). */
export const NODE_MIN = 0;
/** Word offset of the children's max x (max y, max z follow). */
export const NODE_MAX = 12;
/** Word offset of the children's node index / first triangle slot. */
export const NODE_CHILD = 24;
/** Word offset of the children's kind: CHILD_INTERIOR or a leaf's triangle count. */
export const NODE_COUNT = 28;
/** Kind word of an interior child. */
export const CHILD_INTERIOR = -1;
/** Floats per triangle slot in `tris`: v0, v1, v2. */
export const TRI_FLOATS = 9;

/** True when child `c` (0..3) of node `nodeIndex` is a leaf (possibly empty). */
export function childIsLeaf(nodeInts: Int32Array, nodeIndex: number, c: number): boolean {
  return (nodeInts[nodeIndex * NODE_WORDS + NODE_COUNT + c] as number) >= 0;
}

/** Node index of interior child `c` of node `nodeIndex`. */
export function childNode(nodeInts: Int32Array, nodeIndex: number, c: number): number {
  return nodeInts[nodeIndex * NODE_WORDS + NODE_CHILD + c] as number;
}

/** First triangle slot of leaf child `c` of node `nodeIndex`. */
export function childFirstSlot(nodeInts: Int32Array, nodeIndex: number, c: number): number {
  return nodeInts[nodeIndex * NODE_WORDS + NODE_CHILD + c] as number;
}

/** Triangle count of leaf child `c` of node `nodeIndex` (0 for an unused slot). */
export function childTriangleCount(nodeInts: Int32Array, nodeIndex: number, c: number): number {
  return nodeInts[nodeIndex * NODE_WORDS + NODE_COUNT + c] as number;
}

/** Box coordinate `k` (0..2 min x,y,z; 3..5 max x,y,z) of child `c` of node `nodeIndex` [m]. */
export function childBound(nodes: Float32Array, nodeIndex: number, c: number, k: number): number {
  return nodes[nodeIndex * NODE_WORDS + k * NODE_WIDTH + c] as number;
}
