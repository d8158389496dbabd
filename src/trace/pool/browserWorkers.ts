/**
 * Browser Web Workers for the pool (never loaded by Node). The `new Worker(new URL(...),
 * { type: 'module' })` form lets Vite bundle `workers/trace.worker.ts` as its own chunk.
 */
import { releaseProxy, wrap } from 'comlink';
import type { TraceApi } from '../api.ts';
import { createWorkerPool } from './workerPool.ts';
import type { AsyncTraceApi, TraceExecutor, WorkerFactory, WorkerHandle } from './types.ts';

/** A factory of module Web Workers running the trace API. */
export function browserWorkerFactory(): WorkerFactory {
  return (): WorkerHandle => {
    const worker = new Worker(new URL('../../../workers/trace.worker.ts', import.meta.url), { type: 'module' });
    const remote = wrap<TraceApi>(worker);
    let terminated = false;
    let rejectFailed: (e: Error) => void = () => undefined;
    const failed = new Promise<never>((_, reject) => {
      rejectFailed = reject;
      worker.addEventListener('error', (e) => reject(new Error(`trace worker failed: ${e.message || 'error event'}`)), { once: true });
      worker.addEventListener('messageerror', () => reject(new Error('trace worker could not read a message')), { once: true });
    });
    return {
      api: remote as unknown as AsyncTraceApi,
      failed,
      terminate() {
        if (terminated) return;
        terminated = true;
        // A job still waiting on this worker (another job aborted it) fails instead of hanging.
        rejectFailed(new Error('trace worker was terminated'));
        try {
          remote[releaseProxy]();
        } catch {
          // already released
        }
        worker.terminate();
      },
    };
  };
}

/** A pool of Web Workers (default: navigator.hardwareConcurrency, at least 1). */
export function createBrowserWorkerPool(opts: { workers?: number | undefined } = {}): TraceExecutor {
  const n = opts.workers ?? Math.max(1, (typeof navigator !== 'undefined' && navigator.hardwareConcurrency) || 2);
  return createWorkerPool(browserWorkerFactory(), { workers: n });
}
