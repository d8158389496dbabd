import { describe, it, expect } from 'vitest';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import { sunVisibility } from '../../../src/trace/queries/sunVisibility.ts';
import { bruteOccluded, directionFromAltAz, MeshBuilder, testRandom } from '../../helpers/bruteTracer.ts';

describe('sunVisibility', () => {
  it("a box's shadow on the ground has length h / tan(altitude)", () => {
    // source: geometry (common practice): a vertical edge of height h casts a shadow h / tan(alt)
    // on level ground, along the sun azimuth + 180°.
    const h = 6;
    const m = new MeshBuilder();
    m.box(-2, -2, 0, 2, 2, h); // 4 m × 4 m × 6 m block
    const bvh = buildBvh(m.positions(), m.indices());
    const spacing = 0.05;
    const probes = 400; // 20 m of probes north of the box's north face
    const pts = new Float32Array(probes * 3);
    for (let j = 0; j < probes; j++) {
      pts[j * 3] = 0;
      pts[j * 3 + 1] = 2 + (j + 0.5) * spacing;
      pts[j * 3 + 2] = 0.001;
    }
    for (const altDeg of [20, 35, 50, 70]) {
      const d = directionFromAltAz(altDeg, 180); // sun due south → shadow points north
      const vis = sunVisibility(bvh, { points: pts, sunDirections: Float64Array.from(d), ground: { z: 0 } });
      let last = -1;
      for (let j = 0; j < probes; j++) if (vis[j] === 0) last = j;
      // shaded probes form one run from the wall
      for (let j = 0; j <= last; j++) expect(vis[j]).toBe(0);
      const expected = (h - 0.001) / Math.tan((altDeg * Math.PI) / 180);
      const measured = (last + 1) * spacing; // end of the last shaded probe's cell
      expect(Math.abs(measured - expected)).toBeLessThanOrEqual(spacing);
    }
  });

  it('a point under an overhang is shaded at high sun and lit at low sun', () => {
    // geometry (common practice): south wall at y = 0 up to 4 m, a 1.5 m deep overhang at z = 3 m.
    // Point 0.5 m from the wall at z = 1 m: the overhang edge is 2 m above and 1 m south of it, so the
    // sun due south is blocked when tan(alt) > 2 / 1 (alt > 63.4°) and passes below it otherwise.
    const m = new MeshBuilder();
    m.quad([-10, 0, 0], [10, 0, 0], [10, 0, 4], [-10, 0, 4]); // wall
    m.quad([-10, 0, 3], [10, 0, 3], [10, -1.5, 3], [-10, -1.5, 3]); // overhang
    const bvh = buildBvh(m.positions(), m.indices());
    const pts = Float32Array.of(0, -0.5, 1);
    const lit = (alt: number) =>
      sunVisibility(bvh, { points: pts, sunDirections: Float64Array.from(directionFromAltAz(alt, 180)) })[0];
    expect(lit(75)).toBe(0);
    expect(lit(66)).toBe(0);
    expect(lit(60)).toBe(1);
    expect(lit(15)).toBe(1);
    // sun behind the wall (due north, low): blocked by the wall
    expect(sunVisibility(bvh, { points: pts, sunDirections: Float64Array.from(directionFromAltAz(15, 0)) })[0]).toBe(0);
  });

  it('sun below the horizon, back-facing receivers and points below the ground are not sunlit', () => {
    const m = new MeshBuilder();
    m.box(100, 100, 0, 101, 101, 1); // far away, blocks nothing
    const bvh = buildBvh(m.positions(), m.indices());
    const suns = Float64Array.from([...directionFromAltAz(-2, 90), ...directionFromAltAz(30, 90), ...directionFromAltAz(30, 270)]);
    const pts = Float32Array.of(0, 0, 1, 0, 0, 1, 0, 0, -0.5);
    const normals = Float32Array.of(0, 0, 1, 1, 0, 0, 0, 0, 1);
    const v = sunVisibility(bvh, { points: pts, normals, sunDirections: suns, ground: { z: 0 } });
    expect(Array.from(v)).toEqual([0, 1, 1, /* east-facing */ 0, 1, 0, /* buried */ 0, 0, 0]);
    // without the ground plane the buried point sees the sun
    const v2 = sunVisibility(bvh, { points: pts, normals, sunDirections: suns });
    expect(Array.from(v2.subarray(6))).toEqual([0, 1, 1]);
  });

  it('agrees with a brute-force tracer on a seeded random block scene, any receiver range', () => {
    const rnd = testRandom(12345);
    const m = new MeshBuilder();
    for (let b = 0; b < 40; b++) {
      const x = rnd() * 80, y = rnd() * 80, w = 2 + rnd() * 8, d = 2 + rnd() * 8, h = 3 + rnd() * 30;
      m.box(x, y, 0, x + w, y + d, h);
    }
    const positions = m.positions(), indices = m.indices();
    const bvh = buildBvh(positions, indices);
    const P = 300, S = 7;
    const pts = new Float32Array(P * 3);
    for (let i = 0; i < P; i++) {
      pts[i * 3] = rnd() * 90;
      pts[i * 3 + 1] = rnd() * 90;
      pts[i * 3 + 2] = 0.01 + rnd() * 2;
    }
    const suns = new Float64Array(S * 3);
    for (let s = 0; s < S; s++) suns.set(directionFromAltAz(5 + rnd() * 80, rnd() * 360), s * 3);
    const vis = sunVisibility(bvh, { points: pts, sunDirections: suns });
    let lit = 0;
    for (let i = 0; i < P; i++) {
      for (let s = 0; s < S; s++) {
        const occ = bruteOccluded(positions, indices, pts[i * 3]!, pts[i * 3 + 1]!, pts[i * 3 + 2]!, suns[s * 3]!, suns[s * 3 + 1]!, suns[s * 3 + 2]!, 1e-4, Infinity);
        expect(vis[i * S + s]).toBe(occ ? 0 : 1);
        lit += vis[i * S + s]!;
      }
    }
    expect(lit).toBeGreaterThan(0.2 * P * S); // the scene is neither all lit nor all shaded
    expect(lit).toBeLessThan(0.95 * P * S);
    // a sub-range gives the same rows
    const part = sunVisibility(bvh, { points: pts, sunDirections: suns }, 100, 177);
    expect(Array.from(part)).toEqual(Array.from(vis.subarray(100 * S, 177 * S)));
  });

  it('batchRays: the batch path agrees with the per-ray path on a random block scene, any receiver range', () => {
    // The batch path stores rays in float32: a ray grazing an edge may flip, so allow 0.1 % of rays.
    const rnd = testRandom(4242);
    const m = new MeshBuilder();
    for (let b = 0; b < 40; b++) {
      const x = rnd() * 80, y = rnd() * 80, w = 2 + rnd() * 8, d = 2 + rnd() * 8, h = 3 + rnd() * 30;
      m.box(x, y, 0, x + w, y + d, h);
    }
    const bvh = buildBvh(m.positions(), m.indices());
    const P = 400, S = 30;
    const pts = new Float64Array(P * 3), nrm = new Float64Array(P * 3);
    for (let i = 0; i < P; i++) {
      pts.set([rnd() * 90, rnd() * 90, rnd() * 3 - 0.2], i * 3); // some below the ground plane
      const a = rnd() * 2 * Math.PI, c = rnd() * 2 - 1, q = Math.sqrt(1 - c * c);
      nrm.set([q * Math.cos(a), q * Math.sin(a), c], i * 3);
    }
    const suns = new Float64Array(S * 3);
    for (let s = 0; s < S; s++) suns.set(directionFromAltAz(-10 + rnd() * 95, rnd() * 360), s * 3); // some below the horizon
    for (const normals of [nrm, undefined]) {
      const input = { points: pts, normals, sunDirections: suns, ground: { z: 0 } };
      const ref = sunVisibility(bvh, input);
      const bat = sunVisibility(bvh, { ...input, batchRays: true });
      let flips = 0, lit = 0;
      for (let k = 0; k < ref.length; k++) { if (ref[k] !== bat[k]) flips++; lit += bat[k]!; }
      expect(flips).toBeLessThanOrEqual(Math.ceil(1e-3 * ref.length));
      expect(lit).toBeGreaterThan(0.1 * ref.length);
      expect(lit).toBeLessThan(0.9 * ref.length);
      const part = sunVisibility(bvh, { ...input, batchRays: true }, 123, 311);
      expect(Array.from(part)).toEqual(Array.from(bat.subarray(123 * S, 311 * S)));
    }
  });

  it('names the argument in its errors', () => {
    const bvh = buildBvh(Float32Array.of(0, 0, 0, 1, 0, 0, 0, 1, 0), Uint32Array.of(0, 1, 2));
    expect(() => sunVisibility(bvh, { points: Float32Array.of(0, 0), sunDirections: Float32Array.of(0, 0, 1) })).toThrow(/sunVisibility points/);
    expect(() => sunVisibility(bvh, { points: Float32Array.of(0, 0, 0), sunDirections: Float32Array.of(0, 0, 0) })).toThrow(/sunDirections\[0\]/);
  });
});
