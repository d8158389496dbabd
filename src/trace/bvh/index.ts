export type { BvhData, BuildBvhOptions } from './build.ts';
export { buildBvh } from './build.ts';
export type { ClosestHit } from './query.ts';
export { isOccluded, isOccludedMasked, intersectClosest, intersectClosestMasked, makeClosestHit, DET_EPSILON } from './query.ts';
export { occludedBatch, occludedBatchMasked, closestBatch } from './batch.ts';
export {
  NODE_WORDS, BYTES_PER_NODE, NODE_MIN, NODE_MAX, NODE_OFFSET, NODE_COUNT, TRI_FLOATS,
  nodeIsLeaf, nodeLeftChild, nodeRightChild, nodeSplitAxis, leafFirstSlot, leafCount, nodeBound,
} from './layout.ts';
