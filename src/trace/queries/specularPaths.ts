/**
 * Specular reflection paths of the sun: for one sun direction, which receiver points see the
 * sun's mirror image in which flat mirror surfaces (patches of glazing, polished metal, water), what
 * part of the solar disc's image they see there, and where on the surface they see it.
 *
 * Method (mirror-image construction, law of reflection):
 * - For a mirror with unit normal n lit by the sun (unit vector s toward the sun, n·s > 0), a
 *   receiver X in front of the mirror sees the sun's centre reflected when its line of sight
 *   d = s − 2(n·s)·n (the mirror image of s) meets the mirror's plane inside the mirror: the hit
 *   point H = X + t·d with t = ((c − X)·n)/(d·n), c a point of the plane, must lie in one of the
 *   surface's triangles (barycentric test in its plane).
 * - The sun is a disc of angular diameter 9.3 mrad (fresnel.ts SUN_ANGULAR_DIAMETER_RAD), so the
 *   image is a disc of the same size; the part of it that falls inside the surface is estimated by
 *   repeating the test for `discSamples` directions spread evenly (equal area) over the solar disc:
 *   `discFraction` = hits / samples. Partial images at a surface's edge come out right to 1/K, and
 *   the fractions of the coplanar cells of one pane add up to the whole disc.
 * - A cheap bound first rejects most pairs: the centre ray's hit must lie within the surface's
 *   bounding radius plus the image's spread t·α/ cos θi (α the sun's half-angle).
 * - The path must be free between the receiver and the hit point: one any-hit ray (isOccluded) along
 *   the most central sample that hits, up to just short of the surface; the optional ground plane
 *   blocks it when it crosses the plane first. That the sun reaches the mirror is the caller's
 *   `surfaceLit` flag (the geometry pass's sun visibility of the patch centroid).
 *
 * No allocation in the loops: the output arrays grow by doubling (amortised), scratch is module
 * scope. Determinism: no random numbers (the disc samples are a fixed stratified pattern).
 *
 * References: E. Hecht, Optics, 5th ed., 2017, sec. 4.3 (law of reflection); P. Shirley and
 * K. Chiu, "A low distortion map between disk and square," J. Graphics Tools, vol. 2, no. 3,
 * pp. 45–52, 1997, doi:10.1080/10867651.1997.10487479 (equal-area disc samples); T. Möller and
 * B. Trumbore 1997 (the occlusion kernel, bvh/query.ts).
 */
import type { BvhData } from '../bvh/build.ts';
import { isOccluded } from '../bvh/query.ts';
import { groundCrossingT, groundZOf, type GroundPlaneInput } from './groundPlane.ts';
import { requireTriples } from './inputChecks.ts';
import { InputError } from '../../physics/errors.ts';
import { SUN_ANGULAR_DIAMETER_RAD } from '../../physics/fresnel.ts';

/** Floats per triangle in `SpecularSurfaces.triangleData`: corner a, edges e1 and e2, then d00, d01, d11, 1/det. */
export const SPECULAR_TRI_FLOATS = 13;
/** Default disc samples: a 4 × 4 stratified pattern (16 directions over the solar disc). */
export const DEFAULT_DISC_SAMPLE_SIDE = 4;
/** Default nearest accepted occluder along a path [m]. */
export const DEFAULT_PATH_T_MIN_M = 1e-3;
/** A path stops this far short of the mirror so the mirror itself is not its own occluder [m]. */
export const PATH_END_GAP_M = 2e-3;

/** Flat mirror surfaces (each a set of coplanar triangles, e.g. one patch), ready for path tests. */
export interface SpecularSurfaces {
  count: number;
  /** A point of each surface's plane (its centroid) xyz [m]. */
  centroids: Float64Array;
  /** Unit normal xyz (the reflecting side). */
  normals: Float64Array;
  /** Largest distance from the centroid to a corner [m]. */
  radiiM: Float64Array;
  /** count + 1 offsets into the triangles of `triangleData`. */
  triangleOffsets: Uint32Array;
  /** SPECULAR_TRI_FLOATS per triangle. */
  triangleData: Float64Array;
}

/**
 * Builds the path-test data for a list of patches of a scene.
 * @param positions Scene vertex xyz [m].
 * @param indices Scene triangle corner indices.
 * @param patchTriangleOffsets Per patch p: its triangles are patchTriangleOffsets[p] … [p+1]−1.
 * @param centroids Per patch centroid xyz [m].
 * @param normals Per patch unit normal xyz.
 * @param patchList The patches to include, in the order of the output surfaces.
 */
