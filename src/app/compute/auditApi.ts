/**
 * The viewer's worker API (STYLE §10): a plain object, plain data in and out, run inside
 * `workers/audit.worker.ts` (and callable in-process in tests). It reads models and projects
 * through `src/geometry` and `src/audit`; it computes no physics of its own.
 *
 * - `openModel` imports a model for display (model frame: up axis and units applied, north not).
 * - `sunPath` gives the period's time stamps and sun positions, before any audit has run.
 * - `runAudit` loads the project from text plus in-memory files (or same-origin fetch) and runs
 *   the audit pipeline; it also returns the patches in the engine frame, for colouring.
 * - `cancel` aborts a running audit by its job id.
 */
import { transfer } from 'comlink';
import { importModel } from '../../geometry/import/index.ts';
import { loadProject, type ReadRelative } from '../../audit/load.ts';
import { runAuditWithState, type AuditProgress } from '../../audit/pipeline.ts';
import type { Patches } from '../../geometry/patches.ts';
import type { TraceExecutor } from '../../trace/pool/types.ts';
import { createBrowserWorkerPool } from '../../trace/pool/browserWorkers.ts';
import type { Results } from '../../audit/results.ts';
import { buildSteps } from '../../audit/stages/steps.ts';
import { matchPatchesToResults } from './patchMatch.ts';

/** A model ready to draw: the Scene arrays in the model frame (x, y horizontal, z up) [m]. */
export interface ModelView {
  fileName: string;
  positions: Float32Array;
  indices: Uint32Array;
  surfaceIds: Uint32Array;
  materialIds: Uint32Array;
  surfaceNames: string[];
  materialNames: string[];
  warnings: string[];
  /** [minX, minY, minZ, maxX, maxY, maxZ] [m]. */
  bounds: [number, number, number, number, number, number];
}

/** The audit's patches for colouring: non-indexed triangles in the engine frame. */
export interface PatchView {
  /** 9 floats per triangle [m], engine frame (north applied). */
  positions: Float32Array;
  /** Per triangle: its display patch. */
  patchOfTriangle: Uint32Array;
  /** Per display patch: index into results.surfaces, or −1. */
  resultIndex: Int32Array;
  patchCount: number;
}

export interface AuditOutcome {
  results: Results;
  patches: PatchView | null;
}

/** Files the project can refer to, by path relative to the project file. */
export type FileSet = Record<string, Uint8Array>;

export interface AuditJob {
  projectText: string;
  /** Name shown in messages (e.g. "project.json"). */
  projectFile: string;
  files: FileSet;
  /** Same-origin folder URL to fetch files not in `files` from (the demo folder), or none. */
  baseUrl?: string;
  /** Trace workers for the pipeline; 0 = in this worker (the default here). */
  workers?: number;
}

export interface SunPath {
  times: string[];
  sun: { altitudeDeg: number; azimuthDeg: number }[];
}

export interface AuditApi {
  openModel(bytes: Uint8Array, fileName: string, opts: { upAxis?: 'y' | 'z'; unitsPerMeter?: number }): Promise<ModelView>;
  sunPath(job: AuditJob): Promise<SunPath>;
  runAudit(jobId: number, job: AuditJob, onProgress?: (p: AuditProgress) => void): Promise<AuditOutcome>;
  cancel(jobId: number): void;
}

/** Least time between progress messages to the page [ms]. */
const PROGRESS_INTERVAL_MS = 150;

function boundsOf(positions: Float32Array): ModelView['bounds'] {
  const b: ModelView['bounds'] = [Infinity, Infinity, Infinity, -Infinity, -Infinity, -Infinity];
  for (let i = 0; i < positions.length; i += 3) {
    for (let k = 0; k < 3; k++) {
      const v = positions[i + k]!;
      if (v < b[k]!) b[k] = v;
      if (v > b[k + 3]!) b[k + 3] = v;
    }
  }
  if (!(b[0] <= b[3])) return [0, 0, 0, 0, 0, 0];
  return b;
}

/** Reads project-relative files from memory, else from a same-origin folder. */
export function makeReadRelative(files: FileSet, baseUrl: string | undefined): ReadRelative {
  return async (rel: string) => {
    const inMemory = files[rel] ?? files[rel.split('/').pop() ?? rel];
    if (inMemory) return inMemory;
    if (baseUrl === undefined) {
      throw Object.assign(new Error(`${rel} was not opened with the project; choose it together with the project file`), { code: 'ENOENT' });
    }
    const url = new URL(rel, baseUrl);
    if (typeof location !== 'undefined' && url.origin !== location.origin) throw new Error(`refusing to fetch ${rel} from another origin`);
    const res = await fetch(url);
    if (!res.ok) throw Object.assign(new Error(`HTTP ${res.status}`), { code: res.status === 404 ? 'ENOENT' : 'EIO' });
    return new Uint8Array(await res.arrayBuffer());
  };
}

