import os from 'node:os';
import path from 'node:path';
import type { Command, CliIo } from '../command.ts';
import { readProjectFile } from '../files.ts';
import { loadProject } from '../../audit/load.ts';
import type { Summary } from '../../audit/summary.ts';
import { runAuditWithState, runAuditShard, type RunRecord, type AuditOptions } from '../../audit/pipeline.ts';
import type { LoadedProject } from '../../audit/load.ts';
import { InputError } from '../../physics/errors.ts';
import type { TraceExecutor } from '../../trace/pool/types.ts';
import type { Results } from '../../audit/results.ts';
import { summarizeResults } from '../../audit/summary.ts';
import { surfacesCsvChunks, sensorsCsvChunks } from '../../audit/csv.ts';
import { resultsJsonChunks, jsonChunks } from '../../audit/jsonStream.ts';
import { writeOutputsAtomically } from '../output.ts';
import { createProgressReporter } from '../progress.ts';
import { createNodeWorkerPool } from '../../trace/pool/nodeWorkers.ts';
import { createInProcessExecutor } from '../../trace/pool/workerPool.ts';

export const auditCommand: Command = {
  name: 'audit',
  summary: 'Audits a project: hourly façade heat and terrace MRT/UTCI → results.json, surfaces.csv, sensors.csv, summary.json',
  usage: 'sunfacet audit <project.json> --out <dir> [--workers <n>] [--shard K/N] [--json]',
  options: {
    out: { type: 'string', required: true, value: '<dir>', help: 'output folder (created; files replaced only when the run succeeds)' },
    shard: { type: 'string', value: 'K/N', help: 'trace only the K-th of N slices of patches and sensors; join with `sunfacet merge`' },
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
    if (options.shard !== undefined) return shardToFolder(file, String(options.out), String(options.shard), io, options.workers as number | undefined);
    return auditToFolder(file, String(options.out), io, { workers: options.workers as number | undefined, json: Boolean(options.json) });
  },
};

export function makeTracer(workers: number | undefined): TraceExecutor {
  const n = workers ?? Math.min(4, Math.max(1, os.availableParallelism?.() ?? os.cpus().length));
  return n === 0 ? createInProcessExecutor() : createNodeWorkerPool({ workers: n });
}

/** Runs `work` with a tracer, a progress reporter and Ctrl-C → abort; returns undefined when cancelled. */
export async function withRunContext<T>(io: CliIo, workers: number | undefined, work: (opts: AuditOptions, signal: AbortSignal) => Promise<T>): Promise<T | undefined> {
  const tracer = makeTracer(workers);
  const controller = new AbortController();
  const onSigint = () => {
    io.err('\n[sunfacet] stopping (Ctrl-C): no output will be written\n');
    controller.abort(new Error('cancelled by the user'));
  };
  process.once('SIGINT', onSigint);
  const progress = createProgressReporter(io);
  let stage = '';
  try {
    const r = await work({
      tracer,
      signal: controller.signal,
      onProgress: (p) => {
        if (p.stage !== stage) {
          stage = p.stage;
          progress.stage(p.stage, p.total);
        }
        progress.update(p.done);
      },
    }, controller.signal);
    progress.finish();
    return r;
  } catch (e) {
    progress.finish();
    if (controller.signal.aborted) return undefined;
    throw e;
  } finally {
    process.removeListener('SIGINT', onSigint);
    await tracer.close();
  }
}

export async function loadFromCli(file: string, io: CliIo): Promise<LoadedProject> {
  const { text, readRelative } = await readProjectFile(file, io.cwd);
  return loadProject(text, file, readRelative);
}

export function parseShard(text: string): { index: number; count: number } {
  const m = /^(\d+)\/(\d+)$/.exec(text.trim());
  const index = m ? Number(m[1]) : NaN, count = m ? Number(m[2]) : NaN;
  if (!m || count < 1 || index < 1 || index > count || count > 10000) {
    throw new InputError({ place: '--shard', problem: 'not a shard of the form K/N', value: text, expected: 'K/N with 1 ≤ K ≤ N ≤ 10000, e.g. 2/8' });
  }
  return { index, count };
}

export const PARTIAL_NAME = (k: number, n: number) => `geometry-${k}-of-${n}.sfgp`;

