/**
 * Invented city-block massing scenes for the trace benchmark: a ground quad, and on a street grid
 * one building per lot (a box), with floor ledges (thin slabs around the box) and vertical fins
 * (thin boxes standing off the façades). Plus ray sets from points on the surfaces: sun-directed
 * shadow rays and cosine-hemisphere rays, origins offset along the normal by a small epsilon.
 * Everything is deterministic from the `rngState` number passed in.
 */

/** mulberry32: a small 32-bit generator; returns a function giving uniform numbers in [0, 1). */
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

export interface GeneratedScene {
  positions: Float32Array;
  indices: Uint32Array;
  triangleCount: number;
  /** Area [m²] x/y extent of the built area, for the ground sampling. */
  extentM: number;
}

class MeshWriter {
  positions: Float32Array;
  indices: Uint32Array;
  nv = 0;
  nt = 0;
  constructor(maxTris: number) {
    this.positions = new Float32Array(Math.ceil(maxTris * 8 / 12 + 16) * 3);
    this.indices = new Uint32Array(maxTris * 3 + 12);
  }
  /** Axis-aligned box, 8 vertices, 12 outward-wound triangles. */
  box(x0: number, y0: number, z0: number, x1: number, y1: number, z1: number): void {
    const p = this.positions, b = this.nv;
    const xs = [x0, x1], ys = [y0, y1], zs = [z0, z1];
    for (let k = 0; k < 8; k++) {
      const o = (b + k) * 3;
      p[o] = xs[k & 1] as number; p[o + 1] = ys[(k >> 1) & 1] as number; p[o + 2] = zs[(k >> 2) & 1] as number;
    }
    this.nv += 8;
    // vertex k: bit0 x, bit1 y, bit2 z. Faces wound counter-clockwise seen from outside.
    const quads = [
      [0, 2, 3, 1], // z0 (down)
      [4, 5, 7, 6], // z1 (up)
      [0, 1, 5, 4], // y0 (south)
      [2, 6, 7, 3], // y1 (north)
      [0, 4, 6, 2], // x0 (west)
      [1, 3, 7, 5], // x1 (east)
    ];
    for (const q of quads) this.quad(b + (q[0] as number), b + (q[1] as number), b + (q[2] as number), b + (q[3] as number));
  }
  quad(a: number, b: number, c: number, d: number): void {
    const ix = this.indices, o = this.nt * 3;
    ix[o] = a; ix[o + 1] = b; ix[o + 2] = c; ix[o + 3] = a; ix[o + 4] = c; ix[o + 5] = d;
    this.nt += 2;
  }
  vertex(x: number, y: number, z: number): number {
    const o = this.nv * 3;
    this.positions[o] = x; this.positions[o + 1] = y; this.positions[o + 2] = z;
    return this.nv++;
  }
}

const LOT_M = 36;
const STREET_M = 14;

interface BuildingPlan { fx: number; fy: number; w: number; d: number; h: number; floorM: number; finStepM: number; finDepthM: number; ledgeM: number; }

function planBuilding(rnd: () => number, lotX: number, lotY: number): BuildingPlan {
  const w = 12 + rnd() * 18, d = 12 + rnd() * 18;
  const tall = rnd() < 0.15;
  const h = tall ? 40 + rnd() * 80 : 6 + rnd() * 30;
  return {
    fx: lotX + (LOT_M - w) * rnd(), fy: lotY + (LOT_M - d) * rnd(), w, d, h,
    floorM: 3 + rnd() * 1.2, finStepM: 1.2 + rnd() * 2.5, finDepthM: 0.3 + rnd() * 0.6, ledgeM: 0.4 + rnd() * 0.8,
  };
}

function planTriangles(p: BuildingPlan): number {
  const ledges = Math.max(0, Math.floor(p.h / p.floorM) - 1);
  const fins = 2 * (Math.floor(p.w / p.finStepM) + Math.floor(p.d / p.finStepM));
  return 12 * (1 + ledges + fins);
}

