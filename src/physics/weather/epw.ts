/**
 * Reader for EPW hourly weather files (the EnergyPlus weather format): text in, `WeatherSeries`
 * out. No file access here; the command line and the app read the file and pass its text.
 *
 * Layout [1]: eight header lines (LOCATION, DESIGN CONDITIONS, TYPICAL/EXTREME PERIODS, GROUND
 * TEMPERATURES, HOLIDAYS/DAYLIGHT SAVING, COMMENTS 1, COMMENTS 2, DATA PERIODS), then one line
 * of 35 comma-separated fields per record. Hour h is the interval from (h − 1):00 to h:00 local
 * standard time (no daylight saving); radiation fields are totals over that interval [Wh/m²],
 * i.e. the interval mean in W/m² for hourly records. A value at or above its field's missing
 * marker is missing ("if values in this field are >= the following number, it is considered
 * missing") and becomes NaN.
 *
 * References:
 * [1] U.S. DOE, "EnergyPlus Weather File (EPW) Data Dictionary," in EnergyPlus Auxiliary
 *     Programs, ch. "Weather Converter Program". Online (v24.1.0):
 *     github.com/NREL/EnergyPlus/blob/v24.1.0/doc/auxiliary-programs/src/weather-converter-program/
 *     energyplus-weather-file-epw-data-dictionary.tex
 */
import { InputError } from '../errors.ts';
import {
  ColumnFiller,
  MS_PER_HOUR,
  MS_PER_MINUTE,
  allocColumns,
  daysFromCivil,
  daysInMonth,
  fieldRecord,
  gapWarnings,
  isLeapYear,
  parseDecimal,
  showLocal,
  splitLines,
} from './common.ts';
import type { EpwDetails, WeatherField, WeatherLocation, WeatherSeries } from './types.ts';

/** Number of fields in an EPW data line [1]. */
export const EPW_FIELD_COUNT = 35;

/** Names of the 35 data-line fields, as the data dictionary [1] gives them (field 1 first). */
export const EPW_FIELD_NAMES = [
  'Year',
  'Month',
  'Day',
  'Hour',
  'Minute',
  'Data Source and Uncertainty Flags',
  'Dry Bulb Temperature',
  'Dew Point Temperature',
  'Relative Humidity',
  'Atmospheric Station Pressure',
  'Extraterrestrial Horizontal Radiation',
  'Extraterrestrial Direct Normal Radiation',
  'Horizontal Infrared Radiation Intensity',
  'Global Horizontal Radiation',
  'Direct Normal Radiation',
  'Diffuse Horizontal Radiation',
  'Global Horizontal Illuminance',
  'Direct Normal Illuminance',
  'Diffuse Horizontal Illuminance',
  'Zenith Luminance',
  'Wind Direction',
  'Wind Speed',
  'Total Sky Cover',
  'Opaque Sky Cover',
  'Visibility',
  'Ceiling Height',
  'Present Weather Observation',
  'Present Weather Codes',
  'Precipitable Water',
  'Aerosol Optical Depth',
  'Snow Depth',
  'Days Since Last Snowfall',
  'Albedo',
  'Liquid Precipitation Depth',
  'Liquid Precipitation Quantity',
] as const;

/**
 * The fields read into a `WeatherSeries`: 0-based field index, target quantity and the
 * documented missing marker (`\missing` in [1]; values >= it are missing).
 */
export const EPW_COLUMNS = [
  { index: 6, field: 'dryBulbC', missingAtOrAbove: 99.9 },
  { index: 7, field: 'dewPointC', missingAtOrAbove: 99.9 },
  { index: 8, field: 'relativeHumidityPct', missingAtOrAbove: 999 },
  { index: 9, field: 'pressurePa', missingAtOrAbove: 999999 },
  { index: 12, field: 'horizontalInfraredWm2', missingAtOrAbove: 9999 },
  { index: 13, field: 'ghiWm2', missingAtOrAbove: 9999 },
  { index: 14, field: 'dniWm2', missingAtOrAbove: 9999 },
  { index: 15, field: 'dhiWm2', missingAtOrAbove: 9999 },
  { index: 20, field: 'windDirectionDeg', missingAtOrAbove: 999 },
  { index: 21, field: 'windSpeedMs', missingAtOrAbove: 999 },
] as const satisfies readonly { index: number; field: WeatherField; missingAtOrAbove: number }[];

