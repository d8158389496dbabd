import { readFileSync } from 'node:fs';
import { describe, it, expect } from 'vitest';
import { InputError } from '../../../src/physics/errors.ts';
import { parseEpw, WEATHER_FIELDS } from '../../../src/physics/weather/index.ts';
import type { WeatherSeries } from '../../../src/physics/weather/index.ts';

const REAL_NAME = 'tmy-45.000N-8.000E-2005-2023.epw';
const fixture = (name: string) => readFileSync(new URL(`../../fixtures/weather/${name}`, import.meta.url), 'utf8');
const REAL = fixture(REAL_NAME);
const REAL_LINES = REAL.split('\n');
const H = 3_600_000;

/** Tolerance for numbers read back from text: they must be the same double. */
const EXACT = 1e-12;

// Built once; the tests below read it.
const real = parseEpw(REAL, REAL_NAME);

describe('parseEpw on the real PVGIS/ERA5 typical-year file', () => {
  it('reads the location header', () => {
    // source: test/fixtures/weather/SOURCE.md (45.000 N, 8.000 E, UTC+1, 250 m), LOCATION line of the file
    expect(real.location).not.toBeNull();
    expect(real.location!.latitudeDeg).toBeCloseTo(45.0, 12);
    expect(real.location!.longitudeDeg).toBeCloseTo(8.0, 12);
    expect(real.location!.timeZoneHours).toBeCloseTo(1, 12);
    expect(real.location!.elevationM).toBeCloseTo(250, 12);
    expect(real.epw!.dataSource).toBe('ECMWF/ERA');
  });

  it('has 8760 hourly records, stamped at the interval end', () => {
    // source: SOURCE.md ("8760 data lines"); EPW Data Dictionary, DATA PERIODS "Number of Records per hour" = 1
    expect(real.count).toBe(8760);
    expect(real.intervalMinutes).toBe(60);
    expect(real.timeStampMeaning).toBe('interval-end');
    for (const f of WEATHER_FIELDS) expect(real[f].length).toBe(8760);
  });

  it('reads the first data line as SOURCE.md gives it', () => {
    // source: test/fixtures/weather/SOURCE.md, first data line; tolerance: same double as the text
    expect(Math.abs(real.dryBulbC[0]! - 2.04)).toBeLessThan(EXACT);
    expect(Math.abs(real.dewPointC[0]! - 1.21)).toBeLessThan(EXACT);
    expect(Math.abs(real.relativeHumidityPct[0]! - 94.38)).toBeLessThan(EXACT);
    expect(Math.abs(real.pressurePa[0]! - 99870)).toBeLessThan(EXACT);
    expect(Math.abs(real.horizontalInfraredWm2[0]! - 283.58)).toBeLessThan(EXACT);
    expect(real.ghiWm2[0]).toBe(0);
    expect(real.dniWm2[0]).toBe(0); // written "-0.00": read as 0
    expect(Object.is(real.dniWm2[0], -0)).toBe(false);
    expect(real.dhiWm2[0]).toBe(0);
    expect(real.epw!.sourceYear[0]).toBe(2018);
    expect(real.epw!.month[0]).toBe(1);
    expect(real.epw!.day[0]).toBe(1);
    expect(real.epw!.hour[0]).toBe(1);
  });

  it('places hour 1 as the hour 00:00-01:00 local standard time (UTC+1)', () => {
    // source: EPW Data Dictionary, "Field: Hour": "Hour 1 is 00:01 to 01:00"; TimeZone +1 from LOCATION
    // 2018-01-01 01:00+01:00 = 2018-01-01T00:00Z; tolerance 0 ms (integer arithmetic)
    expect(real.timeMs[0]).toBe(Date.UTC(2018, 0, 1, 0));
    expect(real.midpointTimeMs[0]).toBe(Date.UTC(2017, 11, 31, 23, 30));
    // last record: 2016-12-31 hour 24 in a file placed in 2018 → 2019-01-01 00:00+01:00
    expect(real.timeMs[8759]).toBe(Date.UTC(2018, 11, 31, 23));
  });

  it('reads a mid-summer noon row exactly as written (line 4700)', () => {
    // source: the fixture file, line 4700 as written:
    // 2011,7,15,12,0,...,26.11,15.77,52.95,99700.00,9999,9999,365.00,890.00,727.56,225.00,...,139,0.5,...
    const i = 4700 - 9;
    expect(REAL_LINES[4699]!.startsWith('2011,7,15,12,0,')).toBe(true);
    expect(real.epw!.sourceYear[i]).toBe(2011);
    expect(real.epw!.month[i]).toBe(7);
    expect(real.epw!.day[i]).toBe(15);
    expect(real.epw!.hour[i]).toBe(12);
    const want: [keyof WeatherSeries & string, number][] = [
      ['dryBulbC', 26.11],
      ['dewPointC', 15.77],
      ['relativeHumidityPct', 52.95],
      ['pressurePa', 99700],
      ['horizontalInfraredWm2', 365],
      ['ghiWm2', 890],
      ['dniWm2', 727.56],
      ['dhiWm2', 225],
      ['windDirectionDeg', 139],
      ['windSpeedMs', 0.5],
    ];
    for (const [f, v] of want) {
      const col = real[f] as Float64Array;
      expect(Math.abs(col[i]! - v), f).toBeLessThan(EXACT);
    }
    // timestamps keep month/day/hour in the placement year 2018: 12:00+01:00 = 11:00Z, midpoint 10:30Z
    expect(real.timeMs[i]).toBe(Date.UTC(2018, 6, 15, 11));
    expect(real.midpointTimeMs[i]).toBe(Date.UTC(2018, 6, 15, 10, 30));
  });

  it('reproduces the annual sums computed independently with awk', () => {
    // source: test/fixtures/weather/SOURCE.md (awk sums over fields 14, 15, 16, 7); tolerance 1e-9 relative
    const sum = (a: Float64Array) => a.reduce((s, v) => s + v, 0);
    const rel = (x: number, y: number) => Math.abs(x - y) / y;
    expect(rel(sum(real.ghiWm2), 1435861.0)).toBeLessThan(1e-9);
    expect(rel(sum(real.dniWm2), 1591565.16)).toBeLessThan(1e-9);
    expect(rel(sum(real.dhiWm2), 570947.0)).toBeLessThan(1e-9);
    expect(rel(sum(real.dryBulbC), 118821.52)).toBeLessThan(1e-9);
  });

  it('recognises the mixed source years of a typical year and keeps them', () => {
    // source: the fixture file (months from 2018, 2007, 2009, 2013, 2008, 2006, 2011, 2010, 2020, 2006, 2007, 2016)
    const e = real.epw!;
    expect(e.typicalYear).toBe(true);
    expect(e.timestampYear).toBe(2018);
    const yearOfMonth = new Map<number, number>();
    for (let i = 0; i < real.count; i++) yearOfMonth.set(e.month[i]!, e.sourceYear[i]!);
    expect([...yearOfMonth.values()]).toEqual([2018, 2007, 2009, 2013, 2008, 2006, 2011, 2010, 2020, 2006, 2007, 2016]);
    // one record per hour, no gap, no step back: every step is exactly 1 h
    for (let i = 1; i < real.count; i++) {
      if (real.timeMs[i]! - real.timeMs[i - 1]! !== H) throw new Error(`step at ${i}`);
    }
    expect(real.warnings.some((w) => w.includes('placed in 2018'))).toBe(true);
  });

  it('reports the Irradiance Time Offset comment without applying it', () => {
    // source: COMMENTS 2 line of the fixture: "Irradiance Time Offset (h):-0.8239"
    expect(real.epw!.irradianceTimeOffsetH).toBeCloseTo(-0.8239, 12);
    expect(real.warnings.some((w) => w.includes('-0.8239'))).toBe(true);
    expect(real.epw!.comments[1]).toBe('Irradiance Time Offset (h):-0.8239');
  });

  it('counts no missing or invalid values in this complete file', () => {
    // source: awk over the fixture found no field at or above its missing marker (common practice check)
    for (const f of WEATHER_FIELDS) {
      expect(real.missing[f], f).toBe(0);
      expect(real.invalid[f], f).toBe(0);
      expect(real.present[f]).toBe(true);
    }
  });

  it('places the year where the caller asks (timestampYear)', () => {
    // source: EPW Data Dictionary hour convention; 2026-01-01 01:00+01:00 = 2026-01-01T00:00Z, tolerance 0 ms
    const s = parseEpw(REAL, REAL_NAME, { timestampYear: 2026 });
    expect(s.timeMs[0]).toBe(Date.UTC(2026, 0, 1, 0));
    expect(s.epw!.timestampYear).toBe(2026);
    expect(() => parseEpw(REAL, REAL_NAME, { timestampYear: 2026.5 })).toThrow(InputError);
  });

  it('reads the same numbers with a BOM and CRLF line ends', () => {
    // common practice: Windows tools write CRLF and a UTF-8 BOM
    const s = parseEpw('\uFEFF' + REAL.replace(/\n/g, '\r\n') + '\r\n\r\n', REAL_NAME);
    expect(s.count).toBe(8760);
    expect(s.dryBulbC).toEqual(real.dryBulbC);
    expect(s.timeMs).toEqual(real.timeMs);
  });

  it('matches its TSDoc example', () => {
    // source: the @example of parseEpw
    expect(real.count).toBe(8760);
    expect(real.dryBulbC[0]).toBe(2.04);
    expect(new Date(real.timeMs[0]!).toISOString()).toBe('2018-01-01T00:00:00.000Z');
  });
});

