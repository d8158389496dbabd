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
 *
 * Re-runs: the last run's stage outputs are kept with a key of everything the geometry pass
 * depends on (model bytes and placement, ground level, zones, sampling, the set of sun directions).
 * When only materials or weather values changed, the geometry pass is reused (see `planReuse`).
 */
import { transfer } from 'comlink';
import { importModel } from '../../geometry/import/index.ts';
import { loadProject, type ReadRelative } from '../../audit/load.ts';
import { fnv1a32Hex, runAuditWithState, type AuditProgress, type AuditState } from '../../audit/pipeline.ts';
import type { LoadedProject } from '../../audit/load.ts';
import { prepareModel, type PreparedModel } from '../../audit/stages/model.ts';
import { distinctSunDirections } from '../../audit/stages/geometryPass.ts';
import { canShareMemory } from '../../trace/pool/shareBuffers.ts';
import type { Patches } from '../../geometry/patches.ts';
import type { TraceExecutor } from '../../trace/pool/types.ts';
import { createBrowserWorkerPool } from '../../trace/pool/browserWorkers.ts';
import type { Results } from '../../audit/results.ts';
import { buildSteps } from '../../audit/stages/steps.ts';
import { matchPatchesToResults } from './patchMatch.ts';
import { toResultsView, type ResultsView } from './resultColumns.ts';
import { compareDesigns, designProjects, runDesigns, type Comparison, type DesignRun } from '../../audit/options.ts';

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

/** What a run could take over from the previous one. */
export type ReuseKind = 'none' | 'geometry' | 'model and geometry';

export interface AuditOutcome {
  /** The results as typed-array columns (the full Results stay in the worker: `exportResults`). */
  results: ResultsView;
  patches: PatchView | null;
  /** What was taken over from the previous run. */
  reused: ReuseKind;
  /** Trace workers used for the geometry pass (0 = in the audit worker; also 0 when reused). */
  traceWorkers: number;
  /** Stage timings of this run [ms] (pipeline's run record, plus `total`). */
  timingsMs: Record<string, number>;
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
  /**
   * Trace workers for the geometry pass; 0 = in this worker (the default). Used only where shared
   * memory exists (a cross-origin isolated page); otherwise the trace runs in-process.
   */
  workers?: number;
}

export interface SunPath {
  times: string[];
  sun: { altitudeDeg: number; azimuthDeg: number }[];
}

/** Progress of a run over all designs: the audit's progress plus which design (0-based) of how many. */
export interface DesignsProgress extends AuditProgress {
  design: number;
  designs: number;
}

/** One design's run for the viewer. */
export interface DesignOutcome {
  name: string;
  results: ResultsView;
  patches: PatchView | null;
  reusedGeometry: boolean;
}

export interface DesignsOutcome {
  designs: DesignOutcome[];
  /** Every option against the baseline (compareDesigns). */
  comparison: Comparison;
  baselineName: string;
  timingsMs: { total: number };
}

