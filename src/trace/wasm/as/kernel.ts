/**
 * AssemblyScript ray kernel (compiled by `npm run build:wasm` with SIMD, -O3, stub runtime; the
 * output is embedded in ../kernelBytes.ts). Plain memory, no allocation: the JavaScript loader
 * (../loader.ts) lays out every region and passes pointers.
 *
 * Wasm node layout (one 64-byte record per INTERIOR node of the JavaScript BVH, in the same order;
 * see ../loader.ts for the conversion):
 *   bytes  0..15  f32 [minX(L), minX(R), maxX(L), maxX(R)]
 *   bytes 16..31  f32 [minY(L), minY(R), maxY(L), maxY(R)]
 *   bytes 32..47  f32 [minZ(L), minZ(R), maxZ(L), maxZ(R)]
 *   bytes 48..59  i32 ref(L), ref(R), split axis (0..2)
 * A ref >= 0 is an interior record index; a ref < 0 is a leaf: ~ref = firstSlot << 8 | count.
 *
 * Box test: both children at once in f32x4, made conservative (entry distances lowered and exit
 * distances raised by a relative 2^-20 ≫ the f32 rounding of (bound - origin) · (1 / d)), so it
 * never culls a box the exact test keeps; a NaN slab (0 · ∞) is ignored, as in the JavaScript
 * kernel. Triangle test: Möller–Trumbore in float64 with the same operations in the same order as
 * ../../bvh/query.ts, so hits, t, and the lower-index tie rule are bit-identical to it.
 */

const DET_EPSILON: f64 = 1e-14;
const EPS: f32 = 9.5367431640625e-7; // 2^-20

let gNodes: usize = 0;
let gTris: usize = 0;
let gTriIndex: usize = 0;
let gStack: usize = 0; // i32 refs
let gStackT: usize = 0; // f32 entry distances
let gRoot: i32 = 0;

/** First free byte after the module's static data. */
export function heapBase(): usize {
  return __heap_base;
}

/** Points the kernel at a scene already written into memory. */
export function setScene(nodes: usize, tris: usize, triIndex: usize, stack: usize, stackT: usize, root: i32): void {
  gNodes = nodes; gTris = tris; gTriIndex = triIndex; gStack = stack; gStackT = stackT; gRoot = root;
}

// ---------------------------------------------------------------- triangle test (float64)

let hitU: f64 = 0;
let hitV: f64 = 0;

/** t of the hit of slot `s`, or NaN when missed (same arithmetic as query.ts). */
// @ts-ignore: decorator
@inline
function triT(s: i32, ox: f64, oy: f64, oz: f64, dx: f64, dy: f64, dz: f64): f64 {
  const b = gTris + <usize>s * 36;
  const ax = <f64>load<f32>(b), ay = <f64>load<f32>(b, 4), az = <f64>load<f32>(b, 8);
  const e1x = <f64>load<f32>(b, 12) - ax, e1y = <f64>load<f32>(b, 16) - ay, e1z = <f64>load<f32>(b, 20) - az;
  const e2x = <f64>load<f32>(b, 24) - ax, e2y = <f64>load<f32>(b, 28) - ay, e2z = <f64>load<f32>(b, 32) - az;
  const px = dy * e2z - dz * e2y, py = dz * e2x - dx * e2z, pz = dx * e2y - dy * e2x;
  const det = e1x * px + e1y * py + e1z * pz;
  if (det > -DET_EPSILON && det < DET_EPSILON) return NaN;
  const inv = 1.0 / det;
  const tx = ox - ax, ty = oy - ay, tz = oz - az;
  const u = (tx * px + ty * py + tz * pz) * inv;
  if (u < 0 || u > 1) return NaN;
  const qx = ty * e1z - tz * e1y, qy = tz * e1x - tx * e1z, qz = tx * e1y - ty * e1x;
  const v = (dx * qx + dy * qy + dz * qz) * inv;
  if (v < 0 || u + v > 1) return NaN;
  hitU = u; hitV = v;
  return (e2x * qx + e2y * qy + e2z * qz) * inv;
}

// ---------------------------------------------------------------- traversal

