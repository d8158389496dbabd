/**
 * BVH build: binned surface-area-heuristic (SAH) split, iterative, on typed-array scratch.
 * The node and triangle layout is in `layout.ts`.
 *
 * Method: each node bins its triangles' centroids into `BINS` bins on all three axes (only the
 * longest centroid axis for nodes above `ONE_AXIS_ABOVE` triangles, ≈ 2 % more node visits, a third
 * of the binning work), sweeps the
 * bins for the cheapest SAH split (cost = traversal + sum over children of area × count / parent
 * area) and partitions the triangle order in place; child boxes come straight from the bins, child
 * centroid boxes from the partition pass, so each level reads each triangle twice. A node becomes a
 * leaf when it holds at most `maxLeafSize` triangles and splitting would not be cheaper; a node whose
 * centroids all coincide is split at the middle of its range.
 *
 * References: I. Wald, "On fast construction of SAH-based bounding volume hierarchies," in Proc.
 * IEEE Symp. Interactive Ray Tracing, 2007, pp. 33–40, doi:10.1109/RT.2007.4342588;
 * M. Pharr, W. Jakob, G. Humphreys, Physically Based Rendering, 4th ed., MIT Press, 2023, §7.3.
 */
import { InputError } from '../../physics/errors.ts';
import { NODE_WORDS, TRI_FLOATS } from './layout.ts';

/** A built BVH: a plain object of typed arrays (structured-clone / SharedArrayBuffer friendly). */
export interface BvhData {
  /** Node boxes and words, 8 per node (layout.ts). Same buffer as `nodeInts`. */
  nodes: Float32Array;
  /** Int32 view of the same buffer as `nodes`: child / slot offsets and counts (layout.ts). */
  nodeInts: Int32Array;
  /** v0, v1, v2 [m] per kernel triangle slot, in leaf order (9 floats per slot). */
  tris: Float32Array;
  /** Kernel triangle slot -> ORIGINAL triangle index in the scene. */
  triIndex: Uint32Array;
  /** Number of triangles. */
  triangleCount: number;
  /** Number of nodes in use. */
  nodeCount: number;
  /** Longest root-to-leaf path (edges); the traversal stack needs at most this many entries. */
  depth: number;
}

export interface BuildBvhOptions {
  /** Largest leaf the SAH may keep (default 4). A node above this is always split. */
  maxLeafSize?: number;
  /** Allocate the output arrays on SharedArrayBuffer (for worker_threads / Web Workers). */
  shared?: boolean;
}

/** Number of SAH bins per axis. */
const BINS = 16;
/** SAH cost of one node traversal relative to one triangle test. */
const TRAVERSAL_COST = 1.0;
/** Nodes with more triangles than this bin only their longest centroid axis. */
const ONE_AXIS_ABOVE = 512;

function allocBuffer(bytes: number, shared: boolean): ArrayBuffer | SharedArrayBuffer {
  return shared ? new SharedArrayBuffer(bytes) : new ArrayBuffer(bytes);
}

/** Pads a min coordinate down / max coordinate up (see layout.ts). */
function padDown(v: number): number {
  return Math.fround(v - Math.abs(v) * 9.5367431640625e-7 - 1e-9);
}
function padUp(v: number): number {
  return Math.fround(v + Math.abs(v) * 9.5367431640625e-7 + 1e-9);
}

/**
 * Builds a BVH over an indexed triangle mesh.
 * @param positions xyz per vertex [m]
 * @param indices three vertex indices per triangle
 * @param opts `maxLeafSize` (default 4), `shared` (allocate on SharedArrayBuffer)
 */