export function specularSurfacesFromPatches(
  positions: ArrayLike<number>, indices: ArrayLike<number>, patchTriangleOffsets: ArrayLike<number>,
  centroids: ArrayLike<number>, normals: ArrayLike<number>, patchList: ArrayLike<number>,
): SpecularSurfaces {
  const count = patchList.length;
  const out: SpecularSurfaces = {
    count,
    centroids: new Float64Array(3 * count),
    normals: new Float64Array(3 * count),
    radiiM: new Float64Array(count),
    triangleOffsets: new Uint32Array(count + 1),
    triangleData: new Float64Array(0),
  };
  let triTotal = 0;
  for (let k = 0; k < count; k++) {
    const p = patchList[k]!;
    triTotal += patchTriangleOffsets[p + 1]! - patchTriangleOffsets[p]!;
    out.triangleOffsets[k + 1] = triTotal;
  }
  const td = new Float64Array(triTotal * SPECULAR_TRI_FLOATS);
  let o = 0;
  for (let k = 0; k < count; k++) {
    const p = patchList[k]!;
    const cx = centroids[3 * p]!, cy = centroids[3 * p + 1]!, cz = centroids[3 * p + 2]!;
    out.centroids[3 * k] = cx; out.centroids[3 * k + 1] = cy; out.centroids[3 * k + 2] = cz;
    out.normals[3 * k] = normals[3 * p]!; out.normals[3 * k + 1] = normals[3 * p + 1]!; out.normals[3 * k + 2] = normals[3 * p + 2]!;
    let r2 = 0;
    for (let t = patchTriangleOffsets[p]!; t < patchTriangleOffsets[p + 1]!; t++) {
      const a = 3 * indices[3 * t]!, b = 3 * indices[3 * t + 1]!, c = 3 * indices[3 * t + 2]!;
      const ax = positions[a]!, ay = positions[a + 1]!, az = positions[a + 2]!;
      const e1x = positions[b]! - ax, e1y = positions[b + 1]! - ay, e1z = positions[b + 2]! - az;
      const e2x = positions[c]! - ax, e2y = positions[c + 1]! - ay, e2z = positions[c + 2]! - az;
      const d00 = e1x * e1x + e1y * e1y + e1z * e1z, d01 = e1x * e2x + e1y * e2y + e1z * e2z, d11 = e2x * e2x + e2y * e2y + e2z * e2z;
      const det = d00 * d11 - d01 * d01;
      td.set([ax, ay, az, e1x, e1y, e1z, e2x, e2y, e2z, d00, d01, d11, det > 0 ? 1 / det : 0], o);
      o += SPECULAR_TRI_FLOATS;
      for (const v of [a, b, c]) {
        const dx = positions[v]! - cx, dy = positions[v + 1]! - cy, dz = positions[v + 2]! - cz;
        r2 = Math.max(r2, dx * dx + dy * dy + dz * dz);
      }
    }
    out.radiiM[k] = Math.sqrt(r2);
  }
  out.triangleData = td;
  return out;
}

/**
 * Directions spread evenly over the solar disc: side × side cell centres of the unit square mapped
 * to the disc by the Shirley–Chiu concentric (equal-area) map and scaled to the sun's half-angle;
 * sorted from the centre outward (so the first hitting sample is the most central).
 * @param side Samples per side (K = side²), ≥ 1.
 * @param halfAngleRad Half the sun's angular diameter [rad] (default 4.65 mrad).
 * @returns 2·K offsets (a, b) [rad] along two axes perpendicular to the sun direction.
 */
export function solarDiscSamples(side: number = DEFAULT_DISC_SAMPLE_SIDE, halfAngleRad: number = SUN_ANGULAR_DIAMETER_RAD / 2): Float64Array {
  if (!Number.isInteger(side) || side < 1 || side > 64) {
    throw new InputError({ problem: 'not a valid sample count', place: 'solarDiscSamples side', value: side, expected: 'an integer in [1, 64]' });
  }
  const pts: [number, number][] = [];
  for (let j = 0; j < side; j++) {
    for (let i = 0; i < side; i++) {
      const a = (2 * (i + 0.5)) / side - 1, b = (2 * (j + 0.5)) / side - 1;
      let r: number, phi: number;
      if (a === 0 && b === 0) { r = 0; phi = 0; }
      else if (Math.abs(a) > Math.abs(b)) { r = a; phi = (Math.PI / 4) * (b / a); }
      else { r = b; phi = Math.PI / 2 - (Math.PI / 4) * (a / b); }
      pts.push([r * Math.cos(phi) * halfAngleRad, r * Math.sin(phi) * halfAngleRad]);
    }
  }
  pts.sort((p, q) => Math.hypot(p[0], p[1]) - Math.hypot(q[0], q[1]) || p[0] - q[0] || p[1] - q[1]);
  return Float64Array.from(pts.flat());
}

