import { describe, it, expect } from 'vitest';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import { skyVisibility, DEFAULT_SKY_SAMPLES_PER_PATCH } from '../../../src/trace/queries/skyVisibility.ts';
import { skySubdivision } from '../../../src/physics/skySubdivision.ts';
import { MeshBuilder } from '../../helpers/bruteTracer.ts';
import { canyon } from './canyon.ts';

function farBox() {
  const m = new MeshBuilder();
  m.box(1000, 1000, 0, 1001, 1001, 1); // below 0.06° of elevation seen from the origin: blocks ~nothing
  return buildBvh(m.positions(), m.indices());
}

describe('skyVisibility', () => {
  it('an open field: P_k is the horizontal projected solid angle, sky view factor 1, ground 0', () => {
    // source: analytic; Σ ∫ sin(alt) dω over the sky = π (common practice)
    const bvh = farBox();
    const r = skyVisibility(bvh, { points: Float32Array.of(0, 0, 1.1, 5, -3, 0), ground: { z: 0 } });
    const sky = skySubdivision(1);
    expect(r.patchCount).toBe(145);
    for (let k = 0; k < sky.count; k++) {
      expect(r.patchProjectedSr[k]).toBeCloseTo(sky.horizontalProjectedSr[k]!, 6);
      expect(r.patchProjectedSr[145 + k]).toBeCloseTo(sky.horizontalProjectedSr[k]!, 6);
    }
    expect(Math.abs(r.skyViewFactor[0]! - 1)).toBeLessThan(1e-6);
    expect(r.groundViewFactor[0]).toBe(0);
  });

  it('an unobstructed tilted plane sees (1 + cos β)/2 sky and (1 − cos β)/2 ground', () => {
    // source: the isotropic tilt factors (1 ± cos β)/2 (common practice, e.g. Liu & Jordan 1963)
    const bvh = farBox();
    const betas = [30, 60, 90, 120, 150];
    const pts = new Float32Array(betas.length * 3).fill(2);
    const normals = new Float32Array(betas.length * 3);
    betas.forEach((b, i) => {
      const r = (b * Math.PI) / 180, az = (200 * Math.PI) / 180;
      normals.set([Math.sin(r) * Math.sin(az), Math.sin(r) * Math.cos(az), Math.cos(r)], i * 3);
    });
    const r = skyVisibility(bvh, { points: pts, normals, ground: { z: 0 } });
    betas.forEach((b, i) => {
      const c = Math.cos((b * Math.PI) / 180);
      // tolerance: patches whose few samples all fall behind the plane are dropped (a sliver each)
      expect(Math.abs(r.skyViewFactor[i]! - (1 + c) / 2)).toBeLessThan(2e-3);
      expect(Math.abs(r.groundViewFactor[i]! - (1 - c) / 2)).toBeLessThan(1e-6);
    });
  });

  it('sky view factor at the floor centre of a long canyon is cos(atan(2H/W)) within ±0.01 (default samples)', () => {
    // source: Oke 1987 / Johnson & Watson 1984, REFERENCE-VALUES §9.1 (floor centre ψ_s = cos(atan(2H/W)));
    // long canyon L/W = 40 approximates the infinite one. 60 receivers along the axis per H/W
    // measure the spread of the sampling error with the default 25 samples per patch.
    expect(DEFAULT_SKY_SAMPLES_PER_PATCH).toBe(25);
    const table: Record<string, number> = { '0.5': 0.7071, '1': 0.4472, '2': 0.2425 };
    for (const hw of [0.5, 1, 2]) {
      const { bvh, W } = canyon(hw);
      const R = 60;
      const pts = new Float32Array(R * 3);
      for (let i = 0; i < R; i++) pts[i * 3 + 1] = (i / R - 0.5) * 4 * W;
      const r = skyVisibility(bvh, { points: pts, ground: { z: 0 } });
      const exact = Math.cos(Math.atan(2 * hw));
      expect(exact).toBeCloseTo(table[String(hw)]!, 4);
      let ss = 0;
      for (let i = 0; i < R; i++) {
        const e = r.skyViewFactor[i]! - exact;
        expect(Math.abs(e)).toBeLessThan(0.01);
        ss += e * e;
        expect(r.groundViewFactor[i]).toBe(0);
      }
      expect(Math.sqrt(ss / R)).toBeLessThan(0.004);
    }
  });

  it('canyon floor and wall averages match the closed forms (tilted receivers, ground view)', () => {
    // source: REFERENCE-VALUES §9.1 (Masson 2000; Hottel crossed strings): H/W = 1 gives floor
    // average 0.4142 and wall average 0.2929. By the canyon's symmetry a wall sees as much floor
    // (here the ground plane) as sky. Averages over 40 receivers; tolerance 0.01.
    const { bvh, W, H } = canyon(1);
    const R = 40;
    const floor = new Float32Array(R * 3);
    const wall = new Float32Array(R * 3);
    const wallN = new Float32Array(R * 3);
    for (let i = 0; i < R; i++) {
      floor.set([-W / 2 + ((i + 0.5) / R) * W, (i % 7) - 3, 0], i * 3);
      wall.set([-W / 2, (i % 7) - 3, ((i + 0.5) / R) * H], i * 3);
      wallN.set([1, 0, 0], i * 3);
    }
    const f = skyVisibility(bvh, { points: floor, ground: { z: 0 } });
    const w = skyVisibility(bvh, { points: wall, normals: wallN, ground: { z: 0 } });
    const mean = (a: Float32Array) => a.reduce((s, x) => s + x, 0) / a.length;
    expect(Math.abs(mean(f.skyViewFactor) - 0.4142)).toBeLessThan(0.01);
    expect(Math.abs(mean(w.skyViewFactor) - 0.2929)).toBeLessThan(0.01);
    expect(Math.abs(mean(w.groundViewFactor) - 0.2929)).toBeLessThan(0.01);
  });

  it('receiver ranges give byte-identical rows (streams depend on the receiver index only)', () => {
    const { bvh, W } = canyon(1);
    const R = 12;
    const pts = new Float32Array(R * 3);
    const nrm = new Float32Array(R * 3);
    for (let i = 0; i < R; i++) {
      pts.set([(i / R - 0.5) * W, i, 1], i * 3);
      nrm.set(i % 2 ? [0, 0, 1] : [0.6, 0, 0.8], i * 3);
    }
    const input = { points: pts, normals: nrm, ground: { z: 0 }, samplesPerPatch: 4, groundSamples: 16, seed: 99 };
    const all = skyVisibility(bvh, input);
    const a = skyVisibility(bvh, input, 0, 5);
    const b = skyVisibility(bvh, input, 5, 12);
    const K = all.patchCount;
    expect(Array.from(a.patchProjectedSr)).toEqual(Array.from(all.patchProjectedSr.subarray(0, 5 * K)));
    expect(Array.from(b.patchProjectedSr)).toEqual(Array.from(all.patchProjectedSr.subarray(5 * K)));
    expect(Array.from(b.groundViewFactor)).toEqual(Array.from(all.groundViewFactor.subarray(5)));
    // another seed gives other numbers
    const other = skyVisibility(bvh, { ...input, seed: 100 });
    expect(Array.from(other.patchProjectedSr)).not.toEqual(Array.from(all.patchProjectedSr));
  });

  it('batchRays: canyon floor sky view factor within ±0.01 of cos(atan(2H/W)), close to the per-ray path, range-independent', () => {
    // source: Oke 1987 / Johnson & Watson 1984, REFERENCE-VALUES §9.1 (floor centre ψ_s = cos(atan(2H/W))).
    // The batch path rounds rays to float32, so it may differ from the per-ray path by a grazing
    // ray or so: tolerance 1e-3 on the view factors (one flipped ray of 25 in a patch moves P_k by U_k/25).
    const { bvh, W, H } = canyon(1);
    const R = 20;
    const pts = new Float32Array(R * 3), nrm = new Float32Array(R * 3);
    for (let i = 0; i < R; i++) {
      if (i % 2 === 0) { pts.set([0, (i / R - 0.5) * 4 * W, 0], i * 3); nrm.set([0, 0, 1], i * 3); } // floor centre
      else { pts.set([-W / 2, (i / R - 0.5) * 4 * W, ((i + 0.5) / R) * H], i * 3); nrm.set([1, 0, 0], i * 3); } // west wall
    }
    const exact = Math.cos(Math.atan(2));
    for (const ground of [{ z: 0 }, null]) {
      const input = { points: pts, normals: nrm, ground, groundSamples: 64 };
      const ref = skyVisibility(bvh, input);
      const bat = skyVisibility(bvh, { ...input, batchRays: true });
      for (let i = 0; i < R; i++) {
        if (i % 2 === 0) expect(Math.abs(bat.skyViewFactor[i]! - exact)).toBeLessThan(0.01);
        else expect(bat.groundViewFactor[i]!).toBeGreaterThan(0.05); // a wall sees the floor
        expect(Math.abs(bat.skyViewFactor[i]! - ref.skyViewFactor[i]!)).toBeLessThan(1e-3);
        expect(Math.abs(bat.groundViewFactor[i]! - ref.groundViewFactor[i]!)).toBeLessThan(1e-3);
      }
      const part = skyVisibility(bvh, { ...input, batchRays: true }, 7, 16);
      const K = bat.patchCount;
      expect(Array.from(part.patchProjectedSr)).toEqual(Array.from(bat.patchProjectedSr.subarray(7 * K, 16 * K)));
      expect(Array.from(part.groundViewFactor)).toEqual(Array.from(bat.groundViewFactor.subarray(7, 16)));
    }
  });

  it('a point below the ground plane sees no sky', () => {
    const r = skyVisibility(farBox(), { points: Float32Array.of(0, 0, -1), ground: { z: 0 }, samplesPerPatch: 1 });
    expect(r.skyViewFactor[0]).toBe(0);
  });

  it('refuses a sample count that is not a perfect square, naming the argument', () => {
    expect(() => skyVisibility(farBox(), { points: Float32Array.of(0, 0, 1), samplesPerPatch: 10 })).toThrow(/samplesPerPatch/);
  });
});
