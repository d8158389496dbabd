/**
 * Geometry pathologies of imported models, found and reported (never silently passed on):
 *
 * - open edges (used by one triangle) and non-manifold edges (used by more than two), counted on
 *   vertices welded by position (exporters often split vertices along seams);
 * - duplicated faces: two triangles on the same three welded vertices (they z-fight in the viewer
 *   and double-count in the tracer's view factors);
 * - flipped normals: a triangle whose normal points into its own solid, found by ray parity — a
 *   ray cast from the triangle along its normal crosses the model's surfaces an odd number of
 *   times when it starts inside a closed solid (Jordan–Brouwer separation; three rays vote so a ray
 *   grazing an edge does not decide alone); `fixFlippedNormals` reverses them;
 * - zones off the model: a zone polygon wholly outside the model's bounding box plus a margin
 *   (usually a coordinate or north-rotation mistake);
 * - size: `checkModelSize` refuses a model over a triangle limit with the numbers and the way out,
 *   before the expensive stages allocate.
 *
 * Everything works on the SceneArrays (typed arrays, no object per triangle) with hash tables on
 * typed arrays, so it runs on multi-million-triangle models.
 */
import { InputError } from '../physics/errors.ts';
import type { SceneArrays } from '../geometry/sceneArrays.ts';
import { buildBvh, type BvhData } from '../trace/bvh/build.ts';
import { intersectClosest, makeClosestHit } from '../trace/bvh/query.ts';

/** Default largest model the audit accepts [triangles]. */
export const DEFAULT_TRIANGLE_LIMIT = 3_000_000;

/**
 * Throws an InputError when the model has more triangles than `limit`, naming the count, the limit
 * and how to proceed. Call right after import, before the ground apron, patches and BVH.
 * @param scene the imported model
 * @param limit largest accepted triangle count (default 3 000 000)
 * @param file the model file, for the message
 * @param howToRaise how the caller lets the user raise the limit (e.g. "--max-triangles N")
 */
export function checkModelSize(scene: SceneArrays, limit: number = DEFAULT_TRIANGLE_LIMIT, file?: string, howToRaise = 'the triangle limit setting'): void {
  if (!Number.isInteger(limit) || limit < 1) {
    throw new InputError({ problem: 'bad triangle limit', place: 'triangle limit', value: limit, expected: 'an integer >= 1' });
  }
  const triangles = scene.indices.length / 3;
  if (triangles > limit) {
    throw new InputError({
      problem: `the model has ${triangles.toLocaleString('en-US')} triangles, over the limit of ${limit.toLocaleString('en-US')}`,
      ...(file !== undefined ? { file } : {}),
      place: 'whole model',
      value: triangles,
      expected: `at most ${limit.toLocaleString('en-US')} triangles: simplify or split the model (drop hidden detail, furniture, interiors), or raise the limit (${howToRaise}) on a machine with enough memory (about 1 GB per million triangles)`,
    });
  }
}

export interface PathologyOptions {
  /** Vertices closer than this are one (welding grid) [m]; default 1e-4. */
  weldToleranceM?: number;
  /** Zones to check against the model's footprint: name and polygon [[x, y], ...] [m]. */
  zones?: readonly { name: string; polygon?: readonly (readonly [number, number])[] | undefined }[];
  /** Margin around the model's bounding box for the zone check [m]; default 20. */
  zoneMarginM?: number;
  /** A BVH over exactly `scene` (built here when missing). */
  bvh?: BvhData;
  /** Ray-parity test on at most this many triangles (an even sample above it); default 500 000. */
  flipCheckLimit?: number;
  /** Skip the flipped-normal test (no rays). */
  skipFlipCheck?: boolean;
  /**
   * Height of the ground plane [m]: open edges lying in it are a massing model's open footprint
   * (blocks standing on the ground without bottom faces), not a gap, and are not counted.
   */
  groundZ?: number;
}

export interface PathologyReport {
  /** Plain-language findings, for the results' warnings list (empty when the model is clean). */
  warnings: string[];
  /** Edges (welded) used by exactly one triangle. */
  openEdges: number;
  /** Edges (welded) used by three or more triangles. */
  nonManifoldEdges: number;
  /** Triangles repeating an earlier triangle's three welded vertices (in either winding). */
  duplicateTriangles: Uint32Array;
  /** Triangles whose normal points into a solid (ascending). */
  flippedTriangles: Uint32Array;
  /** Per surface (name) with flipped triangles: how many of how many. */
  flippedBySurface: { surface: string; flipped: number; triangles: number }[];
  /** Triangles the parity test looked at (all, or a sample of large models). */
  flipCheckedTriangles: number;
  /** Names of zones wholly outside the model's bounding box + margin. */
  zonesOffModel: string[];
}

