/**
 * Long-form CSV exports of the Results (DESIGN §4): one row per element per time step, written as
 * chunks of a few hundred kB so a year on thousands of patches (tens of millions of rows) never
 * becomes one string. RFC 4180: fields holding a comma, a double quote, CR or LF are quoted, with
 * quotes doubled; records end in CRLF; the first record is the header.
 *
 * Numbers have fixed decimals: temperatures 2, W/m² 1, positions 3, sky view factor 4. A value
 * that is not finite is written as an empty field; "-0.00" is written "0.00". `sunlit` is 1 or 0
 * (so a column sum counts sunlit steps); `category` is the UTCI category id.
 */
import type { Results } from './results.ts';

export const CSV_RECORD_END = '\r\n';
export const SURFACES_CSV_HEADER = 'id,surface,material,time,incidentShortwaveWm2,surfaceTempC,longwaveEmissionWm2';
export const SENSORS_CSV_HEADER = 'zone,sensor,x,y,z,skyViewFactor,time,sunlit,mrtC,utciC,category';

/** Characters per yielded chunk, roughly (a chunk ends at a record end once it passes this). */
export const CSV_CHUNK_CHARS = 256 * 1024;

const NEEDS_QUOTES = /[",\r\n]/;

/** One RFC 4180 field: as is, or in double quotes with inner quotes doubled. */
export function csvField(text: string): string {
  return NEEDS_QUOTES.test(text) ? '"' + text.replace(/"/g, '""') + '"' : text;
}

/** Fixed-decimal number; empty for NaN/±Infinity; no negative zero. */
export function csvNumber(value: number | undefined, decimals: number): string {
  if (value === undefined || !Number.isFinite(value)) return '';
  const s = value.toFixed(decimals);
  // (-0.001).toFixed(2) is "-0.00": drop the sign of a value that rounds to zero.
  return s.charCodeAt(0) === 45 /* - */ && NEGATIVE_ZERO.test(s) ? s.slice(1) : s;
}
const NEGATIVE_ZERO = /^-0(\.0*)?$/;

/**
 * `surfaces.csv`: header `id,surface,material,time,incidentShortwaveWm2,surfaceTempC,longwaveEmissionWm2`,
 * then one record per patch per step (patch-major: all steps of the first patch, then the next).
 *
 * @param results The audit's results.
 * @returns Chunks of CSV text to be written in order.
 * @example [...surfacesCsvChunks(r)].join('').split('\r\n')[0] // → the header
 */
export function* surfacesCsvChunks(results: Results): Generator<string, void, undefined> {
  const times = results.times.map(csvField);
  let buf = SURFACES_CSV_HEADER + CSV_RECORD_END;
  for (const s of results.surfaces) {
    const head = csvField(s.id) + ',' + csvField(s.surface) + ',' + csvField(s.material) + ',';
    for (let t = 0; t < times.length; t++) {
      buf +=
        head +
        times[t] + ',' +
        csvNumber(s.incidentShortwaveWm2[t], 1) + ',' +
        csvNumber(s.surfaceTempC[t], 2) + ',' +
        csvNumber(s.longwaveEmissionWm2[t], 1) + CSV_RECORD_END;
      if (buf.length >= CSV_CHUNK_CHARS) {
        yield buf;
        buf = '';
      }
    }
  }
  if (buf.length > 0) yield buf;
}

/**
 * `sensors.csv`: header `zone,sensor,x,y,z,skyViewFactor,time,sunlit,mrtC,utciC,category`, then one
 * record per sensor per step (zone by zone, sensor-major). `sensor` is the 0-based index in the
 * zone's `sensors`.
 *
 * @param results The audit's results.
 * @returns Chunks of CSV text to be written in order.
 * @example [...sensorsCsvChunks(r)].join('').split('\r\n')[1] // → 'patio,0,1.000,2.000,1.100,0.8300,<time>,1,55.20,36.40,strong-heat'
 */
export function* sensorsCsvChunks(results: Results): Generator<string, void, undefined> {
  const times = results.times.map(csvField);
  let buf = SENSORS_CSV_HEADER + CSV_RECORD_END;
  for (const z of results.zones) {
    const zone = csvField(z.name);
    for (let si = 0; si < z.sensors.length; si++) {
      const s = z.sensors[si] as Results['zones'][number]['sensors'][number];
      const head =
        zone + ',' + si + ',' +
        csvNumber(s.position[0], 3) + ',' + csvNumber(s.position[1], 3) + ',' + csvNumber(s.position[2], 3) + ',' +
        csvNumber(s.skyViewFactor, 4) + ',';
      for (let t = 0; t < times.length; t++) {
        const lit = s.sunlit[t];
        const cat = s.category[t];
        buf +=
          head +
          times[t] + ',' +
          (lit === undefined ? '' : lit ? '1' : '0') + ',' +
          csvNumber(s.mrtC[t], 2) + ',' +
          csvNumber(s.utciC[t], 2) + ',' +
          (cat === undefined ? '' : csvField(cat)) + CSV_RECORD_END;
        if (buf.length >= CSV_CHUNK_CHARS) {
          yield buf;
          buf = '';
        }
      }
    }
  }
  if (buf.length > 0) yield buf;
}