/** Hits of one `traceSpecularPaths` call (caller-owned, reused; arrays grow as needed). */
export interface SpecularHits {
  count: number;
  /** Receiver index. */
  receiver: Int32Array;
  /** Surface index (into SpecularSurfaces). */
  surface: Int32Array;
  /** Fraction of the solar disc's image seen in the surface [-], (0, 1]. */
  discFraction: Float32Array;
  /** Where the (most central visible part of the) image is seen on the surface, xyz [m]. */
  point: Float64Array;
  /** Distance from the receiver to `point` [m]. */
  distanceM: Float64Array;
}

/** A fresh, empty hit list. */
export function makeSpecularHits(capacity = 64): SpecularHits {
  return {
    count: 0,
    receiver: new Int32Array(capacity),
    surface: new Int32Array(capacity),
    discFraction: new Float32Array(capacity),
    point: new Float64Array(3 * capacity),
    distanceM: new Float64Array(capacity),
  };
}

function grow(h: SpecularHits): void {
  const cap = Math.max(64, 2 * h.receiver.length);
  const r = new Int32Array(cap); r.set(h.receiver); h.receiver = r;
  const s = new Int32Array(cap); s.set(h.surface); h.surface = s;
  const f = new Float32Array(cap); f.set(h.discFraction); h.discFraction = f;
  const p = new Float64Array(3 * cap); p.set(h.point); h.point = p;
  const d = new Float64Array(cap); d.set(h.distanceM); h.distanceM = d;
}

export interface SpecularPathInput {
  surfaces: SpecularSurfaces;
  /** Receiver points xyz [m]. */
  points: Float64Array | Float32Array;
  /** Unit vector toward the sun's centre (x, y, z) [-]; normalised here. */
  sunDirection: ArrayLike<number>;
  /** Per surface: 1 when the sun reaches it (others are skipped). Absent: all lit. */
  surfaceLit?: Uint8Array | undefined;
  /** Offsets over the solar disc (solarDiscSamples), default 4 × 4. */
  discSamples?: Float64Array | undefined;
  /** Optional ground plane (blocks paths that cross it). */
  ground?: GroundPlaneInput | null | undefined;
  /** Nearest accepted occluder [m] (default 1e-3). */
  tMinM?: number | undefined;
}

const _defaultDisc = solarDiscSamples();
const _sk = new Float64Array(3);

/**
 * Appends to `out` every (receiver, surface) pair for which the receiver sees part of the sun's
 * mirror image in the surface with a clear line of sight. `out.count` is reset first.
 * @param bvh Scene BVH (the occluders; the mirrors themselves may be in it).
 * @param input Surfaces, receivers, the sun direction, lit flags, disc samples, ground.
 * @param out Hit list (caller-owned).
 * @returns The number of hits.
 */
