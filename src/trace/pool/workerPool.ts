/**
 * The executors: a pool of workers (any `WorkerFactory`: Node worker threads, browser Web Workers)
 * and an in-process executor with the same API, both on one scheduler.
 *
 * - Work is split into chunks of receivers; idle workers take the next chunk. Each receiver draws
 *   its random numbers from its own stream (random.ts), so results are identical for 1 and N
 *   workers and for any chunk size.
 * - The BVH is moved onto SharedArrayBuffer once per pool (shareBuffers.ts) and sent once per
 *   worker (`putBvh`); a job's input is sent once per worker (`putTask`); chunks only carry ranges.
 * - Progress: `onProgress(done, total)` in receivers, throttled, always called at the end.
 * - Cancellation: an aborted `signal` stops handing out chunks, terminates the workers at once
 *   (they are started again for the next job) and rejects with the signal's reason. In-process,
 *   the running chunk finishes first (it cannot be interrupted).
 * - Faults: a chunk that throws in its worker, or whose worker dies, is run again on a fresh worker
 *   (the failed one is terminated and replaced); since every receiver's numbers depend only on its
 *   index, the result equals a fault-free run. After `MAX_CHUNK_ATTEMPTS` tries (or at once for an
 *   InputError) the job rejects with a `TraceChunkError` naming the query and the receivers.
 */
import type { BvhData } from '../bvh/build.ts';
import { createTraceApi, type TraceChunkResult, type TraceTask } from '../api.ts';
import { sunVisibility, sunVisibilityReceiverCount, type SunVisibilityInput } from '../queries/sunVisibility.ts';
import {
  DEFAULT_GROUND_SAMPLES,
  DEFAULT_SKY_SAMPLES_PER_PATCH,
  skyVisibility,
  skyVisibilityReceiverCount,
  type SkyVisibilityInput,
  type SkyVisibilityResult,
} from '../queries/skyVisibility.ts';
import {
  DEFAULT_VIEW_SAMPLES,
  surfaceViews,
  surfaceViewsDirections,
  surfaceViewsReceiverCount,
  type SurfaceViewsInput,
  type SurfaceViewsResult,
} from '../queries/surfaceViews.ts';
import { skySubdivision } from '../../physics/skySubdivision.ts';
import { InputError } from '../../physics/errors.ts';
import { mergeSkyVisibility, mergeSunVisibility, mergeSurfaceViews } from './merge.ts';
import { withSharedBuffers } from './shareBuffers.ts';
import { TraceChunkError, type AsyncTraceApi, type TraceExecutor, type TraceRunOptions, type WorkerFactory, type WorkerHandle } from './types.ts';

/** Rays per chunk the default chunk size aims at. */
export const RAYS_PER_CHUNK = 200_000;
/** Times one chunk is tried (on a fresh worker each time) before the job fails. */
export const MAX_CHUNK_ATTEMPTS = 3;
/** Consecutive failed worker starts in one slot before the job fails. */
export const MAX_WORKER_STARTS = 3;
/** Default least time between progress calls [ms]. */
export const DEFAULT_PROGRESS_INTERVAL_MS = 100;

interface Slot {
  handle: WorkerHandle | null;
  started: Promise<WorkerHandle> | null;
  bvhIds: Set<number>;
  /** Jobs currently using this worker (the host process is kept alive while > 0). */
  busy: number;
}

interface Scheduler {
  workerCount: number;
  run(task: TraceTask, bvh: BvhData, total: number, raysPerReceiver: number, opts: TraceRunOptions): Promise<TraceChunkResult[]>;
  close(): void;
}

function isInputError(err: unknown): boolean {
  return err instanceof InputError || (err instanceof Error && err.name === 'InputError');
}

function abortReason(signal: AbortSignal): unknown {
  return signal.reason ?? new DOMException('The trace job was aborted', 'AbortError');
}

