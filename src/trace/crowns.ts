/**
 * Semi-transparent things along a ray: tree crowns as Beer–Lambert volumes (analytic ray–ellipsoid
 * chords) and fabric sheets (device triangles with a transmittance). No allocation per call.
 *
 * Crowns: τ_ray = Π_i exp(−k_i · L_i), L_i the length [m] of the ray's part inside ellipsoid i
 * clipped to t in [0, tMax], k_i the crown's extinction [1/m] on the day (`crownExtinctionForDay`,
 * convention of src/physics/vegetation.ts: k = −ln τ / crown height, so the vertical chord through
 * the centre passes exactly the crown's stated τ). Reference: Beer–Lambert law for canopies,
 * G. S. Campbell and J. M. Norman, An Introduction to Environmental Biophysics, 2nd ed., Springer,
 * 1998, ch. 15 (from memory).
 *
 * Chord: with the ellipsoid scaled to the unit sphere, q(t) = (o − c)/r + t·d/r, solve |q(t)|² = 1:
 * a t² + 2 b t + c0 = 0, a = |d/r|², b = (o − c)/r · d/r, c0 = |(o − c)/r|² − 1; the roots
 * t = (−b ± √(b² − a c0)) / a bound the inside, and L = (min(t₊, tMax) − max(t₋, 0))⁺ · |d|.
 *
 * Longwave: crowns emit at air temperature (common practice); a view ray that crosses crowns sees
 * them with weight 1 − τ_ray (and what lies behind with τ_ray).
 */
import type { CrownSet } from '../geometry/generators/tree.ts';
import { CROWN_SEASON_FLOATS, CROWN_SHAPE_FLOATS } from '../geometry/generators/tree.ts';
import { crownExtinctionPerM, seasonalCrownTransmittance, type CrownSeason } from '../physics/vegetation.ts';
import { InputError } from '../physics/errors.ts';
import type { BvhData } from './bvh/build.ts';
import { intersectClosestMasked, makeClosestHit } from './bvh/query.ts';

/**
 * Length [m] of the part of the ray o + t·d, t in [0, tMax], inside the axis-aligned ellipsoid
 * with centre c and semi-axes r (t in units of |d|; d need not be unit).
 * @param cx centre x [m] (cy, cz alike)
 * @param rx semi-axis along x [m] (ry, rz alike)
 * @param ox origin x [m] (oy, oz alike)
 * @param dx direction x (dy, dz alike)
 * @param tMax end of the ray (Infinity for none)
 * @returns chord length [m], 0 when missed
 * @example ellipsoidChordM(0, 0, 0, 1, 1, 1, -5, 0.5, 0, 1, 0, 0, Infinity) // 2·√(1 − 0.25) = 1.732…
 */
export function ellipsoidChordM(
  cx: number, cy: number, cz: number, rx: number, ry: number, rz: number,
  ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMax: number,
): number {
  const qx = (ox - cx) / rx, qy = (oy - cy) / ry, qz = (oz - cz) / rz;
  const ux = dx / rx, uy = dy / ry, uz = dz / rz;
  const a = ux * ux + uy * uy + uz * uz;
  if (!(a > 0)) return 0;
  const b = qx * ux + qy * uy + qz * uz;
  const c0 = qx * qx + qy * qy + qz * qz - 1;
  const disc = b * b - a * c0;
  if (!(disc > 0)) return 0;
  const s = Math.sqrt(disc);
  // numerically stable pair of roots
  const qr = b >= 0 ? -(b + s) : -(b - s);
  let t0 = qr / a, t1 = qr !== 0 ? c0 / qr : -t0;
  if (t0 > t1) { const tmp = t0; t0 = t1; t1 = tmp; }
  if (t0 < 0) t0 = 0;
  if (t1 > tMax) t1 = tMax;
  if (!(t1 > t0)) return 0;
  return (t1 - t0) * Math.sqrt(dx * dx + dy * dy + dz * dz);
}

