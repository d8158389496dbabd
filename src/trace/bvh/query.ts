/**
 * Scalar ray queries on a `BvhData` (layout in layout.ts): `isOccluded` (any hit, stops at the
 * first) and `intersectClosest` (nearest hit). Zero allocation per call: module-scope stacks.
 *
 * Conventions: the ray is o + t·d with t in [tMin, tMax] (both inclusive); d need not be unit
 * length (t is then in units of |d|); a zero component is fine. Triangles are double-sided. The
 * triangle test is Möller–Trumbore in float64; a triangle with |det| <= DET_EPSILON (zero area or
 * edge-on to the ray) is never hit. Reference: T. Möller and B. Trumbore, "Fast, minimum storage
 * ray-triangle intersection," J. Graphics Tools, vol. 2, no. 1, pp. 21–28, 1997,
 * doi:10.1080/10867651.1997.10487468.
 *
 * Traversal: iterative with an explicit Int32Array stack; at an interior node both (adjacent)
 * child boxes are slab-tested; any-hit visits the near child by the ray's direction sign on the
 * split axis, closest-hit the one with the smaller entry distance, and skips popped nodes whose
 * entry distance is beyond the best hit so far.
 */
import type { BvhData } from './build.ts';

/** Result slot for `intersectClosest` (caller-owned, reused). */
export interface ClosestHit {
  /** Ray parameter of the hit (distance [m] for a unit direction); Infinity if none. */
  t: number;
  /** ORIGINAL triangle index in the scene; -1 if none. */
  triangle: number;
  /** Barycentric coordinate of vertex 1 at the hit. */
  u: number;
  /** Barycentric coordinate of vertex 2 at the hit. */
  v: number;
}

/** Triangles with |det| at or below this (m² per unit direction length) are treated as missed. */
export const DET_EPSILON = 1e-14;

let stack = new Int32Array(256);
let stackT = new Float64Array(256);

function ensureStack(depth: number): void {
  if (stack.length < depth + 4) {
    stack = new Int32Array(depth + 64);
    stackT = new Float64Array(depth + 64);
  }
}

/** A fresh closest-hit slot (allocate once, outside loops). */
export function makeClosestHit(): ClosestHit {
  return { t: Infinity, triangle: -1, u: 0, v: 0 };
}

/**
 * True when any triangle is hit at t in [tMin, tMax] by the ray o + t·d.
 * @param ox origin x [m] (oy, oz alike)
 * @param dx direction x (dy, dz alike; need not be unit)
 * @param tMin nearest accepted t (offset for self-hits)
 * @param tMax farthest accepted t (Infinity for none)
 */
export function isOccluded(
  bvh: BvhData, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
): boolean {
  return occludedImpl(bvh, ox, oy, oz, dx, dy, dz, tMin, tMax);
}

/**
 * As `isOccluded`, but triangles whose ORIGINAL index has `skip[index] !== 0` are ignored
 * (e.g. semi-transparent devices handled separately).
 */
export function isOccludedMasked(
  bvh: BvhData, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
  skip: Uint8Array,
): boolean {
  return occludedMaskedImpl(bvh, ox, oy, oz, dx, dy, dz, tMin, tMax, skip);
}

/**
 * Nearest hit at t in [tMin, tMax]; fills `hit` (t, ORIGINAL triangle index, u, v) and returns true,
 * or sets hit.t = Infinity, hit.triangle = -1 and returns false.
 */
export function intersectClosest(
  bvh: BvhData, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
  hit: ClosestHit,
): boolean {
  return closestImpl(bvh, ox, oy, oz, dx, dy, dz, tMin, tMax, hit, null);
}

/** As `intersectClosest`, ignoring triangles whose ORIGINAL index has `skip[index] !== 0`. */
export function intersectClosestMasked(
  bvh: BvhData, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
  hit: ClosestHit, skip: Uint8Array,
): boolean {
  return closestImpl(bvh, ox, oy, oz, dx, dy, dz, tMin, tMax, hit, skip);
}

/** Internal: set by `closestT` (kernel slot of the best hit, or -1; its u, v). Read by batch.ts. */
export let lastSlot = -1;
export let lastU = 0;
export let lastV = 0;

