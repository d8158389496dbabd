/**
 * Sky-patch visibility: for each receiver (a point with the plane of its normal; sensors are an
 * upward horizontal plane), the cosine-weighted visible solid angle of every sky patch,
 *
 *   P_k = ∫_{patch k} V(ω) · max(0, n·ω) dω   [sr],
 *
 * so that the diffuse sky irradiance on the receiver is Σ_k L_k P_k (L_k the patch radiance
 * [W m⁻² sr⁻¹]); the receiver's sky view factor is Σ_k P_k / π. For a horizontal receiver this is
 * Oke's ψ_s (DESIGN §4): 1 in an open field, cos(atan(2H/W)) at the floor centre of an infinite
 * canyon; for a tilted receiver it is its own sky view factor, (1 + cos β)/2 unobstructed.
 *
 * Method (per receiver, per patch): the unobstructed value U_k = ∫_patch max(0, n·ω) dω is computed
 * by quadrature (`projectedSolidAngleOfCell`); `samplesPerPatch` directions are drawn on a jittered
 * side × side grid uniform in solid angle inside the patch, traced with any-hit rays, and weighted
 * by the cosine w = max(0, n·ω); then P_k = U_k · Σ(V·w) / Σw (a ratio estimator: exact for a patch
 * fully seen or fully hidden). A patch whose samples all fall behind the receiver's plane (only a
 * sliver of it is in front) gets P_k = 0; that sliver's U_k is below ~1/samplesPerPatch of the patch.
 *
 * Ground view (tilted receivers): the part of the receiver's cosine-weighted hemisphere below the
 * horizon. `groundSamples` cosine-weighted directions are drawn around the normal; those with
 * d_z < 0 are traced to the ground plane (groundPlane.ts: a downward ray leaving the model counts
 * as ground too), and groundViewFactor = G0 · seen / below with the exact unobstructed value
 * G0 = (1 − n_z)/2. If no sample lands below the horizon (G0 < ~1/groundSamples), G0 is used.
 * An upward horizontal receiver has groundViewFactor = 0. So sky + ground = 1 in an open field and
 * 1 − (fraction that sees geometry) otherwise; surfaceViews gives the rest.
 *
 * Accuracy with the defaults (25 samples per patch on a 5 × 5 jittered grid, Tregenza level 1:
 * 145 patches = 3 625 rays per receiver; 1 024 ground samples for a tilted receiver, about half of
 * them traced): at the floor centre of long canyons (H/W = 0.5, 1, 2) the sky view factor error
 * had an RMS of about 0.002 and a maximum of 0.0064 over 600 receivers, so ±0.01 holds with
 * margin; 16 samples per patch gave RMS 0.0026 and maximum 0.0095; 9 gave maximum 0.014.
 * test/trace/queries/skyVisibility.test.ts checks ±0.01 (and RMS < 0.004) on 180 receivers.
 *
 * Determinism: receiver i draws from stream i of `seed` only (random.ts), so any split of the
 * receivers into chunks or workers gives the same numbers. With `streamIndex`, receiver i draws from
 * stream streamIndex[i] instead: a subset of receivers can be traced with the numbers they get in
 * a full run (incremental re-trace, src/audit/stages/retrace.ts), and patches keep their numbers
 * when devices are inserted before them.
 *
 * Tree crowns (optional `crowns` with `crownExtinctionPerM`): a sky ray that meets no surface is
 * weighted by the crowns' Beer–Lambert transmittance along it (crowns.ts), so P_k is the sky seen
 * through the foliage: P_k = U_k · Σ(V·τ·w) / Σw. The below-horizon samples are weighted alike
 * (τ up to the ground crossing). With no crown on a ray τ = 1 exactly, so the numbers equal those
 * of a run without crowns.
 *
 * `batchRays: true`: per receiver, the sky rays (and the below-horizon rays when no ground plane
 * cuts them) are generated first, traced with one `occludedBatch` call (the WebAssembly kernel
 * when loaded), then summed in the same order as the per-ray path. The batch API stores rays in
 * float32, so a ray grazing an edge can flip and the numbers may differ slightly from the default
 * (float64, per-ray) path. Below-horizon rays that end on the ground plane (a per-ray tMax) are
 * traced per ray on both paths.
 */
