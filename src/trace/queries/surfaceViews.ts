/**
 * Surface views: for each receiver, the fraction of its (cosine-weighted) view that lands on each
 * patch, on the ground and on the sky, so the audit can sum longwave εσT⁴ and reflected shortwave
 * from the surroundings without re-tracing.
 *
 * Receivers and directions:
 * - `directions: 'normal'` (patches): one view per receiver, the cosine-weighted hemisphere around
 *   its own normal; the origin is offset `normalOffsetM` along the normal.
 * - `directions: 'six'` (sensors): six views per receiver, in the order of `SIX_DIRECTIONS`
 *   (up, down, east, south, west, north): each is the cosine-weighted hemisphere of a small plane
 *   facing that way, as the six-directional MRT method needs (VDI 3787 Part 2; Thorsson et al. 2007).
 *
 * Method: `samplesPerDirection` cosine-weighted directions on a jittered side × side grid
 * (sampling.ts), traced with closest-hit rays. A hit triangle maps to its patch through the
 * caller's `trianglePatch` (per ORIGINAL triangle index; −1 = geometry that is no patch, counted in
 * `otherFraction`). A ray that meets the ground plane first, or leaves the model downward, counts as
 * ground; one that leaves upward (d_z >= 0) as sky (groundPlane.ts). Each sample weighs 1/N, so
 * sky + ground + other + Σ patches = 1 per row exactly (up to float32 rounding of the stored values).
 *
 * Consistency with skyVisibility: skyFraction here and skyViewFactor there estimate the same
 * integral (the cosine-weighted visible sky of the same plane) with independent samples; they agree
 * within the sampling error of both (checked in the tests), and both are exact in an open field.
 *
 * Accuracy with the default 1024 samples per direction: standard error below about 0.003 on any
 * fraction near a sharp edge (jittered stratification); the coaxial-disc test checks ±0.01.
 *
 * Determinism: receiver i draws from stream i of `seed` (or streamIndex[i] when given, so a subset
 * of receivers traced alone gets the numbers of a full run; see skyVisibility.ts).
 *
 * Tree crowns (optional `crowns` with `crownExtinctionPerM`): a ray that crosses crowns before what
 * it meets (patch, ground, sky, other geometry) counts τ_ray toward that and 1 − τ_ray toward the
 * crowns (crowns.ts, Beer–Lambert up to the hit). Crowns emit longwave at air temperature and
 * reflect no shortwave (common practice), which is how the audit already treats `otherFraction`
 * (geometry that is no patch), so the crown part is ADDED to otherFraction; `crownFraction` reports
 * it separately (a part of otherFraction, not in addition to it). Rows still sum to 1. With no
 * crown on a ray τ = 1 exactly, so the numbers equal those of a run without crowns.
 *
 * `batchRays: true`: per receiver, all its rays (every direction) are generated first, traced with
 * one `closestBatch` call (the WebAssembly kernel when loaded) with no far limit, then counted in
 * the per-ray path's order. A ray whose ground-plane crossing tG is finite counts its hit only when
 * the hit is nearer than tG; when the float32 hit distance is within 1e-5 (relative) of tG the ray
 * is re-traced per ray with tMax = tG. The batch API stores rays and hit distances in float32, so a
 * ray grazing an edge can flip and crown transmittances use the float32 distance: the numbers may
 * differ slightly from the default (float64, per-ray) path.
 *
 * Output: CSR-like typed arrays, one row per (receiver, direction), row r = (i − start)·D + d:
 * entries rowStart[r] .. rowStart[r+1]−1 of patchIndex (ascending) and fraction.
 */