export function buildBvh(
  positions: Float32Array,
  indices: Uint32Array,
  opts?: { maxLeafSize?: number; shared?: boolean },
): BvhData {
  const maxLeaf = opts?.maxLeafSize ?? 4;
  const shared = opts?.shared ?? false;
  if (!Number.isInteger(maxLeaf) || maxLeaf < 1 || maxLeaf > 255) {
    throw new InputError({ problem: 'bad leaf size', place: 'buildBvh opts.maxLeafSize', expected: 'an integer in [1, 255]', value: maxLeaf });
  }
  if (indices.length % 3 !== 0) {
    throw new InputError({ problem: 'index count is not a multiple of 3', place: 'buildBvh indices.length', expected: 'three vertex indices per triangle', value: indices.length });
  }
  if (positions.length % 3 !== 0) {
    throw new InputError({ problem: 'position count is not a multiple of 3', place: 'buildBvh positions.length', expected: 'xyz per vertex', value: positions.length });
  }
  const vertexCount = positions.length / 3;
  for (let i = 0; i < positions.length; i++) {
    if (!Number.isFinite(positions[i] as number)) {
      throw new InputError({ problem: 'vertex coordinate is not finite', place: `buildBvh positions[${i}]`, expected: 'a finite number', value: positions[i] });
    }
  }
  const n = indices.length / 3;
  for (let i = 0; i < indices.length; i++) {
    if ((indices[i] as number) >= vertexCount) {
      throw new InputError({ problem: 'vertex index out of range', place: `buildBvh indices[${i}] (triangle ${(i / 3) | 0})`, expected: `an index below ${vertexCount}`, value: indices[i] });
    }
  }

  // Per-triangle boxes and centroids (scratch).
  const tb = new Float32Array(n * 6);
  const cen = new Float32Array(n * 3);
  const order = new Uint32Array(n);
  let rminx = Infinity, rminy = Infinity, rminz = Infinity, rmaxx = -Infinity, rmaxy = -Infinity, rmaxz = -Infinity;
  let cminx = Infinity, cminy = Infinity, cminz = Infinity, cmaxx = -Infinity, cmaxy = -Infinity, cmaxz = -Infinity;
  for (let t = 0; t < n; t++) {
    const a = (indices[t * 3] as number) * 3, b = (indices[t * 3 + 1] as number) * 3, c = (indices[t * 3 + 2] as number) * 3;
    const ax = positions[a] as number, ay = positions[a + 1] as number, az = positions[a + 2] as number;
    const bx = positions[b] as number, by = positions[b + 1] as number, bz = positions[b + 2] as number;
    const cx = positions[c] as number, cy = positions[c + 1] as number, cz = positions[c + 2] as number;
    const mnx = ax < bx ? (ax < cx ? ax : cx) : bx < cx ? bx : cx;
    const mny = ay < by ? (ay < cy ? ay : cy) : by < cy ? by : cy;
    const mnz = az < bz ? (az < cz ? az : cz) : bz < cz ? bz : cz;
    const mxx = ax > bx ? (ax > cx ? ax : cx) : bx > cx ? bx : cx;
    const mxy = ay > by ? (ay > cy ? ay : cy) : by > cy ? by : cy;
    const mxz = az > bz ? (az > cz ? az : cz) : bz > cz ? bz : cz;
    const o = t * 6;
    tb[o] = mnx; tb[o + 1] = mny; tb[o + 2] = mnz; tb[o + 3] = mxx; tb[o + 4] = mxy; tb[o + 5] = mxz;
    const ccx = (mnx + mxx) * 0.5, ccy = (mny + mxy) * 0.5, ccz = (mnz + mxz) * 0.5;
    cen[t * 3] = ccx; cen[t * 3 + 1] = ccy; cen[t * 3 + 2] = ccz;
    order[t] = t;
    if (mnx < rminx) rminx = mnx; if (mny < rminy) rminy = mny; if (mnz < rminz) rminz = mnz;
    if (mxx > rmaxx) rmaxx = mxx; if (mxy > rmaxy) rmaxy = mxy; if (mxz > rmaxz) rmaxz = mxz;
    if (ccx < cminx) cminx = ccx; if (ccy < cminy) cminy = ccy; if (ccz < cminz) cminz = ccz;
    if (ccx > cmaxx) cmaxx = ccx; if (ccy > cmaxy) cmaxy = ccy; if (ccz > cmaxz) cmaxz = ccz;
  }

  const maxNodes = n > 0 ? 2 * n : 2;
  const nf = new Float32Array(maxNodes * NODE_WORDS);
  const ni = new Int32Array(nf.buffer);
  nf[0] = rminx; nf[1] = rminy; nf[2] = rminz; nf[3] = rmaxx; nf[4] = rmaxy; nf[5] = rmaxz;
  // Node 1 stays an empty leaf so that every child pair starts at an even index: a pair is then
  // 64 bytes from a 64-byte multiple of the buffer start, which keeps it in as few cache lines as
  // the buffer's own alignment allows.
  nf[8] = Infinity; nf[9] = Infinity; nf[10] = Infinity; nf[11] = -Infinity; nf[12] = -Infinity; nf[13] = -Infinity;
  let nodeCount = 2;
  let maxDepth = 0;

  // Task stack: node, start, end, depth (ints) + centroid box (floats).
  let taskCap = 64;
  let taskI = new Int32Array(taskCap * 4);
  let taskF = new Float64Array(taskCap * 6);
  let sp = 0;
  // Bin scratch: per axis BINS counts and boxes; sweep scratch for right-side areas.
  const binCount = new Int32Array(3 * BINS);
  const binBox = new Float64Array(3 * BINS * 6);
  const rightArea = new Float64Array(BINS);
  const rightCount = new Int32Array(BINS);
  const childCen = new Float64Array(12);
  const splitOut = new Int32Array(2);

  let node = 0, start = 0, end = n, depth = 0;
  for (;;) {
    const count = end - start;
    const no = node * NODE_WORDS;
    let leaf = count <= 1;
    let splitAxis = -1, splitBin = -1;
    let bestCost = Infinity;
    const ex = cmaxx - cminx, ey = cmaxy - cminy, ez = cmaxz - cminz;
    if (!leaf) {
      // --- binning on all three axes ---
      const sx = ex > 0 ? (BINS * (1 - 1e-6)) / ex : 0;
      const sy = ey > 0 ? (BINS * (1 - 1e-6)) / ey : 0;
      const sz = ez > 0 ? (BINS * (1 - 1e-6)) / ez : 0;
      let sweepX = ex, sweepY = ey, sweepZ = ez;
      if (count > ONE_AXIS_ABOVE) {
        // large node: bin only the axis of largest centroid extent (a third of the work)
        const axis = ex >= ey ? (ex >= ez ? 0 : 2) : ey >= ez ? 1 : 2;
        if (axis !== 0) sweepX = 0;
        if (axis !== 1) sweepY = 0;
        if (axis !== 2) sweepZ = 0;
        binTrianglesOneAxis(order, cen, tb, start, end, axis, axis === 0 ? cminx : axis === 1 ? cminy : cminz, axis === 0 ? sx : axis === 1 ? sy : sz, binCount, binBox);
      } else {
        binTriangles(order, cen, tb, start, end, cminx, cminy, cminz, sx, sy, sz, binCount, binBox);
      }
      // --- SAH sweep per axis ---
      bestCost = sweepBins(binCount, binBox, sweepX, sweepY, sweepZ, rightArea, rightCount, splitOut);
      splitAxis = splitOut[0] as number; splitBin = splitOut[1] as number;
      const pdx = (nf[no + 3] as number) - (nf[no] as number);
      const pdy = (nf[no + 4] as number) - (nf[no + 1] as number);
      const pdz = (nf[no + 5] as number) - (nf[no + 2] as number);
      const parentArea = pdx * pdy + pdy * pdz + pdz * pdx;
      if (count <= maxLeaf) {
        // Leaf unless the split is cheaper: leaf cost = count, split cost = Ct + SAH.
        const splitCost = splitAxis < 0 ? Infinity : parentArea > 0 ? TRAVERSAL_COST + bestCost / parentArea : TRAVERSAL_COST + count;
        if (count <= splitCost) leaf = true;
      }
    }

    if (leaf) {
      ni[no + 6] = start;
      ni[no + 7] = count;
      if (depth > maxDepth) maxDepth = depth;
    } else {
      let mid: number;
      let lcx0 = Infinity, lcy0 = Infinity, lcz0 = Infinity, lcx1 = -Infinity, lcy1 = -Infinity, lcz1 = -Infinity;
      let rcx0 = Infinity, rcy0 = Infinity, rcz0 = Infinity, rcx1 = -Infinity, rcy1 = -Infinity, rcz1 = -Infinity;
      const left = nodeCount, right = nodeCount + 1;
      nodeCount += 2;
      const lo = left * NODE_WORDS, ro = right * NODE_WORDS;
      let axisOut = 0;
      if (splitAxis >= 0) {
        axisOut = splitAxis;
        const cmin = splitAxis === 0 ? cminx : splitAxis === 1 ? cminy : cminz;
        const extent = splitAxis === 0 ? ex : splitAxis === 1 ? ey : ez;
        const s = (BINS * (1 - 1e-6)) / extent;
        mid = partition(order, cen, start, end, splitAxis, cmin, s, splitBin, childCen);
        lcx0 = childCen[0] as number; lcy0 = childCen[1] as number; lcz0 = childCen[2] as number;
        lcx1 = childCen[3] as number; lcy1 = childCen[4] as number; lcz1 = childCen[5] as number;
        rcx0 = childCen[6] as number; rcy0 = childCen[7] as number; rcz0 = childCen[8] as number;
        rcx1 = childCen[9] as number; rcy1 = childCen[10] as number; rcz1 = childCen[11] as number;
        childBoxesFromBins(binCount, binBox, splitAxis * BINS, splitBin, nf, lo, ro);
      } else {
        // all centroids coincide: split the range in the middle
        mid = (start + end) >> 1;
        for (let side = 0; side < 2; side++) {
          const a = side === 0 ? start : mid, b = side === 0 ? mid : end;
          let x0 = Infinity, y0 = Infinity, z0 = Infinity, x1 = -Infinity, y1 = -Infinity, z1 = -Infinity;
          for (let i = a; i < b; i++) {
            const o = (order[i] as number) * 6;
            if ((tb[o] as number) < x0) x0 = tb[o] as number;
            if ((tb[o + 1] as number) < y0) y0 = tb[o + 1] as number;
            if ((tb[o + 2] as number) < z0) z0 = tb[o + 2] as number;
            if ((tb[o + 3] as number) > x1) x1 = tb[o + 3] as number;
            if ((tb[o + 4] as number) > y1) y1 = tb[o + 4] as number;
            if ((tb[o + 5] as number) > z1) z1 = tb[o + 5] as number;
          }
          const oo = side === 0 ? lo : ro;
          nf[oo] = x0; nf[oo + 1] = y0; nf[oo + 2] = z0; nf[oo + 3] = x1; nf[oo + 4] = y1; nf[oo + 5] = z1;
        }
        lcx0 = rcx0 = cminx; lcy0 = rcy0 = cminy; lcz0 = rcz0 = cminz;
        lcx1 = rcx1 = cmaxx; lcy1 = rcy1 = cmaxy; lcz1 = rcz1 = cmaxz;
      }
      ni[no + 6] = left;
      ni[no + 7] = -1 - axisOut;
      // push right, continue with left
      if (sp === taskCap) {
        taskCap *= 2;
        const ti = new Int32Array(taskCap * 4); ti.set(taskI); taskI = ti;
        const tf = new Float64Array(taskCap * 6); tf.set(taskF); taskF = tf;
      }
      taskI[sp * 4] = right; taskI[sp * 4 + 1] = mid; taskI[sp * 4 + 2] = end; taskI[sp * 4 + 3] = depth + 1;
      taskF[sp * 6] = rcx0; taskF[sp * 6 + 1] = rcy0; taskF[sp * 6 + 2] = rcz0;
      taskF[sp * 6 + 3] = rcx1; taskF[sp * 6 + 4] = rcy1; taskF[sp * 6 + 5] = rcz1;
      sp++;
      node = left; end = mid; depth++;
      cminx = lcx0; cminy = lcy0; cminz = lcz0; cmaxx = lcx1; cmaxy = lcy1; cmaxz = lcz1;
      continue;
    }
    if (sp === 0) break;
    sp--;
    node = taskI[sp * 4] as number; start = taskI[sp * 4 + 1] as number; end = taskI[sp * 4 + 2] as number; depth = taskI[sp * 4 + 3] as number;
    cminx = taskF[sp * 6] as number; cminy = taskF[sp * 6 + 1] as number; cminz = taskF[sp * 6 + 2] as number;
    cmaxx = taskF[sp * 6 + 3] as number; cmaxy = taskF[sp * 6 + 4] as number; cmaxz = taskF[sp * 6 + 5] as number;
  }

  // --- output arrays (exact size), boxes padded outward ---
  const nodeBuf = allocBuffer(nodeCount * NODE_WORDS * 4, shared);
  const nodes = new Float32Array(nodeBuf);
  const nodeInts = new Int32Array(nodeBuf);
  for (let k = 0; k < nodeCount; k++) {
    const o = k * NODE_WORDS;
    if (n === 0 || k === 1) {
      nodes[o] = Infinity; nodes[o + 1] = Infinity; nodes[o + 2] = Infinity;
      nodes[o + 3] = -Infinity; nodes[o + 4] = -Infinity; nodes[o + 5] = -Infinity;
    } else {
      nodes[o] = padDown(nf[o] as number); nodes[o + 1] = padDown(nf[o + 1] as number); nodes[o + 2] = padDown(nf[o + 2] as number);
      nodes[o + 3] = padUp(nf[o + 3] as number); nodes[o + 4] = padUp(nf[o + 4] as number); nodes[o + 5] = padUp(nf[o + 5] as number);
    }
    nodeInts[o + 6] = ni[o + 6] as number;
    nodeInts[o + 7] = ni[o + 7] as number;
  }
  const tris = new Float32Array(allocBuffer(n * TRI_FLOATS * 4, shared));
  const triIndex = new Uint32Array(allocBuffer(n * 4, shared));
  for (let s = 0; s < n; s++) {
    const t = order[s] as number;
    triIndex[s] = t;
    const o = s * TRI_FLOATS;
    for (let v = 0; v < 3; v++) {
      const p = (indices[t * 3 + v] as number) * 3;
      tris[o + v * 3] = positions[p] as number;
      tris[o + v * 3 + 1] = positions[p + 1] as number;
      tris[o + v * 3 + 2] = positions[p + 2] as number;
    }
  }
  return { nodes, nodeInts, tris, triIndex, triangleCount: n, nodeCount, depth: maxDepth };
}

