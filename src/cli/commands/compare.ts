import path from 'node:path';
import type { Command } from '../command.ts';
import { runDesigns, compareDesigns, type Comparison } from '../../audit/options.ts';
import { summarizeResults } from '../../audit/summary.ts';
import { surfacesCsvChunks, sensorsCsvChunks } from '../../audit/csv.ts';
import { resultsJsonChunks, jsonChunks } from '../../audit/jsonStream.ts';
import { writeOutputsAtomically, type OutputFile } from '../output.ts';
import { loadFromCli, withRunContext } from './audit.ts';
import { InputError } from '../../physics/errors.ts';

export const compareCommand: Command = {
  name: 'compare',
  summary: "Audits the project's baseline and every design option and reports each option's change against the baseline",
  usage: 'sunfacet compare <project.json> --out <dir> [--mrt-threshold <°C>] [--workers <n>] [--json]',
  options: {
    out: { type: 'string', required: true, value: '<dir>', help: 'output folder: compare.json and one folder of results per design' },
    'mrt-threshold': { type: 'number', min: 0, max: 100, unit: '°C', value: '<°C>', help: 'MRT threshold for the hours-above figure (default 50)' },
    workers: { type: 'number', min: 0, max: 64, value: '<n>', help: 'tracer worker threads (0 = in this process)' },
    json: { type: 'boolean', help: 'print compare.json to stdout' },
  },
  details: 'A change is option minus baseline (MRT in K, hours per seat in h); means are over the zone\'s sensors\nand the daylight steps. An option that changes only materials reuses the baseline\'s geometry pass.',
  async run({ positional, options }, io) {
    const t0 = Date.now();
    const file = positional[0];
    if (!file) throw new InputError({ place: 'sunfacet compare', problem: 'missing the project file', expected: this.usage });
    const loaded = await loadFromCli(file, io);
    if (loaded.project.options.length === 0) {
      throw new InputError({ file, place: 'options', problem: 'the project has no design options to compare', expected: 'an "options": [{ "name": …, "devices": […], "materials": {…} }] list (README: design options)' });
    }
    const runs = await withRunContext(io, options.workers as number | undefined, (o) => runDesigns(loaded, o));
    if (!runs) {
      io.err('[sunfacet] compare cancelled; nothing written\n');
      return 130;
    }
    const threshold = (options['mrt-threshold'] as number | undefined) ?? undefined;
    const cmp = compareDesigns(runs, loaded.project.baselineName, threshold);
    const out = path.resolve(io.cwd, String(options.out));
    // One folder of results per design (each written atomically), then compare.json last: a
    // compare.json present means every design's folder is complete.
    for (const r of runs) {
      const summary = summarizeResults(r.results, { stepHours: Number(r.results.run.stepHours), ...(threshold === undefined ? {} : { mrtThresholdC: threshold }) });
      const files: OutputFile[] = [
        { name: 'results.json', chunks: resultsJsonChunks(r.results) },
        { name: 'summary.json', chunks: jsonChunks(summary) },
        { name: 'surfaces.csv', chunks: surfacesCsvChunks(r.results) },
        { name: 'sensors.csv', chunks: sensorsCsvChunks(r.results) },
        { name: 'run.json', chunks: [JSON.stringify(r.record, null, 1) + '\n'] },
      ];
      await writeOutputsAtomically(path.join(out, safeName(r.name)), files);
    }
    await writeOutputsAtomically(out, [{ name: 'compare.json', chunks: jsonChunks(cmp) }]);
    io.err(`[sunfacet] wrote compare.json and ${runs.length} result folders to ${path.relative(io.cwd, out) || '.'} in ${((Date.now() - t0) / 1000).toFixed(1)} s\n`);
    io.out(options.json ? JSON.stringify(cmp, null, 1) + '\n' : formatComparison(cmp));
    return 0;
  },
};

/** A folder name for a design: letters, digits, dash and underscore. */
export function safeName(name: string): string {
  return name.replace(/[^A-Za-z0-9_-]+/g, '-').replace(/^-+|-+$/g, '') || 'design';
}

export function formatComparison(c: Comparison): string {
  const lines = [`${c.project}: each option against "${c.baseline}" (option − baseline; MRT in K, hours per seat)`];
  const heat = ['extreme-heat', 'very-strong-heat', 'strong-heat'];
  for (const o of c.options) {
    lines.push(`  ${o.name}${o.reusedGeometry ? ' (materials only; geometry reused)' : ''}`);
    for (const z of o.zones) {
      const strong = heat.reduce((a, k) => a + (z.hoursByCategoryChange[k] ?? 0), 0);
      const sign = (x: number) => (x > 0 ? '+' : '') + x.toFixed(1);
      lines.push(`    ${z.name}: mean daylight MRT ${sign(z.meanMrtChangeK)} K, peak MRT ${sign(z.peakMrtChangeK)} K, strong heat stress or worse ${sign(strong)} h, MRT above ${c.mrtThresholdC} °C ${sign(z.mrtHoursAboveChange)} h`);
    }
  }
  lines.push('');
  return lines.join('\n');
}