import type { BvhData } from '../bvh/build.ts';
import type { SampledQueryOptions } from './sampledQueryOptions.ts';
import { isOccluded } from '../bvh/query.ts';
import { occludedBatch } from '../bvh/batch.ts';
import { ensureRayScratch, scratch } from './rayScratch.ts';
import { skySubdivision, type SkySubdivision } from '../../physics/skySubdivision.ts';
import { createRandomState, DEFAULT_SEED, nextFloat, seedRandom } from '../random.ts';
import { buildFrame, frameToWorld, projectedSolidAngleOfCell, sampleCosineHemisphere, sampleSkyCell } from '../sampling.ts';
import { groundCrossingT, groundZOf } from './groundPlane.ts';
import { requireMatchingTriples, requireNonNegative, requireRange, requireSquareCount, requireTriples } from './inputChecks.ts';
import { DEFAULT_NORMAL_OFFSET_M, DEFAULT_T_MIN_M } from './sunVisibility.ts';
import { crownTransmittance } from '../crowns.ts';
import type { CrownSet } from '../../geometry/generators/tree.ts';
import { InputError } from '../../physics/errors.ts';

/** Default stratified samples per sky patch (a 5 × 5 jittered grid). */
export const DEFAULT_SKY_SAMPLES_PER_PATCH = 25;
/** Default cosine-weighted samples for the ground part of a tilted receiver's view (32 × 32). */
export const DEFAULT_GROUND_SAMPLES = 1024;
/** Substream id of this query in random.ts, so it never shares numbers with another query. */
export const SKY_VISIBILITY_SUBSTREAM = 1;

export interface SkyVisibilityInput extends SampledQueryOptions {
  /** xyz per receiver [m]. */
  points: Float32Array | Float64Array;
  /** Optional unit normal per receiver; absent = upward horizontal receivers (sensors). */
  normals?: Float32Array | Float64Array | undefined;
  /** Sky subdivision level (1 = Tregenza 145 patches; physics/skySubdivision.ts). Default 1. */
  skyLevel?: number | undefined;
  /** Samples per sky patch, a perfect square (default 25). */
  samplesPerPatch?: number | undefined;
  /** Samples for the below-horizon view of tilted receivers, a perfect square (default 1024). */
  groundSamples?: number | undefined;
}

/** Checks the optional stream list and crown inputs shared by skyVisibility and surfaceViews. */
export function checkStreamsAndCrowns(
  input: { streamIndex?: Uint32Array | undefined; crowns?: CrownSet | undefined; crownExtinctionPerM?: Float64Array | undefined },
  count: number, place: string,
): CrownSet | undefined {
  if (input.streamIndex !== undefined && input.streamIndex.length !== count) {
    throw new InputError({ problem: 'length does not match the receiver count', place: `${place} streamIndex`, expected: `${count} entries`, value: input.streamIndex.length });
  }
  const c = input.crowns;
  if (c === undefined || c.count === 0) return undefined;
  if (input.crownExtinctionPerM === undefined || input.crownExtinctionPerM.length < c.count) {
    throw new InputError({ problem: 'crown extinction missing or too short', place: `${place} crownExtinctionPerM`, expected: `${c.count} values [1/m]`, value: input.crownExtinctionPerM?.length });
  }
  return c;
}

export interface SkyVisibilityResult {
  /** Sky patches per receiver (K). */
  patchCount: number;
  /** P_k per receiver, row-major: element (i − start)·K + k [sr]. */
  patchProjectedSr: Float32Array;
  /** Σ_k P_k / π per receiver [-]. */
  skyViewFactor: Float32Array;
  /** Cosine-weighted fraction of the receiver's hemisphere that sees the ground (below-horizon, unobstructed) [-]. */
  groundViewFactor: Float32Array;
}

export function skyVisibilityReceiverCount(input: SkyVisibilityInput): number {
  return requireTriples(input.points, 'skyVisibility points');
}