/** Bins triangles order[start..end) by centroid on all three axes: counts and boxes per bin. */
function binTriangles(
  order: Uint32Array, cen: Float32Array, tb: Float32Array, start: number, end: number,
  cminx: number, cminy: number, cminz: number, sx: number, sy: number, sz: number,
  binCount: Int32Array, binBox: Float64Array,
): void {
      binCount.fill(0); // a bin's box is set by its first triangle (binTriangles)
      for (let i = start; i < end; i++) {
        const t = order[i] as number;
        const c3 = t * 3, b6 = t * 6;
        const mnx = tb[b6] as number, mny = tb[b6 + 1] as number, mnz = tb[b6 + 2] as number;
        const mxx = tb[b6 + 3] as number, mxy = tb[b6 + 4] as number, mxz = tb[b6 + 5] as number;
        let k = ((cen[c3] as number) - cminx) * sx | 0;
        if (k >= BINS) k = BINS - 1;
        let o = k * 6;
        if ((binCount[k] as number) === 0) {
          binBox[o] = mnx; binBox[o + 1] = mny; binBox[o + 2] = mnz; binBox[o + 3] = mxx; binBox[o + 4] = mxy; binBox[o + 5] = mxz;
        } else {
          if (mnx < (binBox[o] as number)) binBox[o] = mnx;
          if (mny < (binBox[o + 1] as number)) binBox[o + 1] = mny;
          if (mnz < (binBox[o + 2] as number)) binBox[o + 2] = mnz;
          if (mxx > (binBox[o + 3] as number)) binBox[o + 3] = mxx;
          if (mxy > (binBox[o + 4] as number)) binBox[o + 4] = mxy;
          if (mxz > (binBox[o + 5] as number)) binBox[o + 5] = mxz;
        }
        binCount[k] = (binCount[k] as number) + 1;
        k = ((cen[c3 + 1] as number) - cminy) * sy | 0;
        if (k >= BINS) k = BINS - 1;
        k += BINS;
        o = k * 6;
        if ((binCount[k] as number) === 0) {
          binBox[o] = mnx; binBox[o + 1] = mny; binBox[o + 2] = mnz; binBox[o + 3] = mxx; binBox[o + 4] = mxy; binBox[o + 5] = mxz;
        } else {
          if (mnx < (binBox[o] as number)) binBox[o] = mnx;
          if (mny < (binBox[o + 1] as number)) binBox[o + 1] = mny;
          if (mnz < (binBox[o + 2] as number)) binBox[o + 2] = mnz;
          if (mxx > (binBox[o + 3] as number)) binBox[o + 3] = mxx;
          if (mxy > (binBox[o + 4] as number)) binBox[o + 4] = mxy;
          if (mxz > (binBox[o + 5] as number)) binBox[o + 5] = mxz;
        }
        binCount[k] = (binCount[k] as number) + 1;
        k = ((cen[c3 + 2] as number) - cminz) * sz | 0;
        if (k >= BINS) k = BINS - 1;
        k += 2 * BINS;
        o = k * 6;
        if ((binCount[k] as number) === 0) {
          binBox[o] = mnx; binBox[o + 1] = mny; binBox[o + 2] = mnz; binBox[o + 3] = mxx; binBox[o + 4] = mxy; binBox[o + 5] = mxz;
        } else {
          if (mnx < (binBox[o] as number)) binBox[o] = mnx;
          if (mny < (binBox[o + 1] as number)) binBox[o + 1] = mny;
          if (mnz < (binBox[o + 2] as number)) binBox[o + 2] = mnz;
          if (mxx > (binBox[o + 3] as number)) binBox[o + 3] = mxx;
          if (mxy > (binBox[o + 4] as number)) binBox[o + 4] = mxy;
          if (mxz > (binBox[o + 5] as number)) binBox[o + 5] = mxz;
        }
        binCount[k] = (binCount[k] as number) + 1;
      }
}

