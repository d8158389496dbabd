/**
 * `sunfacet report <results-dir>`: the review report (HTML, and PDF through headless Chromium) and
 * the results glTF, from an audit's output folder.
 *
 * The results hold patch centroids, not triangles, so the glTF export re-creates the patch
 * geometry by running the model preparation (`prepareModel`) on the project file given with
 * `--project`, and refuses a project whose model hash or patches differ from the results'.
 */
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import type { Command, CliIo } from '../command.ts';
import type { Results } from '../../audit/results.ts';
import type { Summary } from '../../audit/summary.ts';
import { summarizeResults } from '../../audit/summary.ts';
import type { RunRecord } from '../../audit/pipeline.ts';
import { prepareModel } from '../../audit/stages/model.ts';
import { InputError } from '../../physics/errors.ts';
import { buildReportHtml, type DesignOptionInput } from '../../report/html.ts';
import { safeName } from './compare.ts';
import { PLAN_METRICS, type PlanMetricId } from '../../report/zoneData.ts';
import { resultsGlb, pickStep, SURFACE_METRICS, type SurfaceMetricId } from '../../report/gltfResults.ts';
import type { ScaleId } from '../../report/palette.ts';
import { writeOutputsAtomically } from '../output.ts';
import { loadFromCli } from './audit.ts';
import { htmlToPdf } from '../pdf.ts';

const SCALES: readonly ScaleId[] = ['magma', 'viridis', 'cividis'];

export const reportCommand: Command = {
  name: 'report',
  summary: 'Writes the review report (HTML, optionally PDF) and a results glTF from an audit output folder',
  usage: 'sunfacet report <results-dir> [--out report.html] [--pdf] [--plan heatHours|peakMrt|skyView] [--scale magma|viridis|cividis] [--gltf out.glb --project <project.json> [--metric surfaceTempC|incidentShortwaveWm2|longwaveEmissionWm2] [--time <iso>]]',
  options: {
    out: { type: 'string', value: '<file.html>', help: 'the report as one self-contained HTML file' },
    pdf: { type: 'boolean', help: 'also print it to PDF (same name, .pdf) with headless Chromium' },
    plan: { type: 'string', value: 'heatHours|peakMrt|skyView', help: 'what colours the zone plans (default heatHours: hours of strong heat stress or worse)' },
    scale: { type: 'string', value: 'magma|viridis|cividis', help: 'colour scale of plans and glTF (default magma)' },
    gltf: { type: 'string', value: '<file.glb>', help: 'the model coloured by a surface result at one step (COLOR_0; values in extras)' },
    project: { type: 'string', value: '<project.json>', help: 'the project the results came from (needed by --gltf to re-create the patch triangles)' },
    metric: { type: 'string', value: 'surfaceTempC|incidentShortwaveWm2|longwaveEmissionWm2', help: 'surface result for --gltf (default surfaceTempC)' },
    time: { type: 'string', value: '<iso>', help: 'step for --gltf, e.g. 2026-07-15T15:00:00+02:00 (default: the step with the highest area-weighted mean)' },
  },
  details: 'Reads results.json, summary.json (recomputed when missing) and run.json from the folder; a\n`sunfacet compare` folder (compare.json) gives the baseline plus a design-options page.\nThe report carries the cautions: it screens designs, it does not certify them.',
  async run({ positional, options }, io) {
    const dir = positional[0];
    if (!dir) {
      io.err(`sunfacet report: missing the results folder; usage: ${this.usage}\n`);
      return 2;
    }
    const out = options.out === undefined ? undefined : String(options.out);
    const gltf = options.gltf === undefined ? undefined : String(options.gltf);
    if (!out && !gltf) throw new InputError({ place: '--out', problem: 'nothing to write', expected: '--out <file.html> and/or --gltf <file.glb>' });
    if (options.pdf && !out) throw new InputError({ place: '--pdf', problem: '--pdf needs --out', expected: '--out <file.html> (the PDF is written beside it)' });
    const plan = String(options.plan ?? 'heatHours');
    if (!(plan in PLAN_METRICS)) throw new InputError({ place: '--plan', problem: 'unknown plan metric', value: plan, expected: Object.keys(PLAN_METRICS).join(', ') });
    const scale = String(options.scale ?? 'magma') as ScaleId;
    if (!SCALES.includes(scale)) throw new InputError({ place: '--scale', problem: 'unknown colour scale', value: scale, expected: SCALES.join(', ') });
    const designs = await readCompareFolder(path.resolve(io.cwd, dir), dir);
    const { results, summary, run } = designs ? designs.baseline : await readResultsFolder(path.resolve(io.cwd, dir), dir);
    if (out) await writeReport(results, summary, run, path.resolve(io.cwd, out), Boolean(options.pdf), plan as PlanMetricId, scale, io, designs?.options ?? [], designs?.baselineName);
    if (gltf) {
      if (options.project === undefined) throw new InputError({ place: '--project', problem: '--gltf needs the project file', expected: 'the project .json the results were computed from (its model gives the patch triangles)' });
      const metric = String(options.metric ?? 'surfaceTempC');
      if (!(metric in SURFACE_METRICS)) throw new InputError({ place: '--metric', problem: 'unknown surface metric', value: metric, expected: Object.keys(SURFACE_METRICS).join(', ') });
      await writeGltf(results, String(options.project), path.resolve(io.cwd, gltf), metric as SurfaceMetricId, options.time === undefined ? undefined : String(options.time), scale, io);
    }
    return 0;
  },
};

