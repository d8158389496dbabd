import { readFileSync } from 'node:fs';
import { describe, it, expect } from 'vitest';
import { InputError } from '../../../src/physics/errors.ts';
import { isoWithOffsetToMs, parseWeatherCsv } from '../../../src/physics/weather/index.ts';

const NAME = 'invented-hourly.csv';
const TEXT = readFileSync(new URL(`../../fixtures/weather/${NAME}`, import.meta.url), 'utf8');
const MIN = 60_000;

describe('isoWithOffsetToMs', () => {
  // source: ISO 8601-1:2019 (date-time with UTC offset); expected instants from Date.UTC; tolerance 0 ms
  it('reads offsets in all written forms', () => {
    expect(isoWithOffsetToMs('2026-07-21T14:00:00+02:00')).toBe(Date.UTC(2026, 6, 21, 12));
    expect(isoWithOffsetToMs('2026-07-21T14:00+0200')).toBe(Date.UTC(2026, 6, 21, 12));
    expect(isoWithOffsetToMs('2026-07-21 14:00:00+02')).toBe(Date.UTC(2026, 6, 21, 12));
    expect(isoWithOffsetToMs('2026-07-21T12:00Z')).toBe(Date.UTC(2026, 6, 21, 12));
    expect(isoWithOffsetToMs('2026-01-01T00:00:00-03:30')).toBe(Date.UTC(2026, 0, 1, 3, 30));
    expect(isoWithOffsetToMs('2024-02-29T23:59:59.5+05:45')).toBe(Date.UTC(2024, 1, 29, 18, 14, 59, 500));
    expect(isoWithOffsetToMs('0050-03-01T00:00:00Z')).toBe(new Date('0050-03-01T00:00:00Z').getTime());
  });
  it('refuses times without an offset or with impossible parts', () => {
    for (const s of ['2026-07-21T14:00:00', '2026-02-29T00:00Z', '2026-07-21T24:00Z', '2026-13-01T00:00Z', '2026-07-21T14:00+15:00', 'noon', '']) {
      expect(Number.isNaN(isoWithOffsetToMs(s)), s).toBe(true);
    }
  });
  it('matches its TSDoc example', () => {
    expect(isoWithOffsetToMs('2026-07-21T14:00:00+02:00')).toBe(Date.UTC(2026, 6, 21, 12));
  });
});

describe('parseWeatherCsv on the invented fixture', () => {
  const s = parseWeatherCsv(TEXT, NAME);
  it('reads rows, times and values', () => {
    // source: the fixture as written (invented data); times: 10:00+02:00 = 08:00Z
    expect(s.format).toBe('csv');
    expect(s.count).toBe(4);
    expect(s.timeMs[0]).toBe(Date.UTC(2026, 6, 21, 8));
    expect(s.timeMs[3]).toBe(Date.UTC(2026, 6, 21, 11));
    expect(s.intervalMinutes).toBe(60);
    expect(s.dryBulbC[3]).toBe(28.75);
    expect(s.ghiWm2[2]).toBe(790);
    expect(s.dniWm2[1]).toBe(610);
    expect(s.dhiWm2[0]).toBe(150);
    expect(s.windSpeedMs[3]).toBe(3.0);
    expect(s.location).toBeNull();
  });
  it('treats empty cells as missing and absent columns as all missing', () => {
    expect(Number.isNaN(s.relativeHumidityPct[1]!)).toBe(true);
    expect(s.relativeHumidityPct[2]).toBe(48);
    expect(s.missing.relativeHumidityPct).toBe(1);
    expect(Number.isNaN(s.windSpeedMs[2]!)).toBe(true);
    expect(s.missing.windSpeedMs).toBe(1);
    expect(s.present.dewPointC).toBe(false);
    expect(s.missing.dewPointC).toBe(4);
    expect([...s.dewPointC].every(Number.isNaN)).toBe(true); // not derived from RH here
    expect(s.present.pressurePa).toBe(false);
    expect(s.present.dryBulbC).toBe(true);
    expect(s.missing.dryBulbC).toBe(0);
  });
  it('warns about the unknown column instead of failing', () => {
    expect(s.warnings.some((w) => w.includes('"cloudiness"') && w.includes('line 2'))).toBe(true);
  });
  it('takes the stamp as the interval midpoint unless told otherwise', () => {
    // DESIGN §3: a step stands for its interval's midpoint unless the file says otherwise
    expect(s.timeStampMeaning).toBe('interval-midpoint');
    expect(s.midpointTimeMs).toEqual(s.timeMs);
    const start = parseWeatherCsv(TEXT, NAME, { timeStampMeaning: 'interval-start' });
    expect(start.midpointTimeMs[0]).toBe(start.timeMs[0]! + 30 * MIN);
    const end = parseWeatherCsv(TEXT, NAME, { timeStampMeaning: 'interval-end', intervalMinutes: 60 });
    expect(end.midpointTimeMs[0]).toBe(end.timeMs[0]! - 30 * MIN);
  });
  it('keeps a caller-given location and checks it', () => {
    const loc = { name: 'harbour', latitudeDeg: 52.1, longitudeDeg: 4.3, timeZoneHours: 1, elevationM: 5 };
    expect(parseWeatherCsv(TEXT, NAME, { location: loc }).location).toEqual(loc);
    expect(() => parseWeatherCsv(TEXT, NAME, { location: { ...loc, latitudeDeg: 123 } })).toThrow(
      /invented-hourly\.csv: option location\.latitudeDeg/,
    );
  });
});