export function createAuditApi(): AuditApi {
  const jobs = new Map<number, AbortController>();
  return {
    async openModel(bytes, fileName, opts) {
      const scene = await importModel(bytes, fileName, { ...opts, northDeg: 0 });
      const view: ModelView = {
        fileName,
        positions: scene.positions,
        indices: scene.indices,
        surfaceIds: scene.surfaceIds,
        materialIds: scene.materialIds,
        surfaceNames: scene.surfaceNames,
        materialNames: scene.materialNames,
        warnings: scene.warnings,
        bounds: boundsOf(scene.positions),
      };
      return transfer(view, [view.positions.buffer, view.indices.buffer, view.surfaceIds.buffer, view.materialIds.buffer] as ArrayBuffer[]);
    },

    async sunPath(job) {
      const loaded = await loadProject(job.projectText, job.projectFile, makeReadRelative(job.files, job.baseUrl));
      const steps = buildSteps(loaded.project, loaded.weather);
      const sun: SunPath['sun'] = [];
      for (let i = 0; i < steps.count; i++) sun.push({ altitudeDeg: steps.sunAltitudeDeg[i]!, azimuthDeg: steps.sunAzimuthDeg[i]! });
      return { times: steps.labels, sun };
    },

    async runAudit(jobId, job, onProgress) {
      const ctrl = new AbortController();
      jobs.set(jobId, ctrl);
      try {
        const read = makeReadRelative(job.files, job.baseUrl);
        const loaded = await loadProject(job.projectText, job.projectFile, read);
        let last = 0;
        let lastStage = '';
        const workers = job.workers ?? 0;
        const tracer: TraceExecutor | undefined = workers > 0 ? createBrowserWorkerPool({ workers }) : undefined;
        try {
          const { results, state } = await runAuditWithState(loaded, {
            ...(tracer ? { tracer } : {}),
            signal: ctrl.signal,
            onProgress: (p) => {
              const now = Date.now();
              // Throttled, but a new stage and the end of a stage always get through.
              if (p.stage !== lastStage || p.done >= p.total || now - last >= PROGRESS_INTERVAL_MS) {
                last = now;
                lastStage = p.stage;
                void onProgress?.({ stage: p.stage, done: p.done, total: p.total });
              }
            },
          });
          ctrl.signal.throwIfAborted();
          const patches = patchView(state.model.patches, results);
          return patches ? transfer({ results, patches }, [patches.positions.buffer, patches.patchOfTriangle.buffer, patches.resultIndex.buffer] as ArrayBuffer[]) : { results, patches };
        } finally {
          await tracer?.close();
        }
      } finally {
        jobs.delete(jobId);
      }
    },

    cancel(jobId) {
      jobs.get(jobId)?.abort(new DOMException('The audit was cancelled', 'AbortError'));
    },
  };
}

/** The audit's own patches as drawable triangles (engine frame), linked to the result surfaces. */
export function patchView(patches: Patches, results: Results): PatchView | null {
  if (results.surfaces.length === 0 || patches.count === 0) return null;
  const tri = patches.scene.indices.length / 3;
  const pos = patches.scene.positions;
  const idx = patches.scene.indices;
  const positions = new Float32Array(tri * 9);
  for (let t = 0; t < tri; t++) {
    for (let k = 0; k < 3; k++) {
      const v = idx[t * 3 + k]! * 3;
      positions[t * 9 + k * 3] = pos[v]!;
      positions[t * 9 + k * 3 + 1] = pos[v + 1]!;
      positions[t * 9 + k * 3 + 2] = pos[v + 2]!;
    }
  }
  const surfaces = Array.from(patches.surfaceIds, (s) => patches.scene.surfaceNames[s] ?? '');
  const resultIndex = matchPatchesToResults({ ids: patches.ids, surfaces, centroids: patches.centroids }, results.surfaces);
  return { positions, patchOfTriangle: patches.patchOfTriangle.slice(), resultIndex, patchCount: patches.count };
}

/** The API object the worker exposes. */
export const auditApi: AuditApi = createAuditApi();
