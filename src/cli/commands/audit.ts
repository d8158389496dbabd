import os from 'node:os';
import path from 'node:path';
import type { Command, CliIo } from '../command.ts';
import { readProjectFile } from '../files.ts';
import { loadProject } from '../../audit/load.ts';
import { runAudit } from '../../audit/pipeline.ts';
import type { Results } from '../../audit/results.ts';
import { summarizeResults, type Summary } from '../../audit/summary.ts';
import { surfacesCsvChunks, sensorsCsvChunks } from '../../audit/csv.ts';
import { resultsJsonChunks, jsonChunks } from '../../audit/jsonStream.ts';
import { writeOutputsAtomically } from '../output.ts';
import { createProgressReporter } from '../progress.ts';
import { createNodeWorkerPool } from '../../trace/pool/nodeWorkers.ts';
import { createInProcessExecutor } from '../../trace/pool/workerPool.ts';

export const auditCommand: Command = {
  name: 'audit',
  summary: 'Audits a project: hourly façade heat and terrace MRT/UTCI → results.json, surfaces.csv, sensors.csv, summary.json',
  usage: 'sunfacet audit <project.json> --out <dir> [--workers <n>] [--json]',
  options: {
    out: { type: 'string', required: true, value: '<dir>', help: 'output folder (created; files replaced only when the run succeeds)' },
    workers: { type: 'number', min: 0, max: 64, value: '<n>', help: 'tracer worker threads (0 = in this process; default: cores, at most 4)' },
    json: { type: 'boolean', help: 'print summary.json to stdout as well' },
  },
  details: 'Progress goes to stderr. Ctrl-C stops the workers and leaves no half-written output.',
  async run({ positional, options }, io) {
    const file = positional[0];
    if (!file) {
      io.err(`sunfacet audit: missing the project file; usage: ${this.usage}\n`);
      return 2;
    }
    return auditToFolder(file, String(options.out), io, { workers: options.workers as number | undefined, json: Boolean(options.json) });
  },
};

export async function auditToFolder(file: string, outDir: string, io: CliIo, opts: { workers?: number | undefined; json?: boolean }): Promise<number> {
  const { text, readRelative } = await readProjectFile(file, io.cwd);
  const loaded = await loadProject(text, file, readRelative);
  const workers = opts.workers ?? Math.min(4, Math.max(1, os.availableParallelism?.() ?? os.cpus().length));
  const tracer = workers === 0 ? createInProcessExecutor() : createNodeWorkerPool({ workers });
  const controller = new AbortController();
  const onSigint = () => {
    io.err('\n[sunfacet] stopping (Ctrl-C): no output will be written\n');
    controller.abort(new Error('cancelled by the user'));
  };
  process.once('SIGINT', onSigint);
  const progress = createProgressReporter(io);
  let stage = '';
  let results: Results;
  const t0 = Date.now();
  try {
    results = await runAudit(loaded, {
      tracer,
      signal: controller.signal,
      onProgress: (p) => {
        if (p.stage !== stage) {
          stage = p.stage;
          progress.stage(p.stage, p.total);
        }
        progress.update(p.done);
      },
    });
    progress.finish();
  } catch (e) {
    progress.finish();
    if (controller.signal.aborted) {
      io.err('[sunfacet] audit cancelled; nothing written\n');
      return 130;
    }
    throw e;
  } finally {
    process.removeListener('SIGINT', onSigint);
    await tracer.close();
  }
  const summary = summarizeResults(results, { stepHours: Number(results.run.stepHours) });
  const dir = path.resolve(io.cwd, outDir);
  await writeOutputsAtomically(dir, [
    { name: 'results.json', chunks: resultsJsonChunks(results) },
    { name: 'surfaces.csv', chunks: surfacesCsvChunks(results) },
    { name: 'sensors.csv', chunks: sensorsCsvChunks(results) },
    { name: 'summary.json', chunks: jsonChunks(summary, undefined) },
  ], { signal: controller.signal });
  io.err(`[sunfacet] wrote results.json, surfaces.csv, sensors.csv, summary.json to ${path.relative(io.cwd, dir) || '.'} in ${((Date.now() - t0) / 1000).toFixed(1)} s\n`);
  for (const w of results.warnings) io.err(`warning: ${w}\n`);
  io.out(opts.json ? JSON.stringify(summary, null, 1) + '\n' : formatSummary(summary));
  return 0;
}

/** A few lines a person reads after a run. */
export function formatSummary(s: Summary): string {
  const lines: string[] = [`${s.project}`];
  for (const z of s.zones) {
    const hot = z.categoryHours.filter((c) => c.meanHours > 0 && /heat/.test(c.id)).map((c) => `${c.label} ${c.meanHours} h`);
    lines.push(
      `  ${z.name}: ${z.sensors} sensors; peak MRT ${z.peakMrt?.valueC ?? '—'} °C at ${z.peakMrt?.time.slice(11, 16) ?? '—'}; ` +
        `peak UTCI ${z.peakUtci?.valueC ?? '—'} °C at ${z.peakUtci?.time.slice(11, 16) ?? '—'}`,
    );
    if (hot.length) lines.push(`    hours per seat: ${hot.join(', ')}`);
  }
  for (const m of s.materials) lines.push(`  ${m.material}: peak surface ${m.peakSurfaceTemp?.valueC ?? '—'} °C at ${m.peakSurfaceTemp?.time.slice(11, 16) ?? '—'} (${m.peakSurfaceTemp?.patch ?? ''})`);
  lines.push('');
  return lines.join('\n');
}