describe('parseEpw missing-value markers (invented fixture)', () => {
  const s = parseEpw(fixture('missing-markers.epw'), 'missing-markers.epw');
  it('turns each documented marker into NaN and counts it', () => {
    // source: EnergyPlus Auxiliary Programs, EPW Data Dictionary: \missing 99.9 (dry bulb, dew point),
    // 999 (RH, wind direction, wind speed), 999999 (pressure), 9999 (horizontal IR, GHI, DNI, DHI)
    expect(s.count).toBe(7);
    expect(Number.isNaN(s.dryBulbC[1]!)).toBe(true);
    expect(Number.isNaN(s.dewPointC[2]!)).toBe(true);
    expect(Number.isNaN(s.relativeHumidityPct[2]!)).toBe(true);
    expect(Number.isNaN(s.pressurePa[3]!)).toBe(true);
    expect(Number.isNaN(s.horizontalInfraredWm2[3]!)).toBe(true);
    expect(Number.isNaN(s.ghiWm2[4]!)).toBe(true);
    expect(Number.isNaN(s.dniWm2[4]!)).toBe(true);
    expect(Number.isNaN(s.dhiWm2[4]!)).toBe(true);
    expect(Number.isNaN(s.windDirectionDeg[5]!)).toBe(true);
    expect(Number.isNaN(s.windSpeedMs[5]!)).toBe(true);
    for (const f of WEATHER_FIELDS) expect(s.missing[f], f).toBe(1);
    // the other entries are numbers as written
    expect(s.dryBulbC[0]).toBe(14.2);
    expect(s.relativeHumidityPct[1]).toBe(76.0);
    expect(s.ghiWm2[5]).toBe(55);
    expect(s.windSpeedMs[6]).toBe(2.7);
  });

  it('sets out-of-range values to NaN and counts them apart', () => {
    // source: EPW Data Dictionary, RH \maximum 110, radiation \minimum 0
    expect(Number.isNaN(s.relativeHumidityPct[6]!)).toBe(true);
    expect(Number.isNaN(s.dhiWm2[6]!)).toBe(true);
    expect(s.invalid.relativeHumidityPct).toBe(1);
    expect(s.invalid.dhiWm2).toBe(1);
    expect(s.invalid.dryBulbC).toBe(0);
    expect(s.warnings.some((w) => w.includes('Relative Humidity') && w.includes('line 15'))).toBe(true);
  });

  it('reads a negative time zone and CRLF with a trailing blank line', () => {
    // source: EPW Data Dictionary hour convention; 2021-06-01 01:00-02:00 = 03:00Z, tolerance 0 ms
    expect(s.location!.timeZoneHours).toBe(-2);
    expect(s.location!.longitudeDeg).toBe(-3.25);
    expect(s.location!.name).toBe('Testville, Nowhere');
    expect(s.timeMs[0]).toBe(Date.UTC(2021, 5, 1, 3));
    expect(s.epw!.typicalYear).toBe(false);
    expect(s.epw!.irradianceTimeOffsetH).toBeNull();
    expect(s.warnings.some((w) => w.includes('partial'))).toBe(true);
  });
});