function writeBuilding(m: MeshWriter, p: BuildingPlan): void {
  const { fx, fy, w, d, h } = p;
  m.box(fx, fy, 0, fx + w, fy + d, h);
  // ledges: thin slabs sticking out around the box at each floor
  const ledges = Math.max(0, Math.floor(h / p.floorM) - 1);
  for (let k = 1; k <= ledges; k++) {
    const z = k * p.floorM;
    m.box(fx - p.ledgeM, fy - p.ledgeM, z - 0.15, fx + w + p.ledgeM, fy + d + p.ledgeM, z + 0.05);
  }
  // fins: thin vertical boxes standing off the façades (small gap so they do not touch the wall)
  const t = 0.08, gap = 0.05, dep = p.finDepthM;
  const nx = Math.floor(w / p.finStepM), ny = Math.floor(d / p.finStepM);
  for (let k = 0; k < nx; k++) {
    const x = fx + (k + 0.5) * (w / nx);
    m.box(x - t, fy - gap - dep, 0.5, x + t, fy - gap, h - 0.3);
    m.box(x - t, fy + d + gap, 0.5, x + t, fy + d + gap + dep, h - 0.3);
  }
  for (let k = 0; k < ny; k++) {
    const y = fy + (k + 0.5) * (d / ny);
    m.box(fx - gap - dep, y - t, 0.5, fx - gap, y + t, h - 0.3);
    m.box(fx + w + gap, y - t, 0.5, fx + w + gap + dep, y + t, h - 0.3);
  }
}

/** A city-block scene of about `targetTriangles` triangles (never more). */
export function generateCity(targetTriangles: number, rngState: number): GeneratedScene {
  // estimate triangles per building from a separate stream, to size the grid
  const est = makeRandom(rngState ^ 0x5bd1e995);
  let sum = 0;
  for (let i = 0; i < 200; i++) sum += planTriangles(planBuilding(est, 0, 0));
  const perBuilding = sum / 200;
  const lots = Math.max(1, Math.ceil(targetTriangles / perBuilding));
  const side = Math.ceil(Math.sqrt(lots));
  const pitch = LOT_M + STREET_M;
  const extentM = side * pitch;
  const m = new MeshWriter(targetTriangles);
  // ground quad, a margin around the city
  const g0 = -50, g1 = extentM + 50;
  const a = m.vertex(g0, g0, 0), b = m.vertex(g1, g0, 0), c = m.vertex(g1, g1, 0), d = m.vertex(g0, g1, 0);
  m.quad(a, b, c, d);
  const rnd = makeRandom(rngState);
  outer: for (let j = 0; j < side; j++) {
    for (let i = 0; i < side; i++) {
      const plan = planBuilding(rnd, i * pitch, j * pitch);
      if (m.nt + planTriangles(plan) > targetTriangles) break outer;
      writeBuilding(m, plan);
    }
  }
  return {
    positions: m.positions.slice(0, m.nv * 3),
    indices: m.indices.slice(0, m.nt * 3),
    triangleCount: m.nt,
    extentM,
  };
}

/** Sun directions used by the shadow rays (unit, z up): a spread of day-time positions. */
export function sunDirections(): Float64Array {
  const out = new Float64Array(8 * 3);
  for (let k = 0; k < 8; k++) {
    const altDeg = 15 + 50 * Math.sin((Math.PI * (k + 0.5)) / 8);
    const azDeg = 90 + (180 * (k + 0.5)) / 8; // east through south to west
    const alt = (altDeg * Math.PI) / 180, az = (azDeg * Math.PI) / 180;
    out[k * 3] = Math.cos(alt) * Math.sin(az);
    out[k * 3 + 1] = Math.cos(alt) * Math.cos(az);
    out[k * 3 + 2] = Math.sin(alt);
  }
  return out;
}

/**
 * Ray sets from points on the surfaces: 30 % on the ground within the city, 70 % on the other
 * triangles, area-weighted. Origins are offset by `offsetM` along the facing normal.
 * kind "shadow": towards one of `sunDirections()`, only from surfaces facing the sun;
 * kind "hemi": cosine-weighted about the normal.
 */
