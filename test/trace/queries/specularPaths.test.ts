import { describe, it, expect } from 'vitest';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import {
  makeSpecularHits, solarDiscSamples, specularSurfacesFromPatches, traceSpecularPaths, type SpecularSurfaces,
} from '../../../src/trace/queries/specularPaths.ts';
import { reflectDirection, SUN_ANGULAR_DIAMETER_RAD } from '../../../src/physics/fresnel.ts';
import { bruteClosest, directionFromAltAz, MeshBuilder, testRandom } from '../../helpers/bruteTracer.ts';

/** Surfaces from a MeshBuilder whose quads (two triangles each, tag = quad index) are the mirrors. */
function quadSurfaces(m: MeshBuilder, mirrorQuads: number[]): SpecularSurfaces {
  const pos = m.positions(), idx = m.indices();
  const triCount = idx.length / 3;
  const quadCount = triCount / 2;
  const offsets = Uint32Array.from({ length: quadCount + 1 }, (_, k) => 2 * k);
  const centroids = new Float64Array(3 * quadCount), normals = new Float64Array(3 * quadCount);
  for (let q = 0; q < quadCount; q++) {
    const v = [idx[6 * q]!, idx[6 * q + 1]!, idx[6 * q + 2]!, idx[6 * q + 5]!];
    for (let c = 0; c < 3; c++) centroids[3 * q + c] = v.reduce((s, k) => s + pos[3 * k + c]!, 0) / 4;
    const a = v[0]! * 3, b = v[1]! * 3, d = v[3]! * 3;
    const e1 = [pos[b]! - pos[a]!, pos[b + 1]! - pos[a + 1]!, pos[b + 2]! - pos[a + 2]!];
    const e2 = [pos[d]! - pos[a]!, pos[d + 1]! - pos[a + 1]!, pos[d + 2]! - pos[a + 2]!];
    const n = [e1[1]! * e2[2]! - e1[2]! * e2[1]!, e1[2]! * e2[0]! - e1[0]! * e2[2]!, e1[0]! * e2[1]! - e1[1]! * e2[0]!];
    const l = Math.hypot(n[0]!, n[1]!, n[2]!);
    for (let c = 0; c < 3; c++) normals[3 * q + c] = n[c]! / l;
  }
  return specularSurfacesFromPatches(pos, idx, offsets, centroids, normals, mirrorQuads);
}

