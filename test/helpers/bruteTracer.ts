/**
 * Test-only helpers for the ray queries: a tiny mesh builder for closed-form scenes and a
 * brute-force tracer (every triangle, every ray) used as the slow oracle (STYLE §9).
 */

/** Accumulates an indexed triangle mesh with a tag (e.g. a patch id) per triangle. */
export class MeshBuilder {
  readonly pos: number[] = [];
  readonly idx: number[] = [];
  readonly tags: number[] = [];

  vertex(x: number, y: number, z: number): number {
    this.pos.push(x, y, z);
    return this.pos.length / 3 - 1;
  }

  triangle(a: number, b: number, c: number, tag = -1): void {
    this.idx.push(a, b, c);
    this.tags.push(tag);
  }

  /** Quad a-b-c-d (in order around its edge) as two triangles. */
  quad(a: readonly number[], b: readonly number[], c: readonly number[], d: readonly number[], tag = -1): void {
    const ia = this.vertex(a[0]!, a[1]!, a[2]!);
    const ib = this.vertex(b[0]!, b[1]!, b[2]!);
    const ic = this.vertex(c[0]!, c[1]!, c[2]!);
    const id = this.vertex(d[0]!, d[1]!, d[2]!);
    this.triangle(ia, ib, ic, tag);
    this.triangle(ia, ic, id, tag);
  }

  /** Axis-aligned box (six faces). */
  box(x0: number, y0: number, z0: number, x1: number, y1: number, z1: number, tag = -1): void {
    this.quad([x0, y0, z0], [x1, y0, z0], [x1, y1, z0], [x0, y1, z0], tag);
    this.quad([x0, y0, z1], [x1, y0, z1], [x1, y1, z1], [x0, y1, z1], tag);
    this.quad([x0, y0, z0], [x1, y0, z0], [x1, y0, z1], [x0, y0, z1], tag);
    this.quad([x0, y1, z0], [x1, y1, z0], [x1, y1, z1], [x0, y1, z1], tag);
    this.quad([x0, y0, z0], [x0, y1, z0], [x0, y1, z1], [x0, y0, z1], tag);
    this.quad([x1, y0, z0], [x1, y1, z0], [x1, y1, z1], [x1, y0, z1], tag);
  }

  /** Horizontal disc (triangle fan, `segments` triangles) of radius r at height z. */
  disc(cx: number, cy: number, z: number, r: number, segments: number, tag = -1): void {
    const c = this.vertex(cx, cy, z);
    const first = this.pos.length / 3;
    for (let s = 0; s < segments; s++) {
      const a = (2 * Math.PI * s) / segments;
      this.vertex(cx + r * Math.cos(a), cy + r * Math.sin(a), z);
    }
    for (let s = 0; s < segments; s++) this.triangle(c, first + s, first + ((s + 1) % segments), tag);
  }

  positions(): Float32Array {
    return Float32Array.from(this.pos);
  }
  indices(): Uint32Array {
    return Uint32Array.from(this.idx);
  }
  trianglePatch(): Int32Array {
    return Int32Array.from(this.tags);
  }
}

/** Möller–Trumbore, double-sided, float64; returns t or Infinity. */
function rayTriangle(
  p: Float32Array, i: Uint32Array, tri: number,
  ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
): number {
  const a = i[tri * 3]! * 3, b = i[tri * 3 + 1]! * 3, c = i[tri * 3 + 2]! * 3;
  const ax = p[a]!, ay = p[a + 1]!, az = p[a + 2]!;
  const e1x = p[b]! - ax, e1y = p[b + 1]! - ay, e1z = p[b + 2]! - az;
  const e2x = p[c]! - ax, e2y = p[c + 1]! - ay, e2z = p[c + 2]! - az;
  const px = dy * e2z - dz * e2y, py = dz * e2x - dx * e2z, pz = dx * e2y - dy * e2x;
  const det = e1x * px + e1y * py + e1z * pz;
  if (Math.abs(det) < 1e-14) return Infinity;
  const inv = 1 / det;
  const tx = ox - ax, ty = oy - ay, tz = oz - az;
  const u = (tx * px + ty * py + tz * pz) * inv;
  if (u < 0 || u > 1) return Infinity;
  const qx = ty * e1z - tz * e1y, qy = tz * e1x - tx * e1z, qz = tx * e1y - ty * e1x;
  const v = (dx * qx + dy * qy + dz * qz) * inv;
  if (v < 0 || u + v > 1) return Infinity;
  const t = (e2x * qx + e2y * qy + e2z * qz) * inv;
  return t >= tMin && t <= tMax ? t : Infinity;
}

/** Brute-force any-hit over every triangle. */
export function bruteOccluded(
  positions: Float32Array, indices: Uint32Array,
  ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
): boolean {
  const n = indices.length / 3;
  for (let t = 0; t < n; t++) {
    if (rayTriangle(positions, indices, t, ox, oy, oz, dx, dy, dz, tMin, tMax) !== Infinity) return true;
  }
  return false;
}

/** Brute-force closest hit: { t, triangle } (triangle −1 if none). */
export function bruteClosest(
  positions: Float32Array, indices: Uint32Array,
  ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, tMin: number, tMax: number,
): { t: number; triangle: number } {
  const n = indices.length / 3;
  let best = Infinity, tri = -1;
  for (let t = 0; t < n; t++) {
    const h = rayTriangle(positions, indices, t, ox, oy, oz, dx, dy, dz, tMin, Math.min(tMax, best));
    if (h < best) {
      best = h;
      tri = t;
    }
  }
  return { t: best, triangle: tri };
}

/** Unit direction toward altitude/azimuth (clockwise from north) in degrees. */
export function directionFromAltAz(altDeg: number, azDeg: number): [number, number, number] {
  const a = (altDeg * Math.PI) / 180, z = (azDeg * Math.PI) / 180;
  return [Math.cos(a) * Math.sin(z), Math.cos(a) * Math.cos(z), Math.sin(a)];
}

/** Small deterministic generator for building random test scenes (mulberry32). */
export function testRandom(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
