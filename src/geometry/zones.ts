/**
 * Zones → sensor grids: the points where the audit computes MRT and UTCI.
 *
 * - Polygon zones (project `zones[]`): a horizontal polygon (x, y in metres, engine frame after the
 *   model transform), a floor height and a sensor height; sensors on a regular grid aligned to the
 *   polygon's bounding box, offset by half a spacing, kept where inside the polygon (even–odd rule).
 *   A polygon too small to hold a grid point gets one sensor at its area centroid (or, for a concave
 *   polygon whose centroid is outside, at the middle of the widest inside span through it).
 * - Surface zones: sensors over the upward-facing triangles of a named surface (a roof terrace, a
 *   balcony slab), at a height above the surface.
 * Sensors inside solid geometry are dropped and counted, through a caller-supplied test
 * (`isInsideSolid`; the audit wires in a traced ray-parity test) or `isInsideByParity` here.
 */
import { InputError } from '../physics/errors.ts';
import type { SceneArrays } from './sceneArrays.ts';

/** Tells whether a point [m] lies inside closed solid geometry. */
export type InsideSolidTest = (xM: number, yM: number, zM: number) => boolean;

/** A polygon zone as in the project file. */
export interface ZonePolygonSpec {
  name: string;
  /** Corners (x, y) [m], engine frame; either winding; not closed (last ≠ first, or repeated: both fine). */
  polygon: ReadonlyArray<ReadonlyArray<number>>;
  /** Floor height [m]. */
  floorZ: number;
  /** Sensor height above the floor [m]. */
  sensorHeightM: number;
  /** Grid spacing [m]. */
  spacingM: number;
}

/** A zone on the upward-facing triangles of one named surface of the scene. */
export interface SurfaceZoneSpec {
  name: string;
  /** A name from scene.surfaceNames. */
  surfaceName: string;
  /** Sensor height above the surface [m]. */
  sensorHeightM: number;
  /** Grid spacing [m]. */
  spacingM: number;
  /** Steepest triangle still counted as upward-facing [deg]. Default 30. */
  maxSlopeDeg?: number;
}

export interface SensorGridOptions {
  /** Drops sensors for which this returns true (counted in `droppedInsideSolid`). */
  isInsideSolid?: InsideSolidTest;
  /** Key path for error messages, e.g. "zones[2]". */
  place?: string;
  /** File for error messages (the project file). */
  file?: string;
}

/** A zone's sensors. */
export interface SensorGrid {
  zoneName: string;
  count: number;
  /** xyz per sensor [m], engine frame, ordered by row (y) then column (x). */
  positions: Float64Array;
  /** Sensors dropped because they were inside solid geometry. */
  droppedInsideSolid: number;
  /** True when the grid had no point inside and the single fallback point was used. */
  usedFallbackPoint: boolean;
}

function positive(value: number, place: string, file: string | undefined, what: string): void {
  if (!Number.isFinite(value) || value <= 0) {
    throw new InputError({ problem: 'not a positive number', file, place, value, expected: what });
  }
}

function finite(value: number, place: string, file: string | undefined, what: string): void {
  if (!Number.isFinite(value)) throw new InputError({ problem: 'not a finite number', file, place, value, expected: what });
}

/** Checks a polygon and returns it as flat xy (a closing repeat of the first corner removed). */
export function checkPolygon(polygon: ReadonlyArray<ReadonlyArray<number>>, place: string, file?: string): Float64Array {
  if (!Array.isArray(polygon) || polygon.length < 3) {
    throw new InputError({ problem: 'polygon needs at least 3 corners', file, place, value: polygon, expected: '[[x, y], [x, y], [x, y], ...] in metres' });
  }
  const pts: number[] = [];
  polygon.forEach((p, k) => {
    if (!Array.isArray(p) || p.length !== 2 || !Number.isFinite(p[0]) || !Number.isFinite(p[1])) {
      throw new InputError({ problem: 'not an [x, y] pair of finite numbers', file, place: `${place}[${k}]`, value: p, expected: '[x, y] in metres' });
    }
    pts.push(p[0]!, p[1]!);
  });
  const n0 = pts.length;
  if (n0 > 6 && pts[0] === pts[n0 - 2] && pts[1] === pts[n0 - 1]) pts.length = n0 - 2;
  const flat = Float64Array.from(pts);
  if (!(Math.abs(polygonSignedAreaM2(flat)) > 0)) {
    throw new InputError({ problem: 'polygon has zero area', file, place, value: polygon, expected: 'corners that enclose an area' });
  }
  return flat;
}

