/**
 * Reader for Sunfacet's own plain weather CSV: text in, `WeatherSeries` out. No file access here.
 *
 * Format: lines starting with `#` and blank lines are skipped; the first other line is a header
 * of column names, then one row per record, cells separated by commas (a cell may be wrapped in
 * double quotes; commas inside cells are not supported). Columns:
 *
 * | column                  | meaning                                   | unit  |
 * | ----------------------- | ----------------------------------------- | ----- |
 * | `time` (required)       | ISO 8601 date-time with offset or `Z`     | -     |
 * | `airTempC` (required)   | air (dry bulb) temperature                | °C    |
 * | `dewPointC`             | dew point temperature                     | °C    |
 * | `relativeHumidityPct`   | relative humidity                         | %     |
 * | `pressurePa`            | station air pressure                      | Pa    |
 * | `ghiWm2`, `dniWm2`, `dhiWm2` | global horizontal, direct normal, diffuse horizontal irradiance, interval means | W/m² |
 * | `horizontalInfraredWm2` | longwave irradiance from the sky on a horizontal surface | W/m² |
 * | `windMs`                | wind speed at 10 m                        | m/s   |
 * | `windDirectionDeg`      | direction the wind comes from, clockwise from north | deg |
 *
 * An empty cell is missing (NaN). Unknown columns are ignored with a warning. Humidity is not
 * derived here when only one of dew point / relative humidity is given: that column stays NaN
 * and the audit derives it (src/physics/humidity.ts).
 */
import { InputError } from '../errors.ts';
import {
  ColumnFiller,
  MS_PER_MINUTE,
  allocColumns,
  daysFromCivil,
  daysInMonth,
  fieldRecord,
  gapWarnings,
  parseDecimal,
  splitLines,
} from './common.ts';
import type { TimeStampMeaning, WeatherField, WeatherLocation, WeatherSeries } from './types.ts';

/** CSV column name → series quantity. */
export const WEATHER_CSV_COLUMNS = {
  airTempC: 'dryBulbC',
  dewPointC: 'dewPointC',
  relativeHumidityPct: 'relativeHumidityPct',
  pressurePa: 'pressurePa',
  horizontalInfraredWm2: 'horizontalInfraredWm2',
  ghiWm2: 'ghiWm2',
  dniWm2: 'dniWm2',
  dhiWm2: 'dhiWm2',
  windMs: 'windSpeedMs',
  windDirectionDeg: 'windDirectionDeg',
} as const satisfies Record<string, WeatherField>;

export type WeatherCsvColumn = keyof typeof WEATHER_CSV_COLUMNS;

/** Options of `parseWeatherCsv`. */
export interface WeatherCsvOptions {
  /** The site, since the CSV does not carry it. Default: none (`location: null`). */
  location?: WeatherLocation;
  /** Length of the interval each row stands for [min]. Default: the step between the first two rows (60 for a single row). */
  intervalMinutes?: number;
  /** Where in its interval a row's `time` sits. Default `'interval-midpoint'` (DESIGN §3). */
  timeStampMeaning?: TimeStampMeaning;
}

const ISO_RE = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(\.\d{1,9})?)?(Z|z|[+-]\d{2}(?::?\d{2})?)$/;

/**
 * UTC epoch milliseconds of an ISO 8601 date-time with an explicit offset (`Z`, `±hh`, `±hhmm`,
 * `±hh:mm`), or NaN when `s` is not one or names an impossible date/time.
 *
 * @param s e.g. "2026-07-21T14:00:00+02:00" [-]
 * @returns [ms since 1970-01-01T00:00Z]
 * @example isoWithOffsetToMs('2026-07-21T14:00:00+02:00') // Date.UTC(2026, 6, 21, 12)
 */
export function isoWithOffsetToMs(s: string): number {
  const m = ISO_RE.exec(s.trim());
  if (!m) return NaN;
  const year = Number(m[1]);
  const month = Number(m[2]);
  const day = Number(m[3]);
  const hour = Number(m[4]);
  const minute = Number(m[5]);
  const second = m[6] === undefined ? 0 : Number(m[6]);
  const fracMs = m[7] === undefined ? 0 : Number(m[7]) * 1000;
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return NaN;
  if (hour > 23 || minute > 59 || second > 59) return NaN;
  let offsetMin = 0;
  const off = m[8]!;
  if (off !== 'Z' && off !== 'z') {
    const sign = off[0] === '-' ? -1 : 1;
    const digits = off.slice(1).replace(':', '');
    const oh = Number(digits.slice(0, 2));
    const om = digits.length > 2 ? Number(digits.slice(2)) : 0;
    if (oh > 14 || om > 59) return NaN;
    offsetMin = sign * (oh * 60 + om);
  }
  const localMin = daysFromCivil(year, month, day) * 1440 + hour * 60 + minute;
  return (localMin - offsetMin) * MS_PER_MINUTE + second * 1000 + fracMs;
}

