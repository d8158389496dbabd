/**
 * The BVH's flat memory layout, declared once, with tiny accessors (STYLE §5). The traversal kernels
 * in `query.ts` inline these reads by hand for speed; everything else should use the accessors.
 *
 * Nodes: 32 bytes each (`NODE_WORDS` = 8 words of 4 bytes), node 0 is the root, node 1 is an unused
 * empty leaf (padding so that every child pair starts at an even index, i.e. a 64-byte pair is
 * 64-byte aligned relative to the buffer). Two views share one buffer: `nodes` (Float32Array) and
 * `nodeInts` (Int32Array).
 *
 * | word | view      | interior node                          | leaf node                        |
 * | ---- | --------- | -------------------------------------- | -------------------------------- |
 * | 0..2 | f32       | box min x, y, z [m]                    | box min x, y, z [m]              |
 * | 3..5 | f32       | box max x, y, z [m]                    | box max x, y, z [m]              |
 * | 6    | i32       | index of the LEFT child; the right     | first triangle slot              |
 * |      |           | child is always left + 1 (adjacent)    |                                  |
 * | 7    | i32       | -1 - splitAxis (so -1, -2 or -3)       | triangle count (>= 0)            |
 *
 * The left child holds the lower side of the split axis, so a ray with a negative direction
 * component on that axis visits the right child first. Boxes are padded outward by a relative
 * 2^-20 (plus 1e-9 m) so that float rounding in the slab test never culls a triangle lying on a face.
 *
 * Triangles: `tris` holds `TRI_FLOATS` = 9 floats per kernel slot, the vertices v0, v1, v2 (x, y, z
 * each) copied from the scene's positions in leaf order, so a leaf's triangles are one contiguous
 * read. The edges are formed in float64 in the kernel, which keeps the answers bit-identical to a
 * brute-force loop over the original positions. `triIndex[slot]` is the original triangle index.
 */

/** 32-bit words per node. */
export const NODE_WORDS = 8;
/** Bytes per node. */
export const BYTES_PER_NODE = NODE_WORDS * 4;
/** Word offset of the min corner (x, y, z follow). */
export const NODE_MIN = 0;
/** Word offset of the max corner. */
export const NODE_MAX = 3;
/** Word offset of the left child (interior) or first triangle slot (leaf). */
export const NODE_OFFSET = 6;
/** Word offset of the leaf triangle count (>= 0) or -1 - split axis (interior). */
export const NODE_COUNT = 7;
/** Floats per triangle slot in `tris`: v0, v1, v2. */
export const TRI_FLOATS = 9;

/** True when node `nodeIndex` is a leaf. */
export function nodeIsLeaf(nodeInts: Int32Array, nodeIndex: number): boolean {
  return (nodeInts[nodeIndex * NODE_WORDS + NODE_COUNT] as number) >= 0;
}

/** Index of the left child of interior node `nodeIndex` (the right child is this + 1). */
export function nodeLeftChild(nodeInts: Int32Array, nodeIndex: number): number {
  return nodeInts[nodeIndex * NODE_WORDS + NODE_OFFSET] as number;
}

/** Index of the right child of interior node `nodeIndex`. */
export function nodeRightChild(nodeInts: Int32Array, nodeIndex: number): number {
  return (nodeInts[nodeIndex * NODE_WORDS + NODE_OFFSET] as number) + 1;
}

/** Split axis (0 x, 1 y, 2 z) of interior node `nodeIndex`. */
export function nodeSplitAxis(nodeInts: Int32Array, nodeIndex: number): number {
  return -1 - (nodeInts[nodeIndex * NODE_WORDS + NODE_COUNT] as number);
}

/** First triangle slot of leaf `nodeIndex`. */
export function leafFirstSlot(nodeInts: Int32Array, nodeIndex: number): number {
  return nodeInts[nodeIndex * NODE_WORDS + NODE_OFFSET] as number;
}

/** Triangle count of leaf `nodeIndex`. */
export function leafCount(nodeInts: Int32Array, nodeIndex: number): number {
  return nodeInts[nodeIndex * NODE_WORDS + NODE_COUNT] as number;
}

/** Box coordinate `k` (0..2 min x,y,z; 3..5 max x,y,z) of node `nodeIndex` [m]. */
export function nodeBound(nodes: Float32Array, nodeIndex: number, k: number): number {
  return nodes[nodeIndex * NODE_WORDS + k] as number;
}
