/**
 * Design options: a project holds a baseline (its own devices and materials) and named options,
 * each adding devices to the baseline's and replacing material assignments. `runDesigns` audits
 * them all — an option that only changes materials reuses the baseline's geometry pass — and
 * `compareDesigns` reports, per zone and option, the change against the baseline.
 *
 * A change is option minus baseline: per sensor the mean over the period's daylight steps (sun
 * above the horizon) of the MRT difference; per zone the mean of that over the zone's sensors, the
 * change of the zone's peak MRT, of the hours in each UTCI category (mean hours per sensor) and of
 * the hours with MRT above the threshold. Sensors are matched by position (to 1 mm); a sensor that
 * exists in only one design (e.g. inside a new tree trunk) is left out of the means and counted.
 *
 * An option that adds devices re-traces only what they can change (stages/retrace.ts), reusing the
 * baseline's geometry pass; its results equal a full trace of the option exactly. Every design
 * with devices traces patches with the stream keys of `designPatchStreams`, so that holds.
 */
import type { Project } from './project.ts';
import type { LoadedProject } from './load.ts';
import type { Results } from './results.ts';
import { runAuditWithState, type AuditOptions, type RunRecord } from './pipeline.ts';
import { prepareModel, type PreparedModel } from './stages/model.ts';
import { buildSteps } from './stages/steps.ts';
import { geometryPass, type GeometryData } from './stages/geometryPass.ts';
import { addedDeviceBoxes, designPatchStreams, retraceGeometry, type RetraceStats } from './stages/retrace.ts';
import { createInProcessExecutor } from '../trace/pool/workerPool.ts';
import { summarizeResults, DEFAULT_MRT_THRESHOLD_C } from './summary.ts';

export interface DesignRun {
  name: string;
  results: Results;
  record: RunRecord;
  /** True when this design reused the baseline's geometry pass (materials-only option). */
  reusedGeometry: boolean;
  /** When the option's devices were re-traced incrementally on the baseline's geometry: what was traced. */
  retrace?: RetraceStats;
  /** Why an option adding devices was traced in full instead (no baseline run, or the model changed). */
  fullTraceReason?: string;
}

/** Options of runDesigns beyond the audit's. */
export interface DesignRunOptions {
  /** Trace every design in full (no incremental re-trace); for checks and measurements. */
  fullTrace?: boolean;
}

export interface ZoneChange {
  name: string;
  /** Mean over sensors of the mean daylight MRT change [K]. */
  meanMrtChangeK: number;
  /** Zone peak MRT, option minus baseline [K]. */
  peakMrtChangeK: number;
  /** Mean hours per sensor in each UTCI category, option minus baseline [h]. */
  hoursByCategoryChange: Record<string, number>;
  /** Mean hours per sensor with MRT above the threshold, option minus baseline [h]. */
  mrtHoursAboveChange: number;
  /** Per sensor of the baseline: mean daylight MRT change [K] (null: no matching sensor). */
  sensorMeanMrtChangeK: (number | null)[];
  /** Per sensor of the baseline and step: MRT change [K] (periods of at most 31 days only). */
  sensorMrtChangeK?: (number[] | null)[];
  unmatchedSensors: number;
}

export interface Comparison {
  sunfacetCompare: 1;
  project: string;
  baseline: string;
  mrtThresholdC: number;
  times: string[];
  options: { name: string; reusedGeometry: boolean; zones: ZoneChange[] }[];
}

/** The baseline and every option as complete projects. */
export function designProjects(project: Project): { name: string; project: Project }[] {
  const base = { ...project, options: [] };
  return [
    { name: project.baselineName, project: base },
    ...project.options.map((o) => ({
      name: o.name,
      project: { ...base, devices: [...project.devices, ...o.devices], materials: { ...project.materials, ...o.materials } },
    })),
  ];
}