/** Signed area (counter-clockwise positive) of a flat xy polygon [m²] (shoelace formula). */
export function polygonSignedAreaM2(xy: ArrayLike<number>): number {
  const n = xy.length / 2;
  let s = 0;
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    s += xy[i * 2]! * xy[j * 2 + 1]! - xy[j * 2]! * xy[i * 2 + 1]!;
  }
  return s / 2;
}

/** Even–odd point-in-polygon test (crossing number) for a flat xy polygon. */
export function pointInPolygon(x: number, y: number, xy: ArrayLike<number>): boolean {
  const n = xy.length / 2;
  let inside = false;
  for (let i = 0, j = n - 1; i < n; j = i++) {
    const xi = xy[i * 2]!, yi = xy[i * 2 + 1]!, xj = xy[j * 2]!, yj = xy[j * 2 + 1]!;
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

/** Area centroid of a flat xy polygon. */
export function polygonCentroid(xy: ArrayLike<number>): [number, number] {
  const n = xy.length / 2;
  let a = 0, cx = 0, cy = 0;
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    const xi = xy[i * 2]!, yi = xy[i * 2 + 1]!, xj = xy[j * 2]!, yj = xy[j * 2 + 1]!;
    const c = xi * yj - xj * yi;
    a += c;
    cx += (xi + xj) * c;
    cy += (yi + yj) * c;
  }
  return [cx / (3 * a), cy / (3 * a)];
}

/** A point surely inside: the centroid if inside, else the middle of the widest span on its row. */
function interiorPoint(xy: Float64Array): [number, number] {
  const [cx, cy] = polygonCentroid(xy);
  if (pointInPolygon(cx, cy, xy)) return [cx, cy];
  let yLine = cy;
  let minY = Infinity, maxY = -Infinity;
  for (let i = 1; i < xy.length; i += 2) {
    minY = Math.min(minY, xy[i]!);
    maxY = Math.max(maxY, xy[i]!);
  }
  for (let attempt = 0; attempt < 8; attempt++) {
    const xs: number[] = [];
    const n = xy.length / 2;
    for (let i = 0, j = n - 1; i < n; j = i++) {
      const xi = xy[i * 2]!, yi = xy[i * 2 + 1]!, xj = xy[j * 2]!, yj = xy[j * 2 + 1]!;
      if (yi > yLine !== yj > yLine) xs.push(((xj - xi) * (yLine - yi)) / (yj - yi) + xi);
    }
    xs.sort((p, q) => p - q);
    let best = -1, bestW = 0;
    for (let k = 0; k + 1 < xs.length; k += 2) {
      const w = xs[k + 1]! - xs[k]!;
      if (w > bestW) {
        bestW = w;
        best = k;
      }
    }
    if (best >= 0) return [(xs[best]! + xs[best + 1]!) / 2, yLine];
    yLine = minY + ((maxY - minY) * (attempt + 1)) / 9; // the centroid's row touched a vertex: try others
  }
  return [cx, cy];
}

/**
 * Sensor grid of a polygon zone: grid points (minX + (i + ½)s, minY + (j + ½)s) inside the
 * polygon, at z = floorZ + sensorHeightM; at least one sensor (see module comment).
 * @param zone polygon [m], floorZ [m], sensorHeightM [m], spacingM [m]
 * @param opts inside-solid test, and the key path / file for error messages
 */
export function sensorGridForPolygon(zone: ZonePolygonSpec, opts: SensorGridOptions = {}): SensorGrid {
  const place = opts.place ?? `zone "${zone.name}"`;
  const file = opts.file;
  const xy = checkPolygon(zone.polygon, `${place}.polygon`, file);
  finite(zone.floorZ, `${place}.floorZ`, file, 'a height in metres');
  finite(zone.sensorHeightM, `${place}.sensorHeightM`, file, 'a height in metres');
  positive(zone.spacingM, `${place}.spacingM`, file, 'a grid spacing > 0 m');
  const s = zone.spacingM;
  let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
  for (let i = 0; i < xy.length; i += 2) {
    minX = Math.min(minX, xy[i]!);
    maxX = Math.max(maxX, xy[i]!);
    minY = Math.min(minY, xy[i + 1]!);
    maxY = Math.max(maxY, xy[i + 1]!);
  }
  if ((maxX - minX) / s > 1e4 || (maxY - minY) / s > 1e4) {
    throw new InputError({ problem: 'grid too large', file, place: `${place}.spacingM`, value: s, expected: 'at most 10 000 sensors along a side of the zone' });
  }
  const z = zone.floorZ + zone.sensorHeightM;
  const pts: number[] = [];
  for (let j = 0; ; j++) {
    const y = minY + (j + 0.5) * s;
    if (y >= maxY) break;
    for (let i = 0; ; i++) {
      const x = minX + (i + 0.5) * s;
      if (x >= maxX) break;
      if (pointInPolygon(x, y, xy)) pts.push(x, y, z);
    }
  }
  let usedFallbackPoint = false;
  if (pts.length === 0) {
    const [x, y] = interiorPoint(xy);
    pts.push(x, y, z);
    usedFallbackPoint = true;
  }
  return finishGrid(zone.name, pts, usedFallbackPoint, opts.isInsideSolid);
}

function finishGrid(name: string, pts: number[], usedFallbackPoint: boolean, inside: InsideSolidTest | undefined): SensorGrid {
  let dropped = 0;
  const kept: number[] = [];
  for (let k = 0; k < pts.length; k += 3) {
    if (inside && inside(pts[k]!, pts[k + 1]!, pts[k + 2]!)) {
      dropped++;
      continue;
    }
    kept.push(pts[k]!, pts[k + 1]!, pts[k + 2]!);
  }
  return { zoneName: name, count: kept.length / 3, positions: Float64Array.from(kept), droppedInsideSolid: dropped, usedFallbackPoint };
}

/**
 * Sensor grid over the upward-facing triangles of a named surface: grid points over the xy bounding
 * box of those triangles (offset by half a spacing), each placed `sensorHeightM` above the highest
 * upward triangle under it. At least one sensor (above the centroid of the largest triangle).
 * @param scene the scene (engine frame)
 * @param zone surface name, sensor height above it [m], spacing [m], steepest slope [deg]
 */
export function sensorGridOnSurface(scene: SceneArrays, zone: SurfaceZoneSpec, opts: SensorGridOptions = {}): SensorGrid {
  const place = opts.place ?? `zone "${zone.name}"`;
  const file = opts.file;
  const sid = scene.surfaceNames.indexOf(zone.surfaceName);
  if (sid < 0) {
    const some = scene.surfaceNames.slice(0, 12).join(', ') + (scene.surfaceNames.length > 12 ? ', ...' : '');
    throw new InputError({ problem: 'no surface of that name in the model', file, place: `${place}.surfaceName`, value: zone.surfaceName, expected: `one of: ${some}` });
  }
  finite(zone.sensorHeightM, `${place}.sensorHeightM`, file, 'a height in metres');
  positive(zone.spacingM, `${place}.spacingM`, file, 'a grid spacing > 0 m');
  const maxSlopeDeg = zone.maxSlopeDeg ?? 30;
  if (!(maxSlopeDeg >= 0 && maxSlopeDeg < 90)) {
    throw new InputError({ problem: 'outside the valid range', file, place: `${place}.maxSlopeDeg`, value: maxSlopeDeg, expected: 'an angle in [0, 90) degrees' });
  }
  const minNz = Math.cos((maxSlopeDeg * Math.PI) / 180);
  const pos = scene.positions, idx = scene.indices;
  const tris: number[] = [];
  let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
  let bestTri = -1, bestArea = 0;
  for (let t = 0; t < scene.surfaceIds.length; t++) {
    if (scene.surfaceIds[t] !== sid) continue;
    const a = idx[t * 3]! * 3, b = idx[t * 3 + 1]! * 3, c = idx[t * 3 + 2]! * 3;
    const e1x = pos[b]! - pos[a]!, e1y = pos[b + 1]! - pos[a + 1]!, e1z = pos[b + 2]! - pos[a + 2]!;
    const e2x = pos[c]! - pos[a]!, e2y = pos[c + 1]! - pos[a + 1]!, e2z = pos[c + 2]! - pos[a + 2]!;
    const nx = e1y * e2z - e1z * e2y, ny = e1z * e2x - e1x * e2z, nz = e1x * e2y - e1y * e2x;
    const len = Math.hypot(nx, ny, nz);
    if (!(len > 0) || nz / len < minNz) continue;
    tris.push(t);
    if (len > bestArea) {
      bestArea = len;
      bestTri = t;
    }
    for (const p of [a, b, c]) {
      minX = Math.min(minX, pos[p]!);
      maxX = Math.max(maxX, pos[p]!);
      minY = Math.min(minY, pos[p + 1]!);
      maxY = Math.max(maxY, pos[p + 1]!);
    }
  }
  if (tris.length === 0) {
    throw new InputError({ problem: 'surface has no upward-facing triangles', file, place: `${place}.surfaceName`, value: zone.surfaceName, expected: `a surface with triangles sloped at most ${maxSlopeDeg}°` });
  }
  const s = zone.spacingM;
  const nxCells = Math.max(0, Math.ceil((maxX - minX) / s - 0.5));
  const nyCells = Math.max(0, Math.ceil((maxY - minY) / s - 0.5));
  if (nxCells > 1e4 || nyCells > 1e4) {
    throw new InputError({ problem: 'grid too large', file, place: `${place}.spacingM`, value: s, expected: 'at most 10 000 sensors along a side of the zone' });
  }
  const topZ = new Float64Array(nxCells * nyCells).fill(-Infinity);
  for (const t of tris) {
    const a = idx[t * 3]! * 3, b = idx[t * 3 + 1]! * 3, c = idx[t * 3 + 2]! * 3;
    const ax = pos[a]!, ay = pos[a + 1]!, az = pos[a + 2]!;
    const bx = pos[b]!, by = pos[b + 1]!, bz = pos[b + 2]!;
    const cx = pos[c]!, cy = pos[c + 1]!, cz = pos[c + 2]!;
    const det = (bx - ax) * (cy - ay) - (cx - ax) * (by - ay); // > 0 (upward facing)
    const i0 = Math.max(0, Math.floor((Math.min(ax, bx, cx) - minX) / s - 0.5));
    const i1 = Math.min(nxCells - 1, Math.ceil((Math.max(ax, bx, cx) - minX) / s - 0.5));
    const j0 = Math.max(0, Math.floor((Math.min(ay, by, cy) - minY) / s - 0.5));
    const j1 = Math.min(nyCells - 1, Math.ceil((Math.max(ay, by, cy) - minY) / s - 0.5));
    const eps = -1e-9 * det;
    for (let j = j0; j <= j1; j++) {
      const y = minY + (j + 0.5) * s;
      for (let i = i0; i <= i1; i++) {
        const x = minX + (i + 0.5) * s;
        const w1 = ((x - ax) * (cy - ay) - (cx - ax) * (y - ay)) / det;
        const w2 = ((bx - ax) * (y - ay) - (x - ax) * (by - ay)) / det;
        const w0 = 1 - w1 - w2;
        if (w0 * det < eps || w1 * det < eps || w2 * det < eps) continue;
        const zz = w0 * az + w1 * bz + w2 * cz;
        const cell = j * nxCells + i;
        if (zz > topZ[cell]!) topZ[cell] = zz;
      }
    }
  }
  const pts: number[] = [];
  for (let j = 0; j < nyCells; j++) {
    for (let i = 0; i < nxCells; i++) {
      const zz = topZ[j * nxCells + i]!;
      if (zz > -Infinity) pts.push(minX + (i + 0.5) * s, minY + (j + 0.5) * s, zz + zone.sensorHeightM);
    }
  }
  let usedFallbackPoint = false;
  if (pts.length === 0) {
    const a = idx[bestTri * 3]! * 3, b = idx[bestTri * 3 + 1]! * 3, c = idx[bestTri * 3 + 2]! * 3;
    pts.push(
      (pos[a]! + pos[b]! + pos[c]!) / 3,
      (pos[a + 1]! + pos[b + 1]! + pos[c + 1]!) / 3,
      (pos[a + 2]! + pos[b + 2]! + pos[c + 2]!) / 3 + zone.sensorHeightM,
    );
    usedFallbackPoint = true;
  }
  return finishGrid(zone.name, pts, usedFallbackPoint, opts.isInsideSolid);
}

/** Fixed, non-axis-aligned ray directions for the parity test (unit vectors). */
const PARITY_DIRS = [
  [0.5773502691896258, 0.41239304942116123, 0.7044940642339567],
  [-0.6246950475544243, 0.7027819284987273, -0.3403669570744624],
  [0.2357022603955158, -0.8997354935830002, -0.3674234614174767],
].map((d) => {
  const l = Math.hypot(d[0]!, d[1]!, d[2]!);
  return [d[0]! / l, d[1]! / l, d[2]! / l] as const;
});

/**
 * Brute-force inside test over the raw triangles: casts three fixed rays from the point and counts
 * the triangles each crosses (Möller & Trumbore 1997 ray–triangle test, both sides); the point is
 * inside when at least two of the three counts are odd (the vote guards against a ray grazing an
 * edge). Assumes closed (watertight) solids; the ground plane is not a solid. O(triangles), for
 * tests and small scenes.
 * @param xM, yM, zM the point [m]
 */
export function isInsideByParity(scene: SceneArrays, xM: number, yM: number, zM: number): boolean {
  const pos = scene.positions, idx = scene.indices;
  const n = idx.length / 3;
  let oddVotes = 0;
  for (const [dx, dy, dz] of PARITY_DIRS) {
    let crossings = 0;
    for (let t = 0; t < n; t++) {
      const a = idx[t * 3]! * 3, b = idx[t * 3 + 1]! * 3, c = idx[t * 3 + 2]! * 3;
      const e1x = pos[b]! - pos[a]!, e1y = pos[b + 1]! - pos[a + 1]!, e1z = pos[b + 2]! - pos[a + 2]!;
      const e2x = pos[c]! - pos[a]!, e2y = pos[c + 1]! - pos[a + 1]!, e2z = pos[c + 2]! - pos[a + 2]!;
      const px = dy * e2z - dz * e2y, py = dz * e2x - dx * e2z, pz = dx * e2y - dy * e2x;
      const det = e1x * px + e1y * py + e1z * pz;
      if (det === 0) continue;
      const inv = 1 / det;
      const tx = xM - pos[a]!, ty = yM - pos[a + 1]!, tz = zM - pos[a + 2]!;
      const u = (tx * px + ty * py + tz * pz) * inv;
      if (u < 0 || u > 1) continue;
      const qx = ty * e1z - tz * e1y, qy = tz * e1x - tx * e1z, qz = tx * e1y - ty * e1x;
      const v = (dx * qx + dy * qy + dz * qz) * inv;
      if (v < 0 || u + v > 1) continue;
      const dist = (e2x * qx + e2y * qy + e2z * qz) * inv;
      if (dist > 0) crossings++;
    }
    if (crossings % 2 === 1) oddVotes++;
  }
  return oddVotes >= 2;
}