// Module-scope scratch (STYLE §6).
const _rng = createRandomState();
const _dir = new Float64Array(3);
const _local = new Float64Array(3);
const _frame = new Float64Array(9);

/**
 * Sky-patch visibility of receivers [start, end).
 * @param bvh Scene BVH
 * @param input Receivers and sampling settings
 * @param start First receiver (default 0)
 * @param end One past the last receiver (default all)
 */
export function skyVisibility(bvh: BvhData, input: SkyVisibilityInput, start = 0, end = -1): SkyVisibilityResult {
  const count = requireTriples(input.points, 'skyVisibility points');
  if (end < 0) end = count;
  requireRange(start, end, count, 'skyVisibility start/end');
  requireMatchingTriples(input.normals, count, 'skyVisibility normals');
  const sky: SkySubdivision = skySubdivision(input.skyLevel ?? 1);
  const side = requireSquareCount(input.samplesPerPatch ?? DEFAULT_SKY_SAMPLES_PER_PATCH, 'skyVisibility samplesPerPatch');
  const gSide = requireSquareCount(input.groundSamples ?? DEFAULT_GROUND_SAMPLES, 'skyVisibility groundSamples');
  const offset = input.normalOffsetM ?? DEFAULT_NORMAL_OFFSET_M;
  const tMin = input.tMinM ?? DEFAULT_T_MIN_M;
  requireNonNegative(offset, 'skyVisibility normalOffsetM', '[m]');
  requireNonNegative(tMin, 'skyVisibility tMinM', '[m]');
  const seed = input.seed ?? DEFAULT_SEED;
  const streams = input.streamIndex;
  const crowns = checkStreamsAndCrowns(input, count, 'skyVisibility');
  const kc = input.crownExtinctionPerM!;
  const K = sky.count;
  const rows = end - start;
  const result: SkyVisibilityResult = {
    patchCount: K,
    patchProjectedSr: new Float32Array(rows * K),
    skyViewFactor: new Float32Array(rows),
    groundViewFactor: new Float32Array(rows),
  };
  // Unobstructed U_k for the last normal seen (receivers on one wall share it).
  const unobstructed = new Float64Array(K);
  let lastNx = NaN, lastNy = NaN, lastNz = NaN;
  const gz = groundZOf(input.ground);
  const empty = bvh.triangleCount === 0;
  const pts = input.points;
  const nrm = input.normals;
  const rng = _rng, dir = _dir, local = _local, frame = _frame;
  const invSide = 1 / side;
  const batched = input.batchRays === true && !empty;
  if (batched) ensureRayScratch(K * side * side + gSide * gSide);
  for (let i = start; i < end; i++) {
    seedRandom(rng, seed, streams === undefined ? i : streams[i]!, SKY_VISIBILITY_SUBSTREAM);
    let nx = 0, ny = 0, nz = 1;
    let ox = pts[i * 3]!, oy = pts[i * 3 + 1]!, oz = pts[i * 3 + 2]!;
    if (nrm !== undefined) {
      nx = nrm[i * 3]!;
      ny = nrm[i * 3 + 1]!;
      nz = nrm[i * 3 + 2]!;
      ox += nx * offset;
      oy += ny * offset;
      oz += nz * offset;
    }
    if (nx !== lastNx || ny !== lastNy || nz !== lastNz) {
      const horizontal = nx === 0 && ny === 0 && nz === 1;
      for (let k = 0; k < K; k++) {
        unobstructed[k] = horizontal
          ? sky.horizontalProjectedSr[k]!
          : projectedSolidAngleOfCell(nx, ny, nz, sky.altMinRad[k]!, sky.altMaxRad[k]!, sky.azMinRad[k]!, sky.azMaxRad[k]!);
      }
      lastNx = nx;
      lastNy = ny;
      lastNz = nz;
    }
    if (batched) {
      batchedReceiver(bvh, i - start, ox, oy, oz, nx, ny, nz, unobstructed, sky, side, gSide, gz, tMin, crowns, kc, result);
      continue;
    }
    // Every upward ray from a point below the ground plane ends on it.
    const buried = gz === gz && oz < gz;
    const row = (i - start) * K;
    let total = 0;
    for (let k = 0; k < K; k++) {
      const U = unobstructed[k]!;
      if (U <= 0 || buried) {
        result.patchProjectedSr[row + k] = 0;
        continue;
      }
      const a0 = sky.altMinRad[k]!, a1 = sky.altMaxRad[k]!, z0 = sky.azMinRad[k]!, z1 = sky.azMaxRad[k]!;
      let sumW = 0, sumV = 0;
      for (let a = 0; a < side; a++) {
        for (let b = 0; b < side; b++) {
          const u1 = (a + nextFloat(rng)) * invSide;
          const u2 = (b + nextFloat(rng)) * invSide;
          sampleSkyCell(a0, a1, z0, z1, u1, u2, dir);
          const dx = dir[0]!, dy = dir[1]!, dz = dir[2]!;
          const w = nx * dx + ny * dy + nz * dz;
          if (w <= 0) continue;
          sumW += w;
          if (empty || !isOccluded(bvh, ox, oy, oz, dx, dy, dz, tMin, Infinity)) {
            sumV += crowns === undefined ? w : w * crownTransmittance(crowns, ox, oy, oz, dx, dy, dz, Infinity, kc);
          }
        }
      }
      const p = sumW > 0 ? (U * sumV) / sumW : 0;
      result.patchProjectedSr[row + k] = p;
      total += p;
    }
    result.skyViewFactor[i - start] = total / Math.PI;

    // Below-horizon part of the receiver's hemisphere.
    const g0 = 0.5 * (1 - Math.max(-1, Math.min(1, nz)));
    let ground = 0;
    if (g0 > 0) {
      buildFrame(nx, ny, nz, frame);
      const invG = 1 / gSide;
      let below = 0, seen = 0;
      for (let a = 0; a < gSide; a++) {
        for (let b = 0; b < gSide; b++) {
          const u1 = (a + nextFloat(rng)) * invG;
          const u2 = (b + nextFloat(rng)) * invG;
          sampleCosineHemisphere(u1, u2, local);
          frameToWorld(frame, local[0]!, local[1]!, local[2]!, dir);
          const dx = dir[0]!, dy = dir[1]!, dz = dir[2]!;
          if (dz >= 0) continue;
          below++;
          const tG = groundCrossingT(gz, oz, dz);
          if (empty || !isOccluded(bvh, ox, oy, oz, dx, dy, dz, tMin, tG)) {
            seen += crowns === undefined ? 1 : crownTransmittance(crowns, ox, oy, oz, dx, dy, dz, tG, kc);
          }
        }
      }
      ground = below > 0 ? (g0 * seen) / below : g0;
    }
    result.groundViewFactor[i - start] = ground;
  }
  return result;
}

