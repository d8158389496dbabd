/**
 * The page's side of the audit worker: one module Web Worker wrapped with comlink. A run can be
 * cancelled: the worker is asked to abort; if it has not stopped within a grace period (a stage
 * that cannot be interrupted), the worker is terminated and a fresh one started.
 */
import { proxy, releaseProxy, wrap, type Remote } from 'comlink';
import type { AuditApi, AuditJob, AuditOutcome, DesignsOutcome, DesignsProgress, ModelView, SunPath } from './auditApi.ts';
import type { Comparison } from '../../audit/options.ts';
import type { AuditProgress } from '../../audit/pipeline.ts';

/** How long a cancelled run may take to stop before its worker is terminated [ms]. */
const CANCEL_GRACE_MS = 1500;

export interface RunHandle<T = AuditOutcome> {
  promise: Promise<T>;
  cancel(): void;
}

export class AuditClient {
  private worker: Worker | null = null;
  private remote: Remote<AuditApi> | null = null;
  private nextJob = 1;

  private api(): Remote<AuditApi> {
    if (this.remote) return this.remote;
    this.worker = new Worker(new URL('../../../workers/audit.worker.ts', import.meta.url), { type: 'module', name: 'sunfacet-audit' });
    this.remote = wrap<AuditApi>(this.worker);
    return this.remote;
  }

  private restart(): void {
    try {
      this.remote?.[releaseProxy]();
    } catch {
      // already released
    }
    this.worker?.terminate();
    this.worker = null;
    this.remote = null;
  }

  openModel(bytes: Uint8Array, fileName: string, opts: { upAxis?: 'y' | 'z'; unitsPerMeter?: number }): Promise<ModelView> {
    // A copy goes to the worker; the page keeps its bytes for autosave and for the audit.
    return this.api().openModel(bytes.slice(), fileName, opts);
  }

  sunPath(job: AuditJob): Promise<SunPath> {
    return this.api().sunPath(job);
  }

  run(job: AuditJob, onProgress: (p: AuditProgress) => void): RunHandle {
    return this.cancellable((api, id) => api.runAudit(id, job, proxy(onProgress)));
  }

  /** Runs the baseline and every option. */
  runDesigns(job: AuditJob, onProgress: (p: DesignsProgress) => void): RunHandle<DesignsOutcome> {
    return this.cancellable((api, id) => api.runDesigns(id, job, proxy(onProgress)));
  }

  /** The full results.json of the last run (or of one design), serialised in the worker. */
  exportResults(design?: string): Promise<Uint8Array> {
    return this.api().exportResults(design);
  }

  compareDesignPair(option: string, reference: string): Promise<Comparison> {
    return this.api().compareDesignPair(option, reference);
  }

  private cancellable<T>(start: (api: Remote<AuditApi>, id: number) => Promise<T>): RunHandle<T> {
    const id = this.nextJob++;
    const api = this.api();
    let settled = false;
    let rejectCancel: (e: unknown) => void = () => {};
    const cancelled = new Promise<never>((_, reject) => (rejectCancel = reject));
    const work = start(api, id);
    const promise = Promise.race([work, cancelled]).finally(() => (settled = true));
    return {
      promise,
      cancel: () => {
        if (settled) return;
        void api.cancel(id);
        setTimeout(() => {
          if (settled) return;
          this.restart();
          rejectCancel(new DOMException('The audit was cancelled', 'AbortError'));
        }, CANCEL_GRACE_MS);
      },
    };
  }

  dispose(): void {
    this.restart();
  }
}