function createScheduler(factory: WorkerFactory, workerCount: number, shareMemory: boolean): Scheduler {
  if (!Number.isInteger(workerCount) || workerCount < 1) {
    throw new InputError({ problem: 'bad worker count', place: 'trace pool workers', expected: 'an integer >= 1', value: workerCount });
  }
  const slots: Slot[] = Array.from({ length: workerCount }, () => ({ handle: null, started: null, bvhIds: new Set<number>(), busy: 0 }));
  const bvhIds = new WeakMap<BvhData, { id: number; sendable: BvhData }>();
  let nextBvhId = 1;
  let nextTaskId = 1;
  let closed = false;

  function stop(slot: Slot): void {
    const h = slot.handle;
    slot.handle = null;
    slot.started = null;
    slot.bvhIds.clear();
    slot.busy = 0;
    if (h !== null) h.terminate();
  }

  function start(slot: Slot): Promise<WorkerHandle> {
    if (slot.started === null) {
      const h = factory();
      h.failed.catch(() => undefined); // observed where it matters; never an unhandled rejection
      slot.handle = h;
      slot.started = Promise.race([h.api.ping(), h.failed]).then(() => h);
      slot.started.catch(() => undefined);
    }
    return slot.started;
  }

  function bvhEntry(bvh: BvhData): { id: number; sendable: BvhData } {
    let e = bvhIds.get(bvh);
    if (e === undefined) {
      e = { id: nextBvhId++, sendable: shareMemory ? withSharedBuffers(bvh) : bvh };
      bvhIds.set(bvh, e);
    }
    return e;
  }

  return {
    workerCount,
    close() {
      closed = true;
      for (const s of slots) stop(s);
    },
    run(task, bvh, total, raysPerReceiver, opts) {
      if (closed) return Promise.reject(new Error('the trace executor is closed'));
      const signal = opts.signal;
      if (signal?.aborted) return Promise.reject(abortReason(signal));
      const [r0, r1] = opts.range ?? [0, total];
      if (!(Number.isInteger(r0) && Number.isInteger(r1) && r0 >= 0 && r1 <= total && r0 <= r1)) {
        return Promise.reject(new InputError({ problem: 'bad receiver range', place: 'trace run range', expected: `0 <= start <= end <= ${total}`, value: opts.range }));
      }
      const span = r1 - r0;
      const chunkSize =
        opts.chunkSize ??
        Math.max(1, Math.min(Math.ceil(span / workerCount), Math.floor(RAYS_PER_CHUNK / Math.max(1, raysPerReceiver))));
      if (!Number.isInteger(chunkSize) || chunkSize < 1) {
        return Promise.reject(new InputError({ problem: 'bad chunk size', place: 'trace run chunkSize', expected: 'an integer >= 1', value: chunkSize }));
      }
      const chunks: [number, number][] = [];
      for (let s = r0; s < r1; s += chunkSize) chunks.push([s, Math.min(r1, s + chunkSize)]);
      // An empty job still runs one (empty) chunk so the result has its shape.
      if (chunks.length === 0) chunks.push([r0, r0]);
      const { id: bvhId, sendable } = bvhEntry(bvh);
      const taskId = nextTaskId++;
      const fullTask: TraceTask = { ...task, bvhId } as TraceTask;
      const interval = opts.progressIntervalMs ?? DEFAULT_PROGRESS_INTERVAL_MS;
      const onProgress = opts.onProgress;

      return new Promise<TraceChunkResult[]>((resolve, reject) => {
        const results: TraceChunkResult[] = new Array(chunks.length);
        let next = 0;
        let remaining = chunks.length;
        let done = 0;
        let settled = false;
        let lastProgress = -Infinity;
        const used = slots.slice(0, Math.min(slots.length, chunks.length));

        const progress = () => {
          if (onProgress === undefined) return;
          const now = Date.now();
          if (done === total || now - lastProgress >= interval) {
            lastProgress = now;
            onProgress(done, total);
          }
        };
        const holding = new Set<Slot>();
        const finish = () => {
          signal?.removeEventListener('abort', onAbort);
          for (const s of used) {
            if (holding.has(s) && s.handle !== null) {
              s.busy = Math.max(0, s.busy - 1);
              if (s.busy === 0) s.handle.hold?.(false);
            }
            s.handle?.api.dropTask(taskId).catch(() => undefined);
          }
        };
        const fail = (err: unknown) => {
          if (settled) return;
          settled = true;
          finish();
          reject(err);
        };
        const onAbort = () => {
          if (settled) return;
          // Terminate first so no worker keeps computing for a job nobody waits for.
          for (const s of used) stop(s);
          fail(abortReason(signal!));
        };
        signal?.addEventListener('abort', onAbort, { once: true });
        progress();

        // Faults: a chunk whose worker throws or dies is queued again and the worker replaced
        // (each receiver's random stream depends only on its index, so a re-run gives the same
        // numbers). A chunk is tried at most MAX_CHUNK_ATTEMPTS times; an InputError is not retried.
        const attempts = new Uint8Array(chunks.length);
        const retry: number[] = [];
        /** Workers that hold this job's task (a replacement must be sent it again). */
        const hasTask = new WeakSet<WorkerHandle>();
        const takeChunk = (): number => (retry.length > 0 ? retry.shift()! : next < chunks.length ? next++ : -1);

        /** Starts (or restarts) the slot's worker and gives it the BVH and this job's task. */
        const ready = async (slot: Slot): Promise<WorkerHandle> => {
          const h = await start(slot);
          if (!holding.has(slot) || slot.busy === 0) {
            if (slot.busy++ === 0) h.hold?.(true);
            holding.add(slot);
          }
          if (!slot.bvhIds.has(bvhId)) {
            await Promise.race([h.api.putBvh(bvhId, sendable), h.failed]);
            slot.bvhIds.add(bvhId);
          }
          if (!hasTask.has(h)) {
            await Promise.race([h.api.putTask(taskId, fullTask), h.failed]);
            hasTask.add(h);
          }
          return h;
        };
        /** Terminates the slot's worker if it is still `h` (another job may have replaced it already). */
        const replace = (slot: Slot, h: WorkerHandle | null) => {
          if (h === null || slot.handle === h) stop(slot);
        };

        const runSlot = async (slot: Slot) => {
          let startFailures = 0;
          while (!settled) {
            let c = takeChunk();
            if (c < 0) return;
            let h: WorkerHandle | null = null;
            try {
              h = await ready(slot);
            } catch (err) {
              if (settled) return;
              retry.unshift(c);
              replace(slot, h ?? slot.handle);
              if (++startFailures >= MAX_WORKER_STARTS || isInputError(err)) fail(err);
              continue;
            }
            startFailures = 0;
            while (!settled && c >= 0) {
              const [s, e] = chunks[c]!;
              let r: TraceChunkResult;
              try {
                r = await Promise.race([h.api.runChunk(taskId, s, e), h.failed]);
              } catch (err) {
                if (settled) return;
                replace(slot, h);
                if (++attempts[c]! >= MAX_CHUNK_ATTEMPTS || isInputError(err)) {
                  fail(new TraceChunkError(task.kind, s, e, err));
                  return;
                }
                retry.push(c);
                break; // a fresh worker for this slot, then the next chunk (maybe this one again)
              }
              if (settled) return;
              results[c] = r;
              done += e - s;
              progress();
              if (--remaining === 0) {
                settled = true;
                finish();
                resolve(results);
                return;
              }
              c = takeChunk();
            }
          }
        };
        for (const s of used) void runSlot(s);
      });
    },
  };
}

