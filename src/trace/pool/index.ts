// Re-exports only. The worker factories are imported by path so each side loads only its own:
// Node: './nodeWorkers.ts' (createNodeWorkerPool); browser: './browserWorkers.ts' (createBrowserWorkerPool).
export { createWorkerPool, createInProcessExecutor, RAYS_PER_CHUNK, DEFAULT_PROGRESS_INTERVAL_MS } from './workerPool.ts';
export { TraceChunkError } from './types.ts';
export type { AsyncTraceApi, TraceExecutor, TraceRunOptions, WorkerFactory, WorkerHandle } from './types.ts';
export { withSharedBuffers, canShareMemory } from './shareBuffers.ts';
export { mergeSkyVisibility, mergeSunVisibility, mergeSurfaceViews } from './merge.ts';
