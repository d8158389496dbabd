/**
 * Batch ray queries: arrays in, arrays out. Rays are 6 floats each (ox oy oz dx dy dz); results
 * are written at the ray's own index, so several workers can fill disjoint ranges of one shared
 * output array. `start`/`end` are ray indices (default: all rays).
 */
import type { BvhData } from './build.ts';
import { InputError } from '../../physics/errors.ts';
import { isOccluded, isOccludedMasked, closestT, lastSlot } from './query.ts';

function checkRange(rays: Float32Array, outLength: number, start: number, end: number, fn: string): void {
  const n = Math.floor(rays.length / 6);
  if (rays.length % 6 !== 0) {
    throw new InputError({ problem: 'ray array length is not a multiple of 6', place: `${fn} rays.length`, expected: 'six floats per ray (ox oy oz dx dy dz)', value: rays.length });
  }
  if (!Number.isInteger(start) || !Number.isInteger(end) || start < 0 || end > n || start > end) {
    throw new InputError({ problem: 'bad ray range', place: `${fn} start/end`, expected: `integers with 0 <= start <= end <= ${n}`, value: [start, end] });
  }
  if (outLength < end) {
    throw new InputError({ problem: 'output array too short', place: `${fn} out.length`, expected: `at least ${end}`, value: outLength });
  }
}

/**
 * Any-hit for rays [start, end): out[i] = 1 if ray i is blocked at t in [tMin, tMax], else 0.
 * @returns the number of blocked rays in the range
 */
export function occludedBatch(
  bvh: BvhData, rays: Float32Array, tMin: number, tMax: number, out: Uint8Array, start?: number, end?: number,
): number {
  const s0 = start ?? 0, e0 = end ?? Math.floor(rays.length / 6);
  checkRange(rays, out.length, s0, e0, 'occludedBatch');
  let hits = 0;
  for (let i = s0; i < e0; i++) {
    const o = i * 6;
    const h = isOccluded(bvh, rays[o] as number, rays[o + 1] as number, rays[o + 2] as number,
      rays[o + 3] as number, rays[o + 4] as number, rays[o + 5] as number, tMin, tMax);
    out[i] = h ? 1 : 0;
    if (h) hits++;
  }
  return hits;
}

/** As `occludedBatch`, ignoring triangles whose ORIGINAL index has `skip[index] !== 0`. */
export function occludedBatchMasked(
  bvh: BvhData, rays: Float32Array, tMin: number, tMax: number, out: Uint8Array, skip: Uint8Array, start?: number, end?: number,
): number {
  const s0 = start ?? 0, e0 = end ?? Math.floor(rays.length / 6);
  checkRange(rays, out.length, s0, e0, 'occludedBatchMasked');
  let hits = 0;
  for (let i = s0; i < e0; i++) {
    const o = i * 6;
    const h = isOccludedMasked(bvh, rays[o] as number, rays[o + 1] as number, rays[o + 2] as number,
      rays[o + 3] as number, rays[o + 4] as number, rays[o + 5] as number, tMin, tMax, skip);
    out[i] = h ? 1 : 0;
    if (h) hits++;
  }
  return hits;
}

/**
 * Closest hit for rays [start, end): outT[i] = t of the nearest hit (Infinity if none),
 * outTri[i] = its ORIGINAL triangle index (-1 if none).
 * @returns the number of rays that hit
 */
export function closestBatch(
  bvh: BvhData, rays: Float32Array, tMin: number, tMax: number, outT: Float32Array, outTri: Int32Array, start?: number, end?: number,
): number {
  const s0 = start ?? 0, e0 = end ?? Math.floor(rays.length / 6);
  checkRange(rays, Math.min(outT.length, outTri.length), s0, e0, 'closestBatch');
  const ti = bvh.triIndex;
  let hits = 0;
  for (let i = s0; i < e0; i++) {
    const o = i * 6;
    const t = closestT(bvh, rays[o] as number, rays[o + 1] as number, rays[o + 2] as number,
      rays[o + 3] as number, rays[o + 4] as number, rays[o + 5] as number, tMin, tMax, null);
    if (lastSlot >= 0) {
      outT[i] = t;
      outTri[i] = ti[lastSlot] as number;
      hits++;
    } else {
      outT[i] = Infinity;
      outTri[i] = -1;
    }
  }
  return hits;
}
