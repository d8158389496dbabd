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
 * Traversal of the 4-wide tree (layout.ts): iterative with an explicit Int32Array stack; at a node
 * the 4 child boxes (side by side in one 128-byte node) are slab-tested; closest-hit visits hit
 * children nearest entry first and skips popped nodes whose entry distance is beyond the best hit
 * so far.
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

/** Makes the module stacks hold a traversal of a tree `depth` levels deep (3 entries per level). */
function ensureStack(depth: number): void {
  if (stack.length < 3 * depth + 8) {
    stack = new Int32Array(3 * depth + 64);
    stackT = new Float64Array(3 * depth + 64);
  }
}

/**
 * 1 / d for the slab test, with a zero component mapped to ±1e30 (sign kept) instead of ±Infinity,
 * so that box · inv − origin · inv stays finite (no Infinity − Infinity = NaN). The slab of such an
 * axis then spans ±1e30 · (distance to the plane), which is beyond any scene unless the origin lies
 * within ~1e-27 m of the plane, and the boxes are padded far more than that (layout.ts).
 */
function invDir(d: number): number {
  return d !== 0 ? 1 / d : 1 / d > 0 ? 1e30 : -1e30;
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
  return occludedImpl(bvh, ox, oy, oz, dx, dy, dz, tMin, tMax, null);
}

/**
 * As `isOccluded`, but triangles whose ORIGINAL index has `skip[index] !== 0` are ignored
 * (e.g. semi-transparent devices handled separately).
 */