export interface AuditApi {
  /** Audits the baseline and every option (runDesigns), keeping the runs for `compareDesignPair`. */
  runDesigns(jobId: number, job: AuditJob, onProgress?: (p: DesignsProgress) => void): Promise<DesignsOutcome>;
  /** `option` against `reference` (as compareDesigns with the reference as baseline) from the last runDesigns. */
  compareDesignPair(option: string, reference: string): Promise<Comparison>;
  openModel(bytes: Uint8Array, fileName: string, opts: { upAxis?: 'y' | 'z'; unitsPerMeter?: number }): Promise<ModelView>;
  sunPath(job: AuditJob): Promise<SunPath>;
  runAudit(jobId: number, job: AuditJob, onProgress?: (p: AuditProgress) => void): Promise<AuditOutcome>;
  cancel(jobId: number): void;
  /**
   * The full Results of the last run (or of design `design` of the last runDesigns) as the CLI's
   * results.json text, UTF-8 (serialised here, off the page's main thread).
   */
  exportResults(design?: string): Promise<Uint8Array>;
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

/** The progress stage shown when the previous geometry pass is taken over. */
export const REUSE_STAGE = 'reusing the geometry pass';

/** Keys of what a run's stages depend on (strings compare exactly). */
export interface ReuseKeys {
  /** Model bytes and placement, ground level, zones, sampling. */
  geometry: string;
  /** The sun directions and which step uses which. */
  sun: string;
  /** Material assignments (surface, default, ground). */
  materials: string;
}

export interface CachedRun {
  keys: ReuseKeys;
  state: AuditState;
}

/** Computes the keys of a loaded project (reads the model's bytes through the project's reader). */
export async function reuseKeys(loaded: LoadedProject): Promise<ReuseKeys> {
  const p = loaded.project;
  const bytes = await loaded.readRelative(p.model.file).catch(() => new Uint8Array(0));
  const geometry = JSON.stringify({
    file: p.model.file, bytes: bytes.length, hash: fnv1a32Hex(bytes), upAxis: p.model.upAxis, unitsPerMeter: p.model.unitsPerMeter,
    northDeg: p.site.northDeg, ground: p.ground ? p.ground.z : null, zones: p.zones, sampling: p.sampling,
  });
  const steps = buildSteps(p, loaded.weather);
  const { sunIndexOfStep, directions } = distinctSunDirections(steps);
  const sun = `${steps.count}:${fnv1a32Hex(new Uint8Array(sunIndexOfStep.buffer))}:${directions.length}:${fnv1a32Hex(new Uint8Array(directions.buffer))}`;
  const materials = JSON.stringify({ m: p.materials, d: p.defaultMaterial, g: p.ground?.material ?? null });
  return { geometry, sun, materials };
}

function sameArray(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/** True when two prepared models have the same patches (ids, centroids, normals) and sensors, in the same order. */
export function sameReceivers(a: PreparedModel, b: PreparedModel): boolean {
  if (a.patches.count !== b.patches.count || a.sensors.length !== b.sensors.length) return false;
  for (let i = 0; i < a.patches.count; i++) if (a.patches.ids[i] !== b.patches.ids[i]) return false;
  if (!sameArray(a.patches.centroids, b.patches.centroids) || !sameArray(a.patches.normals, b.patches.normals)) return false;
  return a.sensors.every((s, i) => sameArray(s.positions, b.sensors[i]!.positions));
}

/**
 * What the next run can take over from the cached one: nothing when the geometry or the sun
 * directions changed; model and geometry when only weather values changed; the geometry alone when
 * materials changed too (the model is prepared again, since materials are resolved into it, and
 * the geometry is taken only if the patches and sensors came out identical: materials split
 * patches, so a new assignment can change them).
 */
export async function planReuse(
  cached: CachedRun | null,
  keys: ReuseKeys,
  loaded: LoadedProject,
): Promise<{ kind: ReuseKind; reuse?: { model: PreparedModel; geometry: AuditState['geometry'] } }> {
  if (!cached || cached.keys.geometry !== keys.geometry || cached.keys.sun !== keys.sun) return { kind: 'none' };
  const { model, geometry } = cached.state;
  if (cached.keys.materials === keys.materials) return { kind: 'model and geometry', reuse: { model, geometry } };
  const fresh = await prepareModel(loaded);
  if (!sameReceivers(fresh, model)) return { kind: 'none' };
  return { kind: 'geometry', reuse: { model: fresh, geometry } };
}

export function createAuditApi(): AuditApi {
  const jobs = new Map<number, AbortController>();
  let cache: CachedRun | null = null;
  let designRuns: DesignRun[] = [];
  let lastResults: Results | null = null;
  return {
    async runDesigns(jobId, job, onProgress) {
      const ctrl = new AbortController();
      jobs.set(jobId, ctrl);
      const t0 = performance.now();
      try {
        const loaded = await loadProject(job.projectText, job.projectFile, makeReadRelative(job.files, job.baseUrl));
        const designs = designProjects(loaded.project);
        const names = designs.map((d) => d.name);
        let last = 0;
        let lastStage = '';
        const report = (p: AuditProgress) => {
          const now = Date.now();
          if (p.stage !== lastStage || p.done >= p.total || now - last >= PROGRESS_INTERVAL_MS) {
            last = now;
            lastStage = p.stage;
            // runDesigns prefixes each stage with "<design name>: "
            const design = Math.max(0, names.findIndex((n) => p.stage.startsWith(`${n}: `)));
            void onProgress?.({ stage: p.stage, done: p.done, total: p.total, design, designs: names.length });
          }
        };
        cache = null; // the single-design cache would hold a second BVH
        designRuns = [];
        lastResults = null;
        const runs = await runDesigns(loaded, { signal: ctrl.signal, onProgress: report });
        ctrl.signal.throwIfAborted();
        designRuns = runs;
        const comparison = compareDesigns(runs, loaded.project.baselineName);
        const out: DesignOutcome[] = [];
        const buffers: ArrayBuffer[] = [];
        for (const r of runs) {
          // The display patches of each design (its devices add patches); no tracing here.
          const d = designs.find((x) => x.name === r.name)!;
          const model = await prepareModel({ ...loaded, project: d.project });
          const patches = patchView(model.patches, r.results);
          if (patches) buffers.push(patches.positions.buffer as ArrayBuffer, patches.patchOfTriangle.buffer as ArrayBuffer, patches.resultIndex.buffer as ArrayBuffer);
          const cols = toResultsView(r.results);
          buffers.push(...cols.buffers);
          out.push({ name: r.name, results: cols.view, patches, reusedGeometry: r.reusedGeometry });
        }
        return transfer({ designs: out, comparison, baselineName: loaded.project.baselineName, timingsMs: { total: Math.round(performance.now() - t0) } }, buffers);
      } finally {
        jobs.delete(jobId);
      }
    },

    async compareDesignPair(option, reference) {
      const ref = designRuns.find((r) => r.name === reference);
      const opt = designRuns.find((r) => r.name === option);
      if (!ref || !opt) throw new Error(`no run of "${!ref ? reference : option}": run all designs first`);
      return compareDesigns([ref, opt], reference);
    },

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
      const t0 = performance.now();
      try {
        const read = makeReadRelative(job.files, job.baseUrl);
        const loaded = await loadProject(job.projectText, job.projectFile, read);
        let last = 0;
        let lastStage = '';
        const report = (p: AuditProgress) => {
          const now = Date.now();
          // Throttled, but a new stage and the end of a stage always get through.
          if (p.stage !== lastStage || p.done >= p.total || now - last >= PROGRESS_INTERVAL_MS) {
            last = now;
            lastStage = p.stage;
            void onProgress?.({ stage: p.stage, done: p.done, total: p.total });
          }
        };
        const keys = await reuseKeys(loaded);
        const plan = await planReuse(cache, keys, loaded);
        ctrl.signal.throwIfAborted();
        if (!plan.reuse) cache = null; // frees the old BVH and geometry before a new trace
        if (plan.reuse) report({ stage: REUSE_STAGE, done: 1, total: 1 });
        const wanted = job.workers ?? 0;
        const workers = !plan.reuse && wanted > 0 && canShareMemory() ? wanted : 0;
        const tracer: TraceExecutor | undefined = workers > 0 ? createBrowserWorkerPool({ workers }) : undefined;
        try {
          const { results, state, record } = await runAuditWithState(
            loaded,
            { ...(tracer ? { tracer } : {}), signal: ctrl.signal, onProgress: report },
            plan.reuse,
          );
          ctrl.signal.throwIfAborted();
          cache = { keys, state };
          lastResults = results;
          designRuns = [];
          const patches = patchView(state.model.patches, results);
          const cols = toResultsView(results);
          const timingsMs = { ...record.timingsMs, total: Math.round(performance.now() - t0) };
          const out: AuditOutcome = { results: cols.view, patches, reused: plan.kind, traceWorkers: workers, timingsMs };
          const buffers = [...cols.buffers, ...(patches ? [patches.positions.buffer, patches.patchOfTriangle.buffer, patches.resultIndex.buffer] as ArrayBuffer[] : [])];
          return transfer(out, buffers);
        } finally {
          await tracer?.close();
        }
      } finally {
        jobs.delete(jobId);
      }
    },

    async exportResults(design) {
      const r = design !== undefined ? designRuns.find((d) => d.name === design)?.results : (lastResults ?? designRuns[0]?.results);
      if (!r) throw new Error(design !== undefined ? `no run of "${design}": run all designs first` : 'no results yet: run the audit first');
      const bytes = new TextEncoder().encode(JSON.stringify(r));
      return transfer(bytes, [bytes.buffer as ArrayBuffer]);
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