export async function runDesigns(loaded: LoadedProject, opts: AuditOptions & DesignRunOptions = {}, only?: string[]): Promise<DesignRun[]> {
  const designs = designProjects(loaded.project).filter((d) => !only || only.includes(d.name));
  const out: DesignRun[] = [];
  let baselineState: { model: PreparedModel; geometry: GeometryData; patchStreams: Uint32Array | undefined } | undefined;
  const tracer = opts.tracer ?? createInProcessExecutor();
  const auditOpts: AuditOptions = { ...opts, tracer };
  const baseDevices = loaded.project.devices.length;
  try {
    for (const d of designs) {
      const sub: LoadedProject = { ...loaded, project: d.project };
      const sameGeometry = baselineState !== undefined && d.project.devices.length === baseDevices;
      const say = (s: string, done = 0, total = 1) => opts.onProgress?.({ stage: `${d.name}: ${s}`, done, total });
      let r: Awaited<ReturnType<typeof runAuditWithState>>;
      let retrace: RetraceStats | undefined, fullTraceReason: string | undefined;
      const model = await prepareModel(sub);
      const patchStreams = designPatchStreams(model, d.project.devices);
      const same = sameGeometry && model.patches.count === baselineState!.model.patches.count && model.patches.ids.every((id, i) => id === baselineState!.model.patches.ids[i]);
      let geometry: GeometryData | undefined;
      if (same) {
        // Materials only: the geometry (and every ray) is the baseline's; re-resolve the materials.
        say('reusing the geometry pass');
        geometry = baselineState!.geometry;
      } else {
        const steps = buildSteps(d.project, loaded.weather);
        const tz = d.project.site.timeZone;
        if (baselineState !== undefined && d.project.devices.length > baseDevices && !opts.fullTrace) {
          say('re-tracing what the new devices can change');
          const res = await retraceGeometry({
            base: baselineState, model, patchStreams, addedBoxes: addedDeviceBoxes(d.project.devices, baseDevices),
            steps, sampling: d.project.sampling, tracer, siteTimeZone: tz, onStage: say, ...(opts.signal ? { signal: opts.signal } : {}),
          });
          if (res.geometry) {
            geometry = res.geometry;
            retrace = res.stats;
          } else fullTraceReason = res.reason;
        } else if (d.project.devices.length > baseDevices) {
          fullTraceReason = opts.fullTrace ? 'full trace requested' : 'no baseline run to reuse';
        }
        geometry ??= await geometryPass(model, steps, d.project.sampling, tracer, { onStage: say, ...(opts.signal ? { signal: opts.signal } : {}), patchStreams }, tz);
      }
      r = await runAuditWithState(sub, auditOpts, { model, geometry });
      if (d.name === loaded.project.baselineName) baselineState = { model, geometry, patchStreams };
      out.push({
        name: d.name, results: r.results, record: r.record, reusedGeometry: same,
        ...(retrace ? { retrace } : {}), ...(fullTraceReason ? { fullTraceReason } : {}),
      });
    }
  } finally {
    if (!opts.tracer) await tracer.close();
  }
  return out;
}

const r2 = (x: number) => Math.round(x * 100) / 100 + 0;

export function compareDesigns(runs: DesignRun[], baselineName: string, mrtThresholdC = DEFAULT_MRT_THRESHOLD_C): Comparison {
  const base = runs.find((r) => r.name === baselineName);
  if (!base) throw new Error(`compareDesigns: no baseline "${baselineName}" among the runs`);
  const b = base.results;
  const T = b.times.length;
  const stepHours = Number(b.run.stepHours);
  const daylight = b.sun.map((s) => s.altitudeDeg > 0);
  const bs = summarizeResults(b, { stepHours, mrtThresholdC });
  const keepSteps = T * stepHours <= 31 * 24;
  const options = runs.filter((r) => r.name !== baselineName).map((o) => {
    const os = summarizeResults(o.results, { stepHours, mrtThresholdC });
    const zones: ZoneChange[] = b.zones.map((bz, zi) => {
      const oz = o.results.zones.find((z) => z.name === bz.name);
      const byPos = new Map<string, number>();
      oz?.sensors.forEach((s, i) => byPos.set(s.position.map((x) => Math.round(x * 1000)).join(','), i));
      const perSensor: (number | null)[] = [];
      const perStep: (number[] | null)[] = [];
      let sum = 0, n = 0, unmatched = 0;
      for (const s of bz.sensors) {
        const j = byPos.get(s.position.map((x) => Math.round(x * 1000)).join(','));
        const os2 = j === undefined ? undefined : oz!.sensors[j];
        if (!os2) {
          unmatched++;
          perSensor.push(null);
          perStep.push(null);
          continue;
        }
        let ds = 0, dn = 0;
        const steps: number[] = [];
        for (let t = 0; t < T; t++) {
          const d = os2.mrtC[t]! - s.mrtC[t]!;
          steps.push(r2(d));
          if (daylight[t]) {
            ds += d;
            dn++;
          }
        }
        const m = dn > 0 ? ds / dn : 0;
        perSensor.push(r2(m));
        perStep.push(steps);
        sum += m;
        n++;
      }
      const bzs = bs.zones[zi]!, ozs = os.zones.find((z) => z.name === bz.name);
      const hours: Record<string, number> = {};
      for (const c of bzs.categoryHours) hours[c.id] = r2((ozs?.categoryHours.find((x) => x.id === c.id)?.meanHours ?? 0) - c.meanHours);
      return {
        name: bz.name,
        meanMrtChangeK: r2(n > 0 ? sum / n : 0),
        peakMrtChangeK: r2((ozs?.peakMrt?.valueC ?? NaN) - (bzs.peakMrt?.valueC ?? NaN)),
        hoursByCategoryChange: hours,
        mrtHoursAboveChange: r2((ozs?.mrtAbove.meanHours ?? 0) - bzs.mrtAbove.meanHours),
        sensorMeanMrtChangeK: perSensor,
        ...(keepSteps ? { sensorMrtChangeK: perStep } : {}),
        unmatchedSensors: unmatched,
      };
    });
    return { name: o.name, reusedGeometry: o.reusedGeometry, zones };
  });
  return { sunfacetCompare: 1, project: b.project, baseline: baselineName, mrtThresholdC, times: b.times, options };
}