export function isOccludedMasked(
  bvh: BvhData, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
  skip: Uint8Array,
): boolean {
  return occludedImpl(bvh, ox, oy, oz, dx, dy, dz, tMin, tMax, skip);
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

/**
 * Any-hit kernel. At each node the 4 child boxes are slab-tested in turn; a hit leaf's triangles
 * are tested at once (an early way out), hit interior children are pushed. `skip` is null or a
 * per-ORIGINAL-triangle skip flag.
 */
function occludedImpl(
  bvh: BvhData, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
  skip: Uint8Array | null,
): boolean {
  const nf = bvh.nodes, ni = bvh.nodeInts, tr = bvh.tris, ti = bvh.triIndex;
  if (stack.length < 3 * bvh.depth + 8) ensureStack(bvh.depth);
  const st = stack, stT = stackT;
  const ix = invDir(dx), iy = invDir(dy), iz = invDir(dz);
  const oix = ox * ix, oiy = oy * iy, oiz = oz * iz;
  // near/far plane word offsets per axis from the direction sign (1/-0 = -Infinity counts as negative)
  const nx = ix >= 0 ? 0 : 12, ny = iy >= 0 ? 4 : 16, nz = iz >= 0 ? 8 : 20;
  const fx = nx === 0 ? 12 : 0, fy = ny === 4 ? 16 : 4, fz = nz === 8 ? 20 : 8;
  let sp = 0;
  let no = 0;
  for (;;) {
    const base = sp;
    for (let c = no; c < no + 4; c++) {
      let tn = tMin, tf = tMax;
      let a = (nf[c + nx] as number) * ix - oix, b = (nf[c + fx] as number) * ix - oix;
      if (a > tn) tn = a; if (b < tf) tf = b;
      a = (nf[c + ny] as number) * iy - oiy; b = (nf[c + fy] as number) * iy - oiy;
      if (a > tn) tn = a; if (b < tf) tf = b;
      a = (nf[c + nz] as number) * iz - oiz; b = (nf[c + fz] as number) * iz - oiz;
      if (a > tn) tn = a; if (b < tf) tf = b;
      if (!(tn <= tf)) continue;
      const w = ni[c + 28] as number;
      if (w < 0) {
        // nearest entry on top of the stack: its subtree is the likeliest to block the ray early
        const child = ni[c + 24] as number;
        let j = sp++;
        while (j > base && (stT[j - 1] as number) < tn) { st[j] = st[j - 1] as number; stT[j] = stT[j - 1] as number; j--; }
        st[j] = child; stT[j] = tn;
        continue;
      }
      let s = ni[c + 24] as number;
      const e = s + w;
      for (; s < e; s++) {
        if (skip !== null && (skip[ti[s] as number] as number) !== 0) continue;
        const o = s * 9;
        const ax = tr[o] as number, ay = tr[o + 1] as number, az = tr[o + 2] as number;
        const e1x = (tr[o + 3] as number) - ax, e1y = (tr[o + 4] as number) - ay, e1z = (tr[o + 5] as number) - az;
        const e2x = (tr[o + 6] as number) - ax, e2y = (tr[o + 7] as number) - ay, e2z = (tr[o + 8] as number) - az;
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
    }
    if (sp === 0) return false;
    no = (st[--sp] as number) << 5;
  }
}

/**
 * Closest-hit kernel: returns the best t (Infinity if none) and leaves the slot, u, v in
 * `lastSlot`, `lastU`, `lastV`. `skip` is null or a per-ORIGINAL-triangle skip flag. A hit leaf's
 * triangles are tested at once (shrinking the window for the remaining children); hit interior
 * children are pushed in order of entry distance, nearest on top, and popped entries whose box
 * starts beyond the best hit are dropped.
 */
export function closestT(
  bvh: BvhData, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
  skip: Uint8Array | null,
): number {
  const nf = bvh.nodes, ni = bvh.nodeInts, tr = bvh.tris, ti = bvh.triIndex;
  if (stack.length < 3 * bvh.depth + 8) ensureStack(bvh.depth);
  const st = stack, stT = stackT;
  const ix = invDir(dx), iy = invDir(dy), iz = invDir(dz);
  const oix = ox * ix, oiy = oy * iy, oiz = oz * iz;
  const nx = ix >= 0 ? 0 : 12, ny = iy >= 0 ? 4 : 16, nz = iz >= 0 ? 8 : 20;
  const fx = nx === 0 ? 12 : 0, fy = ny === 4 ? 16 : 4, fz = nz === 8 ? 20 : 8;
  let best = tMax, bestSlot = -1, bestU = 0, bestV = 0;
  lastSlot = -1;
  let sp = 0;
  let no = 0;
  for (;;) {
    const base = sp;
    for (let c = no; c < no + 4; c++) {
      let tn = tMin, tf = best;
      let a = (nf[c + nx] as number) * ix - oix, b = (nf[c + fx] as number) * ix - oix;
      if (a > tn) tn = a; if (b < tf) tf = b;
      a = (nf[c + ny] as number) * iy - oiy; b = (nf[c + fy] as number) * iy - oiy;
      if (a > tn) tn = a; if (b < tf) tf = b;
      a = (nf[c + nz] as number) * iz - oiz; b = (nf[c + fz] as number) * iz - oiz;
      if (a > tn) tn = a; if (b < tf) tf = b;
      if (!(tn <= tf)) continue;
      const w = ni[c + 28] as number;
      if (w < 0) {
        // insert below the nearer entries pushed from this node (at most 3 moves)
        const child = ni[c + 24] as number;
        let j = sp++;
        while (j > base && (stT[j - 1] as number) < tn) { st[j] = st[j - 1] as number; stT[j] = stT[j - 1] as number; j--; }
        st[j] = child; stT[j] = tn;
        continue;
      }
      let s = ni[c + 24] as number;
      const e = s + w;
      for (; s < e; s++) {
        if (skip !== null && (skip[ti[s] as number] as number) !== 0) continue;
        const o = s * 9;
        const ax = tr[o] as number, ay = tr[o + 1] as number, az = tr[o + 2] as number;
        const e1x = (tr[o + 3] as number) - ax, e1y = (tr[o + 4] as number) - ay, e1z = (tr[o + 5] as number) - az;
        const e2x = (tr[o + 6] as number) - ax, e2y = (tr[o + 7] as number) - ay, e2z = (tr[o + 8] as number) - az;
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
    }
    // pop, skipping entries whose box starts beyond the best hit
    for (;;) {
      if (sp === 0) {
        if (bestSlot < 0) return Infinity;
        lastSlot = bestSlot; lastU = bestU; lastV = bestV;
        return best;
      }
      --sp;
      if ((stT[sp] as number) <= best) { no = (st[sp] as number) << 5; break; }
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