async function readJson<T>(file: string, shown: string, required: boolean): Promise<T | null> {
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (e) {
    if (!required && (e as { code?: string }).code === 'ENOENT') return null;
    throw new InputError({ file: shown, problem: (e as { code?: string }).code === 'ENOENT' ? 'file not found' : `cannot read (${String(e)})`, expected: 'an audit output folder (sunfacet audit … --out <dir>)' });
  }
  try {
    return JSON.parse(text) as T;
  } catch (e) {
    throw new InputError({ file: shown, place: 'JSON', problem: `not valid JSON (${e instanceof Error ? e.message : String(e)})`, expected: 'the file as the audit wrote it' });
  }
}

/** Reads results.json, summary.json (recomputed when missing) and run.json (optional) of an audit folder. */
export async function readResultsFolder(abs: string, shown: string): Promise<{ results: Results; summary: Summary; run: RunRecord | null }> {
  const results = (await readJson<Results>(path.join(abs, 'results.json'), path.join(shown, 'results.json'), true))!;
  if (results.sunfacet !== 1 || !Array.isArray(results.times) || !Array.isArray(results.zones) || !Array.isArray(results.surfaces)) {
    throw new InputError({ file: path.join(shown, 'results.json'), place: 'sunfacet', problem: 'not Sunfacet results of contract version 1', expected: '{ "sunfacet": 1, "times": [...], "zones": [...], "surfaces": [...] }' });
  }
  const summary = (await readJson<Summary>(path.join(abs, 'summary.json'), path.join(shown, 'summary.json'), false)) ?? summarizeResults(results, { stepHours: Number(results.run.stepHours) });
  const run = await readJson<RunRecord>(path.join(abs, 'run.json'), path.join(shown, 'run.json'), false);
  return { results, summary, run };
}

async function writeFiles(files: { abs: string; data: string | Uint8Array }[]): Promise<void> {
  for (const f of files) await writeOutputsAtomically(path.dirname(f.abs), [{ name: path.basename(f.abs), chunks: [f.data] }]);
}

/**
 * A `sunfacet compare` output folder (compare.json + one results folder per design): the baseline's
 * results and the options' for the report's options page; null for a plain audit folder.
 */
async function readCompareFolder(abs: string, shown: string): Promise<{ baseline: Awaited<ReturnType<typeof readResultsFolder>>; options: DesignOptionInput[]; baselineName: string } | null> {
  const cmp = await readJson<{ sunfacetCompare?: number; baseline: string; options: { name: string }[] }>(path.join(abs, 'compare.json'), path.join(shown, 'compare.json'), false);
  if (!cmp) return null;
  const sub = (name: string) => readResultsFolder(path.join(abs, safeName(name)), path.join(shown, safeName(name)));
  const baseline = await sub(cmp.baseline);
  const options: DesignOptionInput[] = [];
  for (const o of cmp.options) {
    const r = await sub(o.name);
    options.push({ name: o.name, results: r.results, summary: r.summary });
  }
  return { baseline, options, baselineName: cmp.baseline };
}

async function writeReport(results: Results, summary: Summary, run: RunRecord | null, outAbs: string, pdf: boolean, plan: PlanMetricId, scale: ScaleId, io: CliIo, options: DesignOptionInput[] = [], baselineName?: string): Promise<void> {
  const html = await buildReportHtml({ results, summary, run, planMetric: plan, scale, options, ...(baselineName ? { baselineName } : {}) });
  const files: { abs: string; data: string | Uint8Array }[] = [{ abs: outAbs, data: html }];
  if (pdf) {
    io.err('[sunfacet] printing the report to PDF (headless Chromium)\n');
    const r = await htmlToPdf(html, `${results.project} · Sunfacet screening report · not a certification`);
    for (const e of r.consoleErrors) io.err(`warning: the report page logged an error: ${e}\n`);
    files.push({ abs: outAbs.replace(/\.html?$/i, '') + '.pdf', data: r.pdf });
  }
  await writeFiles(files);
  io.err(`[sunfacet] wrote ${files.map((f) => path.relative(io.cwd, f.abs) || f.abs).join(' and ')}\n`);
}

async function writeGltf(results: Results, projectFile: string, outAbs: string, metric: SurfaceMetricId, time: string | undefined, scale: ScaleId, io: CliIo): Promise<void> {
  const loaded = await loadFromCli(projectFile, io);
  const model = await prepareModel(loaded);
  const hash = (await import('../../audit/pipeline.ts')).fnv1a32Hex(model.modelBytes);
  if (results.run.modelHashFnv1a32 !== undefined && results.run.modelHashFnv1a32 !== hash) {
    throw new InputError({ file: projectFile, place: 'model.file', problem: `the model's hash is ${hash} but the results were computed from ${String(results.run.modelHashFnv1a32)}`, expected: 'the project and model file the results came from' });
  }
  const stepIndex = pickStep(results, metric, time);
  const bytes = resultsGlb(model.patches, results, { metric, stepIndex, scale });
  await writeFiles([{ abs: outAbs, data: bytes }]);
  io.err(`[sunfacet] wrote ${path.relative(io.cwd, outAbs) || outAbs}: ${SURFACE_METRICS[metric].label} at ${results.times[stepIndex]}, ${model.patches.scene.indices.length / 3} triangles\n`);
}