/**
 * Partitions order[start..end) in place: bins <= splitBin first. Writes the two sides' centroid
 * boxes to childCen (left min, left max, right min, right max). Returns the first right index.
 */
function partition(
  order: Uint32Array, cen: Float32Array, start: number, end: number, splitAxis: number, cmin: number, s: number,
  splitBin: number, childCen: Float64Array,
): number {
  let lcx0 = Infinity, lcy0 = Infinity, lcz0 = Infinity, lcx1 = -Infinity, lcy1 = -Infinity, lcz1 = -Infinity;
  let rcx0 = Infinity, rcy0 = Infinity, rcz0 = Infinity, rcx1 = -Infinity, rcy1 = -Infinity, rcz1 = -Infinity;
        let i = start, j = end - 1;
        while (i <= j) {
          const t = order[i] as number;
          const c3 = t * 3;
          let k = ((cen[c3 + splitAxis] as number) - cmin) * s | 0;
          if (k >= BINS) k = BINS - 1;
          const x = cen[c3] as number, y = cen[c3 + 1] as number, z = cen[c3 + 2] as number;
          if (k <= splitBin) {
            if (x < lcx0) lcx0 = x; if (y < lcy0) lcy0 = y; if (z < lcz0) lcz0 = z;
            if (x > lcx1) lcx1 = x; if (y > lcy1) lcy1 = y; if (z > lcz1) lcz1 = z;
            i++;
          } else {
            if (x < rcx0) rcx0 = x; if (y < rcy0) rcy0 = y; if (z < rcz0) rcz0 = z;
            if (x > rcx1) rcx1 = x; if (y > rcy1) rcy1 = y; if (z > rcz1) rcz1 = z;
            order[i] = order[j] as number;
            order[j] = t;
            j--;
          }
        }
  childCen[0] = lcx0; childCen[1] = lcy0; childCen[2] = lcz0; childCen[3] = lcx1; childCen[4] = lcy1; childCen[5] = lcz1;
  childCen[6] = rcx0; childCen[7] = rcy0; childCen[8] = rcz0; childCen[9] = rcx1; childCen[10] = rcy1; childCen[11] = rcz1;
  return i;
}

