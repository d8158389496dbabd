import type { OptionSpec, ParsedArgs } from './args.ts';

/** Where a command writes: results and --json to `out`, progress and messages to `err`. */
export interface CliIo {
  out: (text: string) => void;
  err: (text: string) => void;
  /** Working directory for relative paths. */
  cwd: string;
  /** True when stderr is a terminal (progress bar) rather than a pipe (plain lines). */
  errIsTty: boolean;
}

export interface Command {
  name: string;
  summary: string;
  usage: string;
  options: Record<string, OptionSpec>;
  /** Longer help text shown after the options. */
  details?: string;
  run(args: ParsedArgs, io: CliIo): Promise<number>;
}