const HEADER_KEYWORDS = [
  'LOCATION',
  'DESIGN CONDITIONS',
  'TYPICAL/EXTREME PERIODS',
  'GROUND TEMPERATURES',
  'HOLIDAYS/DAYLIGHT SAVING',
  'COMMENTS 1',
  'COMMENTS 2',
  'DATA PERIODS',
] as const;

const HEADER_LINES = HEADER_KEYWORDS.length;

const IRRADIANCE_OFFSET_RE = /Irradiance\s+Time\s+Offset\s*\(h\)\s*:?\s*([+-]?(?:\d+\.?\d*|\.\d+))/i;

/** Options of `parseEpw`. */
export interface EpwOptions {
  /**
   * Calendar year to place the time stamps in, keeping each record's month/day/hour. Applies to
   * typical-year files (mixed source years) and single-year files; ignored, with a warning, for
   * actual data spanning several years. Default: a typical year is placed in its first record's
   * year (or the next year with the same leap-ness, so a file with or without 29 February fits).
   */
  timestampYear?: number;
}

const FIELD_LABEL: Record<WeatherField, string> = (() => {
  const r = fieldRecord('');
  for (const c of EPW_COLUMNS) r[c.field] = EPW_FIELD_NAMES[c.index];
  return r;
})();

function fieldPlace(lineNo: number, index: number): string {
  return `line ${lineNo}, field ${index + 1} (${EPW_FIELD_NAMES[index] ?? 'extra'})`;
}

/**
 * Reads the text of an EPW weather file into a columnar `WeatherSeries`.
 *
 * Time stamps: record with date y-m-d, hour h (1..24) and R records per hour ends at local
 * standard time t_end = y-m-d 00:00 + (R = 1 ? h·60 : (h − 1)·60 + minute) min, so
 * timeMs = t_end − timeZoneHours·3 600 000 and midpointTimeMs = timeMs − intervalMinutes·30 000.
 * Missing markers (value ≥ marker, per field, [1]) and values outside the documented ranges
 * become NaN and are counted in `missing` / `invalid`.
 *
 * @param text The whole file as text [UTF-8 decoded; BOM, CRLF and trailing blank lines allowed].
 * @param fileName Name used in error messages and kept on the result [-].
 * @param opts See `EpwOptions`.
 * @returns The series; `timeStampMeaning` is `'interval-end'`.
 * @throws InputError naming the file, `line N, field M (<field name>)` and what was expected.
 *
 * References: [1] EnergyPlus Auxiliary Programs, "EnergyPlus Weather File (EPW) Data Dictionary".
 *
 * @example
 * // the reference file test/fixtures/weather/tmy-45.000N-8.000E-2005-2023.epw
 * const s = parseEpw(text, 'tmy-45.000N-8.000E-2005-2023.epw');
 * s.count;         // 8760
 * s.dryBulbC[0];   // 2.04  (2018-01-01, hour 1 = 00:00–01:00 UTC+1)
 * new Date(s.timeMs[0]!).toISOString(); // '2018-01-01T00:00:00.000Z'
 */