/**
 * SAH sweep over the bins of all three axes. Returns the best (area × count) cost, with its axis and
 * last-left bin in splitOut[0], splitOut[1] (axis -1 when no axis can split).
 */
function sweepBins(
  binCount: Int32Array, binBox: Float64Array, ex: number, ey: number, ez: number,
  rightArea: Float64Array, rightCount: Int32Array, splitOut: Int32Array,
): number {
  let bestCost = Infinity, splitAxis = -1, splitBin = -1;
      for (let axis = 0; axis < 3; axis++) {
        const extent = axis === 0 ? ex : axis === 1 ? ey : ez;
        if (!(extent > 0)) continue;
        const base = axis * BINS;
        // right-to-left: area and count of bins [b, BINS)
        let x0 = Infinity, y0 = Infinity, z0 = Infinity, x1 = -Infinity, y1 = -Infinity, z1 = -Infinity, cnt = 0;
        for (let b = BINS - 1; b > 0; b--) {
          const o = (base + b) * 6;
          const c = binCount[base + b] as number;
          if (c > 0) {
            if ((binBox[o] as number) < x0) x0 = binBox[o] as number;
            if ((binBox[o + 1] as number) < y0) y0 = binBox[o + 1] as number;
            if ((binBox[o + 2] as number) < z0) z0 = binBox[o + 2] as number;
            if ((binBox[o + 3] as number) > x1) x1 = binBox[o + 3] as number;
            if ((binBox[o + 4] as number) > y1) y1 = binBox[o + 4] as number;
            if ((binBox[o + 5] as number) > z1) z1 = binBox[o + 5] as number;
            cnt += c;
          }
          rightCount[b] = cnt;
          const dx = x1 - x0, dy = y1 - y0, dz = z1 - z0;
          rightArea[b] = cnt > 0 ? dx * dy + dy * dz + dz * dx : 0;
        }
        x0 = Infinity; y0 = Infinity; z0 = Infinity; x1 = -Infinity; y1 = -Infinity; z1 = -Infinity; cnt = 0;
        for (let b = 0; b < BINS - 1; b++) {
          const o = (base + b) * 6;
          const c = binCount[base + b] as number;
          if (c > 0) {
            if ((binBox[o] as number) < x0) x0 = binBox[o] as number;
            if ((binBox[o + 1] as number) < y0) y0 = binBox[o + 1] as number;
            if ((binBox[o + 2] as number) < z0) z0 = binBox[o + 2] as number;
            if ((binBox[o + 3] as number) > x1) x1 = binBox[o + 3] as number;
            if ((binBox[o + 4] as number) > y1) y1 = binBox[o + 4] as number;
            if ((binBox[o + 5] as number) > z1) z1 = binBox[o + 5] as number;
            cnt += c;
          }
          const rc = rightCount[b + 1] as number;
          if (cnt === 0 || rc === 0) continue;
          const dx = x1 - x0, dy = y1 - y0, dz = z1 - z0;
          const cost = (dx * dy + dy * dz + dz * dx) * cnt + (rightArea[b + 1] as number) * rc;
          if (cost < bestCost) { bestCost = cost; splitAxis = axis; splitBin = b; }
        }
      }
  splitOut[0] = splitAxis; splitOut[1] = splitBin;
  return bestCost;
}