// @ts-ignore: decorator
@inline
function occludedOne(ray: usize, tMin: f64, tMax: f64, skip: usize, masked: bool): bool {
  const fox = load<f32>(ray), foy = load<f32>(ray, 4), foz = load<f32>(ray, 8);
  const fdx = load<f32>(ray, 12), fdy = load<f32>(ray, 16), fdz = load<f32>(ray, 20);
  const ox = <f64>fox, oy = <f64>foy, oz = <f64>foz, dx = <f64>fdx, dy = <f64>fdy, dz = <f64>fdz;
  const ix: f32 = <f32>1.0 / fdx, iy: f32 = <f32>1.0 / fdy, iz: f32 = <f32>1.0 / fdz;
  const ID = i8x16(0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15);
  const SW = i8x16(8, 9, 10, 11, 12, 13, 14, 15, 0, 1, 2, 3, 4, 5, 6, 7);
  const sx = ix >= 0 ? ID : SW, sy = iy >= 0 ? ID : SW, sz = iz >= 0 ? ID : SW;
  const negBits: i32 = (ix < 0 ? 1 : 0) | (iy < 0 ? 2 : 0) | (iz < 0 ? 4 : 0);
  const oX = f32x4.splat(fox), oY = f32x4.splat(foy), oZ = f32x4.splat(foz);
  const iX = f32x4.replace_lane(f32x4.replace_lane(f32x4.splat(ix), 2, -ix), 3, -ix);
  const iY = f32x4.replace_lane(f32x4.replace_lane(f32x4.splat(iy), 2, -iy), 3, -iy);
  const iZ = f32x4.replace_lane(f32x4.replace_lane(f32x4.splat(iz), 2, -iz), 3, -iz);
  const lo32 = <f32>tMin, hi32 = -<f32>tMax;
  const lim = f32x4.replace_lane(f32x4.replace_lane(f32x4.splat(lo32), 2, hi32), 3, hi32);
  const epsV = f32x4.splat(EPS);
  const st = gStack;
  let sp: i32 = 0;
  let cur = gRoot;
  while (true) {
    if (cur < 0) {
      const code = ~cur;
      let s = code >>> 8;
      const e = s + (code & 255);
      for (; s < e; s++) {
        if (masked && load<u8>(skip + <usize>load<u32>(gTriIndex + (<usize>s << 2))) != 0) continue;
        const t = triT(s, ox, oy, oz, dx, dy, dz);
        if (t >= tMin && t <= tMax) return true;
      }
    } else {
      const p = gNodes + (<usize>cur << 6);
      const tx = f32x4.mul(f32x4.sub(i8x16.swizzle(v128.load(p), sx), oX), iX);
      const ty = f32x4.mul(f32x4.sub(i8x16.swizzle(v128.load(p, 16), sy), oY), iY);
      const tz = f32x4.mul(f32x4.sub(i8x16.swizzle(v128.load(p, 32), sz), oZ), iZ);
      let m = f32x4.pmax(f32x4.pmax(f32x4.pmax(lim, tx), ty), tz);
      m = f32x4.pmin(m, f32x4.sub(m, f32x4.mul(f32x4.abs(m), epsV)));
      const f = f32x4.neg(v128.shuffle<f32>(m, m, 2, 3, 0, 1));
      const bits = i32x4.bitmask(f32x4.le(m, f)) & 3;
      if (bits == 3) {
        const l = load<i32>(p, 48), r = load<i32>(p, 52);
        if ((negBits >> load<i32>(p, 56)) & 1) { store<i32>(st + (<usize>sp << 2), l); cur = r; }
        else { store<i32>(st + (<usize>sp << 2), r); cur = l; }
        sp++;
        continue;
      } else if (bits == 1) { cur = load<i32>(p, 48); continue; }
      else if (bits == 2) { cur = load<i32>(p, 52); continue; }
    }
    if (sp == 0) return false;
    sp--;
    cur = load<i32>(st + (<usize>sp << 2));
  }
}

let lastSlot: i32 = -1;

