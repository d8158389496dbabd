/**
 * The `sunfacet` command: dispatches to one command module per verb. Exit codes (DESIGN §4):
 * 0 success, 1 computation failure, 2 bad input (the message names the file, line or key, and what
 * was expected).
 */
import { parseArgs, formatOptionsHelp } from './args.ts';
import type { CliIo, Command } from './command.ts';
import { InputError } from '../physics/errors.ts';
import { sunCommand } from './commands/sun.ts';
import { comfortCommand } from './commands/comfort.ts';
import { demoCommand } from './commands/demo.ts';
import { dayCommand } from './commands/day.ts';
import { auditCommand } from './commands/audit.ts';
import { mergeCommand } from './commands/merge.ts';
import { reportCommand } from './commands/report.ts';
import { compareCommand } from './commands/compare.ts';

export const COMMANDS: Command[] = [auditCommand, compareCommand, mergeCommand, reportCommand, demoCommand, dayCommand, sunCommand, comfortCommand];

const CAUTION =
  'Sunfacet screens designs; it does not certify them. Results depend on the inputs and the model\n' +
  'assumptions. Heat stress can harm people: follow local heat guidance for events and workers.\n' +
  'Glare that can affect drivers or pilots needs a study by a licensed professional under local rules.\n' +
  'Defer to local codes and licensed practice.';

export function mainHelp(): string {
  const width = Math.max(...COMMANDS.map((c) => c.name.length));
  return [
    'sunfacet — radiant heat and reflected glare on terraces, patios and plazas, from a massing model',
    '',
    'Usage: sunfacet <command> [options]     (sunfacet <command> --help for its options)',
    '',
    'Commands:',
    ...COMMANDS.map((c) => `  ${c.name.padEnd(width)}  ${c.summary}`),
    '',
    'Results go to files or stdout (--json for machine output); progress and messages to stderr.',
    'Exit codes: 0 success, 1 computation failure, 2 bad input.',
    '',
    CAUTION,
    '',
  ].join('\n');
}

export function commandHelp(c: Command): string {
  return [`Usage: ${c.usage}`, '', c.summary, '', 'Options:', formatOptionsHelp(c.options), '  --help                       this text', c.details ? '\n' + c.details : '', ''].join('\n');
}

export function defaultIo(): CliIo {
  return {
    out: (t) => process.stdout.write(t),
    err: (t) => process.stderr.write(t),
    cwd: process.cwd(),
    errIsTty: Boolean(process.stderr.isTTY),
  };
}

export async function main(argv: string[], io: CliIo = defaultIo()): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
    io.out(mainHelp());
    return 0;
  }
  if (name === '--version') {
    io.out('sunfacet 0.1.0\n');
    return 0;
  }
  const command = COMMANDS.find((c) => c.name === name);
  if (!command) {
    io.err(`sunfacet: unknown command ${JSON.stringify(name)}; expected one of ${COMMANDS.map((c) => c.name).join(', ')} (sunfacet --help)\n`);
    return 2;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    io.out(commandHelp(command));
    return 0;
  }
  try {
    const parsed = parseArgs(rest, command.options, command.name);
    return await command.run(parsed, io);
  } catch (e) {
    if (e instanceof InputError) {
      io.err(`sunfacet ${command.name}: ${e.message}\n`);
      return 2;
    }
    io.err(`sunfacet ${command.name}: failed: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`);
    return 1;
  }
}

export { CAUTION };