// ---- synthetic EPW text for calendar cases (invented data) -------------------------------
const HEADER = REAL_LINES.slice(0, 8).join('\n');
const TAIL = REAL_LINES[8]!.split(',').slice(5).join(',');
function dataLine(y: number, m: number, d: number, h: number, minute = 0): string {
  return `${y},${m},${d},${h},${minute},${TAIL}`;
}
function hoursOf(y: number, fromMonth = 1, toMonth = 12, perHour = 1): string[] {
  const out: string[] = [];
  for (let m = fromMonth; m <= toMonth; m++) {
    const days = new Date(Date.UTC(y, m, 0)).getUTCDate();
    for (let d = 1; d <= days; d++)
      for (let h = 1; h <= 24; h++)
        for (let k = 1; k <= perHour; k++) out.push(dataLine(y, m, d, h, perHour === 1 ? 0 : (60 / perHour) * k));
  }
  return out;
}
const epwText = (data: string[], header = HEADER) => header + '\n' + data.join('\n') + '\n';

describe('parseEpw calendar cases (synthetic files)', () => {
  it('accepts a leap-year file of 8784 records without a count warning', () => {
    // source: 366 days × 24 h = 8784 (common practice)
    const s = parseEpw(epwText(hoursOf(2020)), 'leap.epw');
    expect(s.count).toBe(8784);
    expect(s.epw!.typicalYear).toBe(false);
    expect(s.epw!.timestampYear).toBe(2020);
    expect(s.warnings.filter((w) => w.includes('records;') || w.includes('gap'))).toEqual([]);
    expect(s.timeMs[59 * 24]).toBe(Date.UTC(2020, 1, 29, 0)); // Feb 29 hour 1 ends 01:00+01:00
  });

  it('accepts a partial period with a warning', () => {
    // common practice: a design-week extract
    const s = parseEpw(epwText(hoursOf(2019, 7, 7)), 'july.epw');
    expect(s.count).toBe(31 * 24);
    expect(s.warnings.some((w) => w.includes('partial'))).toBe(true);
  });

  it('warns about a gap', () => {
    const lines = hoursOf(2019, 7, 7);
    lines.splice(100, 3);
    const s = parseEpw(epwText(lines), 'gap.epw');
    expect(s.warnings.some((w) => w.includes('1 gap') && w.includes('line 109') && w.includes('4.00 h'))).toBe(true);
  });

  it('reads sub-hourly records (4 per hour) at 15-min intervals', () => {
    // source: EPW Data Dictionary, DATA PERIODS "Number of Records per hour"; minute = end of the interval
    const header = HEADER.replace('DATA PERIODS,1,1,', 'DATA PERIODS,1,4,');
    const s = parseEpw(epwText(hoursOf(2019, 3, 3, 4), header), 'quarter.epw');
    expect(s.intervalMinutes).toBe(15);
    expect(s.count).toBe(31 * 24 * 4);
    expect(s.timeMs[0]).toBe(Date.UTC(2019, 2, 1, 0, 15) - H); // 00:15+01:00
    expect(s.midpointTimeMs[0]).toBe(Date.UTC(2019, 2, 1, 0, 7, 30) - H);
    expect(s.timeMs[1]! - s.timeMs[0]!).toBe(15 * 60_000);
  });

  it('keeps source years for actual data across a year boundary', () => {
    const lines = [...hoursOf(2020, 12, 12), ...hoursOf(2021, 1, 1)];
    const s = parseEpw(epwText(lines), 'winter.epw', { timestampYear: 2030 });
    expect(s.epw!.typicalYear).toBe(false);
    expect(s.epw!.timestampYear).toBeNull();
    expect(s.timeMs[31 * 24]).toBe(Date.UTC(2021, 0, 1, 0));
    expect(s.warnings.some((w) => w.includes('timestampYear ignored'))).toBe(true);
  });

  it('places a typical year with 29 February in a leap year', () => {
    const lines = [...hoursOf(2019, 1, 1), ...hoursOf(2012, 2, 2), ...hoursOf(2015, 3, 12)];
    const s = parseEpw(epwText(lines), 'tmy-leap.epw');
    expect(s.epw!.typicalYear).toBe(true);
    expect(s.epw!.timestampYear).toBe(2020); // first year with the same leap-ness as the file after 2019
    expect(s.count).toBe(8784);
    expect(() => parseEpw(epwText(lines), 'tmy-leap.epw', { timestampYear: 2021 })).toThrow(/timestampYear.*leap year/);
  });

  it('accepts a trailing empty 36th field', () => {
    const s = parseEpw(epwText(hoursOf(2019, 1, 1).map((l) => l + ',')), 'trailing.epw');
    expect(s.count).toBe(744);
  });
});

