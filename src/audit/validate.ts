/**
 * Small validators for JSON input: each checks one value at a key path and throws an InputError
 * naming the file, the path (e.g. `zones[1].spacingM`), the value and what was expected.
 */
import { InputError } from '../physics/errors.ts';

export class Validator {
  constructor(readonly file: string) {}

  fail(path: string, problem: string, expected: string, value?: unknown): never {
    throw new InputError({ file: this.file, place: path, problem, expected, value });
  }

  object(v: unknown, path: string): Record<string, unknown> {
    if (typeof v !== 'object' || v === null || Array.isArray(v)) this.fail(path, 'wrong type', 'an object', v);
    return v as Record<string, unknown>;
  }

  /** Refuses keys not in `known` (catches typos), suggesting the closest known key. */
  keys(obj: Record<string, unknown>, path: string, known: readonly string[]): void {
    for (const k of Object.keys(obj)) {
      if (!known.includes(k)) {
        const near = closest(k, known);
        this.fail(join(path, k), 'unknown key', `one of ${known.join(', ')}${near ? ` (did you mean "${near}"?)` : ''}`);
      }
    }
  }

  number(v: unknown, path: string, opts: { min?: number; max?: number; exclusiveMin?: boolean; integer?: boolean; unit?: string } = {}): number {
    const unit = opts.unit ? ` ${opts.unit}` : '';
    const range =
      opts.min !== undefined && opts.max !== undefined
        ? `a${opts.integer ? 'n integer' : ' number'} in ${opts.exclusiveMin ? '(' : '['}${opts.min}, ${opts.max}]${unit}`
        : opts.min !== undefined
          ? `a${opts.integer ? 'n integer' : ' number'} ${opts.exclusiveMin ? '>' : '≥'} ${opts.min}${unit}`
          : `a number${unit}`;
    if (typeof v !== 'number' || !Number.isFinite(v)) this.fail(path, 'not a finite number', range, v);
    const n = v as number;
    if (opts.integer && !Number.isInteger(n)) this.fail(path, 'not an integer', range, v);
    if (opts.min !== undefined && (opts.exclusiveMin ? n <= opts.min : n < opts.min)) this.fail(path, 'outside the valid range', range, v);
    if (opts.max !== undefined && n > opts.max) this.fail(path, 'outside the valid range', range, v);
    return n;
  }

  string(v: unknown, path: string, expected = 'a non-empty string'): string {
    if (typeof v !== 'string' || v.trim() === '') this.fail(path, 'not a non-empty string', expected, v);
    return v as string;
  }

  oneOf<T extends string>(v: unknown, path: string, options: readonly T[]): T {
    if (typeof v !== 'string' || !options.includes(v as T)) this.fail(path, 'not an accepted value', `one of ${options.map((o) => JSON.stringify(o)).join(', ')}`, v);
    return v as T;
  }

  array(v: unknown, path: string, opts: { minLength?: number } = {}): unknown[] {
    if (!Array.isArray(v)) this.fail(path, 'wrong type', 'an array', v);
    const a = v as unknown[];
    if (opts.minLength !== undefined && a.length < opts.minLength) this.fail(path, 'too few entries', `at least ${opts.minLength}`, a.length);
    return a;
  }
}

export function join(path: string, key: string | number): string {
  if (typeof key === 'number') return `${path}[${key}]`;
  return path === '' ? key : `${path}.${key}`;
}

function closest(word: string, options: readonly string[]): string | undefined {
  let best: string | undefined;
  let bestD = Infinity;
  for (const o of options) {
    const d = editDistance(word.toLowerCase(), o.toLowerCase());
    if (d < bestD) {
      bestD = d;
      best = o;
    }
  }
  return bestD <= Math.max(2, Math.floor(word.length / 3)) ? best : undefined;
}

function editDistance(a: string, b: string): number {
  const row = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let prev = row[0]!;
    row[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const tmp = row[j]!;
      row[j] = Math.min(row[j]! + 1, row[j - 1]! + 1, prev + (a[i - 1] === b[j - 1] ? 0 : 1));
      prev = tmp;
    }
  }
  return row[b.length]!;
}