/** Writes the two children's boxes (unions of bins [0, splitBin] and (splitBin, BINS)) at nf[lo], nf[ro]. */
function childBoxesFromBins(binCount: Int32Array, binBox: Float64Array, base: number, splitBin: number, nf: Float32Array, lo: number, ro: number): void {
        let x0 = Infinity, y0 = Infinity, z0 = Infinity, x1 = -Infinity, y1 = -Infinity, z1 = -Infinity;
        for (let b = 0; b < BINS; b++) {
          if (b === splitBin + 1) {
            nf[lo] = x0; nf[lo + 1] = y0; nf[lo + 2] = z0; nf[lo + 3] = x1; nf[lo + 4] = y1; nf[lo + 5] = z1;
            x0 = Infinity; y0 = Infinity; z0 = Infinity; x1 = -Infinity; y1 = -Infinity; z1 = -Infinity;
          }
          if ((binCount[base + b] as number) === 0) continue;
          const o = (base + b) * 6;
          if ((binBox[o] as number) < x0) x0 = binBox[o] as number;
          if ((binBox[o + 1] as number) < y0) y0 = binBox[o + 1] as number;
          if ((binBox[o + 2] as number) < z0) z0 = binBox[o + 2] as number;
          if ((binBox[o + 3] as number) > x1) x1 = binBox[o + 3] as number;
          if ((binBox[o + 4] as number) > y1) y1 = binBox[o + 4] as number;
          if ((binBox[o + 5] as number) > z1) z1 = binBox[o + 5] as number;
        }
        nf[ro] = x0; nf[ro + 1] = y0; nf[ro + 2] = z0; nf[ro + 3] = x1; nf[ro + 4] = y1; nf[ro + 5] = z1;
}