import type { BvhData } from '../bvh/build.ts';
import type { SampledQueryOptions } from './sampledQueryOptions.ts';
import { intersectClosest, makeClosestHit } from '../bvh/query.ts';
import { closestBatch } from '../bvh/batch.ts';
import { ensureRayScratch, scratch } from './rayScratch.ts';
import { InputError } from '../../physics/errors.ts';
import { createRandomState, DEFAULT_SEED, nextFloat, seedRandom } from '../random.ts';
import { buildFrame, frameToWorld, sampleCosineHemisphere } from '../sampling.ts';
import { groundCrossingT, groundZOf } from './groundPlane.ts';
import { requireMatchingTriples, requireNonNegative, requireRange, requireSquareCount, requireTriples } from './inputChecks.ts';
import { DEFAULT_NORMAL_OFFSET_M, DEFAULT_T_MIN_M } from './sunVisibility.ts';
import { checkStreamsAndCrowns } from './skyVisibility.ts';
import { crownTransmittance } from '../crowns.ts';

/** Default samples per receiver direction (a 32 × 32 jittered grid). */
export const DEFAULT_VIEW_SAMPLES = 1024;
/** Batch path: hits within this relative distance of the ground crossing are re-traced per ray. */
const BATCH_NEAR_GROUND = 1e-5;
/** Substream id of this query in random.ts. */
export const SURFACE_VIEWS_SUBSTREAM = 2;

/** The six directions of the MRT method, xyz each: up, down, east, south, west, north. */
export const SIX_DIRECTIONS: readonly number[] = Object.freeze([0, 0, 1, 0, 0, -1, 1, 0, 0, 0, -1, 0, -1, 0, 0, 0, 1, 0]);
/** Names of `SIX_DIRECTIONS`, in order. */
export const SIX_DIRECTION_NAMES = ['up', 'down', 'east', 'south', 'west', 'north'] as const;

export type ViewDirections = 'normal' | 'six';

export interface SurfaceViewsInput extends SampledQueryOptions {
  /** xyz per receiver [m]. */
  points: Float32Array | Float64Array;
  /** Unit normal per receiver; required for `directions: 'normal'`. */
  normals?: Float32Array | Float64Array | undefined;
  /** 'normal' (default when normals are given) or 'six' (default otherwise). */
  directions?: ViewDirections | undefined;
  /** Patch index per ORIGINAL triangle of the BVH, or −1 for geometry that is no patch. */
  trianglePatch: Int32Array;
  /** Number of patches (patch indices are < this). */
  patchCount: number;
  /** Samples per receiver direction, a perfect square (default 1024). */
  samplesPerDirection?: number | undefined;
}

export interface SurfaceViewsResult {
  /** Views per receiver: 1 ('normal') or 6 ('six'). */
  directionsPerReceiver: number;
  /** rows + 1 offsets into patchIndex / fraction. */
  rowStart: Uint32Array;
  /** Patch seen, ascending within a row. */
  patchIndex: Uint32Array;
  /** Fraction of the row's view on that patch [-]. */
  fraction: Float32Array;
  /** Per row: fraction on open sky [-]. */
  skyFraction: Float32Array;
  /** Per row: fraction on the ground (plane, or beyond the model below the horizon) [-]. */
  groundFraction: Float32Array;
  /** Per row: fraction on triangles with no patch (trianglePatch −1), and on tree crowns when given [-]. */
  otherFraction: Float32Array;
  /**
   * Per row, only with crowns and only from a direct call (the pool's merge keeps the fields above):
   * the part of otherFraction that is tree crowns [-].
   */
  crownFraction?: Float32Array;
}

export function surfaceViewsReceiverCount(input: SurfaceViewsInput): number {
  return requireTriples(input.points, 'surfaceViews points');
}

/** Views per receiver for an input. */
export function surfaceViewsDirections(input: SurfaceViewsInput): number {
  return resolveMode(input) === 'six' ? 6 : 1;
}

function resolveMode(input: SurfaceViewsInput): ViewDirections {
  const mode = input.directions ?? (input.normals !== undefined ? 'normal' : 'six');
  if (mode !== 'normal' && mode !== 'six') {
    throw new InputError({ problem: 'unknown view mode', place: 'surfaceViews directions', expected: '"normal" or "six"', value: mode });
  }
  if (mode === 'normal' && input.normals === undefined) {
    throw new InputError({ problem: 'normals missing', place: 'surfaceViews normals', expected: 'a unit normal per receiver for directions "normal"' });
  }
  return mode;
}