function occludedImpl(
  bvh: BvhData, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
): boolean {
  const nf = bvh.nodes, ni = bvh.nodeInts, tr = bvh.tris;
  if (stack.length < bvh.depth + 4) ensureStack(bvh.depth);
  const st = stack;
  const ix = 1 / dx, iy = 1 / dy, iz = 1 / dz;
  // near/far plane word offsets per axis from the direction sign (1/-0 = -Infinity counts as negative)
  const nx = ix >= 0 ? 0 : 3, ny = iy >= 0 ? 1 : 4, nz = iz >= 0 ? 2 : 5;
  const fxx = nx === 0 ? 3 : 0, fyy = ny === 1 ? 4 : 1, fzz = nz === 2 ? 5 : 2;
  // root box
  {
    let tn = tMin, tf = tMax;
    let a = ((nf[nx] as number) - ox) * ix, b = ((nf[fxx] as number) - ox) * ix;
    if (a > tn) tn = a; if (b < tf) tf = b;
    a = ((nf[ny] as number) - oy) * iy; b = ((nf[fyy] as number) - oy) * iy;
    if (a > tn) tn = a; if (b < tf) tf = b;
    a = ((nf[nz] as number) - oz) * iz; b = ((nf[fzz] as number) - oz) * iz;
    if (a > tn) tn = a; if (b < tf) tf = b;
    if (!(tn <= tf)) return false;
  }
  let sp = 0;
  let node = 0;
  for (;;) {
    const no = node << 3;
    const w = ni[no + 7] as number;
    if (w >= 0) {
      let s = ni[no + 6] as number;
      const e = s + w;
      for (; s < e; s++) {
        const b = s * 9;
        const ax = tr[b] as number, ay = tr[b + 1] as number, az = tr[b + 2] as number;
        const e1x = (tr[b + 3] as number) - ax, e1y = (tr[b + 4] as number) - ay, e1z = (tr[b + 5] as number) - az;
        const e2x = (tr[b + 6] as number) - ax, e2y = (tr[b + 7] as number) - ay, e2z = (tr[b + 8] as number) - az;
        const px = dy * e2z - dz * e2y, py = dz * e2x - dx * e2z, pz = dx * e2y - dy * e2x;
        const det = e1x * px + e1y * py + e1z * pz;
        if (det > -DET_EPSILON && det < DET_EPSILON) continue;
        const inv = 1 / det;
        const tx = ox - ax, ty = oy - ay, tz = oz - az;
        const u = (tx * px + ty * py + tz * pz) * inv;
        if (u < 0 || u > 1) continue;
        const qx = ty * e1z - tz * e1y, qy = tz * e1x - tx * e1z, qz = tx * e1y - ty * e1x;
        const v = (dx * qx + dy * qy + dz * qz) * inv;
        if (v < 0 || u + v > 1) continue;
        const t = (e2x * qx + e2y * qy + e2z * qz) * inv;
        if (t >= tMin && t <= tMax) return true;
      }
    } else {
      const lo = (ni[no + 6] as number) << 3;
      const ro = lo + 8;
      let hitL: boolean, hitR: boolean;
      {
        let tn = tMin, tf = tMax;
        let a = ((nf[lo + nx] as number) - ox) * ix, b = ((nf[lo + fxx] as number) - ox) * ix;
        if (a > tn) tn = a; if (b < tf) tf = b;
        a = ((nf[lo + ny] as number) - oy) * iy; b = ((nf[lo + fyy] as number) - oy) * iy;
        if (a > tn) tn = a; if (b < tf) tf = b;
        a = ((nf[lo + nz] as number) - oz) * iz; b = ((nf[lo + fzz] as number) - oz) * iz;
        if (a > tn) tn = a; if (b < tf) tf = b;
        hitL = tn <= tf;
      }
      {
        let tn = tMin, tf = tMax;
        let a = ((nf[ro + nx] as number) - ox) * ix, b = ((nf[ro + fxx] as number) - ox) * ix;
        if (a > tn) tn = a; if (b < tf) tf = b;
        a = ((nf[ro + ny] as number) - oy) * iy; b = ((nf[ro + fyy] as number) - oy) * iy;
        if (a > tn) tn = a; if (b < tf) tf = b;
        a = ((nf[ro + nz] as number) - oz) * iz; b = ((nf[ro + fzz] as number) - oz) * iz;
        if (a > tn) tn = a; if (b < tf) tf = b;
        hitR = tn <= tf;
      }
      const l = lo >> 3;
      if (hitL) {
        if (hitR) {
          const axis = -1 - w;
          const neg = axis === 0 ? ix < 0 : axis === 1 ? iy < 0 : iz < 0;
          if (neg) { st[sp++] = l; node = l + 1; } else { st[sp++] = l + 1; node = l; }
        } else node = l;
        continue;
      } else if (hitR) {
        node = l + 1;
        continue;
      }
    }
    if (sp === 0) return false;
    node = st[--sp] as number;
  }
}