/** Nearest hit t (f64) or Infinity; leaves the slot in lastSlot (-1 when none). */
// @ts-ignore: decorator
@inline
function closestOne(ray: usize, tMin: f64, tMax: f64): f64 {
  const fox = load<f32>(ray), foy = load<f32>(ray, 4), foz = load<f32>(ray, 8);
  const fdx = load<f32>(ray, 12), fdy = load<f32>(ray, 16), fdz = load<f32>(ray, 20);
  const ox = <f64>fox, oy = <f64>foy, oz = <f64>foz, dx = <f64>fdx, dy = <f64>fdy, dz = <f64>fdz;
  const ix: f32 = <f32>1.0 / fdx, iy: f32 = <f32>1.0 / fdy, iz: f32 = <f32>1.0 / fdz;
  const ID = i8x16(0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15);
  const SW = i8x16(8, 9, 10, 11, 12, 13, 14, 15, 0, 1, 2, 3, 4, 5, 6, 7);
  const sx = ix >= 0 ? ID : SW, sy = iy >= 0 ? ID : SW, sz = iz >= 0 ? ID : SW;
  const oX = f32x4.splat(fox), oY = f32x4.splat(foy), oZ = f32x4.splat(foz);
  const iX = f32x4.replace_lane(f32x4.replace_lane(f32x4.splat(ix), 2, -ix), 3, -ix);
  const iY = f32x4.replace_lane(f32x4.replace_lane(f32x4.splat(iy), 2, -iy), 3, -iy);
  const iZ = f32x4.replace_lane(f32x4.replace_lane(f32x4.splat(iz), 2, -iz), 3, -iz);
  const lo32 = <f32>tMin;
  let hi32 = -<f32>tMax;
  let lim = f32x4.replace_lane(f32x4.replace_lane(f32x4.splat(lo32), 2, hi32), 3, hi32);
  const epsV = f32x4.splat(EPS);
  const st = gStack, stT = gStackT, ti = gTriIndex;
  let best = tMax;
  let bestSlot: i32 = -1;
  let sp: i32 = 0;
  let cur = gRoot;
  while (true) {
    if (cur < 0) {
      const code = ~cur;
      let s = code >>> 8;
      const e = s + (code & 255);
      let improved = false;
      for (; s < e; s++) {
        const t = triT(s, ox, oy, oz, dx, dy, dz);
        if (t >= tMin && t <= best) {
          // on an exact tie keep the lower original index (as query.ts)
          if (t == best && bestSlot >= 0 && load<u32>(ti + (<usize>s << 2)) > load<u32>(ti + (<usize>bestSlot << 2))) continue;
          best = t; bestSlot = s; improved = true;
        }
      }
      if (improved) {
        hi32 = -<f32>best;
        lim = f32x4.replace_lane(f32x4.replace_lane(lim, 2, hi32), 3, hi32);
      }
    } else {
      const p = gNodes + (<usize>cur << 6);
      const tx = f32x4.mul(f32x4.sub(i8x16.swizzle(v128.load(p), sx), oX), iX);
      const ty = f32x4.mul(f32x4.sub(i8x16.swizzle(v128.load(p, 16), sy), oY), iY);
      const tz = f32x4.mul(f32x4.sub(i8x16.swizzle(v128.load(p, 32), sz), oZ), iZ);
      let m = f32x4.pmax(f32x4.pmax(f32x4.pmax(lim, tx), ty), tz);
      m = f32x4.pmin(m, f32x4.sub(m, f32x4.mul(f32x4.abs(m), epsV)));
      const f = f32x4.neg(v128.shuffle<f32>(m, m, 2, 3, 0, 1));
      const bits = i32x4.bitmask(f32x4.le(m, f)) & 3;
      if (bits == 3) {
        const l = load<i32>(p, 48), r = load<i32>(p, 52);
        const tL = f32x4.extract_lane(m, 0), tR = f32x4.extract_lane(m, 1);
        if (tR < tL) { store<i32>(st + (<usize>sp << 2), l); store<f32>(stT + (<usize>sp << 2), tL); cur = r; }
        else { store<i32>(st + (<usize>sp << 2), r); store<f32>(stT + (<usize>sp << 2), tR); cur = l; }
        sp++;
        continue;
      } else if (bits == 1) { cur = load<i32>(p, 48); continue; }
      else if (bits == 2) { cur = load<i32>(p, 52); continue; }
    }
    // pop, skipping entries whose box starts beyond the best hit
    let found = false;
    while (sp > 0) {
      sp--;
      if (<f64>load<f32>(stT + (<usize>sp << 2)) <= best) { cur = load<i32>(st + (<usize>sp << 2)); found = true; break; }
    }
    if (!found) {
      lastSlot = bestSlot;
      return bestSlot < 0 ? Infinity : best;
    }
  }
  return unreachable();
}

// ---------------------------------------------------------------- batch entry points

/**
 * Any-hit over `n` rays at `rays` (6 f32 each): out[i] = 1 / 0 (u8). `order` (0 = none) lists
 * the ray indices to trace in that order; `skip` (0 = none) is a u8 flag per ORIGINAL triangle.
 * Returns the number of blocked rays.
 */
export function occludedRange(rays: usize, n: i32, tMin: f64, tMax: f64, out: usize, order: usize, skip: usize): i32 {
  let hits = 0;
  if (skip == 0) {
    for (let k = 0; k < n; k++) {
      const i = order == 0 ? k : load<i32>(order + (<usize>k << 2));
      const h = occludedOne(rays + <usize>i * 24, tMin, tMax, 0, false);
      store<u8>(out + <usize>i, h ? 1 : 0);
      if (h) hits++;
    }
  } else {
    for (let k = 0; k < n; k++) {
      const i = order == 0 ? k : load<i32>(order + (<usize>k << 2));
      const h = occludedOne(rays + <usize>i * 24, tMin, tMax, skip, true);
      store<u8>(out + <usize>i, h ? 1 : 0);
      if (h) hits++;
    }
  }
  return hits;
}

