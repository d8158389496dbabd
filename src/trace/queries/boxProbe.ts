/**
 * Box probes for the incremental re-trace (issue 6: "adding a fin re-traces only the rays it can
 * affect"): which receivers have a ray that can reach a new device? A new device lies inside its
 * bounding box, so a ray that never enters any box, or that meets a surface before it enters one,
 * gives the same answer with or without the device; only receivers with at least one ray that
 * enters a box unobstructed need tracing again.
 *
 * The probes regenerate EXACTLY the rays of skyVisibility.ts and surfaceViews.ts (same stream per
 * receiver, same draws in the same order, same origins and ray ends), then test each ray against
 * the boxes (slab test) and, if it enters one at t_e, against the scene before it
 * (`isOccluded(bvh, …, tMin, t_e)`: any surface hit before the first box is old geometry, because
 * every new triangle and crown lies inside a box). A receiver whose plane has every box corner
 * behind it is skipped at once (its hemisphere cannot see a box). The sun probe tests the ray to
 * every sun direction against the boxes (no occlusion test: sun rays are few).
 *
 * Kept in step with the two queries by test/audit/retrace.test.ts, which checks that the
 * incremental result equals a full trace to the last bit.
 */
import type { BvhData } from '../bvh/build.ts';
import { isOccluded } from '../bvh/query.ts';
import { skySubdivision } from '../../physics/skySubdivision.ts';
import { createRandomState, DEFAULT_SEED, nextFloat, seedRandom } from '../random.ts';
import { buildFrame, frameToWorld, projectedSolidAngleOfCell, sampleCosineHemisphere, sampleSkyCell } from '../sampling.ts';
import { groundCrossingT, groundZOf } from './groundPlane.ts';
import { DEFAULT_NORMAL_OFFSET_M, DEFAULT_T_MIN_M, type SunVisibilityInput } from './sunVisibility.ts';
import { DEFAULT_GROUND_SAMPLES, DEFAULT_SKY_SAMPLES_PER_PATCH, SKY_VISIBILITY_SUBSTREAM, type SkyVisibilityInput } from './skyVisibility.ts';
import { DEFAULT_VIEW_SAMPLES, SIX_DIRECTIONS, SURFACE_VIEWS_SUBSTREAM, type SurfaceViewsInput } from './surfaceViews.ts';
import { InputError } from '../../physics/errors.ts';

/** Counts of a probe: receivers tested per ray, skipped by the plane test, and rays generated. */
export interface ProbeStats {
  receiversProbed: number;
  receiversSkippedByPlane: number;
  raysGenerated: number;
}

const _rng = createRandomState();
const _dir = new Float64Array(3);
const _local = new Float64Array(3);
const _frame = new Float64Array(9);

function checkBoxes(boxes: Float64Array): number {
  if (boxes.length % 6 !== 0) throw new InputError({ problem: 'not six numbers per box', place: 'box probe boxes', expected: 'min x, y, z, max x, y, z per box [m]', value: boxes.length });
  return boxes.length / 6;
}

/** Smallest t in [0, tMax] where the ray enters one of the boxes, Infinity when it enters none. */
function firstBoxEntry(boxes: Float64Array, nb: number, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMax: number): number {
  const ix = 1 / dx, iy = 1 / dy, iz = 1 / dz;
  let best = Infinity;
  for (let b = 0; b < nb; b++) {
    const o = 6 * b;
    let tn = 0, tf = tMax;
    let a = (boxes[o]! - ox) * ix, c = (boxes[o + 3]! - ox) * ix;
    if (a > c) { const t = a; a = c; c = t; }
    if (a > tn) tn = a; if (c < tf) tf = c;
    if (!(tn <= tf)) continue;
    a = (boxes[o + 1]! - oy) * iy; c = (boxes[o + 4]! - oy) * iy;
    if (a > c) { const t = a; a = c; c = t; }
    if (a > tn) tn = a; if (c < tf) tf = c;
    if (!(tn <= tf)) continue;
    a = (boxes[o + 2]! - oz) * iz; c = (boxes[o + 5]! - oz) * iz;
    if (a > c) { const t = a; a = c; c = t; }
    if (a > tn) tn = a; if (c < tf) tf = c;
    if (!(tn <= tf)) continue;
    if (tn < best) best = tn;
  }
  return best;
}

/**
 * Conservative slab test: NaN from 0·∞ (an origin on a slab plane with a zero direction
 * component) makes a comparison false, which would drop the box; such rays are treated as entering.
 */
function reaches(bvh: BvhData, boxes: Float64Array, nb: number, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tEnd: number): boolean {
  const te = firstBoxEntry(boxes, nb, ox, oy, oz, dx, dy, dz, tEnd);
  if (te === Infinity) return false;
  if (bvh.triangleCount === 0 || te <= tMin) return true;
  return !isOccluded(bvh, ox, oy, oz, dx, dy, dz, tMin, te);
}