async function shardToFolder(file: string, outDir: string, shardText: string, io: CliIo, workers: number | undefined): Promise<number> {
  const shard = parseShard(shardText);
  const loaded = await loadFromCli(file, io);
  const r = await withRunContext(io, workers, (opts) => runAuditShard(loaded, shard, opts));
  if (!r) {
    io.err('[sunfacet] audit cancelled; nothing written\n');
    return 130;
  }
  const dir = path.resolve(io.cwd, outDir);
  const manifest = { sunfacetShard: 1, project: path.resolve(io.cwd, file), ...r.meta };
  await writeOutputsAtomically(dir, [
    { name: PARTIAL_NAME(shard.index, shard.count), chunks: [r.partial] },
    { name: `shard-${shard.index}-of-${shard.count}.json`, chunks: [JSON.stringify(manifest, null, 1) + '\n'] },
  ]);
  io.err(`[sunfacet] shard ${shard.index}/${shard.count}: wrote ${PARTIAL_NAME(shard.index, shard.count)} to ${path.relative(io.cwd, dir) || '.'}; join all shards with \`sunfacet merge\`\n`);
  return 0;
}

/** Writes the four result files (and run.json) atomically, then prints the summary. */
export async function writeResults(results: Results, record: RunRecord, outDir: string, io: CliIo, json: boolean, startedMs: number): Promise<void> {
  const summary = summarizeResults(results, { stepHours: Number(results.run.stepHours) });
  const dir = path.resolve(io.cwd, outDir);
  await writeOutputsAtomically(dir, [
    { name: 'results.json', chunks: resultsJsonChunks(results) },
    { name: 'surfaces.csv', chunks: surfacesCsvChunks(results) },
    { name: 'sensors.csv', chunks: sensorsCsvChunks(results) },
    { name: 'summary.json', chunks: jsonChunks(summary, undefined) },
    { name: 'run.json', chunks: [JSON.stringify(record, null, 1) + '\n'] },
  ]);
  io.err(`[sunfacet] wrote results.json, surfaces.csv, sensors.csv, summary.json (and run.json) to ${path.relative(io.cwd, dir) || '.'} in ${((Date.now() - startedMs) / 1000).toFixed(1)} s\n`);
  for (const w of results.warnings) io.err(`warning: ${w}\n`);
  io.out(json ? JSON.stringify(summary, null, 1) + '\n' : formatSummary(summary));
}

export async function auditToFolder(file: string, outDir: string, io: CliIo, opts: { workers?: number | undefined; json?: boolean }): Promise<number> {
  const t0 = Date.now();
  const loaded = await loadFromCli(file, io);
  const r = await withRunContext(io, opts.workers, (o) => runAuditWithState(loaded, o));
  if (!r) {
    io.err('[sunfacet] audit cancelled; nothing written\n');
    return 130;
  }
  await writeResults(r.results, r.record, outDir, io, Boolean(opts.json), t0);
  return 0;
}

/** A few lines a person reads after a run. */
export function formatSummary(s: Summary): string {
  const lines: string[] = [`${s.project}`];
  // Within one day the clock time says enough; over several days show the date too.
  const oneDay = (s.period.first ?? '').slice(0, 10) === (s.period.last ?? '').slice(0, 10);
  const when = (t: string | undefined) => (t === undefined ? '—' : oneDay ? t.slice(11, 16) : t.slice(0, 16).replace('T', ' '));
  for (const z of s.zones) {
    const hot = z.categoryHours.filter((c) => c.meanHours > 0 && /heat/.test(c.id)).map((c) => `${c.label} ${c.meanHours} h`);
    lines.push(
      `  ${z.name}: ${z.sensors} sensors; peak MRT ${z.peakMrt?.valueC ?? '—'} °C at ${when(z.peakMrt?.time)}; ` +
        `peak UTCI ${z.peakUtci?.valueC ?? '—'} °C at ${when(z.peakUtci?.time)}`,
    );
    if (hot.length) lines.push(`    hours per seat: ${hot.join(', ')}`);
  }
  for (const m of s.materials) lines.push(`  ${m.material}: peak surface ${m.peakSurfaceTemp?.valueC ?? '—'} °C at ${when(m.peakSurfaceTemp?.time)} (${m.peakSurfaceTemp?.patch ?? ''})`);
  lines.push('  (screening figures, not a certification: heat stress can harm people — follow local heat guidance; see `sunfacet --help`)', '');
  return lines.join('\n');
}
