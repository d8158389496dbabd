import { describe, it, expect } from 'vitest';
import {
  surfacesCsvChunks,
  sensorsCsvChunks,
  csvField,
  csvNumber,
  SURFACES_CSV_HEADER,
  SENSORS_CSV_HEADER,
  CSV_CHUNK_CHARS,
} from '../../src/audit/csv.ts';
import type { Results } from '../../src/audit/results.ts';

// Invented data: these tests check the file format, not physics.

/** A strict RFC 4180 reader, independent of the writer: returns records of fields. */
function parseCsv(text: string): string[][] {
  const records: string[][] = [];
  let field = '';
  let record: string[] = [];
  let i = 0;
  let quoted = false;
  while (i < text.length) {
    const c = text[i]!;
    if (quoted) {
      if (c === '"') {
        if (text[i + 1] === '"') { field += '"'; i += 2; continue; }
        quoted = false; i++; continue;
      }
      field += c; i++; continue;
    }
    if (c === '"' && field === '') { quoted = true; i++; continue; }
    if (c === ',') { record.push(field); field = ''; i++; continue; }
    if (c === '\r' && text[i + 1] === '\n') { record.push(field); records.push(record); record = []; field = ''; i += 2; continue; }
    if (c === '"' || c === '\r' || c === '\n') throw new Error(`bare ${JSON.stringify(c)} at ${i}`);
    field += c; i++;
  }
  if (field !== '' || record.length > 0) throw new Error('last record not terminated by CRLF');
  return records;
}

function example(): Results {
  const times = ['2026-07-21T12:00:00+02:00', '2026-07-21T13:00:00+02:00'];
  return {
    sunfacet: 1, project: 'p', timeConvention: 'interval midpoint', times,
    sun: times.map(() => ({ altitudeDeg: 50, azimuthDeg: 180 })),
    weather: { airTempC: [], relativeHumidityPct: [], windMs: [], dniWm2: [], dhiWm2: [], ghiWm2: [], skyLongwaveWm2: [] },
    zones: [
      {
        name: 'patio, "north"', posture: 'standing', sensorHeightM: 1.1, droppedSensors: 0,
        sensors: [
          { position: [1, 2.0004, 1.1], skyViewFactor: 0.83, sunlit: [true, false], mrtC: [55.204, -0.001], utciC: [36.4, NaN], category: ['strong-heat', 'no-stress'] },
        ],
      },
      {
        name: 'balcony', posture: 'seated', sensorHeightM: 0.6, droppedSensors: 0,
        sensors: [
          { position: [-3.5, 0, 10.6], skyViewFactor: 0.123456, sunlit: [false, false], mrtC: [30, 31], utciC: [25, 26], category: ['no-stress', 'no-stress'] },
          { position: [-2.5, 0, 10.6], skyViewFactor: 1, sunlit: [true, true], mrtC: [50, 51], utciC: [30, 31], category: ['moderate-heat', 'moderate-heat'] },
        ],
      },
    ],
    surfaces: [
      {
        id: 'wall,s-0', surface: 'wall,s', material: 'steel "dark"\npainted', centroid: [0, 0, 0], normal: [0, -1, 0], areaM2: 1,
        incidentShortwaveWm2: [612.34, Infinity], surfaceTempC: [48.125, 30], longwaveEmissionWm2: [580.06, 470],
      },
      {
        id: 'ground-0', surface: 'ground', material: 'concrete', centroid: [0, 0, 0], normal: [0, 0, 1], areaM2: 4,
        incidentShortwaveWm2: [700, 0.04], surfaceTempC: [40, 29.999], longwaveEmissionWm2: [540, 470],
      },
    ],
    warnings: [], run: {},
  };
}