// ---- hashing on typed arrays --------------------------------------------------------------

function mix(a: number, b: number, c: number): number {
  let h = Math.imul(a | 0, 0x9e3779b1) ^ Math.imul(b | 0, 0x85ebca77) ^ Math.imul(c | 0, 0xc2b2ae3d);
  h ^= h >>> 15;
  h = Math.imul(h, 0x2c1b3c6d);
  h ^= h >>> 12;
  return h >>> 0;
}

function tableSize(n: number): number {
  let s = 16;
  while (s < 2 * n) s *= 2;
  return s;
}

/** Welded vertex id per vertex: vertices in the same `tol` grid cell share an id. */
export function weldVertices(positions: Float32Array, tol: number): { ids: Uint32Array; count: number } {
  const nv = positions.length / 3;
  const q = new Float64Array(positions.length);
  for (let i = 0; i < positions.length; i++) q[i] = Math.round(positions[i]! / tol);
  const size = tableSize(nv), mask = size - 1;
  const slot = new Int32Array(size).fill(-1); // representative vertex
  const slotId = new Uint32Array(size);
  const ids = new Uint32Array(nv);
  let count = 0;
  for (let v = 0; v < nv; v++) {
    const x = q[3 * v]!, y = q[3 * v + 1]!, z = q[3 * v + 2]!;
    let h = mix(x % 4294967296, y % 4294967296, z % 4294967296) & mask;
    for (;;) {
      const r = slot[h]!;
      if (r < 0) {
        slot[h] = v;
        slotId[h] = count;
        ids[v] = count++;
        break;
      }
      if (q[3 * r] === x && q[3 * r + 1] === y && q[3 * r + 2] === z) {
        ids[v] = slotId[h]!;
        break;
      }
      h = (h + 1) & mask;
    }
  }
  return { ids, count };
}

// ---- the checks ---------------------------------------------------------------------------

/** Edge use counts on welded vertices: [open, nonManifold]. */
function edgeCounts(indices: Uint32Array, weld: Uint32Array, positions?: Float32Array, groundZ?: number): [number, number] {
  const nt = indices.length / 3;
  const size = tableSize(3 * nt), mask = size - 1;
  const ka = new Int32Array(size).fill(-1);
  const kb = new Uint32Array(size);
  const uses = new Uint32Array(size);
  for (let t = 0; t < nt; t++) {
    for (let e = 0; e < 3; e++) {
      const p = weld[indices[3 * t + e]!]!, q = weld[indices[3 * t + ((e + 1) % 3)]!]!;
      if (p === q) continue;
      const a = p < q ? p : q, b = p < q ? q : p;
      let h = mix(a, b, 0x5bd1e995) & mask;
      while (ka[h] !== -1 && !(ka[h] === a && kb[h] === b)) h = (h + 1) & mask;
      ka[h] = a;
      kb[h] = b;
      uses[h]!++;
    }
  }
  let open = 0, nonManifold = 0;
  // Welded ids → a representative vertex, to read an edge's height.
  let zOf: Float64Array | undefined;
  if (positions && groundZ !== undefined) {
    zOf = new Float64Array(weld.length).fill(NaN);
    for (let v = 0; v < weld.length; v++) zOf[weld[v]!] = positions[3 * v + 2]!;
  }
  const onGround = (a: number, b: number) => zOf !== undefined && Math.abs(zOf[a]! - groundZ!) < 1e-3 && Math.abs(zOf[b]! - groundZ!) < 1e-3;
  for (let h = 0; h < size; h++) {
    if (ka[h] === -1) continue;
    if (uses[h] === 1 && !onGround(ka[h]!, kb[h]!)) open++;
    else if (uses[h]! > 2) nonManifold++;
  }
  return [open, nonManifold];
}

/** Triangles whose sorted welded vertex triple was seen before. */
function duplicateFaces(indices: Uint32Array, weld: Uint32Array): Uint32Array {
  const nt = indices.length / 3;
  const size = tableSize(nt), mask = size - 1;
  const first = new Int32Array(size).fill(-1);
  const key = new Uint32Array(3 * size);
  const dups: number[] = [];
  for (let t = 0; t < nt; t++) {
    let a = weld[indices[3 * t]!]!, b = weld[indices[3 * t + 1]!]!, c = weld[indices[3 * t + 2]!]!;
    if (a > b) [a, b] = [b, a];
    if (b > c) [b, c] = [c, b];
    if (a > b) [a, b] = [b, a];
    let h = mix(a, b, c) & mask;
    for (;;) {
      if (first[h] === -1) {
        first[h] = t;
        key[3 * h] = a; key[3 * h + 1] = b; key[3 * h + 2] = c;
        break;
      }
      if (key[3 * h] === a && key[3 * h + 1] === b && key[3 * h + 2] === c) {
        dups.push(t);
        break;
      }
      h = (h + 1) & mask;
    }
  }
  return Uint32Array.from(dups);
}