function raysPerSunReceiver(input: SunVisibilityInput): number {
  return input.sunDirections.length / 3;
}

function raysPerSkyReceiver(input: SkyVisibilityInput): number {
  const K = skySubdivision(input.skyLevel ?? 1).count;
  const ground = input.normals !== undefined ? (input.groundSamples ?? DEFAULT_GROUND_SAMPLES) / 2 : 0;
  return K * (input.samplesPerPatch ?? DEFAULT_SKY_SAMPLES_PER_PATCH) + ground;
}

function executorOn(scheduler: Scheduler): TraceExecutor {
  return {
    workerCount: scheduler.workerCount,
    async sunVisibility(bvh, input, opts = {}): Promise<Uint8Array> {
      const total = sunVisibilityReceiverCount(input);
      sunVisibility(bvh, input, 0, 0); // checks the whole input here, so bad input throws an InputError at once
      const chunks = await scheduler.run({ kind: 'sunVisibility', bvhId: 0, input }, bvh, total, raysPerSunReceiver(input), opts);
      const [r0, r1] = opts.range ?? [0, total];
      return mergeSunVisibility(chunks as Extract<TraceChunkResult, { kind: 'sunVisibility' }>[], r1 - r0, input.sunDirections.length / 3, r0);
    },
    async skyVisibility(bvh, input, opts = {}): Promise<SkyVisibilityResult> {
      const total = skyVisibilityReceiverCount(input);
      skyVisibility(bvh, input, 0, 0);
      const chunks = await scheduler.run({ kind: 'skyVisibility', bvhId: 0, input }, bvh, total, raysPerSkyReceiver(input), opts);
      const [r0, r1] = opts.range ?? [0, total];
      return mergeSkyVisibility(chunks as Extract<TraceChunkResult, { kind: 'skyVisibility' }>[], r1 - r0, r0, skySubdivision(input.skyLevel ?? 1).count);
    },
    async surfaceViews(bvh, input, opts = {}): Promise<SurfaceViewsResult> {
      const total = surfaceViewsReceiverCount(input);
      surfaceViews(bvh, input, 0, 0);
      const D = surfaceViewsDirections(input);
      const rays = D * (input.samplesPerDirection ?? DEFAULT_VIEW_SAMPLES);
      const chunks = await scheduler.run({ kind: 'surfaceViews', bvhId: 0, input }, bvh, total, rays, opts);
      const [r0, r1] = opts.range ?? [0, total];
      return mergeSurfaceViews(chunks as Extract<TraceChunkResult, { kind: 'surfaceViews' }>[], r1 - r0, D, r0);
    },
    async close() {
      scheduler.close();
    },
  };
}

