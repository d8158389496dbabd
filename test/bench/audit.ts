/**
 * `npm run bench -- audit [--reps N] [--year] [--workers 1,2]`: the demo design day (24 steps) end
 * to end, median of N runs per worker count, with where the time goes (geometry pass vs time
 * stepping), and with --year a full year of the demo on the real TMY weather file in
 * test/fixtures/weather (site moved to that file's 45° N 8° E). One JSON line per measurement on
 * stdout: {"bench":"audit","case":"design-day"|"year","workers":n,"medianS":x,"runs":[...],
 * "geometryPassS":x,"timeSteppingS":x,"patches":n,"sensors":n,"steps":n,"baselineRatio":x}.
 * `baselineRatio` is the median against the same run's in-process (0-worker) tracer, measured in
 * the same invocation (the baseline of this suite).
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import path from 'node:path';
import { loadProject, type LoadedProject } from '../../src/audit/load.ts';
import { runAuditWithState } from '../../src/audit/pipeline.ts';
import { createNodeWorkerPool } from '../../src/trace/pool/nodeWorkers.ts';
import { createInProcessExecutor } from '../../src/trace/pool/workerPool.ts';

const root = fileURLToPath(new URL('../../', import.meta.url));

function arg(args: string[], name: string): string | undefined {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : undefined;
}

async function demoLoaded(year: boolean): Promise<LoadedProject> {
  const dir = path.join(root, 'public/demo');
  const project = JSON.parse(readFileSync(path.join(dir, 'project.json'), 'utf8')) as Record<string, unknown> & { site: Record<string, unknown> };
  const epw = path.join(root, 'test/fixtures/weather/tmy-45.000N-8.000E-2005-2023.epw');
  if (year) {
    project.site = { ...project.site, latitudeDeg: 45, longitudeDeg: 8, timeZone: '+01:00' };
    project.period = 'year';
    project.weather = { source: 'file', file: 'site.epw' };
  }
  return loadProject(JSON.stringify(project), 'demo.json', async (rel) => new Uint8Array(readFileSync(rel === 'site.epw' ? epw : path.join(dir, rel))));
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2]! : 0.5 * (s[s.length / 2 - 1]! + s[s.length / 2]!);
};

export async function run(args: string[]): Promise<void> {
  const reps = Number(arg(args, '--reps') ?? 3);
  const workerCounts = (arg(args, '--workers') ?? '0,1,2').split(',').map(Number);
  const cases: ('design-day' | 'year')[] = args.includes('--year') ? ['design-day', 'year'] : ['design-day'];
  for (const c of cases) {
    let baseline = NaN;
    for (const w of workerCounts) {
      const runs: number[] = [], geo: number[] = [], steps: number[] = [];
      let meta = { patches: 0, sensors: 0, steps: 0 };
      for (let r = 0; r < (c === 'year' ? 1 : reps); r++) {
        const loaded = await demoLoaded(c === 'year');
        const tracer = w === 0 ? createInProcessExecutor() : createNodeWorkerPool({ workers: w });
        const t0 = performance.now();
        const { results, record } = await runAuditWithState(loaded, { tracer });
        runs.push((performance.now() - t0) / 1000);
        await tracer.close();
        geo.push((record.timingsMs.geometryPass ?? 0) / 1000);
        steps.push((record.timingsMs.timeStepping ?? 0) / 1000);
        meta = { patches: Number(results.run.patches), sensors: Number(results.run.sensors), steps: results.times.length };
        process.stderr.write(`[bench audit] ${c} workers ${w} run ${r + 1}: ${runs[runs.length - 1]!.toFixed(2)} s\n`);
      }
      const m = median(runs);
      if (w === 0) baseline = m;
      process.stdout.write(JSON.stringify({
        bench: 'audit', case: c, workers: w, medianS: Number(m.toFixed(3)), runs: runs.map((x) => Number(x.toFixed(3))),
        geometryPassS: Number(median(geo).toFixed(3)), timeSteppingS: Number(median(steps).toFixed(3)), ...meta,
        baselineRatio: Number.isFinite(baseline) ? Number((baseline / m).toFixed(3)) : null,
      }) + '\n');
    }
  }
}
