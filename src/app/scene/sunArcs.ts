/**
 * Sun-path arcs for the overlay: the sun's positions through one day (every few minutes while it
 * is up) as points on a dome, plus the whole-hour marks. Engine frame (x east, y north, z up).
 * Pure; the sun positions come from src/physics/solarPosition.ts (NREL SPA).
 */
import { sunPositionInto, type SunPosition } from '../../physics/solarPosition.ts';

export interface SunArc {
  /** xyz per sample on a dome of radius `radiusM` around `centre` [m], sun above the horizon only. */
  points: number[];
  /** xyz of each whole local hour with the sun up [m]. */
  hourMarks: number[];
  /** Local clock hour of each mark. */
  hours: number[];
}

const _sun: SunPosition = { altitudeDeg: 0, azimuthDeg: 0, zenithDeg: 0, altitudeGeometricDeg: 0, dirX: 0, dirY: 0, dirZ: 0 };

/**
 * The arc of one local day.
 * @param midnightMs local midnight of the day [epoch ms]
 * @param offsetMinutes the site's UTC offset that day [min], for the hour marks
 * @param stepMinutes sampling of the arc [min]
 */
export function sunArc(
  midnightMs: number,
  site: { latitudeDeg: number; longitudeDeg: number; elevationM?: number },
  centre: readonly [number, number, number],
  radiusM: number,
  stepMinutes = 10,
): SunArc {
  const points: number[] = [];
  const hourMarks: number[] = [];
  const hours: number[] = [];
  const opts = site.elevationM !== undefined ? { elevationM: site.elevationM } : undefined;
  for (let m = 0; m <= 24 * 60; m += stepMinutes) {
    sunPositionInto(midnightMs + m * 60_000, site.latitudeDeg, site.longitudeDeg, _sun, opts);
    if (_sun.altitudeDeg < 0) continue;
    const p = [centre[0] + _sun.dirX * radiusM, centre[1] + _sun.dirY * radiusM, centre[2] + _sun.dirZ * radiusM] as const;
    points.push(p[0], p[1], p[2]);
    if (m % 60 === 0 && m < 24 * 60) {
      hourMarks.push(p[0], p[1], p[2]);
      hours.push(m / 60);
    }
  }
  return { points, hourMarks, hours };
}

/** Local midnight [epoch ms] of the day of an ISO stamp with offset ("2026-07-15T13:00:00+02:00"). */
export function localMidnightMs(stamp: string): number {
  const m = /^(\d{4}-\d\d-\d\d)T.*?(Z|[+-]\d\d:\d\d)$/.exec(stamp);
  if (!m) return NaN;
  return Date.parse(`${m[1]}T00:00:00${m[2] === 'Z' ? 'Z' : m[2]}`);
}
