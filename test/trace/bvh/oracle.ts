/**
 * Test helpers for the BVH oracle: seeded scenes and a brute-force loop over every triangle of the
 * ORIGINAL positions (Möller–Trumbore, double-sided, same float64 arithmetic as the kernel).
 */
export function makeRandom(state: number): () => number {
  let a = state >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export interface Mesh { positions: Float32Array; indices: Uint32Array }

function fromLists(pos: number[], idx: number[]): Mesh {
  return { positions: new Float32Array(pos), indices: new Uint32Array(idx) };
}

/** n random triangles of size up to `sizeM` in a cube of side `sideM`. */
export function randomTriangles(n: number, rnd: () => number, sideM = 10, sizeM = 1.5): Mesh {
  const pos: number[] = [], idx: number[] = [];
  for (let i = 0; i < n; i++) {
    const cx = rnd() * sideM, cy = rnd() * sideM, cz = rnd() * sideM;
    for (let v = 0; v < 3; v++) {
      pos.push(cx + (rnd() - 0.5) * sizeM, cy + (rnd() - 0.5) * sizeM, cz + (rnd() - 0.5) * sizeM);
      idx.push(i * 3 + v);
    }
  }
  return fromLists(pos, idx);
}

/** n random axis-aligned boxes (12 triangles each, shared vertices) on a ground quad. */
export function randomBoxes(n: number, rnd: () => number, sideM = 40): Mesh {
  const pos: number[] = [0, 0, 0, sideM, 0, 0, sideM, sideM, 0, 0, sideM, 0], idx: number[] = [0, 1, 2, 0, 2, 3];
  const quads = [[0, 2, 3, 1], [4, 5, 7, 6], [0, 1, 5, 4], [2, 6, 7, 3], [0, 4, 6, 2], [1, 3, 7, 5]];
  for (let b = 0; b < n; b++) {
    const x = rnd() * sideM, y = rnd() * sideM, w = 0.5 + rnd() * 4, d = 0.5 + rnd() * 4, h = 0.5 + rnd() * 12;
    const base = pos.length / 3;
    for (let k = 0; k < 8; k++) pos.push(k & 1 ? x + w : x, k & 2 ? y + d : y, k & 4 ? h : 0);
    for (const q of quads) idx.push(base + q[0]!, base + q[1]!, base + q[2]!, base + q[0]!, base + q[2]!, base + q[3]!);
  }
  return fromLists(pos, idx);
}

/**
 * Many coplanar triangles (on a few planes, overlapping, some exact duplicates) and degenerate ones
 * (collinear vertices, repeated vertices, a zero-size point triangle).
 */
export function coplanarAndDegenerate(n: number, rnd: () => number): Mesh {
  const pos: number[] = [], idx: number[] = [];
  const tri = (a: number[], b: number[], c: number[]): void => {
    const k = pos.length / 3;
    pos.push(...a, ...b, ...c);
    idx.push(k, k + 1, k + 2);
  };
  for (let i = 0; i < n; i++) {
    const r = rnd();
    const z = [0, 1, 2.5][Math.floor(rnd() * 3)]!;
    const x = rnd() * 8, y = rnd() * 8, s = 0.3 + rnd() * 2;
    if (r < 0.55) tri([x, y, z], [x + s, y, z], [x, y + s, z]); // coplanar on z planes
    else if (r < 0.65) { tri([x, y, z], [x + s, y, z], [x, y + s, z]); tri([x, y, z], [x + s, y, z], [x, y + s, z]); } // exact duplicate
    else if (r < 0.75) tri([x, z, y], [x + s, z, y], [x, z, y + s]); // coplanar on y planes
    else if (r < 0.85) tri([x, y, z], [x + s, y + s, z + s], [x + 2 * s, y + 2 * s, z + 2 * s]); // collinear
    else if (r < 0.95) tri([x, y, z], [x, y, z], [x + s, y, z + s]); // repeated vertex
    else tri([x, y, z], [x, y, z], [x, y, z]); // a point
  }
  return fromLists(pos, idx);
}

const DET_EPS = 1e-14;

/** t of the hit of triangle `tri` (double-sided), or NaN when missed. */
export function triangleT(m: Mesh, tri: number, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number): number {
  const P = m.positions, I = m.indices;
  const a = I[tri * 3]! * 3, b = I[tri * 3 + 1]! * 3, c = I[tri * 3 + 2]! * 3;
  const ax = P[a]!, ay = P[a + 1]!, az = P[a + 2]!;
  const e1x = P[b]! - ax, e1y = P[b + 1]! - ay, e1z = P[b + 2]! - az;
  const e2x = P[c]! - ax, e2y = P[c + 1]! - ay, e2z = P[c + 2]! - az;
  const px = dy * e2z - dz * e2y, py = dz * e2x - dx * e2z, pz = dx * e2y - dy * e2x;
  const det = e1x * px + e1y * py + e1z * pz;
  if (Math.abs(det) <= DET_EPS) return NaN;
  const inv = 1 / det;
  const tx = ox - ax, ty = oy - ay, tz = oz - az;
  const u = (tx * px + ty * py + tz * pz) * inv;
  if (u < 0 || u > 1) return NaN;
  const qx = ty * e1z - tz * e1y, qy = tz * e1x - tx * e1z, qz = tx * e1y - ty * e1x;
  const v = (dx * qx + dy * qy + dz * qz) * inv;
  if (v < 0 || u + v > 1) return NaN;
  return (e2x * qx + e2y * qy + e2z * qz) * inv;
}

/** Brute force: nearest hit in [tMin, tMax] (lowest index on a tie), skipping `skip[tri] !== 0`. */
export function bruteClosest(
  m: Mesh, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number, skip?: Uint8Array,
): { t: number; triangle: number } {
  let best = Infinity, bestTri = -1;
  const n = m.indices.length / 3;
  for (let i = 0; i < n; i++) {
    if (skip !== undefined && skip[i] !== 0) continue;
    const t = triangleT(m, i, ox, oy, oz, dx, dy, dz);
    if (t >= tMin && t <= tMax && t < best) { best = t; bestTri = i; }
  }
  return { t: best, triangle: bestTri };
}

/** Ray set: random directions (a share axis-parallel, with zero components), origins in a box. */
export function randomRays(count: number, rnd: () => number, lo: number, hi: number): Float32Array {
  const rays = new Float32Array(count * 6);
  for (let i = 0; i < count; i++) {
    let dx = rnd() - 0.5, dy = rnd() - 0.5, dz = rnd() - 0.5;
    const kind = rnd();
    if (kind < 0.1) { const ax = Math.floor(rnd() * 3); dx = ax === 0 ? (rnd() < 0.5 ? -1 : 1) : 0; dy = ax === 1 ? (rnd() < 0.5 ? -1 : 1) : 0; dz = ax === 2 ? (rnd() < 0.5 ? -1 : 1) : 0; }
    else if (kind < 0.2) { dz = 0; } // horizontal: one zero component
    else if (kind < 0.25) { dz = -0; dy = 0; dx = dx < 0 ? -1 : 1; } // signed zeros
    const L = Math.hypot(dx, dy, dz);
    const o = i * 6;
    rays[o] = lo + rnd() * (hi - lo); rays[o + 1] = lo + rnd() * (hi - lo); rays[o + 2] = lo + rnd() * (hi - lo);
    rays[o + 3] = dx / L; rays[o + 4] = dy / L; rays[o + 5] = dz / L;
  }
  return rays;
}