export function generateRays(scene: GeneratedScene, count: number, kind: 'shadow' | 'hemi', rngState: number, offsetM = 1e-3): Float32Array {
  const { positions: P, indices: I, triangleCount: n } = scene;
  // cumulative area over triangles 2.. (0, 1 are the ground quad)
  const cum = new Float64Array(n);
  let total = 0;
  for (let t = 2; t < n; t++) {
    const a = (I[t * 3] as number) * 3, b = (I[t * 3 + 1] as number) * 3, c = (I[t * 3 + 2] as number) * 3;
    const e1x = (P[b] as number) - (P[a] as number), e1y = (P[b + 1] as number) - (P[a + 1] as number), e1z = (P[b + 2] as number) - (P[a + 2] as number);
    const e2x = (P[c] as number) - (P[a] as number), e2y = (P[c + 1] as number) - (P[a + 1] as number), e2z = (P[c + 2] as number) - (P[a + 2] as number);
    const cx = e1y * e2z - e1z * e2y, cy = e1z * e2x - e1x * e2z, cz = e1x * e2y - e1y * e2x;
    total += 0.5 * Math.hypot(cx, cy, cz);
    cum[t] = total;
  }
  const suns = sunDirections();
  const rnd = makeRandom(rngState);
  const rays = new Float32Array(count * 6);
  let k = 0;
  while (k < count) {
    let px: number, py: number, pz: number, nx: number, ny: number, nz: number;
    if (rnd() < 0.3 || total === 0) {
      px = rnd() * scene.extentM; py = rnd() * scene.extentM; pz = 0; nx = 0; ny = 0; nz = 1;
    } else {
      const target = rnd() * total;
      let lo = 2, hi = n - 1;
      while (lo < hi) { const mid = (lo + hi) >> 1; if ((cum[mid] as number) < target) lo = mid + 1; else hi = mid; }
      const t = lo;
      const a = (I[t * 3] as number) * 3, b = (I[t * 3 + 1] as number) * 3, c = (I[t * 3 + 2] as number) * 3;
      let u = rnd(), v = rnd();
      if (u + v > 1) { u = 1 - u; v = 1 - v; }
      const e1x = (P[b] as number) - (P[a] as number), e1y = (P[b + 1] as number) - (P[a + 1] as number), e1z = (P[b + 2] as number) - (P[a + 2] as number);
      const e2x = (P[c] as number) - (P[a] as number), e2y = (P[c + 1] as number) - (P[a + 1] as number), e2z = (P[c + 2] as number) - (P[a + 2] as number);
      px = (P[a] as number) + u * e1x + v * e2x; py = (P[a + 1] as number) + u * e1y + v * e2y; pz = (P[a + 2] as number) + u * e1z + v * e2z;
      nx = e1y * e2z - e1z * e2y; ny = e1z * e2x - e1x * e2z; nz = e1x * e2y - e1y * e2x;
      const L = Math.hypot(nx, ny, nz);
      if (!(L > 0)) continue;
      nx /= L; ny /= L; nz /= L;
    }
    let dx: number, dy: number, dz: number;
    if (kind === 'shadow') {
      const s = Math.floor(rnd() * 8) * 3;
      dx = suns[s] as number; dy = suns[s + 1] as number; dz = suns[s + 2] as number;
      if (dx * nx + dy * ny + dz * nz <= 0.02) continue; // faces away from the sun: no ray needed
    } else {
      // cosine-weighted (Malley): disc sample lifted to the hemisphere, in a frame about n
      const r = Math.sqrt(rnd()), phi = 2 * Math.PI * rnd();
      const lx = r * Math.cos(phi), ly = r * Math.sin(phi), lz = Math.sqrt(Math.max(0, 1 - r * r));
      // orthonormal basis (Duff et al. 2017)
      const sign = nz >= 0 ? 1 : -1;
      const aa = -1 / (sign + nz), bb = nx * ny * aa;
      const tx = 1 + sign * nx * nx * aa, ty = sign * bb, tz = -sign * nx;
      const bx = bb, by = sign + ny * ny * aa, bz = -ny;
      dx = lx * tx + ly * bx + lz * nx; dy = lx * ty + ly * by + lz * ny; dz = lx * tz + ly * bz + lz * nz;
      const L = Math.hypot(dx, dy, dz);
      dx /= L; dy /= L; dz /= L;
    }
    const o = k * 6;
    rays[o] = px + nx * offsetM; rays[o + 1] = py + ny * offsetM; rays[o + 2] = pz + nz * offsetM;
    rays[o + 3] = dx; rays[o + 4] = dy; rays[o + 5] = dz;
    k++;
  }
  return rays;
}
