/**
 * Node worker threads for the pool (never loaded by the browser bundle). Each worker runs
 * `workers/trace.node-worker.ts`, which exposes the trace API through comlink's Node adapter.
 *
 * From source (this file is `.ts`), Node 20 does not apply tsx's loader to a `.ts` worker entry
 * (TOOLCHAIN.md §2), so the worker starts from an eval'd bootstrap that registers tsx and then
 * imports the entry. From a bundle (`.js`), the `.js` entry beside it is loaded directly.
 */
import { Worker } from 'node:worker_threads';
import { availableParallelism } from 'node:os';
import { createRequire } from 'node:module';
import { pathToFileURL } from 'node:url';
import { releaseProxy, wrap } from 'comlink';
import nodeEndpoint from 'comlink/dist/esm/node-adapter.mjs';
import type { TraceApi } from '../api.ts';
import { createWorkerPool } from './workerPool.ts';
import type { AsyncTraceApi, TraceExecutor, WorkerFactory, WorkerHandle } from './types.ts';

export interface NodeWorkerOptions {
  /** Worker entry module (default: workers/trace.node-worker.ts or .js beside this file's tree). */
  workerUrl?: URL | undefined;
}

const fromSource = import.meta.url.endsWith('.ts');

function defaultWorkerUrl(): URL {
  return new URL(`../../../workers/trace.node-worker.${fromSource ? 'ts' : 'js'}`, import.meta.url);
}

function tsxApiHref(): string {
  const resolve = (import.meta as { resolve?: (s: string) => string }).resolve;
  if (typeof resolve === 'function') {
    try {
      return resolve('tsx/esm/api');
    } catch {
      // fall through to require.resolve (e.g. under a test runner that rewrites import.meta)
    }
  }
  return pathToFileURL(createRequire(import.meta.url).resolve('tsx/esm/api')).href;
}

function startWorker(entry: URL): Worker {
  if (!entry.pathname.endsWith('.ts')) return new Worker(entry);
  const code =
    `import(${JSON.stringify(tsxApiHref())}).then((m) => { (m.register ?? m.default.register)(); ` +
    `return import(${JSON.stringify(entry.href)}); });`;
  return new Worker(code, { eval: true });
}

/** A factory of Node worker threads running the trace API. */
export function nodeWorkerFactory(opts: NodeWorkerOptions = {}): WorkerFactory {
  const entry = opts.workerUrl ?? defaultWorkerUrl();
  return (): WorkerHandle => {
    const worker = startWorker(entry);
    const remote = wrap<TraceApi>(nodeEndpoint(worker));
    let terminated = false;
    let rejectFailed: (e: Error) => void = () => undefined;
    const failed = new Promise<never>((_, reject) => {
      rejectFailed = reject;
      worker.once('error', (err) => reject(err));
      worker.once('exit', (code) => {
        if (!terminated) reject(new Error(`trace worker exited with code ${code}`));
      });
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
          // the port may already be closed
        }
        void worker.terminate();
      },
      hold(busy) {
        if (busy) worker.ref();
        else worker.unref();
      },
    };
  };
}

/** A pool of Node worker threads (default: one per available core). */
export function createNodeWorkerPool(opts: NodeWorkerOptions & { workers?: number | undefined } = {}): TraceExecutor {
  return createWorkerPool(nodeWorkerFactory(opts), { workers: opts.workers ?? Math.max(1, availableParallelism()) });
}
