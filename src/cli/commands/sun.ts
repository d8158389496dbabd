import type { Command } from '../command.ts';
import { parseIsoTime } from '../../physics/time.ts';
import { sunPosition } from '../../physics/solarPosition.ts';

export const sunCommand: Command = {
  name: 'sun',
  summary: 'Sun position (altitude, azimuth clockwise from north, zenith) for a site and time',
  usage: 'sunfacet sun --lat <deg> --lon <deg> --time <iso 8601 with offset> [--json]',
  options: {
    lat: { type: 'number', min: -90, max: 90, unit: 'degrees north', required: true, value: '<deg>', help: 'latitude' },
    lon: { type: 'number', min: -180, max: 180, unit: 'degrees east', required: true, value: '<deg>', help: 'longitude' },
    time: { type: 'string', required: true, value: '<iso>', help: 'time with offset, e.g. 2026-07-21T14:00:00+02:00' },
    json: { type: 'boolean', help: 'print {altitudeDeg, azimuthDeg, zenithDeg} as JSON' },
  },
  details: 'Altitude is refraction-corrected; azimuth is measured clockwise from true north (0 N, 90 E, 180 S, 270 W).',
  async run({ options }, io) {
    const { timeMs } = parseIsoTime(String(options.time), '--time');
    const p = sunPosition(timeMs, options.lat as number, options.lon as number);
    const r = { altitudeDeg: round(p.altitudeDeg, 4), azimuthDeg: round(p.azimuthDeg, 4), zenithDeg: round(p.zenithDeg, 4) };
    if (options.json) io.out(JSON.stringify(r) + '\n');
    else io.out(`altitude ${r.altitudeDeg.toFixed(4)}°\nazimuth  ${r.azimuthDeg.toFixed(4)}° (clockwise from north)\nzenith   ${r.zenithDeg.toFixed(4)}°\n`);
    return 0;
  },
};

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}