/**
 * A pool of `workers` workers made by `factory` (see nodeWorkers.ts, browserWorkers.ts). Workers
 * start on the first job.
 */
export function createWorkerPool(factory: WorkerFactory, opts: { workers: number }): TraceExecutor {
  return executorOn(createScheduler(factory, opts.workers, true));
}

/** The same API run on this thread, one chunk at a time (for tests and tiny jobs). */
export function createInProcessExecutor(): TraceExecutor {
  const factory: WorkerFactory = () => {
    const api = createTraceApi();
    // Yield to the event loop before each chunk so progress and abort events get through.
    const later = <T>(f: () => T) => new Promise<T>((resolve, reject) => setTimeout(() => { try { resolve(f()); } catch (e) { reject(e); } }, 0));
    const asyncApi: AsyncTraceApi = {
      ping: async () => api.ping(),
      putBvh: async (id, bvh) => api.putBvh(id, bvh),
      dropBvh: async (id) => api.dropBvh(id),
      putTask: async (id, task) => api.putTask(id, task),
      dropTask: async (id) => api.dropTask(id),
      runChunk: (id, s, e) => later(() => api.runChunk(id, s, e)),
    };
    return { api: asyncApi, failed: new Promise<never>(() => undefined), terminate: () => undefined };
  };
  return executorOn(createScheduler(factory, 1, false));
}
