export type { BvhData, BuildBvhOptions } from './build.ts';
export { buildBvh } from './build.ts';
export type { ClosestHit } from './query.ts';
export { isOccluded, isOccludedMasked, intersectClosest, intersectClosestMasked, makeClosestHit, DET_EPSILON } from './query.ts';
export { occludedBatch, occludedBatchMasked, closestBatch } from './batch.ts';
export {
  NODE_WIDTH, NODE_WORDS, BYTES_PER_NODE, NODE_MIN, NODE_MAX, NODE_CHILD, NODE_COUNT, CHILD_INTERIOR, TRI_FLOATS,
  childIsLeaf, childNode, childFirstSlot, childTriangleCount, childBound,
} from './layout.ts';