function unquote(cell: string): string {
  const t = cell.trim();
  return t.length >= 2 && t.startsWith('"') && t.endsWith('"') ? t.slice(1, -1).trim() : t;
}

function validateLocation(loc: WeatherLocation, fileName: string): WeatherLocation {
  const check = (v: number, lo: number, hi: number, key: string) => {
    if (!Number.isFinite(v) || v < lo || v > hi) {
      throw new InputError({
        problem: Number.isFinite(v) ? 'outside the valid range' : 'not a finite number',
        file: fileName,
        place: `option location.${key}`,
        expected: `a value in [${lo}, ${hi}]`,
        value: v,
      });
    }
  };
  check(loc.latitudeDeg, -90, 90, 'latitudeDeg');
  check(loc.longitudeDeg, -180, 180, 'longitudeDeg');
  check(loc.timeZoneHours, -12, 14, 'timeZoneHours');
  check(loc.elevationM, -1000, 9999, 'elevationM');
  return { ...loc };
}

/**
 * Reads the text of a weather CSV (format in the module comment) into a columnar `WeatherSeries`.
 *
 * Time: each row's `time` is one instant; rows must be strictly increasing. With interval Δ
 * (`intervalMinutes`) the midpoint is time + Δ/2 (`interval-start`), time (`interval-midpoint`)
 * or time − Δ/2 (`interval-end`).
 *
 * @param text The whole file as text [BOM, CRLF and blank lines allowed].
 * @param fileName Name used in error messages and kept on the result [-].
 * @param opts See `WeatherCsvOptions`.
 * @returns The series; quantities whose column is absent are all NaN, `present[f]` false.
 * @throws InputError naming the file, `line N, column M (<name>)` and what was expected.
 *
 * @example
 * const s = parseWeatherCsv('time,airTempC\n2026-07-21T14:00:00+02:00,31.5\n', 'site.csv');
 * s.dryBulbC[0]; // 31.5
 * s.timeMs[0];   // Date.UTC(2026, 6, 21, 12)
 */
