// Re-exports only (STYLE §12). Worker factories are not re-exported: import
// './pool/nodeWorkers.ts' (Node) or './pool/browserWorkers.ts' (browser) by path.
export * from './bvh/index.ts';
export * from './random.ts';
export * from './sampling.ts';
export * from './queries/groundPlane.ts';
export * from './queries/sunVisibility.ts';
export * from './queries/skyVisibility.ts';
export * from './queries/surfaceViews.ts';
export { createTraceApi, runTraceChunk, traceApi } from './api.ts';
export type { TraceApi, TraceTask, TraceChunkResult } from './api.ts';
export * from './pool/index.ts';
