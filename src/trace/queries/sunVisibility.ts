/**
 * Sun visibility: for P receiver points and S sun directions, whether the ray from the point to the
 * sun's centre is unobstructed (DESIGN §4 `sunlit`). Any-hit rays (`isOccluded`).
 *
 * Rules:
 * - A sun direction at or below the horizon (d_z <= 0) gives 0: not sunlit (DESIGN §4).
 * - With normals given, the origin is moved `normalOffsetM` along the normal (self-hit guard), and a
 *   receiver whose normal faces away from the sun (n·s <= 0) gives 0: its surface gets no beam.
 * - The ground plane (groundPlane.ts) never blocks sun rays from points above it; a point below it
 *   (after the offset) is always shaded.
 *
 * Output layout: `Uint8Array`, row-major by receiver, element (i − start)·S + s, 1 = sunlit.
 *
 * `batchRays: true` traces the rays of blocks of receivers with one `occludedBatch` call each
 * (the WebAssembly kernel when loaded). The batch API stores rays in float32, so origins and
 * directions are rounded to float32 and a ray grazing an edge can flip: results may differ
 * slightly from the default per-ray (float64) path. Decisions made without tracing (sun down,
 * facing away, below the ground plane) are the same on both paths.
 */
import type { BvhData } from '../bvh/build.ts';
import { isOccluded } from '../bvh/query.ts';
import { occludedBatch } from '../bvh/batch.ts';
import { BLOCK_RAYS, ensureRayScratch, scratch } from './rayScratch.ts';
import { groundCrossingT, groundZOf, type GroundPlaneInput } from './groundPlane.ts';
import { requireMatchingTriples, requireNonNegative, requireRange, requireTriples } from './inputChecks.ts';
import { InputError } from '../../physics/errors.ts';

/** Default origin offset along the receiver normal [m]. */
export const DEFAULT_NORMAL_OFFSET_M = 1e-3;
/** Default nearest accepted hit distance [m]. */
export const DEFAULT_T_MIN_M = 1e-4;

export interface SunVisibilityInput {
  /** xyz per receiver [m]. */
  points: Float32Array | Float64Array;
  /** Optional unit normal per receiver (surfaces); absent for free points (sensors). */
  normals?: Float32Array | Float64Array | undefined;
  /** Direction toward the sun per time step, xyz (normalised here) [-]. */
  sunDirections: Float32Array | Float64Array;
  /** Optional ground plane. */
  ground?: GroundPlaneInput | null | undefined;
  /** Origin offset along the normal [m] (default 1e-3). */
  normalOffsetM?: number | undefined;
  /** Nearest accepted hit [m] (default 1e-4). */
  tMinM?: number | undefined;
  /** Trace with the batch kernel (float32 rays; may differ slightly from the default path). */
  batchRays?: boolean | undefined;
}

/** Number of receivers of a sun-visibility input (after checking it). */
export function sunVisibilityReceiverCount(input: SunVisibilityInput): number {
  return requireTriples(input.points, 'sunVisibility points');
}

/**
 * Sun visibility of receivers [start, end) for every sun direction.
 * @param bvh Scene BVH
 * @param input Points, optional normals, sun directions, ground
 * @param start First receiver (default 0)
 * @param end One past the last receiver (default all)
 * @param out Optional target of (end − start)·S bytes
 * @returns 1 = sunlit, 0 = shaded or sun down, row-major by receiver
 */