export function parseWeatherCsv(text: string, fileName: string, opts: WeatherCsvOptions = {}): WeatherSeries {
  const fail = (problem: string, place: string, expected?: string, value?: unknown): never => {
    throw new InputError({ problem, file: fileName, place, expected, value });
  };
  const location = opts.location ? validateLocation(opts.location, fileName) : null;
  const meaning: TimeStampMeaning = opts.timeStampMeaning ?? 'interval-midpoint';
  if (meaning !== 'interval-start' && meaning !== 'interval-midpoint' && meaning !== 'interval-end') {
    fail('unknown time-stamp meaning', 'option timeStampMeaning', '"interval-start", "interval-midpoint" or "interval-end"', meaning);
  }
  const lines = splitLines(text);
  const skip = (line: string) => {
    const t = line.trim();
    return t === '' || t.startsWith('#');
  };

  // ---- header ----------------------------------------------------------------------------
  let h = 0;
  while (h < lines.length && skip(lines[h]!)) h++;
  if (h === lines.length) fail('the file is empty', 'line 1', 'a header row of column names, e.g. "time,airTempC"');
  const headerLineNo = h + 1;
  const names = lines[h]!.split(',').map(unquote);
  const warnings: string[] = [];
  let timeCol = -1;
  /** Per cell index: the target quantity or null (time column / unknown). */
  const target: (WeatherField | null)[] = [];
  const seen = new Map<string, number>();
  const unknown: string[] = [];
  for (let j = 0; j < names.length; j++) {
    const n = names[j]!;
    const place = `line ${headerLineNo}, column ${j + 1}`;
    if (n === '') fail('empty column name', place, 'a column name such as "time" or "airTempC"');
    const before = seen.get(n);
    if (before !== undefined) fail(`column "${n}" appears twice (also column ${before + 1})`, place, 'each column once');
    seen.set(n, j);
    if (n === 'time') {
      timeCol = j;
      target.push(null);
    } else if (Object.hasOwn(WEATHER_CSV_COLUMNS, n)) {
      target.push(WEATHER_CSV_COLUMNS[n as WeatherCsvColumn]);
    } else {
      target.push(null);
      unknown.push(`"${n}" (column ${j + 1})`);
    }
  }
  const known = ['time', ...Object.keys(WEATHER_CSV_COLUMNS)].join(', ');
  if (timeCol < 0) fail('no "time" column', `line ${headerLineNo}`, `a header with a "time" column (known columns: ${known})`);
  if (!seen.has('airTempC')) fail('no "airTempC" column', `line ${headerLineNo}`, 'an air temperature column "airTempC" [°C]');
  if (unknown.length > 0) warnings.push(`line ${headerLineNo}: unknown column(s) ignored: ${unknown.join(', ')}; known columns: ${known}`);

  // ---- rows ------------------------------------------------------------------------------
  const rowLine: number[] = [];
  for (let k = h + 1; k < lines.length; k++) if (!skip(lines[k]!)) rowLine.push(k);
  const count = rowLine.length;
  if (count === 0) fail('the file has a header but no data rows', `line ${headerLineNo + 1}`, 'one row per record after the header');

  const present = fieldRecord(false);
  for (const t of target) if (t !== null) present[t] = true;
  const columns = allocColumns(count);
  const filler = new ColumnFiller(columns);
  const timeMs = new Float64Array(count);
  const ncol = names.length;

  for (let i = 0; i < count; i++) {
    const lineNo = rowLine[i]! + 1;
    const cells = lines[rowLine[i]!]!.split(',');
    if (cells.length !== ncol) {
      let extraEmpty = cells.length > ncol;
      for (let j = ncol; extraEmpty && j < cells.length; j++) if (cells[j]!.trim() !== '') extraEmpty = false;
      if (!extraEmpty) fail(`the row has ${cells.length} cell(s)`, `line ${lineNo}`, `${ncol} cells, one per header column`);
    }
    const ts = unquote(cells[timeCol]!);
    const t = isoWithOffsetToMs(ts);
    const tPlace = `line ${lineNo}, column ${timeCol + 1} (time)`;
    if (Number.isNaN(t)) fail('not an ISO 8601 date-time with offset', tPlace, 'e.g. 2026-07-21T14:00:00+02:00 or 2026-07-21T12:00Z', ts);
    if (i > 0 && t <= timeMs[i - 1]!) {
      fail(
        t === timeMs[i - 1] ? 'duplicate time: the same instant as the row before' : 'time out of order: earlier than the row before',
        tPlace,
        `a time after ${unquote(lines[rowLine[i - 1]!]!.split(',')[timeCol] ?? '')}`,
        ts,
      );
    }
    timeMs[i] = t;
    for (let j = 0; j < ncol; j++) {
      const field = target[j];
      if (field === null || field === undefined) continue;
      const s = unquote(cells[j]!);
      if (s === '') {
        filler.storeMissing(field, i);
        continue;
      }
      const v = parseDecimal(s);
      if (Number.isNaN(v)) fail('not a number', `line ${lineNo}, column ${j + 1} (${names[j]})`, 'a number, or an empty cell for missing', s);
      filler.store(field, i, v, lineNo);
    }
  }
  for (const f of Object.values(WEATHER_CSV_COLUMNS)) {
    if (!present[f]) {
      columns[f].fill(NaN);
      filler.missing[f] = count;
    }
  }

  // ---- interval and time-stamp meaning ---------------------------------------------------
  let intervalMinutes: number;
  if (opts.intervalMinutes !== undefined) {
    const iv = opts.intervalMinutes;
    if (!Number.isFinite(iv) || iv <= 0 || iv > 1440) fail('not a valid interval', 'option intervalMinutes', 'a number of minutes in (0, 1440]', iv);
    intervalMinutes = iv;
  } else if (count >= 2) {
    intervalMinutes = (timeMs[1]! - timeMs[0]!) / MS_PER_MINUTE;
  } else {
    intervalMinutes = 60;
    warnings.push('a single row: its interval is taken as 60 min (pass intervalMinutes to say otherwise)');
  }
  const intervalMs = intervalMinutes * MS_PER_MINUTE;
  let shorter = 0;
  let firstShorter = -1;
  for (let i = 1; i < count; i++) {
    if (timeMs[i]! - timeMs[i - 1]! < intervalMs && shorter++ === 0) firstShorter = i;
  }
  if (shorter > 0) {
    warnings.push(`${shorter} step(s) shorter than the interval of ${intervalMinutes} min (first before line ${rowLine[firstShorter]! + 1})`);
  }
  warnings.push(...gapWarnings(timeMs, intervalMs, (i) => rowLine[i]! + 1));
  warnings.push(...filler.invalidWarnings((f) => csvName(f)));

  const shift = meaning === 'interval-start' ? intervalMs / 2 : meaning === 'interval-end' ? -intervalMs / 2 : 0;
  const midpointTimeMs = new Float64Array(count);
  for (let i = 0; i < count; i++) midpointTimeMs[i] = timeMs[i]! + shift;

  return {
    fileName,
    format: 'csv',
    location,
    count,
    intervalMinutes,
    timeStampMeaning: meaning,
    timeMs,
    midpointTimeMs,
    ...columns,
    present,
    missing: filler.missing,
    invalid: filler.invalid,
    warnings,
  };
}

function csvName(field: WeatherField): string {
  for (const [k, v] of Object.entries(WEATHER_CSV_COLUMNS)) if (v === field) return k;
  return field;
}