export function traceSpecularPaths(bvh: BvhData, input: SpecularPathInput, out: SpecularHits): number {
  out.count = 0;
  const n = requireTriples(input.points, 'specularPaths points');
  const S = input.surfaces;
  const disc = input.discSamples ?? _defaultDisc;
  const K = disc.length / 2;
  if (K < 1 || disc.length % 2 !== 0) {
    throw new InputError({ problem: 'no disc samples', place: 'specularPaths discSamples', value: disc.length, expected: 'pairs of angular offsets (solarDiscSamples)' });
  }
  let sx = input.sunDirection[0]!, sy = input.sunDirection[1]!, sz = input.sunDirection[2]!;
  const len = Math.hypot(sx, sy, sz);
  if (!(len > 0) || !Number.isFinite(len)) {
    throw new InputError({ problem: 'sun direction is zero or not finite', place: 'specularPaths sunDirection', value: [sx, sy, sz], expected: 'a non-zero finite vector' });
  }
  sx /= len; sy /= len; sz /= len;
  // Two axes perpendicular to s for the disc offsets.
  let ux: number, uy: number, uz: number;
  if (Math.abs(sz) < 0.9) { ux = -sy; uy = sx; uz = 0; } else { ux = 0; uy = -sz; uz = sy; }
  const ul = Math.hypot(ux, uy, uz);
  ux /= ul; uy /= ul; uz /= ul;
  const vx = sy * uz - sz * uy, vy = sz * ux - sx * uz, vz = sx * uy - sy * ux;
  let maxOffset = 0;
  for (let k = 0; k < K; k++) maxOffset = Math.max(maxOffset, Math.hypot(disc[2 * k]!, disc[2 * k + 1]!));
  const gz = groundZOf(input.ground);
  const tMin = input.tMinM ?? DEFAULT_PATH_T_MIN_M;
  const pts = input.points;
  const lit = input.surfaceLit;
  const empty = bvh.triangleCount === 0;
  const td = S.triangleData;

  for (let j = 0; j < S.count; j++) {
    if (lit !== undefined && lit[j] !== 1) continue;
    const nx = S.normals[3 * j]!, ny = S.normals[3 * j + 1]!, nz = S.normals[3 * j + 2]!;
    const cosI = nx * sx + ny * sy + nz * sz;
    if (!(cosI > 0)) continue;
    const cx = S.centroids[3 * j]!, cy = S.centroids[3 * j + 1]!, cz = S.centroids[3 * j + 2]!;
    // Line of sight toward the image of the sun's centre.
    const dx = sx - 2 * cosI * nx, dy = sy - 2 * cosI * ny, dz = sz - 2 * cosI * nz;
    const dn = -cosI;
    const spread = (1.05 * maxOffset) / Math.max(cosI, 1e-3);
    const radius = S.radiiM[j]!;
    const t0 = S.triangleOffsets[j]!, t1 = S.triangleOffsets[j + 1]!;
    for (let i = 0; i < n; i++) {
      const px = pts[3 * i]!, py = pts[3 * i + 1]!, pz = pts[3 * i + 2]!;
      const front = (px - cx) * nx + (py - cy) * ny + (pz - cz) * nz;
      if (!(front > 1e-6)) continue;
      const t = -front / dn;
      const hx = px + t * dx - cx, hy = py + t * dy - cy, hz = pz + t * dz - cz;
      const bound = radius + t * spread + 1e-6;
      if (hx * hx + hy * hy + hz * hz > bound * bound) continue;
      // Disc samples.
      let hits = 0;
      let firstK = -1, fx = 0, fy = 0, fz = 0, ft = 0;
      for (let k = 0; k < K; k++) {
        const a = disc[2 * k]!, b = disc[2 * k + 1]!;
        let qx = sx + a * ux + b * vx, qy = sy + a * uy + b * vy, qz = sz + a * uz + b * vz;
        const ql = Math.hypot(qx, qy, qz);
        qx /= ql; qy /= ql; qz /= ql;
        const cq = nx * qx + ny * qy + nz * qz;
        if (!(cq > 0)) continue;
        _sk[0] = qx - 2 * cq * nx; _sk[1] = qy - 2 * cq * ny; _sk[2] = qz - 2 * cq * nz;
        const tk = front / cq; // (c − X)·n / (d_k·n), d_k·n = −cq
        const hkx = px + tk * _sk[0]!, hky = py + tk * _sk[1]!, hkz = pz + tk * _sk[2]!;
        if (!insideSurface(td, t0, t1, hkx, hky, hkz)) continue;
        hits++;
        if (firstK < 0) {
          firstK = k;
          fx = hkx; fy = hky; fz = hkz; ft = tk;
        }
      }
      if (hits === 0) continue;
      // Clear line of sight along the most central hitting sample.
      const lx = (fx - px) / ft, ly = (fy - py) / ft, lz = (fz - pz) / ft;
      const tEnd = ft - Math.max(PATH_END_GAP_M, 1e-6 * ft);
      if (tEnd <= tMin) continue;
      if (groundCrossingT(gz, pz, lz) < tEnd) continue;
      if (!empty && isOccluded(bvh, px, py, pz, lx, ly, lz, tMin, tEnd)) continue;
      if (out.count >= out.receiver.length) grow(out);
      const o = out.count++;
      out.receiver[o] = i;
      out.surface[o] = j;
      out.discFraction[o] = hits / K;
      out.point[3 * o] = fx; out.point[3 * o + 1] = fy; out.point[3 * o + 2] = fz;
      out.distanceM[o] = ft;
    }
  }
  return out.count;
}

/** Point-in-triangles test for a point on the surface's plane (barycentric, edges inclusive). */
function insideSurface(td: Float64Array, t0: number, t1: number, x: number, y: number, z: number): boolean {
  for (let t = t0; t < t1; t++) {
    const o = t * SPECULAR_TRI_FLOATS;
    const wx = x - td[o]!, wy = y - td[o + 1]!, wz = z - td[o + 2]!;
    const d20 = wx * td[o + 3]! + wy * td[o + 4]! + wz * td[o + 5]!;
    const d21 = wx * td[o + 6]! + wy * td[o + 7]! + wz * td[o + 8]!;
    const d00 = td[o + 9]!, d01 = td[o + 10]!, d11 = td[o + 11]!, inv = td[o + 12]!;
    const v = (d11 * d20 - d01 * d21) * inv;
    if (v < -1e-9) continue;
    const w = (d00 * d21 - d01 * d20) * inv;
    if (w < -1e-9 || v + w > 1 + 1e-9) continue;
    return true;
  }
  return false;
}
