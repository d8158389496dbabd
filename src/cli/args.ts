/**
 * A small, strict argument parser for the `sunfacet` command: `--name value`, `--name=value` and
 * boolean `--flag`s, plus positional arguments. Unknown options are errors; every bad value is an
 * InputError naming the argument and the accepted range (exit code 2).
 */
import { InputError } from '../physics/errors.ts';

export interface OptionSpec {
  /** 'string' and 'number' take a value; 'boolean' is a flag. */
  type: 'string' | 'number' | 'boolean';
  /** For numbers: inclusive bounds, shown in the message when violated. */
  min?: number;
  max?: number;
  unit?: string;
  required?: boolean;
  help: string;
  /** Shown in help as the value's placeholder, e.g. "<deg>". */
  value?: string;
}

export interface ParsedArgs {
  positional: string[];
  options: Record<string, string | number | boolean | undefined>;
}

export function parseArgs(argv: string[], specs: Record<string, OptionSpec>, command: string): ParsedArgs {
  const positional: string[] = [];
  const options: ParsedArgs['options'] = {};
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!;
    if (!arg.startsWith('--') || arg === '--') {
      if (arg !== '--') positional.push(arg);
      continue;
    }
    const eq = arg.indexOf('=');
    const name = eq >= 0 ? arg.slice(2, eq) : arg.slice(2);
    const spec = specs[name];
    if (!spec) {
      throw new InputError({
        place: `sunfacet ${command} ${arg}`,
        problem: 'unknown option',
        expected: `one of ${Object.keys(specs).map((k) => '--' + k).join(', ')}`,
      });
    }
    if (spec.type === 'boolean') {
      options[name] = true;
      continue;
    }
    const raw = eq >= 0 ? arg.slice(eq + 1) : argv[++i];
    if (raw === undefined || (eq < 0 && raw.startsWith('--') && !/^--?\d/.test(raw))) {
      throw new InputError({ place: `--${name}`, problem: 'missing value', expected: describe(spec) });
    }
    if (spec.type === 'number') {
      const v = Number(raw);
      const inRange = Number.isFinite(v) && raw.trim() !== '' && (spec.min === undefined || v >= spec.min) && (spec.max === undefined || v <= spec.max);
      if (!inRange) {
        throw new InputError({
          place: `--${name}`,
          problem: Number.isFinite(v) && raw.trim() !== '' ? 'outside the accepted range' : 'not a number',
          value: raw,
          expected: describe(spec),
        });
      }
      options[name] = v;
    } else {
      options[name] = raw;
    }
  }
  for (const [name, spec] of Object.entries(specs)) {
    if (spec.required && options[name] === undefined) {
      throw new InputError({ place: `--${name}`, problem: 'required option missing', expected: describe(spec) });
    }
  }
  return { positional, options };
}

function describe(spec: OptionSpec): string {
  if (spec.type === 'number') {
    const unit = spec.unit ? ' ' + spec.unit : '';
    if (spec.min !== undefined && spec.max !== undefined) return `a number in [${spec.min}, ${spec.max}]${unit}`;
    if (spec.min !== undefined) return `a number ≥ ${spec.min}${unit}`;
    if (spec.max !== undefined) return `a number ≤ ${spec.max}${unit}`;
    return `a number${unit}`;
  }
  return spec.value ?? 'a value';
}

export function formatOptionsHelp(specs: Record<string, OptionSpec>): string {
  const rows = Object.entries(specs).map(([name, s]) => {
    const left = `  --${name}${s.type === 'boolean' ? '' : ' ' + (s.value ?? (s.type === 'number' ? '<n>' : '<value>'))}`;
    const range = s.type === 'number' && (s.min !== undefined || s.max !== undefined) ? ` ${describe(s).replace(/^a number /, '')}` : '';
    return `${left.padEnd(28)} ${s.help}${range}${s.required ? ' (required)' : ''}`;
  });
  return rows.join('\n');
}