describe('csvField and csvNumber', () => {
  it('quotes only what RFC 4180 requires and doubles quotes', () => {
    expect(csvField('plain')).toBe('plain');
    expect(csvField('a,b')).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField('two\nlines')).toBe('"two\nlines"');
    expect(csvField('')).toBe('');
  });
  it('writes fixed decimals, empty for non-finite, never negative zero', () => {
    expect(csvNumber(48.125, 2)).toBe('48.13');
    expect(csvNumber(1, 3)).toBe('1.000');
    expect(csvNumber(-0.001, 2)).toBe('0.00');
    expect(csvNumber(-0, 1)).toBe('0.0');
    expect(csvNumber(-0.006, 2)).toBe('-0.01');
    expect(csvNumber(NaN, 2)).toBe('');
    expect(csvNumber(-Infinity, 2)).toBe('');
    expect(csvNumber(undefined, 2)).toBe('');
  });
});

describe('surfacesCsvChunks', () => {
  it('writes the header and one record per patch per step, names round-tripping through a strict reader', () => {
    const text = [...surfacesCsvChunks(example())].join('');
    const rows = parseCsv(text);
    expect(rows[0]!.join(',')).toBe(SURFACES_CSV_HEADER);
    expect(rows).toHaveLength(1 + 2 * 2);
    expect(rows[1]).toEqual(['wall,s-0', 'wall,s', 'steel "dark"\npainted', '2026-07-21T12:00:00+02:00', '612.3', '48.13', '580.1']);
    expect(rows[2]).toEqual(['wall,s-0', 'wall,s', 'steel "dark"\npainted', '2026-07-21T13:00:00+02:00', '', '30.00', '470.0']);
    expect(rows[4]).toEqual(['ground-0', 'ground', 'concrete', '2026-07-21T13:00:00+02:00', '0.0', '30.00', '470.0']);
    for (const r of rows) expect(r).toHaveLength(7);
  });
});

describe('sensorsCsvChunks', () => {
  it('writes the header and one record per sensor per step, zone by zone', () => {
    const rows = parseCsv([...sensorsCsvChunks(example())].join(''));
    expect(rows[0]!.join(',')).toBe(SENSORS_CSV_HEADER);
    expect(rows).toHaveLength(1 + 3 * 2);
    expect(rows[1]).toEqual(['patio, "north"', '0', '1.000', '2.000', '1.100', '0.8300', '2026-07-21T12:00:00+02:00', '1', '55.20', '36.40', 'strong-heat']);
    expect(rows[2]).toEqual(['patio, "north"', '0', '1.000', '2.000', '1.100', '0.8300', '2026-07-21T13:00:00+02:00', '0', '0.00', '', 'no-stress']);
    expect(rows[3]).toEqual(['balcony', '0', '-3.500', '0.000', '10.600', '0.1235', '2026-07-21T12:00:00+02:00', '0', '30.00', '25.00', 'no-stress']);
    expect(rows[6]).toEqual(['balcony', '1', '-2.500', '0.000', '10.600', '1.0000', '2026-07-21T13:00:00+02:00', '1', '51.00', '31.00', 'moderate-heat']);
  });

  it('streams a large result in bounded chunks that each end on a record boundary', () => {
    const steps = 500;
    const times = Array.from({ length: steps }, (_, t) => `2026-07-21T${String(t % 24).padStart(2, '0')}:00:00+02:00`);
    const sensors = Array.from({ length: 400 }, (_, i) => ({
      position: [i, 0, 1.1] as [number, number, number], skyViewFactor: 0.5,
      sunlit: times.map((_, t) => t % 2 === 0), mrtC: times.map((_, t) => 20 + (t % 40)), utciC: times.map(() => 25), category: times.map(() => 'no-stress' as const),
    }));
    const r = { ...example(), times, zones: [{ name: 'plaza', posture: 'standing' as const, sensorHeightM: 1.1, droppedSensors: 0, sensors }] };
    let chunks = 0, records = 0, maxLen = 0;
    for (const c of sensorsCsvChunks(r)) {
      chunks++;
      maxLen = Math.max(maxLen, c.length);
      expect(c.endsWith('\r\n')).toBe(true);
      for (let i = c.indexOf('\r\n'); i >= 0; i = c.indexOf('\r\n', i + 2)) records++;
    }
    expect(records).toBe(1 + 400 * steps);
    expect(chunks).toBeGreaterThan(20);
    expect(maxLen).toBeLessThan(CSV_CHUNK_CHARS + 200); // at most one record past the target
  });
});