describe('parseWeatherCsv details', () => {
  it('handles a BOM, CRLF, comments and trailing blank lines', () => {
    const s = parseWeatherCsv('\uFEFFtime,airTempC\r\n# note\r\n2026-07-21T10:00Z,20\r\n2026-07-21T10:30Z,21\r\n\r\n', 'a.csv');
    expect(s.count).toBe(2);
    expect(s.intervalMinutes).toBe(30);
    expect(s.dryBulbC[1]).toBe(21);
  });
  it('sets out-of-range values to NaN, counts and names them', () => {
    // source: EPW Data Dictionary ranges reused for our CSV: RH \maximum 110
    const s = parseWeatherCsv('time,airTempC,relativeHumidityPct\n2026-07-21T10:00Z,20,150\n2026-07-21T11:00Z,21,60\n', 'a.csv');
    expect(Number.isNaN(s.relativeHumidityPct[0]!)).toBe(true);
    expect(s.invalid.relativeHumidityPct).toBe(1);
    expect(s.warnings.some((w) => w.includes('relativeHumidityPct') && w.includes('line 2'))).toBe(true);
  });
  it('warns about gaps and uneven steps', () => {
    const s = parseWeatherCsv('time,airTempC\n2026-07-21T10:00Z,20\n2026-07-21T11:00Z,21\n2026-07-21T14:00Z,22\n2026-07-21T14:30Z,22\n', 'a.csv');
    expect(s.warnings.some((w) => w.includes('gap') && w.includes('line 4'))).toBe(true);
    expect(s.warnings.some((w) => w.includes('shorter') && w.includes('line 5'))).toBe(true);
  });
  it('accepts a single row with a warning about its interval', () => {
    const s = parseWeatherCsv('time,airTempC\n2026-07-21T10:00Z,20\n', 'a.csv');
    expect(s.intervalMinutes).toBe(60);
    expect(s.warnings.some((w) => w.includes('single row'))).toBe(true);
  });
  it('matches its TSDoc example', () => {
    const s = parseWeatherCsv('time,airTempC\n2026-07-21T14:00:00+02:00,31.5\n', 'site.csv');
    expect(s.dryBulbC[0]).toBe(31.5);
    expect(s.timeMs[0]).toBe(Date.UTC(2026, 6, 21, 12));
  });
});

const BAD: [string, string, RegExp[]][] = [
  ['empty file', '', [/line 1\b/, /empty/]],
  ['header only', 'time,airTempC\n', [/line 2\b/, /no data rows/]],
  ['no time column', 'when,airTempC\n1,2\n', [/line 1\b/, /no "time" column/]],
  ['no air temperature', 'time,relativeHumidityPct\n2026-07-21T10:00Z,50\n', [/line 1\b/, /airTempC/]],
  ['duplicate column', 'time,airTempC,airTempC\n2026-07-21T10:00Z,1,2\n', [/line 1, column 3\b/, /twice/]],
  ['empty column name', 'time,,airTempC\n2026-07-21T10:00Z,1,2\n', [/line 1, column 2\b/]],
  ['time without offset', 'time,airTempC\n2026-07-21T10:00Z,1\n2026-07-21T11:00,2\n', [/line 3, column 1 \(time\)/, /with offset/]],
  ['letters in a number', 'time,airTempC,windMs\n2026-07-21T10:00Z,1,2\n2026-07-21T11:00Z,1,fast\n', [/line 3, column 3 \(windMs\)/, /a number/]],
  ['too few cells', 'time,airTempC,windMs\n2026-07-21T10:00Z,1\n', [/line 2\b/, /2 cell/, /3 cells/]],
  ['duplicate time', 'time,airTempC\n2026-07-21T10:00Z,1\n2026-07-21T12:00+02:00,2\n', [/line 3, column 1 \(time\)/, /duplicate/]],
  ['out of order', 'time,airTempC\n2026-07-21T10:00Z,1\n2026-07-21T09:00Z,2\n', [/line 3, column 1 \(time\)/, /out of order/]],
];

describe('parseWeatherCsv refuses bad files with the file name, line and column', () => {
  for (const [what, text, patterns] of BAD) {
    it(what, () => {
      let err: unknown;
      try {
        parseWeatherCsv(text, 'bad-site.csv');
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(InputError);
      const msg = (err as InputError).message;
      expect(msg.startsWith('bad-site.csv: line ')).toBe(true);
      for (const p of patterns) expect(msg).toMatch(p);
    });
  }
  it('refuses a bad option', () => {
    expect(() => parseWeatherCsv('time,airTempC\n2026-07-21T10:00Z,1\n', 'a.csv', { intervalMinutes: -5 })).toThrow(InputError);
  });
});
