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
 */
import type { Project } from './project.ts';
import type { LoadedProject } from './load.ts';
import type { Results } from './results.ts';
import { runAuditWithState, type AuditOptions, type RunRecord } from './pipeline.ts';
import { prepareModel } from './stages/model.ts';
import { summarizeResults, DEFAULT_MRT_THRESHOLD_C } from './summary.ts';

export interface DesignRun {
  name: string;
  results: Results;
  record: RunRecord;
  /** True when this design reused the baseline's geometry pass (materials-only option). */
  reusedGeometry: boolean;
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

export async function runDesigns(loaded: LoadedProject, opts: AuditOptions = {}, only?: string[]): Promise<DesignRun[]> {
  const designs = designProjects(loaded.project).filter((d) => !only || only.includes(d.name));
  const out: DesignRun[] = [];
  let baselineState: Awaited<ReturnType<typeof runAuditWithState>>['state'] | undefined;
  for (const d of designs) {
    const sub: LoadedProject = { ...loaded, project: d.project };
    const sameGeometry = baselineState !== undefined && d.project.devices.length === loaded.project.devices.length;
    const say = (s: string) => opts.onProgress?.({ stage: `${d.name}: ${s}`, done: 0, total: 1 });
    let r: Awaited<ReturnType<typeof runAuditWithState>>;
    if (sameGeometry) {
      // Materials only: the geometry (and every ray) is the baseline's; re-resolve the materials.
      say('reusing the geometry pass');
      const model = await prepareModel(sub);
      const g = baselineState!;
      const same = model.patches.count === g.model.patches.count && model.patches.ids.every((id, i) => id === g.model.patches.ids[i]);
      r = await runAuditWithState(sub, opts, same ? { model, geometry: g.geometry } : undefined);
    } else {
      r = await runAuditWithState(sub, { ...opts, onProgress: (p) => opts.onProgress?.({ ...p, stage: `${d.name}: ${p.stage}` }) });
    }
    if (d.name === loaded.project.baselineName) baselineState = r.state;
    out.push({ name: d.name, results: r.results, record: r.record, reusedGeometry: sameGeometry });
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