const _hit = makeClosestHit();
/** Barycentric start points and direction tilts of the three parity rays. */
const PARITY_RAYS = [
  { u: 1 / 3, v: 1 / 3, tilt: [0, 0] },
  { u: 0.2, v: 0.5, tilt: [0.21, -0.13] },
  { u: 0.55, v: 0.25, tilt: [-0.17, 0.19] },
] as const;

/** Number of surface crossings of the ray o + t·d for t > tMin (every hit counted). */
function crossings(bvh: BvhData, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number): number {
  let n = 0;
  let t0 = tMin;
  for (let guard = 0; guard < 100000; guard++) {
    if (!intersectClosest(bvh, ox, oy, oz, dx, dy, dz, t0, Infinity, _hit)) break;
    n++;
    t0 = _hit.t * (1 + 1e-7) + 1e-6;
  }
  return n;
}

/**
 * True when triangle `t`'s normal (from its winding, a→b→c counter-clockwise = outward) points
 * into a solid: at least two of three rays from points on it, along its normal (two slightly
 * tilted), cross the model an odd number of times.
 */
export function normalPointsInside(scene: SceneArrays, bvh: BvhData, t: number): boolean {
  const p = scene.positions, ix = scene.indices;
  const a = 3 * ix[3 * t]!, b = 3 * ix[3 * t + 1]!, c = 3 * ix[3 * t + 2]!;
  const e1x = p[b]! - p[a]!, e1y = p[b + 1]! - p[a + 1]!, e1z = p[b + 2]! - p[a + 2]!;
  const e2x = p[c]! - p[a]!, e2y = p[c + 1]! - p[a + 1]!, e2z = p[c + 2]! - p[a + 2]!;
  let nx = e1y * e2z - e1z * e2y, ny = e1z * e2x - e1x * e2z, nz = e1x * e2y - e1y * e2x;
  const len = Math.hypot(nx, ny, nz);
  if (!(len > 0)) return false;
  nx /= len; ny /= len; nz /= len;
  // Two unit tangents for the tilts.
  const l1 = Math.hypot(e1x, e1y, e1z);
  const tx = e1x / l1, ty = e1y / l1, tz = e1z / l1;
  const sx = ny * tz - nz * ty, sy = nz * tx - nx * tz, sz = nx * ty - ny * tx;
  const scale = Math.max(Math.abs(p[a]!), Math.abs(p[a + 1]!), Math.abs(p[a + 2]!), 1);
  const eps = 1e-5 * scale;
  let votes = 0;
  for (const r of PARITY_RAYS) {
    const w = 1 - r.u - r.v;
    const ox = w * p[a]! + r.u * p[b]! + r.v * p[c]!;
    const oy = w * p[a + 1]! + r.u * p[b + 1]! + r.v * p[c + 1]!;
    const oz = w * p[a + 2]! + r.u * p[b + 2]! + r.v * p[c + 2]!;
    const dx = nx + r.tilt[0] * tx + r.tilt[1] * sx;
    const dy = ny + r.tilt[0] * ty + r.tilt[1] * sy;
    const dz = nz + r.tilt[0] * tz + r.tilt[1] * sz;
    if (crossings(bvh, ox + eps * nx, oy + eps * ny, oz + eps * nz, dx, dy, dz, 0) % 2 === 1) votes++;
  }
  return votes >= 2;
}

