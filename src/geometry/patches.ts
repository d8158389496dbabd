/**
 * Discretisation of the Scene's surfaces into patches of about a target area (default 1 m²), the
 * units the surface energy balance and the results work on.
 *
 * Method (deterministic; every step runs in triangle / cell index order):
 * 1. Planar regions: triangles of one surface and one material, connected through shared edges
 *    (vertices welded by exact position) and coplanar with the region's first triangle within an
 *    angle and a distance tolerance, are grown into one region (breadth-first from the lowest
 *    unassigned triangle).
 * 2. Each region gets a 2-D frame on its plane: u horizontal (ẑ × n) for walls and roofs, u = east
 *    projected on the plane for near-horizontal regions; v = n × u. A grid over the region's (u, v)
 *    bounding box has nu × nv cells sized so that a cell is close to the target area (a region
 *    narrower than √target gets cells as tall as the region and correspondingly longer).
 * 3. Triangles inside one cell are kept as they are; triangles crossing cell lines are clipped to
 *    the cells (Sutherland–Hodgman against each cell rectangle) and the convex pieces fanned, so the
 *    patch areas sum to the region's area.
 * 4. A cell holding less than `mergeBelowFraction` of a full cell (slivers at oblique edges) is
 *    merged into its largest edge-neighbour cell.
 *
 * The output carries a new SceneArrays (original triangles plus the clipped pieces, ordered by
 * patch) so that the tracer and the patches agree triangle for triangle.
 */
import { InputError } from '../physics/errors.ts';
import type { SceneArrays } from './sceneArrays.ts';

/** Options of the discretiser. */
export interface PatchOptions {
  /** Target patch area [m²]. Default 1. */
  targetAreaM2?: number;
  /** Per surface id, a different target area [m²] (e.g. coarser ground far from the zones). */
  targetAreaBySurface?: ReadonlyMap<number, number>;
  /** Largest angle between a triangle's normal and its region's normal [deg]. Default 1. */
  coplanarAngleDeg?: number;
  /** Largest distance of a triangle's corners from its region's plane [m]. Default 0.005. */
  coplanarDistanceM?: number;
  /** Cells holding less than this fraction of a full cell merge into a neighbour. Default 0.25. */
  mergeBelowFraction?: number;
}

/**
 * Patches as flat typed arrays (index p = patch id). Patch p is made of the triangles
 * `triangleOffsets[p] .. triangleOffsets[p+1]-1` of `scene`.
 */
export interface Patches {
  count: number;
  /** Result ids, `${surfaceName}-${n}` with n counting from 0 within each surface. */
  ids: string[];
  /** Area-weighted centroid xyz per patch [m]. */
  centroids: Float64Array;
  /** Unit normal xyz per patch (out of the solid, as the triangle winding says). */
  normals: Float64Array;
  /** Patch area [m²]. */
  areasM2: Float64Array;
  /** Per patch: index into scene.surfaceNames. */
  surfaceIds: Uint32Array;
  /** Per patch: index into scene.materialNames. */
  materialIds: Uint32Array;
  /** Per patch: the planar region it belongs to. */
  regionIds: Uint32Array;
  /** count + 1 offsets into the triangles of `scene`. */
  triangleOffsets: Uint32Array;
  /** Per triangle of `scene`: its patch. */
  patchOfTriangle: Uint32Array;
  /** The triangles the patches are made of (input triangles, some clipped into pieces). */
  scene: SceneArrays;
}

/**
 * Splits every surface of `scene` into planar regions and the regions into patches of about
 * `targetAreaM2`.
 * @param scene the imported scene (engine frame, metres)
 * @param opts target area [m²] and coplanarity tolerances
 */