// Per receiver of the batch path: ray range end per patch (−1 = patch skipped).
let _patchEnd = new Int32Array(0);

/**
 * One receiver of the batch path: draws the same numbers in the same order as the per-ray loop
 * (in `_rng`), traces the sky rays and the unbounded below-horizon rays in one batch, then sums
 * in the per-ray loop's order. Writes row `r` of `result`.
 */
function batchedReceiver(
  bvh: BvhData, r: number, ox: number, oy: number, oz: number, nx: number, ny: number, nz: number,
  unobstructed: Float64Array, sky: SkySubdivision, side: number, gSide: number, gz: number, tMin: number,
  crowns: CrownSet | undefined, kc: Float64Array, result: SkyVisibilityResult,
): void {
  const K = sky.count;
  if (_patchEnd.length < K) _patchEnd = new Int32Array(K);
  const patchEnd = _patchEnd;
  const rng = _rng, dir = _dir, local = _local, frame = _frame;
  const rays = scratch.rays, dirs = scratch.dirs, weight = scratch.weight;
  const invSide = 1 / side;
  const buried = gz === gz && oz < gz;
  const row = r * K;
  let m = 0;
  for (let k = 0; k < K; k++) {
    const U = unobstructed[k]!;
    if (U <= 0 || buried) {
      patchEnd[k] = -1;
      continue;
    }
    const a0 = sky.altMinRad[k]!, a1 = sky.altMaxRad[k]!, z0 = sky.azMinRad[k]!, z1 = sky.azMaxRad[k]!;
    for (let a = 0; a < side; a++) {
      for (let b = 0; b < side; b++) {
        const u1 = (a + nextFloat(rng)) * invSide;
        const u2 = (b + nextFloat(rng)) * invSide;
        sampleSkyCell(a0, a1, z0, z1, u1, u2, dir);
        const dx = dir[0]!, dy = dir[1]!, dz = dir[2]!;
        const w = nx * dx + ny * dy + nz * dz;
        if (w <= 0) continue;
        weight[m] = w;
        dirs[m * 3] = dx; dirs[m * 3 + 1] = dy; dirs[m * 3 + 2] = dz;
        const o = m * 6;
        rays[o] = ox; rays[o + 1] = oy; rays[o + 2] = oz;
        rays[o + 3] = dx; rays[o + 4] = dy; rays[o + 5] = dz;
        m++;
      }
    }
    patchEnd[k] = m;
  }
  const skyRays = m;
  // Below-horizon rays: unbounded ones join the batch; ones ending on the ground plane are traced here.
  const g0 = 0.5 * (1 - Math.max(-1, Math.min(1, nz)));
  let below = 0, seen = 0;
  if (g0 > 0) {
    buildFrame(nx, ny, nz, frame);
    const invG = 1 / gSide;
    for (let a = 0; a < gSide; a++) {
      for (let b = 0; b < gSide; b++) {
        const u1 = (a + nextFloat(rng)) * invG;
        const u2 = (b + nextFloat(rng)) * invG;
        sampleCosineHemisphere(u1, u2, local);
        frameToWorld(frame, local[0]!, local[1]!, local[2]!, dir);
        const dx = dir[0]!, dy = dir[1]!, dz = dir[2]!;
        if (dz >= 0) continue;
        below++;
        const tG = groundCrossingT(gz, oz, dz);
        if (tG !== Infinity) {
          if (!isOccluded(bvh, ox, oy, oz, dx, dy, dz, tMin, tG)) {
            seen += crowns === undefined ? 1 : crownTransmittance(crowns, ox, oy, oz, dx, dy, dz, tG, kc);
          }
          continue;
        }
        dirs[m * 3] = dx; dirs[m * 3 + 1] = dy; dirs[m * 3 + 2] = dz;
        const o = m * 6;
        rays[o] = ox; rays[o + 1] = oy; rays[o + 2] = oz;
        rays[o + 3] = dx; rays[o + 4] = dy; rays[o + 5] = dz;
        m++;
      }
    }
  }
  const flags = scratch.flags;
  if (m > 0) occludedBatch(bvh, rays, tMin, Infinity, flags, 0, m);
  let total = 0, j = 0;
  for (let k = 0; k < K; k++) {
    const e = patchEnd[k]!;
    if (e < 0) {
      result.patchProjectedSr[row + k] = 0;
      continue;
    }
    let sumW = 0, sumV = 0;
    for (; j < e; j++) {
      const w = weight[j]!;
      sumW += w;
      if (flags[j] === 0) {
        sumV += crowns === undefined ? w : w * crownTransmittance(crowns, ox, oy, oz, dirs[j * 3]!, dirs[j * 3 + 1]!, dirs[j * 3 + 2]!, Infinity, kc);
      }
    }
    const p = sumW > 0 ? (unobstructed[k]! * sumV) / sumW : 0;
    result.patchProjectedSr[row + k] = p;
    total += p;
  }
  result.skyViewFactor[r] = total / Math.PI;
  // Unbounded below-horizon rays, in sample order (rays ending on the plane were summed above;
  // a receiver has only one kind: either there is a plane below it or there is none).
  for (j = skyRays; j < m; j++) {
    if (flags[j] === 0) {
      seen += crowns === undefined ? 1 : crownTransmittance(crowns, ox, oy, oz, dirs[j * 3]!, dirs[j * 3 + 1]!, dirs[j * 3 + 2]!, Infinity, kc);
    }
  }
  result.groundViewFactor[r] = g0 > 0 ? (below > 0 ? (g0 * seen) / below : g0) : 0;
}