/**
 * Beam fraction passed by all crowns along the ray o + t·d, t in [0, tMax].
 * Fast rejects: the union box of all crowns, then each crown's box (slab tests), before the exact
 * ellipsoid chord.
 * @param crowns the crowns
 * @param ox origin x [m] (oy, oz alike)
 * @param dx direction x (dy, dz alike; need not be unit, t is in units of |d|)
 * @param tMax end of the ray, e.g. the distance to the first opaque hit (Infinity for none)
 * @param extinctionPerM k per crown [1/m] (crownExtinctionForDay)
 * @returns Π exp(−k_i L_i) in (0, 1]
 */
export function crownTransmittance(
  crowns: CrownSet, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMax: number,
  extinctionPerM: Float64Array | Float32Array,
): number {
  const n = crowns.count;
  if (n === 0) return 1;
  const ix = 1 / dx, iy = 1 / dy, iz = 1 / dz;
  const bb = crowns.bounds;
  if (!slab(bb[0]!, bb[1]!, bb[2]!, bb[3]!, bb[4]!, bb[5]!, ox, oy, oz, ix, iy, iz, tMax)) return 1;
  const e = crowns.ellipsoids;
  let opticalDepth = 0;
  for (let i = 0; i < n; i++) {
    const o = i * CROWN_SHAPE_FLOATS;
    const cx = e[o]!, cy = e[o + 1]!, cz = e[o + 2]!, rx = e[o + 3]!, ry = e[o + 4]!, rz = e[o + 5]!;
    if (!slab(cx - rx, cy - ry, cz - rz, cx + rx, cy + ry, cz + rz, ox, oy, oz, ix, iy, iz, tMax)) continue;
    const k = extinctionPerM[i]!;
    if (!(k > 0)) continue;
    const L = ellipsoidChordM(cx, cy, cz, rx, ry, rz, ox, oy, oz, dx, dy, dz, tMax);
    if (L > 0) opticalDepth += k * L;
  }
  return opticalDepth > 0 ? Math.exp(-opticalDepth) : 1;
}

/**
 * Slab test of the ray against a box on t in [0, tMax] (1/d given; 1/0 = ±Infinity is fine; an
 * origin exactly on a slab plane with a zero direction component gives NaN, which the comparisons
 * ignore, so the test stays conservative — the exact chord follows).
 */
function slab(
  x0: number, y0: number, z0: number, x1: number, y1: number, z1: number,
  ox: number, oy: number, oz: number, ix: number, iy: number, iz: number, tMax: number,
): boolean {
  let tn = 0, tf = tMax;
  let a = (x0 - ox) * ix, b = (x1 - ox) * ix;
  if (a > b) { const t = a; a = b; b = t; }
  if (a > tn) tn = a; if (b < tf) tf = b;
  if (!(tn <= tf)) return false;
  a = (y0 - oy) * iy; b = (y1 - oy) * iy;
  if (a > b) { const t = a; a = b; b = t; }
  if (a > tn) tn = a; if (b < tf) tf = b;
  if (!(tn <= tf)) return false;
  a = (z0 - oz) * iz; b = (z1 - oz) * iz;
  if (a > b) { const t = a; a = b; b = t; }
  if (a > tn) tn = a; if (b < tf) tf = b;
  return tn <= tf;
}

/**
 * Extinction coefficient of every crown on a day [1/m] (seasonal τ over the crown height).
 * @param crowns the crowns
 * @param dayOfYear 1..365 (vegetation.ts `dayOfYearLocal`)
 * @param out target of crowns.count numbers (allocated when absent)
 */