const _rng = createRandomState();
const _dir = new Float64Array(3);
const _local = new Float64Array(3);
const _frame = new Float64Array(9);
const _hit = makeClosestHit();

/**
 * Surface views of receivers [start, end).
 * @param bvh Scene BVH
 * @param input Receivers, triangle → patch map and sampling settings
 * @param start First receiver (default 0)
 * @param end One past the last receiver (default all)
 */
export function surfaceViews(bvh: BvhData, input: SurfaceViewsInput, start = 0, end = -1): SurfaceViewsResult {
  const count = requireTriples(input.points, 'surfaceViews points');
  if (end < 0) end = count;
  requireRange(start, end, count, 'surfaceViews start/end');
  requireMatchingTriples(input.normals, count, 'surfaceViews normals');
  const mode = resolveMode(input);
  const D = mode === 'six' ? 6 : 1;
  const side = requireSquareCount(input.samplesPerDirection ?? DEFAULT_VIEW_SAMPLES, 'surfaceViews samplesPerDirection');
  const N = side * side;
  const offset = input.normalOffsetM ?? DEFAULT_NORMAL_OFFSET_M;
  const tMin = input.tMinM ?? DEFAULT_T_MIN_M;
  requireNonNegative(offset, 'surfaceViews normalOffsetM', '[m]');
  requireNonNegative(tMin, 'surfaceViews tMinM', '[m]');
  const patchCount = input.patchCount;
  if (!Number.isInteger(patchCount) || patchCount < 0) {
    throw new InputError({ problem: 'not a non-negative integer', place: 'surfaceViews patchCount', expected: 'the number of patches', value: patchCount });
  }
  const triPatch = input.trianglePatch;
  if (triPatch.length !== bvh.triangleCount) {
    throw new InputError({ problem: 'length does not match the BVH triangle count', place: 'surfaceViews trianglePatch', expected: `${bvh.triangleCount} entries`, value: triPatch.length });
  }
  for (let t = 0; t < triPatch.length; t++) {
    const p = triPatch[t]!;
    if (p < -1 || p >= patchCount) {
      throw new InputError({ problem: 'patch index out of range', place: `surfaceViews trianglePatch[${t}]`, expected: `-1 or an index below ${patchCount}`, value: p });
    }
  }
  const seed = input.seed ?? DEFAULT_SEED;
  const streams = input.streamIndex;
  const crowns = checkStreamsAndCrowns(input, count, 'surfaceViews');
  const kc = input.crownExtinctionPerM!;
  const gz = groundZOf(input.ground);
  const empty = bvh.triangleCount === 0;
  const rows = (end - start) * D;
  const crownFraction = crowns === undefined ? undefined : new Float32Array(rows);
  // With crowns the hits carry weights τ (float sums); a ray missing every crown adds exactly 1.
  const weights = crowns === undefined ? undefined : new Float64Array(patchCount);

  const rowStart = new Uint32Array(rows + 1);
  const skyFraction = new Float32Array(rows);
  const groundFraction = new Float32Array(rows);
  const otherFraction = new Float32Array(rows);
  let cap = Math.max(16, rows * 8);
  let patchIndex = new Uint32Array(cap);
  let fraction = new Float32Array(cap);
  let nnz = 0;

  // Per-call scratch: hit counts per patch and the list of patches touched in the current row.
  const counts = new Uint32Array(patchCount);
  const touched = new Uint32Array(Math.min(patchCount, N) + 1);

  const pts = input.points;
  const nrm = input.normals;
  const rng = _rng, dir = _dir, local = _local, frame = _frame, hit = _hit;
  const invSide = 1 / side;
  const invN = 1 / N;
  const batched = input.batchRays === true && !empty;
  if (batched) ensureRayScratch(D * N);
  for (let i = start; i < end; i++) {
    seedRandom(rng, seed, streams === undefined ? i : streams[i]!, SURFACE_VIEWS_SUBSTREAM);
    let ox = pts[i * 3]!, oy = pts[i * 3 + 1]!, oz = pts[i * 3 + 2]!;
    if (mode === 'normal') {
      ox += nrm![i * 3]! * offset;
      oy += nrm![i * 3 + 1]! * offset;
      oz += nrm![i * 3 + 2]! * offset;
    }
    if (batched) {
      // Draw every ray of the receiver in the per-ray loop's order, then trace them at once.
      let m = 0;
      const rays = scratch.rays, dirs = scratch.dirs, tMaxs = scratch.tMax;
      for (let d = 0; d < D; d++) {
        if (mode === 'normal') buildFrame(nrm![i * 3]!, nrm![i * 3 + 1]!, nrm![i * 3 + 2]!, frame);
        else buildFrame(SIX_DIRECTIONS[d * 3]!, SIX_DIRECTIONS[d * 3 + 1]!, SIX_DIRECTIONS[d * 3 + 2]!, frame);
        for (let a = 0; a < side; a++) {
          for (let b = 0; b < side; b++) {
            const u1 = (a + nextFloat(rng)) * invSide;
            const u2 = (b + nextFloat(rng)) * invSide;
            sampleCosineHemisphere(u1, u2, local);
            frameToWorld(frame, local[0]!, local[1]!, local[2]!, dir);
            const dx = dir[0]!, dy = dir[1]!, dz = dir[2]!;
            dirs[m * 3] = dx; dirs[m * 3 + 1] = dy; dirs[m * 3 + 2] = dz;
            tMaxs[m] = groundCrossingT(gz, oz, dz);
            const o = m * 6;
            rays[o] = ox; rays[o + 1] = oy; rays[o + 2] = oz;
            rays[o + 3] = dx; rays[o + 4] = dy; rays[o + 5] = dz;
            m++;
          }
        }
      }
      closestBatch(bvh, rays, tMin, Infinity, scratch.hitT, scratch.hitTri, 0, m);
    }
    for (let d = 0; d < D; d++) {
      const r = (i - start) * D + d;
      if (mode === 'normal') buildFrame(nrm![i * 3]!, nrm![i * 3 + 1]!, nrm![i * 3 + 2]!, frame);
      else buildFrame(SIX_DIRECTIONS[d * 3]!, SIX_DIRECTIONS[d * 3 + 1]!, SIX_DIRECTIONS[d * 3 + 2]!, frame);
      let nSky = 0, nGround = 0, nOther = 0, nTouched = 0, nCrown = 0;
      if (batched) {
        const dirs = scratch.dirs, tMaxs = scratch.tMax, hitT = scratch.hitT, hitTri = scratch.hitTri;
        for (let j = d * N, e = j + N; j < e; j++) {
          const dx = dirs[j * 3]!, dy = dirs[j * 3 + 1]!, dz = dirs[j * 3 + 2]!;
          const tG = tMaxs[j]!;
          let tri = hitTri[j]!, tHit = hitT[j]!;
          if (tri >= 0 && tG !== Infinity && !(tHit < tG * (1 - BATCH_NEAR_GROUND))) {
            if (tHit > tG * (1 + BATCH_NEAR_GROUND)) tri = -1;
            else if (intersectClosest(bvh, ox, oy, oz, dx, dy, dz, tMin, tG, hit)) { tri = hit.triangle; tHit = hit.t; }
            else tri = -1;
          }
          const found = tri >= 0;
          const tau = crowns === undefined ? 1 : crownTransmittance(crowns, ox, oy, oz, dx, dy, dz, found ? tHit : tG, kc);
          if (crowns !== undefined) nCrown += 1 - tau;
          if (found) {
            const p = triPatch[tri]!;
            if (p < 0) {
              if (crowns === undefined) nOther++;
              else nOther += tau;
            } else {
              if (counts[p] === 0) touched[nTouched++] = p;
              if (crowns === undefined) counts[p]!++;
              else {
                counts[p] = 1;
                weights![p]! += tau;
              }
            }
          } else if (tG !== Infinity || dz < 0) {
            if (crowns === undefined) nGround++;
            else nGround += tau;
          } else if (crowns === undefined) nSky++;
          else nSky += tau;
        }
      }
      for (let a = 0; a < (batched ? 0 : side); a++) {
        for (let b = 0; b < side; b++) {
          const u1 = (a + nextFloat(rng)) * invSide;
          const u2 = (b + nextFloat(rng)) * invSide;
          sampleCosineHemisphere(u1, u2, local);
          frameToWorld(frame, local[0]!, local[1]!, local[2]!, dir);
          const dx = dir[0]!, dy = dir[1]!, dz = dir[2]!;
          const tG = groundCrossingT(gz, oz, dz);
          if (crowns !== undefined) {
            // τ of the crowns between the receiver and what the ray meets; 1 − τ is crown seen.
            const found = !empty && intersectClosest(bvh, ox, oy, oz, dx, dy, dz, tMin, tG, hit);
            const tau = crownTransmittance(crowns, ox, oy, oz, dx, dy, dz, found ? hit.t : tG, kc);
            nCrown += 1 - tau;
            if (found) {
              const p = triPatch[hit.triangle]!;
              if (p < 0) nOther += tau;
              else {
                if (counts[p] === 0) touched[nTouched++] = p;
                counts[p] = 1;
                weights![p]! += tau;
              }
            } else if (tG !== Infinity || dz < 0) nGround += tau;
            else nSky += tau;
            continue;
          }
          if (!empty && intersectClosest(bvh, ox, oy, oz, dx, dy, dz, tMin, tG, hit)) {
            const p = triPatch[hit.triangle]!;
            if (p < 0) nOther++;
            else {
              if (counts[p] === 0) touched[nTouched++] = p;
              counts[p]!++;
            }
          } else if (tG !== Infinity || dz < 0) nGround++;
          else nSky++;
        }
      }
      skyFraction[r] = nSky * invN;
      groundFraction[r] = nGround * invN;
      otherFraction[r] = (nOther + nCrown) * invN;
      if (crownFraction !== undefined) crownFraction[r] = nCrown * invN;
      sortAscending(touched, nTouched);
      if (nnz + nTouched > cap) {
        // amortised doubling, once in a while per row (never per ray)
        while (nnz + nTouched > cap) cap *= 2;
        const pi = new Uint32Array(cap);
        pi.set(patchIndex.subarray(0, nnz));
        patchIndex = pi;
        const fr = new Float32Array(cap);
        fr.set(fraction.subarray(0, nnz));
        fraction = fr;
      }
      rowStart[r] = nnz;
      for (let j = 0; j < nTouched; j++) {
        const p = touched[j]!;
        patchIndex[nnz] = p;
        fraction[nnz] = (weights === undefined ? counts[p]! : weights[p]!) * invN;
        counts[p] = 0;
        if (weights !== undefined) weights[p] = 0;
        nnz++;
      }
    }
  }
  rowStart[rows] = nnz;
  return {
    directionsPerReceiver: D,
    rowStart,
    patchIndex: patchIndex.slice(0, nnz),
    fraction: fraction.slice(0, nnz),
    skyFraction,
    groundFraction,
    otherFraction,
    ...(crownFraction !== undefined ? { crownFraction } : {}),
  };
}

/** Sorts the first n entries ascending without allocating (insertion sort; rows touch few patches). */
function sortAscending(a: Uint32Array, n: number): void {
  if (n > 64) {
    a.subarray(0, n).sort();
    return;
  }
  for (let i = 1; i < n; i++) {
    const v = a[i]!;
    let j = i - 1;
    while (j >= 0 && a[j]! > v) {
      a[j + 1] = a[j]!;
      j--;
    }
    a[j + 1] = v;
  }
}