export function parseEpw(text: string, fileName: string, opts: EpwOptions = {}): WeatherSeries {
  const fail = (problem: string, place: string, expected?: string, value?: unknown): never => {
    throw new InputError({ problem, file: fileName, place, expected, value });
  };

  const lines = splitLines(text);
  let end = lines.length;
  while (end > 0 && lines[end - 1]!.trim() === '') end--;
  if (end === 0) fail('the file is empty', 'line 1', 'an EPW weather file: 8 header lines, then data lines');

  // ---- header ----------------------------------------------------------------------------
  const headerFields: string[][] = [];
  for (let k = 0; k < HEADER_LINES; k++) {
    const keyword = HEADER_KEYWORDS[k]!;
    if (k >= end) fail(`the file ends after ${end} line(s), inside the header`, `line ${k + 1}`, `the ${keyword} header line`);
    const line = lines[k]!;
    const f = line.split(',');
    if (f[0]!.trim().toUpperCase() !== keyword) {
      fail('not the expected header line', `line ${k + 1}`, `a line starting with "${keyword},"`, line);
    }
    headerFields.push(f);
  }
  const loc = headerFields[0]!;
  const locNum = (i: number, name: string, lo: number, hi: number, hiExclusive = false): number => {
    const place = `line 1, field ${i + 1} (${name})`;
    const s = loc[i];
    if (s === undefined) return fail('the LOCATION line is too short', place, `10 fields with ${name} as field ${i + 1}`);
    const v = parseDecimal(s);
    if (Number.isNaN(v)) return fail('not a number', place, 'a number', s);
    if (v < lo || (hiExclusive ? v >= hi : v > hi)) {
      fail('outside the valid range', place, `a value in [${lo}, ${hi}${hiExclusive ? ')' : ']'}`, v);
    }
    return v;
  };
  const latitudeDeg = locNum(6, 'Latitude', -90, 90);
  const longitudeDeg = locNum(7, 'Longitude', -180, 180);
  // The dictionary [1] says ±12 h; real standard-time zones reach +14 h (Line Islands).
  const timeZoneHours = locNum(8, 'TimeZone', -12, 14);
  const elevationM = locNum(9, 'Elevation', -1000, 9999.9, true);
  const locText = (i: number) => (loc[i] ?? '').trim();
  const name = [locText(1), locText(2), locText(3)].filter((s) => s !== '' && s !== '-').join(', ');
  const location: WeatherLocation = { name: name === '' ? 'unknown' : name, latitudeDeg, longitudeDeg, timeZoneHours, elevationM };

  const commentText = (k: number) => lines[k]!.slice(lines[k]!.indexOf(',') + 1).trim();
  const comments: [string, string] = [
    lines[5]!.includes(',') ? commentText(5) : '',
    lines[6]!.includes(',') ? commentText(6) : '',
  ];
  const offsetMatch = IRRADIANCE_OFFSET_RE.exec(comments.join('\n'));
  const irradianceTimeOffsetH = offsetMatch ? Number(offsetMatch[1]) : null;

  const dp = headerFields[7]!;
  const dpLine = HEADER_LINES;
  const periodCount = parseDecimal(dp[1] ?? '');
  if (!Number.isInteger(periodCount) || periodCount < 1) {
    fail('not a valid number of data periods', `line ${dpLine}, field 2 (Number of Data Periods)`, 'an integer >= 1', dp[1] ?? '');
  }
  const recordsPerHour = parseDecimal(dp[2] ?? '');
  if (!Number.isInteger(recordsPerHour) || recordsPerHour < 1 || recordsPerHour > 60 || 60 % recordsPerHour !== 0) {
    fail(
      'not a valid number of records per hour',
      `line ${dpLine}, field 3 (Number of Records per hour)`,
      'an integer that divides 60 (1, 2, 4, 6, 12, ...)',
      dp[2] ?? '',
    );
  }
  const dataPeriods: EpwDetails['dataPeriods'] = [];
  for (let p = 0; p < periodCount; p++) {
    const b = 3 + 4 * p;
    if (dp[b + 3] === undefined) break;
    dataPeriods.push({
      name: dp[b]!.trim(),
      startDayOfWeek: dp[b + 1]!.trim(),
      startDay: dp[b + 2]!.trim(),
      endDay: dp[b + 3]!.trim(),
    });
  }
  const warnings: string[] = [];
  if (dataPeriods.length < periodCount) {
    warnings.push(`line ${dpLine}: DATA PERIODS announces ${periodCount} period(s) but describes ${dataPeriods.length}`);
  }
  if (irradianceTimeOffsetH !== null) {
    warnings.push(
      `the file's comments note an Irradiance Time Offset of ${irradianceTimeOffsetH} h; the EPW format does not ` +
        'define it and it is not applied (records are read as intervals ending at the stamped hour)',
    );
  }

  // ---- data lines ------------------------------------------------------------------------
  const count = end - HEADER_LINES;
  if (count === 0) fail('the file has a header but no data lines', `line ${HEADER_LINES + 1}`, `data lines of ${EPW_FIELD_COUNT} fields`);

  const sourceYear = new Int16Array(count);
  const month = new Uint8Array(count);
  const day = new Uint8Array(count);
  const hour = new Uint8Array(count);
  const minute = new Uint8Array(count);
  const columns = allocColumns(count);
  const filler = new ColumnFiller(columns);
  let firstFeb29NonLeapLine = 0;
  let hasFeb29 = false;

  let f: string[] = [];
  let lineNo = 0;
  const int = (j: number, lo: number, hi: number, what: string): number => {
    const s = f[j]!;
    const v = parseDecimal(s);
    if (Number.isNaN(v)) return fail('not a number', fieldPlace(lineNo, j), `an integer, ${what}`, s);
    if (!Number.isInteger(v) || v < lo || v > hi) return fail('outside the valid range', fieldPlace(lineNo, j), what, v);
    return v;
  };
  for (let i = 0; i < count; i++) {
    lineNo = HEADER_LINES + 1 + i;
    const line = lines[HEADER_LINES + i]!;
    f = line.split(',');
    if (f.length !== EPW_FIELD_COUNT) {
      let extraEmpty = f.length > EPW_FIELD_COUNT;
      for (let j = EPW_FIELD_COUNT; extraEmpty && j < f.length; j++) if (f[j]!.trim() !== '') extraEmpty = false;
      if (!extraEmpty) {
        fail(
          `the data line has ${line.trim() === '' ? 'no fields (blank line)' : `${f.length} field(s)`}`,
          `line ${lineNo}`,
          `${EPW_FIELD_COUNT} comma-separated fields`,
        );
      }
    }
    const y = int(0, -9999, 9999, 'a year');
    const m = int(1, 1, 12, 'month 1..12');
    const dMax = m === 2 ? 29 : daysInMonth(2001, m);
    const d = int(2, 1, dMax, `day 1..${dMax} of month ${m}`);
    const h = int(3, 1, 24, 'hour 1..24 (hour 1 is 00:00-01:00)');
    const mi = recordsPerHour === 1 ? int(4, 0, 60, 'minute 0..60') : int(4, 1, 60, 'minute 1..60 (end of the interval within the hour)');
    if (m === 2 && d === 29) {
      hasFeb29 = true;
      if (!isLeapYear(y) && firstFeb29NonLeapLine === 0) firstFeb29NonLeapLine = lineNo;
    }
    sourceYear[i] = y;
    month[i] = m;
    day[i] = d;
    hour[i] = h;
    minute[i] = mi;

    for (const c of EPW_COLUMNS) {
      const s = f[c.index]!;
      if (s.trim() === '') {
        filler.storeMissing(c.field, i);
        continue;
      }
      const v = parseDecimal(s);
      if (Number.isNaN(v)) fail('not a number', fieldPlace(lineNo, c.index), 'a number', s);
      if (v >= c.missingAtOrAbove) filler.storeMissing(c.field, i);
      else filler.store(c.field, i, v, lineNo);
    }
  }

  // ---- time stamps -----------------------------------------------------------------------
  const intervalMinutes = 60 / recordsPerHour;
  const tzMs = timeZoneHours * MS_PER_HOUR;
  const endMinuteOfDay = (i: number) => (recordsPerHour === 1 ? hour[i]! * 60 : (hour[i]! - 1) * 60 + minute[i]!);
  const stamp = (year: number, i: number) => (daysFromCivil(year, month[i]!, day[i]!) * 1440 + endMinuteOfDay(i)) * MS_PER_MINUTE - tzMs;
  const lineOf = (i: number) => HEADER_LINES + 1 + i;
  const show = (year: number, i: number) => showLocal(year, month[i]!, day[i]!, hour[i]!, recordsPerHour === 1 ? 0 : minute[i]!);
  const orderFail = (i: number, year: number, prevYear: number, equal: boolean): never =>
    fail(
      equal ? 'duplicate record: the same time as the line before' : 'record out of order: earlier than the line before',
      `line ${lineOf(i)}, fields 1-5 (Year, Month, Day, Hour, Minute)`,
      `a time after ${show(prevYear, i - 1)}`,
      show(year, i),
    );

  const firstYear = sourceYear[0]!;
  let singleYear = true;
  for (let i = 1; i < count; i++) if (sourceYear[i] !== firstYear) singleYear = false;

  // With several source years: a step back in time where the year changes is a splice of a
  // typical year; a step back within the same year is an error.
  let typicalYear = false;
  if (!singleYear) {
    let prev = stamp(sourceYear[0]!, 0);
    for (let i = 1; i < count; i++) {
      const t = stamp(sourceYear[i]!, i);
      if (t <= prev) {
        if (sourceYear[i] === sourceYear[i - 1]) orderFail(i, sourceYear[i]!, sourceYear[i - 1]!, t === prev);
        typicalYear = true;
      }
      prev = t;
    }
  }

  let timestampYear: number | null = null;
  if (typicalYear || singleYear) {
    if (opts.timestampYear !== undefined) {
      const ty = opts.timestampYear;
      if (!Number.isInteger(ty) || ty < -9999 || ty > 9999) {
        fail('not a valid year', 'option timestampYear', 'an integer year', ty);
      }
      if (hasFeb29 && !isLeapYear(ty)) {
        fail('the file has records on 29 February but the requested year is not a leap year', 'option timestampYear', 'a leap year', ty);
      }
      timestampYear = ty;
    } else if (typicalYear) {
      let ty = firstYear;
      while (isLeapYear(ty) !== hasFeb29) ty++;
      timestampYear = ty;
      warnings.push(
        `records come from several source years (a typical year); time stamps are placed in ${ty}, ` +
          'keeping each record\'s month, day and hour (source years in epw.sourceYear)',
      );
    } else {
      timestampYear = firstYear;
    }
    if (timestampYear === firstYear && singleYear && firstFeb29NonLeapLine !== 0) {
      fail('29 February in a year that is not a leap year', `line ${firstFeb29NonLeapLine}, field 3 (Day)`, `a day of ${firstYear}`);
    }
  } else {
    if (opts.timestampYear !== undefined) {
      warnings.push('option timestampYear ignored: the file holds actual data spanning several years');
    }
    if (firstFeb29NonLeapLine !== 0) {
      fail('29 February in a year that is not a leap year', `line ${firstFeb29NonLeapLine}, field 3 (Day)`, 'a date of that year');
    }
  }
  if (typicalYear && firstFeb29NonLeapLine !== 0) {
    warnings.push(`line ${firstFeb29NonLeapLine}: 29 February carries a source year that is not a leap year`);
  }

  const timeMs = new Float64Array(count);
  const midpointTimeMs = new Float64Array(count);
  const halfMs = (intervalMinutes * MS_PER_MINUTE) / 2;
  for (let i = 0; i < count; i++) {
    const t = stamp(timestampYear ?? sourceYear[i]!, i);
    if (i > 0 && t <= timeMs[i - 1]!) {
      const y = timestampYear ?? sourceYear[i]!;
      orderFail(i, y, timestampYear ?? sourceYear[i - 1]!, t === timeMs[i - 1]);
    }
    timeMs[i] = t;
    midpointTimeMs[i] = t - halfMs;
  }

  // ---- warnings on odd but readable files ------------------------------------------------
  if (timestampYear !== null) {
    const full = (isLeapYear(timestampYear) ? 8784 : 8760) * recordsPerHour;
    if (count !== full) {
      warnings.push(`${count} records; a full year of ${timestampYear} at ${recordsPerHour} per hour has ${full} (partial or irregular period)`);
    }
  }
  warnings.push(...gapWarnings(timeMs, intervalMinutes * MS_PER_MINUTE, lineOf));
  warnings.push(...filler.invalidWarnings((f) => FIELD_LABEL[f]));
  for (const c of EPW_COLUMNS) {
    const n = filler.missing[c.field];
    if (n > 0) warnings.push(`${n} of ${count} value(s) of ${FIELD_LABEL[c.field]} are missing`);
  }

  return {
    fileName,
    format: 'epw',
    location,
    count,
    intervalMinutes,
    timeStampMeaning: 'interval-end',
    timeMs,
    midpointTimeMs,
    ...columns,
    present: fieldRecord(true),
    missing: filler.missing,
    invalid: filler.invalid,
    warnings,
    epw: {
      sourceYear,
      month,
      day,
      hour,
      minute,
      typicalYear,
      timestampYear,
      recordsPerHour,
      dataPeriods,
      region: locText(2),
      country: locText(3),
      dataSource: locText(4),
      wmoStation: locText(5),
      comments,
      irradianceTimeOffsetH,
    },
  };
}