// ---- bad files -----------------------------------------------------------------------------
function withLine(lineNo: number, edit: (line: string) => string): string {
  const lines = REAL.split('\n');
  lines[lineNo - 1] = edit(lines[lineNo - 1]!);
  return lines.join('\n');
}
function withField(lineNo: number, field: number, value: string): string {
  return withLine(lineNo, (l) => {
    const f = l.split(',');
    f[field - 1] = value;
    return f.join(',');
  });
}

const BAD: [string, () => string, RegExp[]][] = [
  ['empty file', () => '', [/line 1\b/, /empty/]],
  ['blank lines only', () => '\n\r\n  \n', [/line 1\b/, /empty/]],
  ['header only', () => REAL_LINES.slice(0, 8).join('\n') + '\n', [/line 9\b/, /no data lines/]],
  ['header cut short', () => REAL_LINES.slice(0, 5).join('\n'), [/line 6\b/, /COMMENTS 1/]],
  ['wrong header keyword', () => withLine(3, () => 'TYPICAL PERIODS,0'), [/line 3\b/, /TYPICAL\/EXTREME PERIODS/]],
  ['truncated data line', () => withLine(10, (l) => l.slice(0, 60)), [/line 10\b/, /35 comma-separated fields/]],
  ['letters in a numeric field', () => withField(12, 7, '2.O4'), [/line 12, field 7 \(Dry Bulb Temperature\)/, /expected a number/, /"2\.O4"/]],
  ['letters in the wind speed', () => withField(4000, 22, 'calm'), [/line 4000, field 22 \(Wind Speed\)/, /a number/]],
  ['hour 25', () => withField(11, 4, '25'), [/line 11, field 4 \(Hour\)/, /hour 1\.\.24/]],
  ['hour 0', () => withField(11, 4, '0'), [/line 11, field 4 \(Hour\)/, /hour 1\.\.24/]],
  ['fractional hour', () => withField(11, 4, '3.5'), [/line 11, field 4 \(Hour\)/]],
  ['month 13', () => withField(20, 2, '13'), [/line 20, field 2 \(Month\)/, /month 1\.\.12/]],
  ['31 April', () => withLine(2200, (l) => l.replace(/^\d+,\d+,\d+,/, '2013,4,31,')), [/line 2200, field 3 \(Day\)/, /day 1\.\.30/]],
  ['34 fields', () => withLine(9, (l) => l.split(',').slice(0, 34).join(',')), [/line 9\b/, /34 field/, /35 comma-separated fields/]],
  ['36 fields', () => withLine(9, (l) => l + ',7'), [/line 9\b/, /36 field/]],
  ['blank line inside the data', () => withLine(500, () => ''), [/line 500\b/, /blank line/]],
  ['latitude 123', () => withField(1, 7, '123.0'), [/line 1, field 7 \(Latitude\)/, /\[-90, 90\]/]],
  ['longitude 200', () => withField(1, 8, '200'), [/line 1, field 8 \(Longitude\)/]],
  ['time zone 15', () => withField(1, 9, '15'), [/line 1, field 9 \(TimeZone\)/]],
  ['elevation not a number', () => withField(1, 10, 'high'), [/line 1, field 10 \(Elevation\)/, /a number/]],
  ['LOCATION too short', () => withLine(1, () => 'LOCATION,x,-,y,z,0,45,8'), [/line 1, field 9 \(TimeZone\)/]],
  ['7 records per hour', () => withField(8, 3, '7'), [/line 8, field 3 \(Number of Records per hour\)/]],
  ['duplicate hour', () => withLine(10, () => REAL_LINES[8]!), [/line 10\b/, /duplicate/]],
  [
    'hours swapped',
    () => {
      const l = REAL.split('\n');
      [l[9], l[10]] = [l[10]!, l[9]!];
      return l.join('\n');
    },
    [/line 11\b/, /out of order/],
  ],
  [
    'hours swapped inside a month of another source year',
    () => {
      const l = REAL.split('\n');
      [l[4699], l[4700]] = [l[4700]!, l[4699]!];
      return l.join('\n');
    },
    [/line 4701\b/, /out of order/],
  ],
  [
    '29 February in a non-leap single-year file',
    () => epwText([...hoursOf(2019, 2, 2), ...hoursOf(2019, 2, 2).slice(0, 24).map((l) => l.replace(/^2019,2,1,/, '2019,2,29,'))]),
    [/line 681\b/, /29 February/],
  ],
];

describe('parseEpw refuses bad files with the file name and the line', () => {
  for (const [what, make, patterns] of BAD) {
    it(what, () => {
      let err: unknown;
      try {
        parseEpw(make(), 'bad-site.epw');
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(InputError);
      const msg = (err as InputError).message;
      expect(msg.startsWith('bad-site.epw: line ')).toBe(true);
      expect((err as InputError).file).toBe('bad-site.epw');
      for (const p of patterns) expect(msg).toMatch(p);
    });
  }
});
