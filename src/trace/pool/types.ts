/** Types shared by the executors (in-process and worker pools). */
import type { BvhData } from '../bvh/build.ts';
import type { TraceApi, TraceTask } from '../api.ts';
import type { SunVisibilityInput } from '../queries/sunVisibility.ts';
import type { SkyVisibilityInput, SkyVisibilityResult } from '../queries/skyVisibility.ts';
import type { SurfaceViewsInput, SurfaceViewsResult } from '../queries/surfaceViews.ts';

/** The trace API with every method returning a promise (what comlink's `wrap` gives). */
export type AsyncTraceApi = {
  [K in keyof TraceApi]: (...args: Parameters<TraceApi[K]>) => Promise<ReturnType<TraceApi[K]>>;
};

/** One worker as the pool sees it. */
export interface WorkerHandle {
  api: AsyncTraceApi;
  /** Rejects when the worker dies (uncaught error, exit); never resolves. */
  failed: Promise<never>;
  /** Stops the worker at once (no waiting for the current chunk). */
  terminate(): void;
  /** Optional: keep the host process alive only while `busy` (Node `ref`/`unref`). */
  hold?(busy: boolean): void;
}

/** Starts one worker. */
export type WorkerFactory = () => WorkerHandle;

export interface TraceRunOptions {
  /** Receivers per chunk (default: about 200 000 rays per chunk, at least 1, at most total/workers). */
  chunkSize?: number | undefined;
  /** Called with (receivers done, receivers total), at most every `progressIntervalMs`, and always at the end. */
  onProgress?: ((done: number, total: number) => void) | undefined;
  /** Least time between two progress calls [ms] (default 100). */
  progressIntervalMs?: number | undefined;
  /** Aborting stops handing out chunks, terminates the workers and rejects with the signal's reason. */
  signal?: AbortSignal | undefined;
  /**
   * Only receivers [start, end) (a shard of the work); the result covers just those, in order. The
   * numbers equal the same rows of a full run (each receiver's random stream depends on its index).
   */
  range?: readonly [number, number] | undefined;
}

/** Runs the ray queries over all receivers, in chunks, with identical results for any worker count. */
export interface TraceExecutor {
  /** Workers in use (1 for the in-process executor). */
  readonly workerCount: number;
  sunVisibility(bvh: BvhData, input: SunVisibilityInput, opts?: TraceRunOptions): Promise<Uint8Array>;
  skyVisibility(bvh: BvhData, input: SkyVisibilityInput, opts?: TraceRunOptions): Promise<SkyVisibilityResult>;
  surfaceViews(bvh: BvhData, input: SurfaceViewsInput, opts?: TraceRunOptions): Promise<SurfaceViewsResult>;
  /** Terminates the workers; the executor must not be used afterwards. */
  close(): Promise<void>;
}

/** A chunk that failed in a worker: which query, which receivers, and the worker's error as `cause`. */
export class TraceChunkError extends Error {
  readonly kind: TraceTask['kind'];
  readonly start: number;
  readonly end: number;
  constructor(kind: TraceTask['kind'], start: number, end: number, cause: unknown) {
    const why = cause instanceof Error ? cause.message : String(cause);
    super(`${kind}: receivers ${start}..${end - 1} failed in a worker: ${why}`, { cause });
    this.name = 'TraceChunkError';
    this.kind = kind;
    this.start = start;
    this.end = end;
  }
}
