import type { Command } from '../command.ts';
import { fileURLToPath } from 'node:url';
import path from 'node:path';
import { printDayTable } from './day.ts';

/** The built-in demo project (an invented café terrace). */
export const DEMO_PROJECT = fileURLToPath(new URL('../../../public/demo/project.json', import.meta.url));

export const demoCommand: Command = {
  name: 'demo',
  summary: 'Runs the built-in demo project (an invented café terrace on a hot design day)',
  usage: 'sunfacet demo [--json]',
  options: {
    json: { type: 'boolean', help: 'print the rows as JSON' },
  },
  async run({ options }, io) {
    io.err(`[sunfacet] demo project: ${path.relative(io.cwd, DEMO_PROJECT) || DEMO_PROJECT}\n`);
    return printDayTable(DEMO_PROJECT, { ...io, cwd: path.dirname(DEMO_PROJECT) }, options);
  },
};