/**
 * Closest hit over `n` rays: outT[i] (f32, Infinity if none), outTri[i] (ORIGINAL index, -1 if
 * none). Returns the number of rays that hit.
 */
export function closestRange(rays: usize, n: i32, tMin: f64, tMax: f64, outT: usize, outTri: usize, order: usize): i32 {
  let hits = 0;
  for (let k = 0; k < n; k++) {
    const i = order == 0 ? k : load<i32>(order + (<usize>k << 2));
    const t = closestOne(rays + <usize>i * 24, tMin, tMax);
    if (lastSlot >= 0) {
      store<f32>(outT + (<usize>i << 2), <f32>t);
      store<i32>(outTri + (<usize>i << 2), load<i32>(gTriIndex + (<usize>lastSlot << 2)));
      hits++;
    } else {
      store<f32>(outT + (<usize>i << 2), Infinity);
      store<i32>(outTri + (<usize>i << 2), -1);
    }
  }
  return hits;
}

// @ts-ignore: decorator
@inline
function spread3(v: u32): u32 {
  let x = v & 0x3ff;
  x = (x | (x << 16)) & 0x030000ff;
  x = (x | (x << 8)) & 0x0300f00f;
  x = (x | (x << 4)) & 0x030c30c3;
  x = (x | (x << 2)) & 0x09249249;
  return x;
}

/**
 * Coherent order (as ../../bvh/batch.ts): key = direction octant, then the 27-bit Morton code of
 * the origin in the scene box; 2-pass 16-bit LSD radix sort. Writes local ray indices to `perm`
 * (keys, keysTmp, permTmp: n u32 each; hist: 65536 u32).
 */
export function sortRays(
  rays: usize, n: i32, keys: usize, perm: usize, keysTmp: usize, permTmp: usize, hist: usize,
  x0: f64, y0: f64, z0: f64, sx: f64, sy: f64, sz: f64,
): void {
  for (let i = 0; i < n; i++) {
    const o = rays + <usize>i * 24;
    let qx = (<f64>load<f32>(o) - x0) * sx, qy = (<f64>load<f32>(o, 4) - y0) * sy, qz = (<f64>load<f32>(o, 8) - z0) * sz;
    qx = qx > 0 ? (qx < 1023 ? qx : 1023) : 0; qy = qy > 0 ? (qy < 1023 ? qy : 1023) : 0; qz = qz > 0 ? (qz < 1023 ? qz : 1023) : 0;
    const oct: u32 = (load<f32>(o, 12) < 0 ? 1 : 0) | (load<f32>(o, 16) < 0 ? 2 : 0) | (load<f32>(o, 20) < 0 ? 4 : 0);
    const key = (oct << 27) | (spread3(<u32>qx >> 1) << 2) | (spread3(<u32>qy >> 1) << 1) | spread3(<u32>qz >> 1);
    store<u32>(keys + (<usize>i << 2), key);
    store<u32>(perm + (<usize>i << 2), <u32>i);
  }
  let kIn = keys, pIn = perm, kOut = keysTmp, pOut = permTmp;
  for (let shift: u32 = 0; shift < 32; shift += 16) {
    memory.fill(hist, 0, 65536 * 4);
    for (let i = 0; i < n; i++) {
      const d = (load<u32>(kIn + (<usize>i << 2)) >>> shift) & 0xffff;
      const h = hist + (<usize>d << 2);
      store<u32>(h, load<u32>(h) + 1);
    }
    let sum: u32 = 0;
    for (let d = 0; d < 65536; d++) {
      const h = hist + (<usize>d << 2);
      const c = load<u32>(h); store<u32>(h, sum); sum += c;
    }
    for (let i = 0; i < n; i++) {
      const k = load<u32>(kIn + (<usize>i << 2));
      const h = hist + (<usize>((k >>> shift) & 0xffff) << 2);
      const at = load<u32>(h);
      store<u32>(h, at + 1);
      store<u32>(kOut + (<usize>at << 2), k);
      store<u32>(pOut + (<usize>at << 2), load<u32>(pIn + (<usize>i << 2)));
    }
    const tk = kIn; kIn = kOut; kOut = tk;
    const tp = pIn; pIn = pOut; pOut = tp;
  }
}
