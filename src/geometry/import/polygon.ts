/**
 * Triangulation of one planar (or nearly planar) polygon given as 3-D points: a fan for convex
 * polygons, ear clipping on the polygon's projection onto its dominant plane for concave ones.
 * The output keeps the input winding (so outward normals stay outward).
 */

/** Result: triangles as triples of positions in the input list; `fellBack` if ear clipping failed. */
export interface PolygonTriangulation {
  triangles: number[];
  fellBack: boolean;
}

/**
 * Triangulates the polygon whose corners are `corner(i)` = points[i*3..i*3+2], i = 0..n-1.
 * Uses the Newell normal to choose the projection plane, then fan (convex) or ear clipping
 * (concave; Eberly, "Triangulation by Ear Clipping", Geometric Tools 2002). Self-intersecting
 * polygons for which no ear is found fall back to a fan (`fellBack`).
 */
export function triangulatePolygon(points: ArrayLike<number>, n: number): PolygonTriangulation {
  if (n < 3) return { triangles: [], fellBack: false };
  if (n === 3) return { triangles: [0, 1, 2], fellBack: false };
  // Newell normal.
  let nx = 0, ny = 0, nz = 0;
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    const xi = points[i * 3]!, yi = points[i * 3 + 1]!, zi = points[i * 3 + 2]!;
    const xj = points[j * 3]!, yj = points[j * 3 + 1]!, zj = points[j * 3 + 2]!;
    nx += (yi - yj) * (zi + zj);
    ny += (zi - zj) * (xi + xj);
    nz += (xi - xj) * (yi + yj);
  }
  const ax = Math.abs(nx), ay = Math.abs(ny), az = Math.abs(nz);
  if (ax + ay + az === 0) return { triangles: fan(n), fellBack: false }; // zero area: the builder drops them
  // Projection axes (u, v) such that u × v points along the normal's dominant component.
  let ua: number, va: number;
  if (az >= ax && az >= ay) {
    [ua, va] = nz > 0 ? [0, 1] : [1, 0];
  } else if (ax >= ay) {
    [ua, va] = nx > 0 ? [1, 2] : [2, 1];
  } else {
    [ua, va] = ny > 0 ? [2, 0] : [0, 2];
  }
  const u = new Float64Array(n);
  const v = new Float64Array(n);
  let scale = 0;
  for (let i = 0; i < n; i++) {
    u[i] = points[i * 3 + ua]!;
    v[i] = points[i * 3 + va]!;
    scale = Math.max(scale, Math.abs(u[i]! - u[0]!), Math.abs(v[i]! - v[0]!));
  }
  const eps = 1e-12 * scale * scale;
  // Convex: every turn is a left turn (or straight).
  let convex = true;
  for (let i = 0; i < n && convex; i++) {
    if (turn(u, v, i, (i + 1) % n, (i + 2) % n) < -eps) convex = false;
  }
  if (convex) return { triangles: fan(n), fellBack: false };
  return earClip(u, v, n, eps);
}

function fan(n: number): number[] {
  const t: number[] = [];
  for (let i = 1; i + 1 < n; i++) t.push(0, i, i + 1);
  return t;
}

/** Twice the signed area of (a, b, c) in the projection; > 0 for a left (counter-clockwise) turn. */
function turn(u: Float64Array, v: Float64Array, a: number, b: number, c: number): number {
  return (u[b]! - u[a]!) * (v[c]! - v[a]!) - (v[b]! - v[a]!) * (u[c]! - u[a]!);
}

function earClip(u: Float64Array, v: Float64Array, n: number, eps: number): PolygonTriangulation {
  const prev = new Int32Array(n);
  const next = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    prev[i] = (i + n - 1) % n;
    next[i] = (i + 1) % n;
  }
  const tris: number[] = [];
  let remaining = n;
  let cur = 0;
  let sinceLastEar = 0;
  while (remaining > 3) {
    const p = prev[cur]!, q = next[cur]!;
    if (isEar(u, v, p, cur, q, next, eps)) {
      tris.push(p, cur, q);
      next[p] = q;
      prev[q] = p;
      remaining--;
      sinceLastEar = 0;
      cur = q;
    } else {
      cur = q;
      if (++sinceLastEar > remaining) {
        // No ear in a full pass: self-intersecting or badly non-planar; fan the rest.
        const start = cur;
        let a = next[start]!;
        while (next[a]! !== start) {
          tris.push(start, a, next[a]!);
          a = next[a]!;
        }
        return { triangles: tris, fellBack: true };
      }
    }
  }
  tris.push(prev[cur]!, cur, next[cur]!);
  return { triangles: tris, fellBack: false };
}

function isEar(
  u: Float64Array,
  v: Float64Array,
  p: number,
  c: number,
  q: number,
  next: Int32Array,
  eps: number,
): boolean {
  if (turn(u, v, p, c, q) <= eps) return false; // reflex or straight corner
  // No other remaining corner inside or on the candidate triangle.
  for (let r = next[q]!; r !== p; r = next[r]!) {
    if ((u[r] === u[p] && v[r] === v[p]) || (u[r] === u[q] && v[r] === v[q]) || (u[r] === u[c] && v[r] === v[c])) {
      continue; // a repeated corner (touching polygon); not blocking
    }
    if (turn(u, v, p, c, r) >= -eps && turn(u, v, c, q, r) >= -eps && turn(u, v, q, p, r) >= -eps) return false;
  }
  return true;
}