/** Finds the pathologies of `scene` (see the module comment). */
export function findPathologies(scene: SceneArrays, opts: PathologyOptions = {}): PathologyReport {
  const tol = opts.weldToleranceM ?? 1e-4;
  if (!(tol > 0)) throw new InputError({ problem: 'not a positive number', place: 'weldToleranceM', value: tol, expected: 'a tolerance > 0 m' });
  const nt = scene.indices.length / 3;
  const warnings: string[] = [];
  const weld = weldVertices(scene.positions, tol).ids;

  const [openEdges, nonManifoldEdges] = edgeCounts(scene.indices, weld, scene.positions, opts.groundZ);
  if (openEdges > 0) warnings.push(`the model is open: ${openEdges} edge(s) belong to only one triangle (gaps or unclosed solids; inside/outside tests near them may be wrong)`);
  if (nonManifoldEdges > 0) warnings.push(`the model is non-manifold: ${nonManifoldEdges} edge(s) are shared by three or more triangles`);

  const duplicateTriangles = duplicateFaces(scene.indices, weld);
  if (duplicateTriangles.length > 0) {
    warnings.push(`${duplicateTriangles.length} duplicated face(s) (two triangles on the same three corners: they flicker in the viewer and are counted twice); first at triangle ${duplicateTriangles[0]} of surface "${scene.surfaceNames[scene.surfaceIds[duplicateTriangles[0]!]!] ?? ''}"`);
  }

  // Flipped normals by ray parity.
  const flipped: number[] = [];
  let checked = 0;
  if (!opts.skipFlipCheck && nt > 0) {
    const bvh = opts.bvh ?? buildBvh(scene.positions, scene.indices);
    const limit = opts.flipCheckLimit ?? 500_000;
    const stride = nt > limit ? Math.ceil(nt / limit) : 1;
    for (let t = 0; t < nt; t += stride) {
      checked++;
      if (normalPointsInside(scene, bvh, t)) flipped.push(t);
    }
  }
  const flippedTriangles = Uint32Array.from(flipped);
  const perSurface = new Map<number, number>();
  for (const t of flipped) perSurface.set(scene.surfaceIds[t]!, (perSurface.get(scene.surfaceIds[t]!) ?? 0) + 1);
  const totals = new Uint32Array(scene.surfaceNames.length);
  for (let t = 0; t < nt; t++) totals[scene.surfaceIds[t]!]!++;
  const flippedBySurface = [...perSurface].sort((x, y) => x[0] - y[0]).map(([sid, n]) => ({ surface: scene.surfaceNames[sid] ?? `#${sid}`, flipped: n, triangles: totals[sid]! }));
  if (flipped.length > 0) {
    const list = flippedBySurface.slice(0, 8).map((s) => `"${s.surface}" ${s.flipped} of ${s.triangles}`).join(', ');
    warnings.push(`${flipped.length} triangle(s) face into their solid (flipped normals${stride(checked, nt)}): ${list}${flippedBySurface.length > 8 ? ', ...' : ''}`);
  }

  // Zones off the model.
  const zonesOffModel: string[] = [];
  if (opts.zones && opts.zones.length > 0 && nt > 0) {
    const margin = opts.zoneMarginM ?? 20;
    let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity;
    const p = scene.positions;
    for (let i = 0; i < p.length; i += 3) {
      if (p[i]! < x0) x0 = p[i]!; if (p[i]! > x1) x1 = p[i]!;
      if (p[i + 1]! < y0) y0 = p[i + 1]!; if (p[i + 1]! > y1) y1 = p[i + 1]!;
    }
    for (const z of opts.zones) {
      if (!z.polygon || z.polygon.length === 0) continue;
      let zx0 = Infinity, zy0 = Infinity, zx1 = -Infinity, zy1 = -Infinity;
      for (const [x, y] of z.polygon) {
        zx0 = Math.min(zx0, x); zx1 = Math.max(zx1, x); zy0 = Math.min(zy0, y); zy1 = Math.max(zy1, y);
      }
      if (zx1 < x0 - margin || zx0 > x1 + margin || zy1 < y0 - margin || zy0 > y1 + margin) {
        zonesOffModel.push(z.name);
        warnings.push(`zone "${z.name}" (x ${zx0.toFixed(1)}..${zx1.toFixed(1)}, y ${zy0.toFixed(1)}..${zy1.toFixed(1)} m) lies wholly outside the model (x ${x0.toFixed(1)}..${x1.toFixed(1)}, y ${y0.toFixed(1)}..${y1.toFixed(1)} m, ${margin} m margin): check its coordinates, the model's units and site.northDeg`);
      }
    }
  }
  return { warnings, openEdges, nonManifoldEdges, duplicateTriangles, flippedTriangles, flippedBySurface, flipCheckedTriangles: checked, zonesOffModel };
}

function stride(checked: number, nt: number): string {
  return checked < nt ? `, found on a sample of ${checked} of ${nt} triangles` : '';
}

/** A copy of `scene` with the listed triangles' winding reversed (their normals turned round). */
export function fixFlippedNormals(scene: SceneArrays, flippedTriangles: Uint32Array): SceneArrays {
  const indices = new Uint32Array(scene.indices);
  const nt = indices.length / 3;
  for (const t of flippedTriangles) {
    if (t >= nt) throw new InputError({ problem: 'triangle index out of range', place: 'fixFlippedNormals flippedTriangles', value: t, expected: `an index below ${nt}` });
    const b = indices[3 * t + 1]!;
    indices[3 * t + 1] = indices[3 * t + 2]!;
    indices[3 * t + 2] = b;
  }
  const warnings = flippedTriangles.length > 0 ? [...scene.warnings, `${flippedTriangles.length} triangle(s) with flipped normals were turned round`] : scene.warnings;
  return { ...scene, indices, warnings };
}