export function sunVisibility(
  bvh: BvhData,
  input: SunVisibilityInput,
  start = 0,
  end = -1,
  out?: Uint8Array,
): Uint8Array {
  const count = requireTriples(input.points, 'sunVisibility points');
  if (end < 0) end = count;
  requireRange(start, end, count, 'sunVisibility start/end');
  requireMatchingTriples(input.normals, count, 'sunVisibility normals');
  const sunCount = requireTriples(input.sunDirections, 'sunVisibility sunDirections');
  const offset = input.normalOffsetM ?? DEFAULT_NORMAL_OFFSET_M;
  const tMin = input.tMinM ?? DEFAULT_T_MIN_M;
  requireNonNegative(offset, 'sunVisibility normalOffsetM', '[m]');
  requireNonNegative(tMin, 'sunVisibility tMinM', '[m]');
  const rows = end - start;
  const result = out ?? new Uint8Array(rows * sunCount);
  if (result.length < rows * sunCount) {
    throw new InputError({ problem: 'output too short', place: 'sunVisibility out', expected: `at least ${rows * sunCount} bytes`, value: result.length });
  }
  // Unit sun directions, once per call (not per ray).
  const sun = new Float64Array(sunCount * 3);
  for (let s = 0; s < sunCount; s++) {
    const x = input.sunDirections[s * 3]!, y = input.sunDirections[s * 3 + 1]!, z = input.sunDirections[s * 3 + 2]!;
    const len = Math.hypot(x, y, z);
    if (!(len > 0) || !Number.isFinite(len)) {
      throw new InputError({ problem: 'sun direction is zero or not finite', place: `sunVisibility sunDirections[${s}]`, expected: 'a non-zero finite vector', value: [x, y, z] });
    }
    sun[s * 3] = x / len;
    sun[s * 3 + 1] = y / len;
    sun[s * 3 + 2] = z / len;
  }
  const gz = groundZOf(input.ground);
  const pts = input.points;
  const nrm = input.normals;
  const empty = bvh.triangleCount === 0;
  if (input.batchRays === true && !empty) {
    sunVisibilityBatched(bvh, pts, nrm, offset, tMin, sun, sunCount, gz, start, end, result);
    return result;
  }
  for (let i = start; i < end; i++) {
    let ox = pts[i * 3]!, oy = pts[i * 3 + 1]!, oz = pts[i * 3 + 2]!;
    let nx = 0, ny = 0, nz = 0;
    if (nrm !== undefined) {
      nx = nrm[i * 3]!;
      ny = nrm[i * 3 + 1]!;
      nz = nrm[i * 3 + 2]!;
      ox += nx * offset;
      oy += ny * offset;
      oz += nz * offset;
    }
    const row = (i - start) * sunCount;
    for (let s = 0; s < sunCount; s++) {
      const dx = sun[s * 3]!, dy = sun[s * 3 + 1]!, dz = sun[s * 3 + 2]!;
      let lit = 0;
      if (dz > 0 && (nrm === undefined || nx * dx + ny * dy + nz * dz > 0)) {
        if (groundCrossingT(gz, oz, dz) === Infinity) {
          lit = empty || !isOccluded(bvh, ox, oy, oz, dx, dy, dz, tMin, Infinity) ? 1 : 0;
        }
      }
      result[row + s] = lit;
    }
  }
  return result;
}

/** Traces the rays of `sunVisibility` in blocks of about BLOCK_RAYS with `occludedBatch`. */
function sunVisibilityBatched(
  bvh: BvhData, pts: Float32Array | Float64Array, nrm: Float32Array | Float64Array | undefined, offset: number, tMin: number,
  sun: Float64Array, sunCount: number, gz: number, start: number, end: number, result: Uint8Array,
): void {
  ensureRayScratch(BLOCK_RAYS + sunCount);
  const rays = scratch.rays, target = scratch.target, flags = scratch.flags;
  let m = 0;
  for (let i = start; i < end; i++) {
    let ox = pts[i * 3]!, oy = pts[i * 3 + 1]!, oz = pts[i * 3 + 2]!;
    let nx = 0, ny = 0, nz = 0;
    if (nrm !== undefined) {
      nx = nrm[i * 3]!;
      ny = nrm[i * 3 + 1]!;
      nz = nrm[i * 3 + 2]!;
      ox += nx * offset;
      oy += ny * offset;
      oz += nz * offset;
    }
    const row = (i - start) * sunCount;
    for (let s = 0; s < sunCount; s++) {
      const dx = sun[s * 3]!, dy = sun[s * 3 + 1]!, dz = sun[s * 3 + 2]!;
      result[row + s] = 0;
      if (dz > 0 && (nrm === undefined || nx * dx + ny * dy + nz * dz > 0) && groundCrossingT(gz, oz, dz) === Infinity) {
        const o = m * 6;
        rays[o] = ox; rays[o + 1] = oy; rays[o + 2] = oz;
        rays[o + 3] = dx; rays[o + 4] = dy; rays[o + 5] = dz;
        target[m++] = row + s;
      }
    }
    if (m >= BLOCK_RAYS || i === end - 1) {
      if (m > 0) occludedBatch(bvh, rays, tMin, Infinity, flags, 0, m);
      for (let j = 0; j < m; j++) result[target[j]!] = flags[j] === 0 ? 1 : 0;
      m = 0;
    }
  }
}