describe('traceSpecularPaths', () => {
  // A 1 m × 1 m vertical mirror in the plane x = 0 facing +x (east), centred at (0, 0, 10).
  const mirror = (): MeshBuilder => {
    const m = new MeshBuilder();
    m.quad([0, -0.5, 9.5], [0, 0.5, 9.5], [0, 0.5, 10.5], [0, -0.5, 10.5], 0);
    return m;
  };
  // Sun at altitude 35°, azimuth 120° (east-south-east): in front of the mirror.
  const sun = directionFromAltAz(35, 120);
  // Ground receivers every 0.1 m around the expected landing point.
  const grid = (x0: number, y0: number, n: number, step: number, z = 0) => {
    const pts = new Float64Array(3 * n * n);
    for (let j = 0; j < n; j++) for (let i = 0; i < n; i++) pts.set([x0 + (i + 0.5) * step, y0 + (j + 0.5) * step, z], 3 * (j * n + i));
    return pts;
  };

  it('the reflected sun off a known plane lands where the law of reflection puts it, with the mirror\'s projected area', () => {
    // source: law of reflection (Hecht 2017, sec. 4.3): off the plane x = 0 (n = +x) the reflected
    // beam is r = (s_x, −s_y, −s_z); from the mirror's centre (0, 0, 10) it meets z = 0 at
    // t = 10 / s_z, i.e. (10·s_x/s_z, −10·s_y/s_z). The lit footprint is the mirror projected along r
    // onto the ground: area A·|n·r| / |r_z| (closed form, common practice).
    const r = reflectDirection(sun[0], sun[1], sun[2], 1, 0, 0, new Float64Array(3));
    expect(r[0]).toBeCloseTo(sun[0], 12);
    expect(r[1]).toBeCloseTo(-sun[1], 12);
    expect(r[2]).toBeCloseTo(-sun[2], 12);
    const landX = (10 * sun[0]) / sun[2], landY = (-10 * sun[1]) / sun[2];
    const m = mirror();
    const bvh = buildBvh(m.positions(), m.indices());
    const S = quadSurfaces(m, [0]);
    const step = 0.05, n = 100;
    const pts = grid(landX - 2.5, landY - 2.5, n, step);
    const hits = makeSpecularHits();
    const count = traceSpecularPaths(bvh, { surfaces: S, points: pts, sunDirection: sun }, hits);
    expect(count).toBeGreaterThan(100);
    let w = 0, cx = 0, cy = 0;
    for (let h = 0; h < count; h++) {
      const f = hits.discFraction[h]!, i = hits.receiver[h]!;
      w += f;
      cx += f * pts[3 * i]!;
      cy += f * pts[3 * i + 1]!;
      // The image is seen on the mirror.
      expect(Math.abs(hits.point[3 * h]!)).toBeLessThan(1e-9);
      expect(Math.abs(hits.point[3 * h + 1]!)).toBeLessThanOrEqual(0.5 + 1e-9);
    }
    cx /= w;
    cy /= w;
    expect(Math.abs(cx - landX)).toBeLessThan(0.03); // tolerance: half a 0.05 m receiver cell plus disc blur
    expect(Math.abs(cy - landY)).toBeLessThan(0.03);
    const area = w * step * step;
    const expectedArea = (1 * Math.abs(r[0]!)) / Math.abs(r[2]!);
    expect(Math.abs(area / expectedArea - 1)).toBeLessThan(0.03); // tolerance 3 %: receiver grid discretisation
    // Full images well inside the footprint, partial ones only near its edge.
    let full = 0, partial = 0;
    for (let h = 0; h < count; h++) (hits.discFraction[h]! === 1 ? full++ : partial++);
    expect(full).toBeGreaterThan(partial);
    expect(partial).toBeGreaterThan(0);
  });

  it('a receiver at the footprint edge sees about half the solar disc; the penumbra width is t·ω/cos θ', () => {
    // source: geometry (common practice): the image of a disc of angular diameter ω = 9.3 mrad
    // (REFERENCE-VALUES §11) straddles the mirror's edge over a width of about t·ω on the mirror
    // (plane perpendicular to the line of sight at distance t) — here the mirror's top edge, seen
    // along the line of sight. A receiver whose centre line of sight meets the edge sees half.
    const m = mirror();
    const bvh = buildBvh(m.positions(), m.indices());
    const S = quadSurfaces(m, [0]);
    // Line of sight from X along d = s − 2(n·s)n hits x = 0 at height 10.5 (top edge), y = 0.
    const d = [-sun[0], sun[1], sun[2]];
    const t = 20;
    const X = [0 - t * d[0]!, 0 - t * d[1]!, 10.5 - t * d[2]!];
    const hits = makeSpecularHits();
    traceSpecularPaths(bvh, { surfaces: S, points: Float64Array.from(X), sunDirection: sun, discSamples: solarDiscSamples(16) }, hits);
    expect(hits.count).toBe(1);
    expect(Math.abs(hits.discFraction[0]! - 0.5)).toBeLessThan(0.06); // tolerance: 256 disc samples
    // Moved by three image radii stretched by 1/cos θi (an upper bound of the image's extent on the
    // plane), the receiver sees none of it above the edge and all of it below.
    const shift = (3 * t * (SUN_ANGULAR_DIAMETER_RAD / 2)) / sun[0];
    for (const [dz, want] of [[-shift, 0], [shift, 1]] as const) {
      // Moving X by −dz moves the hit on the vertical mirror by −dz too (parallel lines of sight).
      traceSpecularPaths(bvh, { surfaces: S, points: Float64Array.of(X[0]!, X[1]!, X[2]! - dz), sunDirection: sun }, hits);
      if (want === 0) expect(hits.count).toBe(0);
      else expect(hits.discFraction[0]).toBe(1);
    }
  });

  it('no path when the sun is behind the mirror, the receiver is behind it, the mirror is unlit, or the path is blocked', () => {
    const m = mirror();
    const S = quadSurfaces(m, [0]);
    const landX = (10 * sun[0]) / sun[2], landY = (-10 * sun[1]) / sun[2];
    const pt = Float64Array.of(landX, landY, 0);
    const hits = makeSpecularHits();
    const bvh = buildBvh(m.positions(), m.indices());
    expect(traceSpecularPaths(bvh, { surfaces: S, points: pt, sunDirection: sun }, hits)).toBe(1);
    expect(hits.discFraction[0]).toBe(1);
    expect(traceSpecularPaths(bvh, { surfaces: S, points: pt, sunDirection: directionFromAltAz(35, 300) }, hits)).toBe(0);
    expect(traceSpecularPaths(bvh, { surfaces: S, points: Float64Array.of(-landX, landY, 0), sunDirection: sun }, hits)).toBe(0);
    expect(traceSpecularPaths(bvh, { surfaces: S, points: pt, sunDirection: sun, surfaceLit: Uint8Array.of(0) }, hits)).toBe(0);
    // A wall across the path halfway (x = landX / 2, tall and wide).
    const blocked = mirror();
    blocked.quad([landX / 2, -50, -1], [landX / 2, 50, -1], [landX / 2, 50, 30], [landX / 2, -50, 30], 1);
    const bvh2 = buildBvh(blocked.positions(), blocked.indices());
    expect(traceSpecularPaths(bvh2, { surfaces: quadSurfaces(blocked, [0]), points: pt, sunDirection: sun }, hits)).toBe(0);
    // The ground plane blocks a path from below it (the same receiver sees the image without it).
    expect(traceSpecularPaths(bvh, { surfaces: S, points: Float64Array.of(landX * 1.5, landY * 1.5, -5), sunDirection: sun }, hits)).toBe(1);
    expect(traceSpecularPaths(bvh, { surfaces: S, points: Float64Array.of(landX * 1.5, landY * 1.5, -5), sunDirection: sun, ground: { z: 0 } }, hits)).toBe(0);
  });

  it('matches a brute-force oracle on seeded random scenes (centre ray only)', () => {
    // Oracle (STYLE §9): with one disc sample (the sun's centre), receiver X sees mirror j exactly
    // when X is in front of j and the first triangle hit along d_j = s − 2(n_j·s)n_j is one of j's.
    const rnd = testRandom(7);
    for (let scene = 0; scene < 4; scene++) {
      const m = new MeshBuilder();
      const mirrors: number[] = [];
      for (let q = 0; q < 8; q++) {
        // A 2 m × 2 m quad at a random place with a random orientation.
        const c = [rnd() * 30 - 15, rnd() * 30 - 15, 2 + rnd() * 10];
        const az = rnd() * 2 * Math.PI, tilt = rnd() * Math.PI * 0.9;
        const n = [Math.sin(tilt) * Math.sin(az), Math.sin(tilt) * Math.cos(az), Math.cos(tilt)];
        const u0 = Math.abs(n[2]!) < 0.9 ? [-n[1]!, n[0]!, 0] : [1, 0, 0];
        const ul = Math.hypot(u0[0]!, u0[1]!, u0[2]!);
        const u = u0.map((x) => x / ul);
        const v = [n[1]! * u[2]! - n[2]! * u[1]!, n[2]! * u[0]! - n[0]! * u[2]!, n[0]! * u[1]! - n[1]! * u[0]!];
        const corner = (a: number, b: number) => [0, 1, 2].map((k) => c[k]! + a * u[k]! + b * v[k]!);
        m.quad(corner(-1, -1), corner(1, -1), corner(1, 1), corner(-1, 1), q);
        mirrors.push(q);
      }
      for (let b = 0; b < 5; b++) {
        const x = rnd() * 30 - 15, y = rnd() * 30 - 15;
        m.box(x, y, 0, x + 1 + rnd() * 3, y + 1 + rnd() * 3, 1 + rnd() * 8, 100 + b);
      }
      const pos = m.positions(), idx = m.indices();
      const bvh = buildBvh(pos, idx);
      const S = quadSurfaces(m, mirrors);
      const s = directionFromAltAz(10 + rnd() * 70, rnd() * 360);
      const R = 3000;
      const pts = new Float64Array(3 * R);
      for (let i = 0; i < 3 * R; i += 3) pts.set([rnd() * 60 - 30, rnd() * 60 - 30, 0.5 + rnd() * 12], i);
      const hits = makeSpecularHits();
      traceSpecularPaths(bvh, { surfaces: S, points: pts, sunDirection: s, discSamples: solarDiscSamples(1) }, hits);
      const got = new Set<string>();
      for (let h = 0; h < hits.count; h++) got.add(`${hits.receiver[h]},${hits.surface[h]}`);
      const want = new Set<string>();
      for (let j = 0; j < S.count; j++) {
        const n = [S.normals[3 * j]!, S.normals[3 * j + 1]!, S.normals[3 * j + 2]!];
        const ns = n[0]! * s[0] + n[1]! * s[1] + n[2]! * s[2];
        if (ns <= 0) continue;
        const d = [s[0] - 2 * ns * n[0]!, s[1] - 2 * ns * n[1]!, s[2] - 2 * ns * n[2]!];
        for (let i = 0; i < R; i++) {
          const X = [pts[3 * i]!, pts[3 * i + 1]!, pts[3 * i + 2]!];
          const front = (X[0]! - S.centroids[3 * j]!) * n[0]! + (X[1]! - S.centroids[3 * j + 1]!) * n[1]! + (X[2]! - S.centroids[3 * j + 2]!) * n[2]!;
          if (front <= 0) continue;
          const hit = bruteClosest(pos, idx, X[0]!, X[1]!, X[2]!, d[0]!, d[1]!, d[2]!, 1e-3, Infinity);
          if (hit.triangle >= 0 && m.tags[hit.triangle] === mirrors[j]) want.add(`${i},${j}`);
        }
      }
      expect(want.size).toBeGreaterThan(0);
      const diff = [...want].filter((k) => !got.has(k)).length + [...got].filter((k) => !want.has(k)).length;
      expect(diff).toBeLessThanOrEqual(1); // tolerance: a ray grazing a shared edge may go either way
    }
  });

  it('disc samples are spread evenly over the disc: mean offset zero, second moment of a uniform disc', () => {
    // source: a uniform disc of radius a has E[x] = 0 and E[x² + y²] = a²/2 (closed form).
    const a = SUN_ANGULAR_DIAMETER_RAD / 2;
    const d = solarDiscSamples(8);
    expect(d.length).toBe(128);
    let mx = 0, my = 0, m2 = 0;
    for (let k = 0; k < 64; k++) {
      mx += d[2 * k]!; my += d[2 * k + 1]!; m2 += d[2 * k]! ** 2 + d[2 * k + 1]! ** 2;
      expect(Math.hypot(d[2 * k]!, d[2 * k + 1]!)).toBeLessThanOrEqual(a * (1 + 1e-12));
    }
    expect(Math.abs(mx / 64)).toBeLessThan(1e-12);
    expect(Math.abs(my / 64)).toBeLessThan(1e-12);
    // tolerance: the midpoint rule on the 8 × 8 grid under-weights the outer ring, by about 2/side² (≈ 3 %)
    expect(Math.abs(m2 / 64 / (a * a / 2) - 1)).toBeLessThan(2.5 / 64);
    expect(SUN_ANGULAR_DIAMETER_RAD * 1000).toBeCloseTo(9.30, 2); // source: REFERENCE-VALUES §11 (IAU radius, 1 au)
  });
});
