/**
 * The project's own error type. Every error caused by what a user supplied (a file, an argument, a
 * project key, a value outside a model's validity range) is an `InputError` whose message names
 * the file (when there is one), the place in it (line, field, key path, argument) and what was
 * expected. The command line maps `InputError` to exit code 2; anything else is a computation
 * failure (exit 1).
 *
 * It lives in `src/physics` because the physics core is the bottom of the import graph and its
 * range checks throw it too; every other folder imports it from here.
 */
export interface InputErrorParts {
  /** What was wrong, in plain words ("not a number", "outside the valid range"). */
  problem: string;
  /** The file the input came from, if any (a path or file name). */
  file?: string;
  /** Where in the file or call: "line 12, field 7 (dry bulb)", "zones[0].spacingM", "--lat". */
  place?: string;
  /** What would have been accepted ("a number in [-90, 90]"). */
  expected?: string;
  /** The offending value, shown as given. */
  value?: unknown;
}

export class InputError extends Error {
  readonly file: string | undefined;
  readonly place: string | undefined;
  readonly expected: string | undefined;
  readonly problem: string;

  constructor(parts: InputErrorParts) {
    super(formatInputError(parts));
    this.name = 'InputError';
    this.file = parts.file;
    this.place = parts.place;
    this.expected = parts.expected;
    this.problem = parts.problem;
  }
}

/** "file: place: problem (got X); expected Y" — the one format every bad-input message uses. */
export function formatInputError(parts: InputErrorParts): string {
  const where = [parts.file, parts.place].filter((s) => s !== undefined && s !== '').join(': ');
  const got = parts.value === undefined ? '' : ` (got ${showValue(parts.value)})`;
  const want = parts.expected === undefined ? '' : `; expected ${parts.expected}`;
  return `${where === '' ? '' : where + ': '}${parts.problem}${got}${want}`;
}

function showValue(value: unknown): string {
  if (typeof value === 'string') return JSON.stringify(value.length > 60 ? value.slice(0, 57) + '...' : value);
  if (typeof value === 'number' || typeof value === 'boolean' || value === null) return String(value);
  try {
    const s = JSON.stringify(value);
    return s === undefined ? String(value) : s.length > 60 ? s.slice(0, 57) + '...' : s;
  } catch {
    return String(value);
  }
}

/**
 * Throws an InputError unless `lo <= value <= hi` (bounds inclusive unless stated) and finite.
 * Used by public physics functions to refuse inputs outside their model's validity.
 */
export function requireInRange(
  value: number,
  lo: number,
  hi: number,
  place: string,
  unit = '',
  opts: { exclusive?: boolean; source?: string } = {},
): void {
  const ok = Number.isFinite(value) && (opts.exclusive ? value > lo && value < hi : value >= lo && value <= hi);
  if (!ok) {
    const br = opts.exclusive ? ['(', ')'] : ['[', ']'];
    throw new InputError({
      problem: Number.isFinite(value) ? 'outside the valid range' : 'not a finite number',
      place,
      value,
      expected: `a value in ${br[0]}${lo}, ${hi}${br[1]}${unit ? ' ' + unit : ''}${opts.source ? ' (' + opts.source + ')' : ''}`,
    });
  }
}