/** True when every corner of every box lies on or behind the plane through o with normal n. */
function allBehind(boxes: Float64Array, nb: number, ox: number, oy: number, oz: number, nx: number, ny: number, nz: number): boolean {
  for (let b = 0; b < nb; b++) {
    const o = 6 * b;
    // the corner farthest along n
    const cx = nx >= 0 ? boxes[o + 3]! : boxes[o]!;
    const cy = ny >= 0 ? boxes[o + 4]! : boxes[o + 1]!;
    const cz = nz >= 0 ? boxes[o + 5]! : boxes[o + 2]!;
    if (nx * (cx - ox) + ny * (cy - oy) + nz * (cz - oz) > 0) return false;
  }
  return true;
}

/**
 * Per receiver i of `receivers` (indices into input.points): 1 when one of its skyVisibility rays
 * can reach a box. Uses the input's seed, streams, sampling and ground exactly as skyVisibility.
 * @param bvh the BVH the receivers are traced in (old surfaces before a box are found in it)
 * @param boxes min x, y, z, max x, y, z per box [m] (pad them for rounding)
 */
export function skyRaysReachBoxes(bvh: BvhData, input: SkyVisibilityInput, boxes: Float64Array, receivers: Uint32Array, stats?: ProbeStats): Uint8Array {
  const nb = checkBoxes(boxes);
  const out = new Uint8Array(receivers.length);
  if (nb === 0) return out;
  const sky = skySubdivision(input.skyLevel ?? 1);
  const side = Math.round(Math.sqrt(input.samplesPerPatch ?? DEFAULT_SKY_SAMPLES_PER_PATCH));
  const gSide = Math.round(Math.sqrt(input.groundSamples ?? DEFAULT_GROUND_SAMPLES));
  const offset = input.normalOffsetM ?? DEFAULT_NORMAL_OFFSET_M;
  const tMin = input.tMinM ?? DEFAULT_T_MIN_M;
  const seed = input.seed ?? DEFAULT_SEED;
  const K = sky.count;
  const gz = groundZOf(input.ground);
  const pts = input.points, nrm = input.normals, streams = input.streamIndex;
  const unobstructed = new Float64Array(K);
  let lastNx = NaN, lastNy = NaN, lastNz = NaN;
  const rng = _rng, dir = _dir, local = _local, frame = _frame;
  const invSide = 1 / side, invG = 1 / gSide;
  for (let j = 0; j < receivers.length; j++) {
    const i = receivers[j]!;
    let nx = 0, ny = 0, nz = 1;
    let ox = pts[i * 3]!, oy = pts[i * 3 + 1]!, oz = pts[i * 3 + 2]!;
    if (nrm !== undefined) {
      nx = nrm[i * 3]!; ny = nrm[i * 3 + 1]!; nz = nrm[i * 3 + 2]!;
      ox += nx * offset; oy += ny * offset; oz += nz * offset;
    }
    if (allBehind(boxes, nb, ox, oy, oz, nx, ny, nz)) {
      if (stats) stats.receiversSkippedByPlane++;
      continue;
    }
    if (stats) stats.receiversProbed++;
    if (gz === gz && oz < gz) continue; // buried: traces nothing
    seedRandom(rng, seed, streams === undefined ? i : streams[i]!, SKY_VISIBILITY_SUBSTREAM);
    if (nx !== lastNx || ny !== lastNy || nz !== lastNz) {
      const horizontal = nx === 0 && ny === 0 && nz === 1;
      for (let k = 0; k < K; k++) {
        unobstructed[k] = horizontal ? sky.horizontalProjectedSr[k]! : projectedSolidAngleOfCell(nx, ny, nz, sky.altMinRad[k]!, sky.altMaxRad[k]!, sky.azMinRad[k]!, sky.azMaxRad[k]!);
      }
      lastNx = nx; lastNy = ny; lastNz = nz;
    }
    let hit = false;
    for (let k = 0; k < K && !hit; k++) {
      if (unobstructed[k]! <= 0) continue;
      const a0 = sky.altMinRad[k]!, a1 = sky.altMaxRad[k]!, z0 = sky.azMinRad[k]!, z1 = sky.azMaxRad[k]!;
      for (let a = 0; a < side && !hit; a++) {
        for (let b = 0; b < side; b++) {
          const u1 = (a + nextFloat(rng)) * invSide;
          const u2 = (b + nextFloat(rng)) * invSide;
          sampleSkyCell(a0, a1, z0, z1, u1, u2, dir);
          const dx = dir[0]!, dy = dir[1]!, dz = dir[2]!;
          if (stats) stats.raysGenerated++;
          if (nx * dx + ny * dy + nz * dz <= 0) continue;
          if (reaches(bvh, boxes, nb, ox, oy, oz, dx, dy, dz, tMin, Infinity)) { hit = true; break; }
        }
      }
    }
    if (!hit && 0.5 * (1 - Math.max(-1, Math.min(1, nz))) > 0) {
      buildFrame(nx, ny, nz, frame);
      for (let a = 0; a < gSide && !hit; a++) {
        for (let b = 0; b < gSide; b++) {
          const u1 = (a + nextFloat(rng)) * invG;
          const u2 = (b + nextFloat(rng)) * invG;
          sampleCosineHemisphere(u1, u2, local);
          frameToWorld(frame, local[0]!, local[1]!, local[2]!, dir);
          const dx = dir[0]!, dy = dir[1]!, dz = dir[2]!;
          if (stats) stats.raysGenerated++;
          if (dz >= 0) continue;
          if (reaches(bvh, boxes, nb, ox, oy, oz, dx, dy, dz, tMin, groundCrossingT(gz, oz, dz))) { hit = true; break; }
        }
      }
    }
    if (hit) out[j] = 1;
  }
  return out;
}