/** Bins triangles order[start..end) by centroid on one axis (bins axis*BINS ..). */
function binTrianglesOneAxis(
  order: Uint32Array, cen: Float32Array, tb: Float32Array, start: number, end: number,
  axis: number, cmin: number, sc: number, binCount: Int32Array, binBox: Float64Array,
): void {
  binCount.fill(0);
  const base = axis * BINS;
  for (let i = start; i < end; i++) {
    const t = order[i] as number;
    const b6 = t * 6;
    let k = ((cen[t * 3 + axis] as number) - cmin) * sc | 0;
    if (k >= BINS) k = BINS - 1;
    k += base;
    const o = k * 6;
    const mnx = tb[b6] as number, mny = tb[b6 + 1] as number, mnz = tb[b6 + 2] as number;
    const mxx = tb[b6 + 3] as number, mxy = tb[b6 + 4] as number, mxz = tb[b6 + 5] as number;
    if ((binCount[k] as number) === 0) {
      binBox[o] = mnx; binBox[o + 1] = mny; binBox[o + 2] = mnz; binBox[o + 3] = mxx; binBox[o + 4] = mxy; binBox[o + 5] = mxz;
    } else {
      if (mnx < (binBox[o] as number)) binBox[o] = mnx;
      if (mny < (binBox[o + 1] as number)) binBox[o + 1] = mny;
      if (mnz < (binBox[o + 2] as number)) binBox[o + 2] = mnz;
      if (mxx > (binBox[o + 3] as number)) binBox[o + 3] = mxx;
      if (mxy > (binBox[o + 4] as number)) binBox[o + 4] = mxy;
      if (mxz > (binBox[o + 5] as number)) binBox[o + 5] = mxz;
    }
    binCount[k] = (binCount[k] as number) + 1;
  }
}