export function crownExtinctionForDay(crowns: CrownSet, dayOfYear: number, out?: Float64Array): Float64Array {
  const k = out ?? new Float64Array(crowns.count);
  if (k.length < crowns.count) {
    throw new InputError({ problem: 'output too short', place: 'crownExtinctionForDay out', expected: `at least ${crowns.count} numbers`, value: k.length });
  }
  const s = crowns.seasons;
  const season: CrownSeason = { summerTransmittance: 1, winterTransmittance: 1, leafOnDayOfYear: 1, leafOffDayOfYear: 2, transitionDays: 0 };
  for (let i = 0; i < crowns.count; i++) {
    const o = i * CROWN_SEASON_FLOATS;
    season.summerTransmittance = s[o]!; season.winterTransmittance = s[o + 1]!;
    season.leafOnDayOfYear = s[o + 2]!; season.leafOffDayOfYear = s[o + 3]!; season.transitionDays = s[o + 4]!;
    const tau = seasonalCrownTransmittance(season, dayOfYear);
    // vertical chord through the centre = 2·rz = the crown height
    k[i] = crownExtinctionPerM(tau, 2 * crowns.ellipsoids[i * CROWN_SHAPE_FLOATS + 5]!);
  }
  return k;
}

/**
 * Crown transmittance for rays [start, end) (6 floats each: ox oy oz dx dy dz), each ray to
 * t = tMax[i] (or one tMax for all); out[i] = τ.
 */
export function crownTransmittanceBatch(
  crowns: CrownSet, rays: Float32Array | Float64Array, tMax: number | Float32Array | Float64Array,
  extinctionPerM: Float64Array | Float32Array, out: Float32Array | Float64Array, start = 0, end = -1,
): void {
  const n = Math.floor(rays.length / 6);
  if (end < 0) end = n;
  if (rays.length % 6 !== 0 || start < 0 || end > n || start > end || out.length < end) {
    throw new InputError({ problem: 'bad ray range or output', place: 'crownTransmittanceBatch', expected: `six floats per ray, 0 <= start <= end <= ${n}, out.length >= end`, value: [rays.length, start, end, out.length] });
  }
  for (let i = start; i < end; i++) {
    const o = i * 6;
    const tm = typeof tMax === 'number' ? tMax : tMax[i]!;
    out[i] = crownTransmittance(crowns, rays[o]!, rays[o + 1]!, rays[o + 2]!, rays[o + 3]!, rays[o + 4]!, rays[o + 5]!, tm, extinctionPerM);
  }
}

const sheetHit = makeClosestHit();
/** Most sheet faces one ray is followed through. */
export const MAX_SHEET_CROSSINGS = 64;
/** Step past a face hit before looking for the next [m]. */
const SHEET_STEP_M = 1e-6;

/**
 * Beam fraction passed by the semi-transparent device sheets (fabric) along a ray, t in [tMin, tMax].
 * Each fabric sheet is a closed thin solid, so a ray through it crosses two faces; each face crossed
 * multiplies by √τ, so one sheet passes τ. Opaque triangles are ignored here (test them with
 * `isOccludedMasked(..., skipSemiTransparent)`); coincident hits (a shared edge) count once.
 * @param bvh the BVH of the scene the device build describes
 * @param triangleTransmittance per ORIGINAL triangle τ (DeviceBuild.triangleTransmittance)
 * @param skipOpaque per ORIGINAL triangle, 1 where opaque (DeviceBuild.skipOpaque)
 */
export function sheetTransmittance(
  bvh: BvhData, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
  triangleTransmittance: Float32Array, skipOpaque: Uint8Array,
): number {
  const step = SHEET_STEP_M / Math.sqrt(dx * dx + dy * dy + dz * dz);
  let tau = 1;
  let t0 = tMin;
  for (let k = 0; k < MAX_SHEET_CROSSINGS; k++) {
    if (!intersectClosestMasked(bvh, ox, oy, oz, dx, dy, dz, t0, tMax, sheetHit, skipOpaque)) break;
    tau *= Math.sqrt(triangleTransmittance[sheetHit.triangle]!);
    t0 = sheetHit.t + step;
    if (tau === 0) break;
  }
  return tau;
}