function occludedMaskedImpl(
  bvh: BvhData, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
  skip: Uint8Array,
): boolean {
  const nf = bvh.nodes, ni = bvh.nodeInts, tr = bvh.tris, ti = bvh.triIndex;
  if (stack.length < bvh.depth + 4) ensureStack(bvh.depth);
  const st = stack;
  const ix = 1 / dx, iy = 1 / dy, iz = 1 / dz;
  const nx = ix >= 0 ? 0 : 3, ny = iy >= 0 ? 1 : 4, nz = iz >= 0 ? 2 : 5;
  const fxx = nx === 0 ? 3 : 0, fyy = ny === 1 ? 4 : 1, fzz = nz === 2 ? 5 : 2;
  {
    let tn = tMin, tf = tMax;
    let a = ((nf[nx] as number) - ox) * ix, b = ((nf[fxx] as number) - ox) * ix;
    if (a > tn) tn = a; if (b < tf) tf = b;
    a = ((nf[ny] as number) - oy) * iy; b = ((nf[fyy] as number) - oy) * iy;
    if (a > tn) tn = a; if (b < tf) tf = b;
    a = ((nf[nz] as number) - oz) * iz; b = ((nf[fzz] as number) - oz) * iz;
    if (a > tn) tn = a; if (b < tf) tf = b;
    if (!(tn <= tf)) return false;
  }
  let sp = 0;
  let node = 0;
  for (;;) {
    const no = node << 3;
    const w = ni[no + 7] as number;
    if (w >= 0) {
      let s = ni[no + 6] as number;
      const e = s + w;
      for (; s < e; s++) {
        if ((skip[ti[s] as number] as number) !== 0) continue;
        const b = s * 9;
        const ax = tr[b] as number, ay = tr[b + 1] as number, az = tr[b + 2] as number;
        const e1x = (tr[b + 3] as number) - ax, e1y = (tr[b + 4] as number) - ay, e1z = (tr[b + 5] as number) - az;
        const e2x = (tr[b + 6] as number) - ax, e2y = (tr[b + 7] as number) - ay, e2z = (tr[b + 8] as number) - az;
        const px = dy * e2z - dz * e2y, py = dz * e2x - dx * e2z, pz = dx * e2y - dy * e2x;
        const det = e1x * px + e1y * py + e1z * pz;
        if (det > -DET_EPSILON && det < DET_EPSILON) continue;
        const inv = 1 / det;
        const tx = ox - ax, ty = oy - ay, tz = oz - az;
        const u = (tx * px + ty * py + tz * pz) * inv;
        if (u < 0 || u > 1) continue;
        const qx = ty * e1z - tz * e1y, qy = tz * e1x - tx * e1z, qz = tx * e1y - ty * e1x;
        const v = (dx * qx + dy * qy + dz * qz) * inv;
        if (v < 0 || u + v > 1) continue;
        const t = (e2x * qx + e2y * qy + e2z * qz) * inv;
        if (t >= tMin && t <= tMax) return true;
      }
    } else {
      const lo = (ni[no + 6] as number) << 3;
      const ro = lo + 8;
      let hitL: boolean, hitR: boolean;
      {
        let tn = tMin, tf = tMax;
        let a = ((nf[lo + nx] as number) - ox) * ix, b = ((nf[lo + fxx] as number) - ox) * ix;
        if (a > tn) tn = a; if (b < tf) tf = b;
        a = ((nf[lo + ny] as number) - oy) * iy; b = ((nf[lo + fyy] as number) - oy) * iy;
        if (a > tn) tn = a; if (b < tf) tf = b;
        a = ((nf[lo + nz] as number) - oz) * iz; b = ((nf[lo + fzz] as number) - oz) * iz;
        if (a > tn) tn = a; if (b < tf) tf = b;
        hitL = tn <= tf;
      }
      {
        let tn = tMin, tf = tMax;
        let a = ((nf[ro + nx] as number) - ox) * ix, b = ((nf[ro + fxx] as number) - ox) * ix;
        if (a > tn) tn = a; if (b < tf) tf = b;
        a = ((nf[ro + ny] as number) - oy) * iy; b = ((nf[ro + fyy] as number) - oy) * iy;
        if (a > tn) tn = a; if (b < tf) tf = b;
        a = ((nf[ro + nz] as number) - oz) * iz; b = ((nf[ro + fzz] as number) - oz) * iz;
        if (a > tn) tn = a; if (b < tf) tf = b;
        hitR = tn <= tf;
      }
      const l = lo >> 3;
      if (hitL) {
        if (hitR) {
          const axis = -1 - w;
          const neg = axis === 0 ? ix < 0 : axis === 1 ? iy < 0 : iz < 0;
          if (neg) { st[sp++] = l; node = l + 1; } else { st[sp++] = l + 1; node = l; }
        } else node = l;
        continue;
      } else if (hitR) {
        node = l + 1;
        continue;
      }
    }
    if (sp === 0) return false;
    node = st[--sp] as number;
  }
}

