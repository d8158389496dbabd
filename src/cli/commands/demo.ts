import type { Command } from '../command.ts';
import { fileURLToPath } from 'node:url';
import path from 'node:path';
import { auditToFolder } from './audit.ts';

/** The built-in demo project (an invented café terrace). */
export const DEMO_PROJECT = fileURLToPath(new URL('../../../public/demo/project.json', import.meta.url));

export const demoCommand: Command = {
  name: 'demo',
  summary: 'Runs the built-in demo project (an invented café terrace on a hot design day)',
  usage: 'sunfacet demo [--out <dir>] [--workers <n>] [--json]',
  options: {
    out: { type: 'string', value: '<dir>', help: 'output folder (default demo-results)' },
    workers: { type: 'number', min: 0, max: 64, value: '<n>', help: 'tracer worker threads (0 = in this process)' },
    json: { type: 'boolean', help: 'print summary.json to stdout as well' },
  },
  details: 'The demo is an invented scenario: a café terrace at the foot of a block with a south-facing dark\nsteel cladding wall, a glazed neighbour across a lane, paving, a lawn strip and a roof terrace.\n`sunfacet day public/demo/project.json` prints the quick design-day table of the same site.',
  async run({ options }, io) {
    io.err(`[sunfacet] demo project: ${path.relative(io.cwd, DEMO_PROJECT) || DEMO_PROJECT}\n`);
    return auditToFolder(DEMO_PROJECT, String(options.out ?? 'demo-results'), io, { workers: options.workers as number | undefined, json: Boolean(options.json) });
  },
};