export function buildPatches(scene: SceneArrays, opts: PatchOptions = {}): Patches {
  const targetAreaM2 = opts.targetAreaM2 ?? 1;
  if (!Number.isFinite(targetAreaM2) || targetAreaM2 <= 0) {
    throw new InputError({ problem: 'not a positive number', place: 'targetAreaM2', value: targetAreaM2, expected: 'a patch area > 0 m²' });
  }
  const cosTol = Math.cos(((opts.coplanarAngleDeg ?? 1) * Math.PI) / 180);
  const distTolM = opts.coplanarDistanceM ?? 0.005;
  const mergeBelow = opts.mergeBelowFraction ?? 0.25;

  const pos = scene.positions;
  const idx = scene.indices;
  const triCount = idx.length / 3;

  // Per-triangle unit normal, area and plane offset.
  const triN = new Float64Array(triCount * 3);
  const triA = new Float64Array(triCount);
  for (let t = 0; t < triCount; t++) {
    const a = idx[t * 3]! * 3, b = idx[t * 3 + 1]! * 3, c = idx[t * 3 + 2]! * 3;
    const e1x = pos[b]! - pos[a]!, e1y = pos[b + 1]! - pos[a + 1]!, e1z = pos[b + 2]! - pos[a + 2]!;
    const e2x = pos[c]! - pos[a]!, e2y = pos[c + 1]! - pos[a + 1]!, e2z = pos[c + 2]! - pos[a + 2]!;
    const cx = e1y * e2z - e1z * e2y, cy = e1z * e2x - e1x * e2z, cz = e1x * e2y - e1y * e2x;
    const len = Math.hypot(cx, cy, cz);
    triA[t] = len / 2;
    if (len > 0) {
      triN[t * 3] = cx / len;
      triN[t * 3 + 1] = cy / len;
      triN[t * 3 + 2] = cz / len;
    }
  }

  // Weld vertices by exact position, then edge → triangles.
  const weldKey = new Map<string, number>();
  const welded = new Uint32Array(pos.length / 3);
  for (let v = 0; v < welded.length; v++) {
    const key = `${pos[v * 3]! + 0},${pos[v * 3 + 1]! + 0},${pos[v * 3 + 2]! + 0}`;
    let w = weldKey.get(key);
    if (w === undefined) {
      w = weldKey.size;
      weldKey.set(key, w);
    }
    welded[v] = w;
  }
  const nWeld = weldKey.size;
  const edgeTris = new Map<number, number[]>();
  const edgeKey = (p: number, q: number): number => (p < q ? p * nWeld + q : q * nWeld + p);
  for (let t = 0; t < triCount; t++) {
    for (let k = 0; k < 3; k++) {
      const key = edgeKey(welded[idx[t * 3 + k]!]!, welded[idx[t * 3 + ((k + 1) % 3)]!]!);
      const list = edgeTris.get(key);
      if (list) list.push(t);
      else edgeTris.set(key, [t]);
    }
  }

  // 1. Region growing.
  const regionOfTri = new Int32Array(triCount).fill(-1);
  const regionTris: number[][] = [];
  const queue: number[] = [];
  for (let seed = 0; seed < triCount; seed++) {
    if (regionOfTri[seed] !== -1) continue;
    const r = regionTris.length;
    const members: number[] = [];
    regionTris.push(members);
    const snx = triN[seed * 3]!, sny = triN[seed * 3 + 1]!, snz = triN[seed * 3 + 2]!;
    const s0 = idx[seed * 3]! * 3;
    const sd = snx * pos[s0]! + sny * pos[s0 + 1]! + snz * pos[s0 + 2]!;
    regionOfTri[seed] = r;
    queue.length = 0;
    queue.push(seed);
    for (let qi = 0; qi < queue.length; qi++) {
      const t = queue[qi]!;
      members.push(t);
      for (let k = 0; k < 3; k++) {
        const list = edgeTris.get(edgeKey(welded[idx[t * 3 + k]!]!, welded[idx[t * 3 + ((k + 1) % 3)]!]!))!;
        for (const w of list) {
          if (regionOfTri[w] !== -1) continue;
          if (scene.surfaceIds[w] !== scene.surfaceIds[seed] || scene.materialIds[w] !== scene.materialIds[seed]) continue;
          if (triN[w * 3]! * snx + triN[w * 3 + 1]! * sny + triN[w * 3 + 2]! * snz < cosTol) continue;
          let flat = true;
          for (let c = 0; c < 3 && flat; c++) {
            const p = idx[w * 3 + c]! * 3;
            if (Math.abs(snx * pos[p]! + sny * pos[p + 1]! + snz * pos[p + 2]! - sd) > distTolM) flat = false;
          }
          if (!flat) continue;
          regionOfTri[w] = r;
          queue.push(w);
        }
      }
    }
    members.sort((p, q) => p - q);
  }

  // Output accumulators.
  const outPos: number[] = Array.from(pos);
  const patchTris: number[][] = []; // per patch: flat triples of output vertex indices
  const patchSums: number[] = []; // per patch: area, area·centroid xyz, area·normal xyz (float64)
  const pSurface: number[] = [];
  const pMaterial: number[] = [];
  const pRegion: number[] = [];
  const perSurfaceCount = new Map<number, number>();
  const ids: string[] = [];
  for (let r = 0; r < regionTris.length; r++) {
    const members = regionTris[r]!;
    const first = members[0]!;
    const regionTarget = opts.targetAreaBySurface?.get(scene.surfaceIds[first]!) ?? targetAreaM2;
    const cellSide = Math.sqrt(regionTarget);
    // Region normal: area-weighted.
    let nx = 0, ny = 0, nz = 0, area = 0;
    for (const t of members) {
      nx += triN[t * 3]! * triA[t]!;
      ny += triN[t * 3 + 1]! * triA[t]!;
      nz += triN[t * 3 + 2]! * triA[t]!;
      area += triA[t]!;
    }
    const nl = Math.hypot(nx, ny, nz) || 1;
    nx /= nl; ny /= nl; nz /= nl;
    // Plane frame.
    let ux: number, uy: number, uz: number;
    if (Math.abs(nz) < 0.9) {
      ux = -ny; uy = nx; uz = 0; // ẑ × n: horizontal
    } else {
      ux = 1 - nx * nx; uy = -nx * ny; uz = -nx * nz; // east projected on the plane
    }
    const ul = Math.hypot(ux, uy, uz);
    ux /= ul; uy /= ul; uz /= ul;
    const vx = ny * uz - nz * uy, vy = nz * ux - nx * uz, vz = nx * uy - ny * ux;
    let u0 = Infinity, u1 = -Infinity, v0 = Infinity, v1 = -Infinity;
    for (const t of members) {
      for (let c = 0; c < 3; c++) {
        const p = idx[t * 3 + c]! * 3;
        const pu = pos[p]! * ux + pos[p + 1]! * uy + pos[p + 2]! * uz;
        const pv = pos[p]! * vx + pos[p + 1]! * vy + pos[p + 2]! * vz;
        if (pu < u0) u0 = pu;
        if (pu > u1) u1 = pu;
        if (pv < v0) v0 = pv;
        if (pv > v1) v1 = pv;
      }
    }
    const eu = u1 - u0, ev = v1 - v0;
    let nu: number, nv: number;
    if (area <= regionTarget * 1.5) {
      nu = 1; nv = 1;
    } else if (ev < cellSide) {
      nv = 1; nu = Math.max(1, Math.round((eu * ev) / regionTarget));
    } else if (eu < cellSide) {
      nu = 1; nv = Math.max(1, Math.round((eu * ev) / regionTarget));
    } else {
      nu = Math.max(1, Math.round(eu / cellSide));
      nv = Math.max(1, Math.round(ev / cellSide));
    }
    const cu = eu / nu, cv = ev / nv;
    const cells = nu * nv;
    const cellTris: number[][] = Array.from({ length: cells }, () => []);
    const cellArea = new Float64Array(cells);
    // Per cell, float64 sums: area·centroid xyz and area·normal xyz (before float32 storage).
    const cellSums = new Float64Array(cells * 6);
    const accumulate = (cell: number, ar: number, cx: number, cy: number, cz: number, t: number): void => {
      cellArea[cell]! += ar;
      cellSums[cell * 6]! += ar * cx;
      cellSums[cell * 6 + 1]! += ar * cy;
      cellSums[cell * 6 + 2]! += ar * cz;
      cellSums[cell * 6 + 3]! += ar * triN[t * 3]!;
      cellSums[cell * 6 + 4]! += ar * triN[t * 3 + 1]!;
      cellSums[cell * 6 + 5]! += ar * triN[t * 3 + 2]!;
    };
    const cellOf = (x: number, n: number, lo: number, w: number): number => Math.min(n - 1, Math.max(0, Math.floor((x - lo) / w)));

    for (const t of members) {
      const ia = idx[t * 3]!, ib = idx[t * 3 + 1]!, ic = idx[t * 3 + 2]!;
      let imin = nu, imax = -1, jmin = nv, jmax = -1;
      for (const v of [ia, ib, ic]) {
        const pu = pos[v * 3]! * ux + pos[v * 3 + 1]! * uy + pos[v * 3 + 2]! * uz;
        const pv = pos[v * 3]! * vx + pos[v * 3 + 1]! * vy + pos[v * 3 + 2]! * vz;
        const i = cells === 1 ? 0 : cellOf(pu, nu, u0, cu);
        const j = cells === 1 ? 0 : cellOf(pv, nv, v0, cv);
        imin = Math.min(imin, i); imax = Math.max(imax, i);
        jmin = Math.min(jmin, j); jmax = Math.max(jmax, j);
      }
      if (imin === imax && jmin === jmax) {
        const cell = jmin * nu + imin;
        cellTris[cell]!.push(ia, ib, ic);
        accumulate(
          cell, triA[t]!,
          (pos[ia * 3]! + pos[ib * 3]! + pos[ic * 3]!) / 3,
          (pos[ia * 3 + 1]! + pos[ib * 3 + 1]! + pos[ic * 3 + 1]!) / 3,
          (pos[ia * 3 + 2]! + pos[ib * 3 + 2]! + pos[ic * 3 + 2]!) / 3,
          t,
        );
        continue;
      }
      for (let j = jmin; j <= jmax; j++) {
        for (let i = imin; i <= imax; i++) {
          const cell = j * nu + i;
          // Outer grid lines are not clipped, so nothing is lost to rounding at the region edge.
          const poly = clipTriangleToCell(
            pos, ia, ib, ic, ux, uy, uz, vx, vy, vz,
            i === 0 ? -Infinity : u0 + i * cu,
            i === nu - 1 ? Infinity : u0 + (i + 1) * cu,
            j === 0 ? -Infinity : v0 + j * cv,
            j === nv - 1 ? Infinity : v0 + (j + 1) * cv,
          );
          const m = poly.length / 3;
          if (m < 3) continue;
          // Fan the convex piece into new vertices.
          const baseV = outPos.length / 3;
          for (let k = 0; k < poly.length; k++) outPos.push(poly[k]!);
          for (let k = 1; k + 1 < m; k++) {
            const a = baseV, b = baseV + k, c = baseV + k + 1;
            const ar = triangleArea(poly, 0, k, k + 1);
            if (!(ar > 1e-12)) continue;
            cellTris[cell]!.push(a, b, c);
            accumulate(
              cell, ar,
              (poly[0]! + poly[k * 3]! + poly[(k + 1) * 3]!) / 3,
              (poly[1]! + poly[k * 3 + 1]! + poly[(k + 1) * 3 + 1]!) / 3,
              (poly[2]! + poly[k * 3 + 2]! + poly[(k + 1) * 3 + 2]!) / 3,
              t,
            );
          }
        }
      }
    }

    // 4. Merge slivers into their largest edge neighbour (union-find over cells).
    const parent = new Int32Array(cells);
    for (let c = 0; c < cells; c++) parent[c] = c;
    const find = (c: number): number => {
      while (parent[c] !== c) c = parent[c] = parent[parent[c]!]!;
      return c;
    };
    const full = cu * cv;
    if (cells > 1) {
      for (let c = 0; c < cells; c++) {
        if (cellArea[c]! <= 0 || cellArea[c]! >= mergeBelow * full) continue;
        const i = c % nu, j = (c - i) / nu;
        let best = -1, bestArea = cellArea[c]!;
        for (const [di, dj] of [[1, 0], [-1, 0], [0, 1], [0, -1]] as const) {
          const ni = i + di, nj = j + dj;
          if (ni < 0 || nj < 0 || ni >= nu || nj >= nv) continue;
          const nc = nj * nu + ni;
          if (cellArea[nc]! > bestArea) {
            bestArea = cellArea[nc]!;
            best = nc;
          }
        }
        if (best >= 0) parent[find(c)] = find(best);
      }
    }
    const patchOfRoot = new Map<number, number>();
    const sid = scene.surfaceIds[first]!;
    for (let c = 0; c < cells; c++) {
      if (cellTris[c]!.length === 0) continue;
      const root = find(c);
      let p = patchOfRoot.get(root);
      if (p === undefined) {
        p = patchTris.length;
        patchOfRoot.set(root, p);
        patchTris.push([]);
        patchSums.push(0, 0, 0, 0, 0, 0, 0);
        pSurface.push(sid);
        pMaterial.push(scene.materialIds[first]!);
        pRegion.push(r);
        const n = perSurfaceCount.get(sid) ?? 0;
        perSurfaceCount.set(sid, n + 1);
        ids.push(`${scene.surfaceNames[sid] ?? `surface${sid}`}-${n}`);
      }
      const list = patchTris[p]!;
      for (const v of cellTris[c]!) list.push(v);
      patchSums[p * 7]! += cellArea[c]!;
      for (let k = 0; k < 6; k++) patchSums[p * 7 + 1 + k]! += cellSums[c * 6 + k]!;
    }
  }

  // Pack, triangles ordered by patch.
  const count = patchTris.length;
  let outTriCount = 0;
  for (const l of patchTris) outTriCount += l.length / 3;
  const indices = new Uint32Array(outTriCount * 3);
  const surfaceIds = new Uint32Array(outTriCount);
  const materialIds = new Uint32Array(outTriCount);
  const patchOfTriangle = new Uint32Array(outTriCount);
  const triangleOffsets = new Uint32Array(count + 1);
  const positions = Float32Array.from(outPos);
  const centroids = new Float64Array(count * 3);
  const normals = new Float64Array(count * 3);
  const areasM2 = new Float64Array(count);
  let tOut = 0;
  for (let p = 0; p < count; p++) {
    triangleOffsets[p] = tOut;
    const list = patchTris[p]!;
    for (let k = 0; k < list.length; k += 3) {
      indices[tOut * 3] = list[k]!;
      indices[tOut * 3 + 1] = list[k + 1]!;
      indices[tOut * 3 + 2] = list[k + 2]!;
      surfaceIds[tOut] = pSurface[p]!;
      materialIds[tOut] = pMaterial[p]!;
      patchOfTriangle[tOut] = p;
      tOut++;
    }
    // From the float64 geometry before storage, so patch areas add up to the surface areas.
    const area = patchSums[p * 7]!;
    const sx = patchSums[p * 7 + 4]!, sy = patchSums[p * 7 + 5]!, sz = patchSums[p * 7 + 6]!;
    const nl = Math.hypot(sx, sy, sz) || 1;
    normals[p * 3] = sx / nl;
    normals[p * 3 + 1] = sy / nl;
    normals[p * 3 + 2] = sz / nl;
    areasM2[p] = area;
    centroids[p * 3] = patchSums[p * 7 + 1]! / area;
    centroids[p * 3 + 1] = patchSums[p * 7 + 2]! / area;
    centroids[p * 3 + 2] = patchSums[p * 7 + 3]! / area;
  }
  triangleOffsets[count] = tOut;
  const outScene: SceneArrays = {
    positions,
    indices,
    surfaceIds,
    materialIds,
    surfaceNames: [...scene.surfaceNames],
    materialNames: [...scene.materialNames],
    warnings: [...scene.warnings],
  };
  return {
    count,
    ids,
    centroids,
    normals,
    areasM2,
    surfaceIds: Uint32Array.from(pSurface),
    materialIds: Uint32Array.from(pMaterial),
    regionIds: Uint32Array.from(pRegion),
    triangleOffsets,
    patchOfTriangle,
    scene: outScene,
  };
}