/**
 * Closest-hit kernel: returns the best t (Infinity if none) and leaves the slot, u, v in
 * `lastSlot`, `lastU`, `lastV`. `skip` is null or a per-ORIGINAL-triangle skip flag.
 */
export function closestT(
  bvh: BvhData, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
  skip: Uint8Array | null,
): number {
  const nf = bvh.nodes, ni = bvh.nodeInts, tr = bvh.tris, ti = bvh.triIndex;
  if (stack.length < bvh.depth + 4) ensureStack(bvh.depth);
  const st = stack, stT = stackT;
  const ix = 1 / dx, iy = 1 / dy, iz = 1 / dz;
  const nx = ix >= 0 ? 0 : 3, ny = iy >= 0 ? 1 : 4, nz = iz >= 0 ? 2 : 5;
  const fxx = nx === 0 ? 3 : 0, fyy = ny === 1 ? 4 : 1, fzz = nz === 2 ? 5 : 2;
  let best = tMax, bestSlot = -1, bestU = 0, bestV = 0;
  lastSlot = -1;
  {
    let tn = tMin, tf = tMax;
    let a = ((nf[nx] as number) - ox) * ix, b = ((nf[fxx] as number) - ox) * ix;
    if (a > tn) tn = a; if (b < tf) tf = b;
    a = ((nf[ny] as number) - oy) * iy; b = ((nf[fyy] as number) - oy) * iy;
    if (a > tn) tn = a; if (b < tf) tf = b;
    a = ((nf[nz] as number) - oz) * iz; b = ((nf[fzz] as number) - oz) * iz;
    if (a > tn) tn = a; if (b < tf) tf = b;
    if (!(tn <= tf)) return Infinity;
  }
  let sp = 0;
  let node = 0;
  for (;;) {
    const no = node << 3;
    const w = ni[no + 7] as number;
    if (w >= 0) {
      let s = ni[no + 6] as number;
      const e = s + w;
      for (; s < e; s++) {
        if (skip !== null && (skip[ti[s] as number] as number) !== 0) continue;
        const b = s * 9;
        const ax = tr[b] as number, ay = tr[b + 1] as number, az = tr[b + 2] as number;
        const e1x = (tr[b + 3] as number) - ax, e1y = (tr[b + 4] as number) - ay, e1z = (tr[b + 5] as number) - az;
        const e2x = (tr[b + 6] as number) - ax, e2y = (tr[b + 7] as number) - ay, e2z = (tr[b + 8] as number) - az;
        const px = dy * e2z - dz * e2y, py = dz * e2x - dx * e2z, pz = dx * e2y - dy * e2x;
        const det = e1x * px + e1y * py + e1z * pz;
        if (det > -DET_EPSILON && det < DET_EPSILON) continue;
        const inv = 1 / det;
        const tx = ox - ax, ty = oy - ay, tz = oz - az;
        const u = (tx * px + ty * py + tz * pz) * inv;
        if (u < 0 || u > 1) continue;
        const qx = ty * e1z - tz * e1y, qy = tz * e1x - tx * e1z, qz = tx * e1y - ty * e1x;
        const v = (dx * qx + dy * qy + dz * qz) * inv;
        if (v < 0 || u + v > 1) continue;
        const t = (e2x * qx + e2y * qy + e2z * qz) * inv;
        if (t >= tMin && t <= best) {
          // on an exact tie keep the lower original index, so the answer does not depend on the tree
          if (t === best && bestSlot >= 0 && (ti[s] as number) > (ti[bestSlot] as number)) continue;
          best = t; bestSlot = s; bestU = u; bestV = v;
        }
      }
    } else {
      const lo = (ni[no + 6] as number) << 3;
      const ro = lo + 8;
      let tL: number, tR: number;
      {
        let tn = tMin, tf = best;
        let a = ((nf[lo + nx] as number) - ox) * ix, b = ((nf[lo + fxx] as number) - ox) * ix;
        if (a > tn) tn = a; if (b < tf) tf = b;
        a = ((nf[lo + ny] as number) - oy) * iy; b = ((nf[lo + fyy] as number) - oy) * iy;
        if (a > tn) tn = a; if (b < tf) tf = b;
        a = ((nf[lo + nz] as number) - oz) * iz; b = ((nf[lo + fzz] as number) - oz) * iz;
        if (a > tn) tn = a; if (b < tf) tf = b;
        tL = tn <= tf ? tn : Infinity;
      }
      {
        let tn = tMin, tf = best;
        let a = ((nf[ro + nx] as number) - ox) * ix, b = ((nf[ro + fxx] as number) - ox) * ix;
        if (a > tn) tn = a; if (b < tf) tf = b;
        a = ((nf[ro + ny] as number) - oy) * iy; b = ((nf[ro + fyy] as number) - oy) * iy;
        if (a > tn) tn = a; if (b < tf) tf = b;
        a = ((nf[ro + nz] as number) - oz) * iz; b = ((nf[ro + fzz] as number) - oz) * iz;
        if (a > tn) tn = a; if (b < tf) tf = b;
        tR = tn <= tf ? tn : Infinity;
      }
      const l = lo >> 3;
      if (tL !== Infinity) {
        if (tR !== Infinity) {
          if (tR < tL) { stT[sp] = tL; st[sp++] = l; node = l + 1; } else { stT[sp] = tR; st[sp++] = l + 1; node = l; }
        } else node = l;
        continue;
      } else if (tR !== Infinity) {
        node = l + 1;
        continue;
      }
    }
    // pop, skipping entries whose box starts beyond the best hit
    for (;;) {
      if (sp === 0) {
        if (bestSlot < 0) return Infinity;
        lastSlot = bestSlot; lastU = bestU; lastV = bestV;
        return best;
      }
      --sp;
      if ((stT[sp] as number) <= best) { node = st[sp] as number; break; }
    }
  }
}

function closestImpl(
  bvh: BvhData, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
  hit: ClosestHit, skip: Uint8Array | null,
): boolean {
  const t = closestT(bvh, ox, oy, oz, dx, dy, dz, tMin, tMax, skip);
  if (lastSlot < 0) {
    hit.t = Infinity; hit.triangle = -1; hit.u = 0; hit.v = 0;
    return false;
  }
  hit.t = t; hit.triangle = bvh.triIndex[lastSlot] as number; hit.u = lastU; hit.v = lastV;
  return true;
}
