/**
 * Small helpers shared by the weather-file readers: calendar arithmetic without `Date` (so years
 * below 100 are not remapped and nothing is allocated per record), strict number parsing, and the
 * column store with its missing/invalid bookkeeping.
 */
import { WEATHER_FIELDS, WEATHER_FIELD_RANGES } from './types.ts';
import type { WeatherField } from './types.ts';

export const MS_PER_MINUTE = 60_000;
export const MS_PER_HOUR = 3_600_000;
export const MS_PER_DAY = 86_400_000;

/** Gregorian leap year. */
export function isLeapYear(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
}

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31] as const;

/** Days in `month` (1..12) of `year`; Feb has 29 in leap years. */
export function daysInMonth(year: number, month: number): number {
  if (month === 2) return isLeapYear(year) ? 29 : 28;
  return DAYS_IN_MONTH[month - 1] ?? 0;
}

/**
 * Days from 1970-01-01 to the proleptic Gregorian date y-m-d (m 1..12), valid for any integer
 * year. Algorithm "days_from_civil" of H. Hinnant, "chrono-Compatible Low-Level Date Algorithms"
 * (2013), howardhinnant.github.io/date_algorithms.html.
 */
export function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400; // [0, 399]
  const mp = (month + 9) % 12; // March = 0
  const doy = Math.floor((153 * mp + 2) / 5) + day - 1; // [0, 365]
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy; // [0, 146096]
  return era * 146097 + doe - 719468;
}

const NUMBER_RE = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * The decimal number written in `s` (surrounding spaces allowed), or NaN when `s` is anything
 * else — including "", "NaN", "Infinity", hex and other forms `Number()` would accept.
 */
export function parseDecimal(s: string): number {
  const t = s.trim();
  return NUMBER_RE.test(t) ? Number(t) : NaN;
}

/** Text with a leading byte-order mark removed, split on LF, CRLF or CR. */
export function splitLines(text: string): string[] {
  const t = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  return t.split(/\r\n|\n|\r/);
}

export function fieldRecord<T>(value: T): Record<WeatherField, T> {
  const r = {} as Record<WeatherField, T>;
  for (const f of WEATHER_FIELDS) r[f] = value;
  return r;
}

/** The per-quantity columns of a series under construction. */
export type FieldColumns = Record<WeatherField, Float64Array>;

export function allocColumns(count: number): FieldColumns {
  const r = {} as FieldColumns;
  for (const f of WEATHER_FIELDS) r[f] = new Float64Array(count);
  return r;
}

/**
 * Bookkeeping of missing and out-of-range values while the columns are filled: `store` writes a
 * value or NaN and counts; `warnings` summarises each quantity's invalid values with the first line.
 */
export class ColumnFiller {
  readonly missing = fieldRecord(0);
  readonly invalid = fieldRecord(0);
  private readonly firstInvalidLine = fieldRecord(0);
  private readonly firstInvalidValue = fieldRecord(0);

  constructor(readonly columns: FieldColumns) {}

  /** Records a missing entry (NaN). */
  storeMissing(field: WeatherField, index: number): void {
    this.columns[field][index] = NaN;
    this.missing[field]++;
  }

  /** Stores `value` if inside the field's valid range, else NaN counted as invalid. */
  store(field: WeatherField, index: number, value: number, lineNo: number): void {
    const r = WEATHER_FIELD_RANGES[field];
    const ok = r.exclusive ? value > r.min && value < r.max : value >= r.min && value <= r.max;
    if (ok) {
      this.columns[field][index] = value + 0; // + 0 turns a written "-0.00" into 0
      return;
    }
    this.columns[field][index] = NaN;
    if (this.invalid[field]++ === 0) {
      this.firstInvalidLine[field] = lineNo;
      this.firstInvalidValue[field] = value;
    }
  }

  /** One warning per quantity with out-of-range values. */
  invalidWarnings(label: (field: WeatherField) => string): string[] {
    const out: string[] = [];
    for (const f of WEATHER_FIELDS) {
      const n = this.invalid[f];
      if (n === 0) continue;
      const r = WEATHER_FIELD_RANGES[f];
      const range = `${r.exclusive ? '(' : '['}${r.min}, ${r.max}${r.exclusive ? ')' : ']'}`;
      out.push(
        `${n} value(s) of ${label(f)} outside the valid range ${range} were set to missing ` +
          `(first on line ${this.firstInvalidLine[f]}: ${this.firstInvalidValue[f]})`,
      );
    }
    return out;
  }
}

/**
 * Warnings about gaps in a strictly increasing series: steps longer than the interval.
 * `lineOf(i)` gives the line number of record i for the message.
 */
export function gapWarnings(timeMs: Float64Array, intervalMs: number, lineOf: (i: number) => number): string[] {
  let gaps = 0;
  let first = -1;
  let firstLenMs = 0;
  for (let i = 1; i < timeMs.length; i++) {
    const step = timeMs[i]! - timeMs[i - 1]!;
    if (step > intervalMs) {
      if (gaps++ === 0) {
        first = i;
        firstLenMs = step;
      }
    }
  }
  if (gaps === 0) return [];
  return [
    `${gaps} gap(s) in the time series (first before line ${lineOf(first)}: ` +
      `${(firstLenMs / MS_PER_HOUR).toFixed(2)} h between records, interval ${(intervalMs / MS_PER_MINUTE).toFixed(0)} min)`,
  ];
}

/** A wall-clock rendering of local time y-m-d h:mm for messages. */
export function showLocal(year: number, month: number, day: number, hour: number, minute: number): string {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${year}-${p(month)}-${p(day)} hour ${hour}${minute ? `:${p(minute)}` : ''}`;
}
