/**
 * Batch ray queries: arrays in, arrays out. Rays are 6 floats each (ox oy oz dx dy dz); results
 * are written at the ray's own index, so several workers can fill disjoint ranges of one shared
 * output array. `start`/`end` are ray indices (default: all rays).
 *
 * Speed: on scenes whose BVH exceeds the CPU caches, random ray order makes every node visit a
 * cache miss (measured ≈ 100 ns per node on a 200 k-triangle city, about 2× slower than the
 * arithmetic). So ranges of at least `SORT_MIN_RAYS` rays are traced in a coherent order: sorted by
 * direction octant, then by the Morton code of the origin within the scene box (2-pass 16-bit
 * radix sort on module-scope scratch that grows as needed). Results are identical either way.
 *
 * Kernel: the WebAssembly SIMD kernel (../wasm/loader.ts) when it is loaded and enabled on this
 * thread (`setRayKernel`, default 'auto'), else the JavaScript kernel; their answers are identical.
 */
import type { BvhData } from './build.ts';
import { InputError } from '../../physics/errors.ts';
import { isOccluded, isOccludedMasked, closestT, lastSlot } from './query.ts';
import { wasmKernelFor } from '../wasm/loader.ts';

/** Ranges with fewer rays are traced in the given order. */
export const SORT_MIN_RAYS = 2048;

let keys = new Uint32Array(0), perm = new Uint32Array(0), keysTmp = new Uint32Array(0), permTmp = new Uint32Array(0);
const histogram = new Uint32Array(65536);

/** Spreads the low 10 bits of x to every third bit. */
function spread3(x: number): number {
  x &= 0x3ff;
  x = (x | (x << 16)) & 0x030000ff;
  x = (x | (x << 8)) & 0x0300f00f;
  x = (x | (x << 4)) & 0x030c30c3;
  x = (x | (x << 2)) & 0x09249249;
  return x;
}

/**
 * Fills module `perm[0..m)` with ray indices start.. in coherent order (see file comment);
 * returns the array holding the order.
 */
function coherentOrder(bvh: BvhData, rays: Float32Array, start: number, end: number): Uint32Array {
  const m = end - start;
  if (perm.length < m) {
    keys = new Uint32Array(m); perm = new Uint32Array(m); keysTmp = new Uint32Array(m); permTmp = new Uint32Array(m);
  }
  const nf = bvh.nodes;
  const x0 = nf[0] as number, y0 = nf[1] as number, z0 = nf[2] as number;
  const ex = (nf[3] as number) - x0, ey = (nf[4] as number) - y0, ez = (nf[5] as number) - z0;
  const sx = ex > 0 ? 1023 / ex : 0, sy = ey > 0 ? 1023 / ey : 0, sz = ez > 0 ? 1023 / ez : 0;
  for (let i = 0; i < m; i++) {
    const o = (start + i) * 6;
    let qx = ((rays[o] as number) - x0) * sx, qy = ((rays[o + 1] as number) - y0) * sy, qz = ((rays[o + 2] as number) - z0) * sz;
    qx = qx > 0 ? (qx < 1023 ? qx : 1023) : 0; qy = qy > 0 ? (qy < 1023 ? qy : 1023) : 0; qz = qz > 0 ? (qz < 1023 ? qz : 1023) : 0;
    const oct = ((rays[o + 3] as number) < 0 ? 1 : 0) | ((rays[o + 4] as number) < 0 ? 2 : 0) | ((rays[o + 5] as number) < 0 ? 4 : 0);
    // 2 octant bits on top would overflow 32 bits with 30 Morton bits: use 9 bits per axis.
    keys[i] = ((oct << 27) | (spread3(qx >> 1) << 2) | (spread3(qy >> 1) << 1) | spread3(qz >> 1)) >>> 0;
    perm[i] = start + i;
  }
  // LSD radix sort, 2 passes of 16 bits
  let kIn = keys, pIn = perm, kOut = keysTmp, pOut = permTmp;
  for (let shift = 0; shift < 32; shift += 16) {
    histogram.fill(0);
    for (let i = 0; i < m; i++) { const d = ((kIn[i] as number) >>> shift) & 0xffff; histogram[d] = (histogram[d] as number) + 1; }
    let sum = 0;
    for (let d = 0; d < 65536; d++) { const c = histogram[d] as number; histogram[d] = sum; sum += c; }
    for (let i = 0; i < m; i++) {
      const k = kIn[i] as number;
      const d = (k >>> shift) & 0xffff;
      const at = histogram[d] as number;
      histogram[d] = at + 1;
      kOut[at] = k; pOut[at] = pIn[i] as number;
    }
    const tk = kIn; kIn = kOut; kOut = tk;
    const tp = pIn; pIn = pOut; pOut = tp;
  }
  return pIn; // after an even number of passes this is `perm`
}

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
  const wasm = wasmKernelFor(bvh); if (wasm !== null) return wasm.occluded(bvh, rays, tMin, tMax, out, s0, e0, null);
  let hits = 0;
  const sorted = e0 - s0 >= SORT_MIN_RAYS;
  const ord = sorted ? coherentOrder(bvh, rays, s0, e0) : perm;
  for (let k = s0; k < e0; k++) {
    const i = sorted ? (ord[k - s0] as number) : k;
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
  const wasm = wasmKernelFor(bvh); if (wasm !== null) return wasm.occluded(bvh, rays, tMin, tMax, out, s0, e0, skip);
  let hits = 0;
  const sorted = e0 - s0 >= SORT_MIN_RAYS;
  const ord = sorted ? coherentOrder(bvh, rays, s0, e0) : perm;
  for (let k = s0; k < e0; k++) {
    const i = sorted ? (ord[k - s0] as number) : k;
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
  const wasm = wasmKernelFor(bvh); if (wasm !== null) return wasm.closest(bvh, rays, tMin, tMax, outT, outTri, s0, e0);
  const ti = bvh.triIndex;
  let hits = 0;
  const sorted = e0 - s0 >= SORT_MIN_RAYS;
  const ord = sorted ? coherentOrder(bvh, rays, s0, e0) : perm;
  for (let k = s0; k < e0; k++) {
    const i = sorted ? (ord[k - s0] as number) : k;
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