/**
 * Per receiver of `receivers`: 1 when one of its surfaceViews rays (any of its 1 or 6 views) can
 * reach a box. Same rays as surfaceViews.
 */
export function viewRaysReachBoxes(bvh: BvhData, input: SurfaceViewsInput, boxes: Float64Array, receivers: Uint32Array, stats?: ProbeStats): Uint8Array {
  const nb = checkBoxes(boxes);
  const out = new Uint8Array(receivers.length);
  if (nb === 0) return out;
  const mode = input.directions ?? (input.normals !== undefined ? 'normal' : 'six');
  const D = mode === 'six' ? 6 : 1;
  const side = Math.round(Math.sqrt(input.samplesPerDirection ?? DEFAULT_VIEW_SAMPLES));
  const offset = input.normalOffsetM ?? DEFAULT_NORMAL_OFFSET_M;
  const tMin = input.tMinM ?? DEFAULT_T_MIN_M;
  const seed = input.seed ?? DEFAULT_SEED;
  const gz = groundZOf(input.ground);
  const pts = input.points, nrm = input.normals, streams = input.streamIndex;
  const rng = _rng, dir = _dir, local = _local, frame = _frame;
  const invSide = 1 / side;
  for (let j = 0; j < receivers.length; j++) {
    const i = receivers[j]!;
    let ox = pts[i * 3]!, oy = pts[i * 3 + 1]!, oz = pts[i * 3 + 2]!;
    if (mode === 'normal') {
      ox += nrm![i * 3]! * offset; oy += nrm![i * 3 + 1]! * offset; oz += nrm![i * 3 + 2]! * offset;
      if (allBehind(boxes, nb, ox, oy, oz, nrm![i * 3]!, nrm![i * 3 + 1]!, nrm![i * 3 + 2]!)) {
        if (stats) stats.receiversSkippedByPlane++;
        continue;
      }
    }
    if (stats) stats.receiversProbed++;
    seedRandom(rng, seed, streams === undefined ? i : streams[i]!, SURFACE_VIEWS_SUBSTREAM);
    let hit = false;
    for (let d = 0; d < D && !hit; d++) {
      if (mode === 'normal') buildFrame(nrm![i * 3]!, nrm![i * 3 + 1]!, nrm![i * 3 + 2]!, frame);
      else buildFrame(SIX_DIRECTIONS[d * 3]!, SIX_DIRECTIONS[d * 3 + 1]!, SIX_DIRECTIONS[d * 3 + 2]!, frame);
      for (let a = 0; a < side && !hit; a++) {
        for (let b = 0; b < side; b++) {
          const u1 = (a + nextFloat(rng)) * invSide;
          const u2 = (b + nextFloat(rng)) * invSide;
          sampleCosineHemisphere(u1, u2, local);
          frameToWorld(frame, local[0]!, local[1]!, local[2]!, dir);
          const dx = dir[0]!, dy = dir[1]!, dz = dir[2]!;
          if (stats) stats.raysGenerated++;
          if (reaches(bvh, boxes, nb, ox, oy, oz, dx, dy, dz, tMin, groundCrossingT(gz, oz, dz))) { hit = true; break; }
        }
      }
    }
    if (hit) out[j] = 1;
  }
  return out;
}

/**
 * Per receiver of `receivers`: 1 when the ray toward one of the sun directions (above the horizon,
 * in front of the receiver's plane) enters a box. No occlusion test.
 */
export function sunRaysReachBoxes(input: SunVisibilityInput, boxes: Float64Array, receivers: Uint32Array): Uint8Array {
  const nb = checkBoxes(boxes);
  const out = new Uint8Array(receivers.length);
  if (nb === 0) return out;
  const S = input.sunDirections.length / 3;
  const pts = input.points, nrm = input.normals, sd = input.sunDirections;
  for (let j = 0; j < receivers.length; j++) {
    const i = receivers[j]!;
    const ox = pts[i * 3]!, oy = pts[i * 3 + 1]!, oz = pts[i * 3 + 2]!;
    for (let s = 0; s < S; s++) {
      const dx = sd[3 * s]!, dy = sd[3 * s + 1]!, dz = sd[3 * s + 2]!;
      if (!(dz > 0)) continue;
      if (nrm !== undefined && nrm[i * 3]! * dx + nrm[i * 3 + 1]! * dy + nrm[i * 3 + 2]! * dz <= 0) continue;
      if (firstBoxEntry(boxes, nb, ox, oy, oz, dx, dy, dz, Infinity) !== Infinity) { out[j] = 1; break; }
    }
  }
  return out;
}