function triangleArea(p: ArrayLike<number>, a: number, b: number, c: number): number {
  const e1x = p[b * 3]! - p[a * 3]!, e1y = p[b * 3 + 1]! - p[a * 3 + 1]!, e1z = p[b * 3 + 2]! - p[a * 3 + 2]!;
  const e2x = p[c * 3]! - p[a * 3]!, e2y = p[c * 3 + 1]! - p[a * 3 + 1]!, e2z = p[c * 3 + 2]! - p[a * 3 + 2]!;
  return Math.hypot(e1y * e2z - e1z * e2y, e1z * e2x - e1x * e2z, e1x * e2y - e1y * e2x) / 2;
}

/**
 * Clips triangle (a, b, c) to the slab ulo ≤ u ≤ uhi, vlo ≤ v ≤ vhi of its plane frame
 * (Sutherland–Hodgman, one half-plane at a time). Returns the convex piece as flat xyz (3-D points
 * interpolated along the original edges, so they stay on the triangle).
 */
function clipTriangleToCell(
  pos: Float32Array,
  a: number, b: number, c: number,
  ux: number, uy: number, uz: number,
  vx: number, vy: number, vz: number,
  ulo: number, uhi: number, vlo: number, vhi: number,
): number[] {
  let poly: number[] = [];
  for (const v of [a, b, c]) poly.push(pos[v * 3]!, pos[v * 3 + 1]!, pos[v * 3 + 2]!);
  const clip = (dx: number, dy: number, dz: number, limit: number, keepBelow: boolean): void => {
    if (!Number.isFinite(limit) || poly.length === 0) return;
    const out: number[] = [];
    const m = poly.length / 3;
    for (let k = 0; k < m; k++) {
      const k2 = (k + 1) % m;
      const px = poly[k * 3]!, py = poly[k * 3 + 1]!, pz = poly[k * 3 + 2]!;
      const qx = poly[k2 * 3]!, qy = poly[k2 * 3 + 1]!, qz = poly[k2 * 3 + 2]!;
      const sp = keepBelow ? limit - (px * dx + py * dy + pz * dz) : px * dx + py * dy + pz * dz - limit;
      const sq = keepBelow ? limit - (qx * dx + qy * dy + qz * dz) : qx * dx + qy * dy + qz * dz - limit;
      if (sp >= 0) out.push(px, py, pz);
      if ((sp >= 0 && sq < 0) || (sp < 0 && sq >= 0)) {
        const s = sp / (sp - sq);
        out.push(px + (qx - px) * s, py + (qy - py) * s, pz + (qz - pz) * s);
      }
    }
    poly = out;
  };
  clip(ux, uy, uz, ulo, false);
  clip(ux, uy, uz, uhi, true);
  clip(vx, vy, vz, vlo, false);
  clip(vx, vy, vz, vhi, true);
  return poly;
}
