/**
 * The tracer's worker API as a plain object (STYLE §10): plain data in, plain data out, no DOM and
 * no `node:` imports, so the same module runs in a browser Web Worker, a Node worker thread and
 * in-process. `workers/trace.worker.ts` and `workers/trace.node-worker.ts` only `expose` it.
 *
 * Protocol (what the pool does, src/trace/pool/workerPool.ts):
 * 1. `putBvh(bvhId, bvh)` once per worker per scene; with the BVH's typed arrays on
 *    SharedArrayBuffer nothing is copied.
 * 2. `putTask(taskId, task)` once per worker per job (receivers, sun directions, settings).
 * 3. `runChunk(taskId, start, end)` per chunk of receivers; the chunk result's buffers are
 *    transferred back (Comlink.transfer), not copied.
 * 4. `dropTask(taskId)` when the job ends; `dropBvh(bvhId)` when the scene is gone.
 */
import { transfer } from 'comlink';
import type { BvhData } from './bvh/build.ts';
import { InputError } from '../physics/errors.ts';
import { sunVisibility, type SunVisibilityInput } from './queries/sunVisibility.ts';
import { skyVisibility, type SkyVisibilityInput, type SkyVisibilityResult } from './queries/skyVisibility.ts';
import { surfaceViews, type SurfaceViewsInput, type SurfaceViewsResult } from './queries/surfaceViews.ts';

/** A job for the pool: which query, on which BVH, with which input. */
export type TraceTask =
  | { kind: 'sunVisibility'; bvhId: number; input: SunVisibilityInput }
  | { kind: 'skyVisibility'; bvhId: number; input: SkyVisibilityInput }
  | { kind: 'surfaceViews'; bvhId: number; input: SurfaceViewsInput };

/** The result of one chunk of receivers [start, end). */
export type TraceChunkResult =
  | { kind: 'sunVisibility'; start: number; end: number; visible: Uint8Array }
  | ({ kind: 'skyVisibility'; start: number; end: number } & SkyVisibilityResult)
  | ({ kind: 'surfaceViews'; start: number; end: number } & SurfaceViewsResult);

/** The API's methods (what comlink exposes). */
export interface TraceApi {
  /** Answers 'ready'; the pool awaits it to know the worker has loaded. */
  ping(): string;
  putBvh(bvhId: number, bvh: BvhData): void;
  dropBvh(bvhId: number): void;
  putTask(taskId: number, task: TraceTask): void;
  dropTask(taskId: number): void;
  runChunk(taskId: number, start: number, end: number): TraceChunkResult;
}

/** Runs one chunk of a task on a BVH: the single place that dispatches on the query kind. */
export function runTraceChunk(bvh: BvhData, task: TraceTask, start: number, end: number): TraceChunkResult {
  switch (task.kind) {
    case 'sunVisibility':
      return { kind: 'sunVisibility', start, end, visible: sunVisibility(bvh, task.input, start, end) };
    case 'skyVisibility':
      return { kind: 'skyVisibility', start, end, ...skyVisibility(bvh, task.input, start, end) };
    case 'surfaceViews':
      return { kind: 'surfaceViews', start, end, ...surfaceViews(bvh, task.input, start, end) };
  }
}

/** Buffers of a chunk result, for Comlink.transfer. */
export function chunkBuffers(r: TraceChunkResult): ArrayBuffer[] {
  const arrays: ArrayBufferView[] =
    r.kind === 'sunVisibility'
      ? [r.visible]
      : r.kind === 'skyVisibility'
        ? [r.patchProjectedSr, r.skyViewFactor, r.groundViewFactor]
        : [r.rowStart, r.patchIndex, r.fraction, r.skyFraction, r.groundFraction, r.otherFraction];
  const out: ArrayBuffer[] = [];
  for (const a of arrays) {
    // Only whole, unshared buffers can be transferred; a result array always owns its buffer.
    if (a.buffer instanceof ArrayBuffer && a.byteOffset === 0 && a.byteLength === a.buffer.byteLength && !out.includes(a.buffer)) {
      out.push(a.buffer);
    }
  }
  return out;
}

/** A fresh API object with its own BVH and task tables (one per worker; one per in-process executor). */
export function createTraceApi(): TraceApi {
  const bvhs = new Map<number, BvhData>();
  const tasks = new Map<number, TraceTask>();
  return {
    ping: () => 'ready',
    putBvh(bvhId, bvh) {
      bvhs.set(bvhId, bvh);
    },
    dropBvh(bvhId) {
      bvhs.delete(bvhId);
    },
    putTask(taskId, task) {
      if (!bvhs.has(task.bvhId)) {
        throw new InputError({ problem: 'unknown BVH id', place: `trace task ${taskId} bvhId`, expected: 'an id given to putBvh first', value: task.bvhId });
      }
      tasks.set(taskId, task);
    },
    dropTask(taskId) {
      tasks.delete(taskId);
    },
    runChunk(taskId, start, end) {
      const task = tasks.get(taskId);
      if (task === undefined) {
        throw new InputError({ problem: 'unknown task id', place: 'trace runChunk taskId', expected: 'an id given to putTask first', value: taskId });
      }
      const bvh = bvhs.get(task.bvhId);
      if (bvh === undefined) {
        throw new InputError({ problem: 'BVH was dropped', place: `trace task ${taskId} bvhId`, expected: 'a loaded BVH', value: task.bvhId });
      }
      const result = runTraceChunk(bvh, task, start, end);
      return transfer(result, chunkBuffers(result));
    },
  };
}

/** The API object the worker entry files expose. */
export const traceApi: TraceApi = createTraceApi();
