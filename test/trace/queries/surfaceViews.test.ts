import { describe, it, expect } from 'vitest';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import { surfaceViews, SIX_DIRECTION_NAMES, type SurfaceViewsResult } from '../../../src/trace/queries/surfaceViews.ts';
import { skyVisibility } from '../../../src/trace/queries/skyVisibility.ts';
import { MeshBuilder, testRandom } from '../../helpers/bruteTracer.ts';
import { canyon } from './canyon.ts';

function rowPatchFraction(r: SurfaceViewsResult, row: number, patch: number): number {
  for (let j = r.rowStart[row]!; j < r.rowStart[row + 1]!; j++) if (r.patchIndex[j] === patch) return r.fraction[j]!;
  return 0;
}

function rowSum(r: SurfaceViewsResult, row: number): number {
  let s = r.skyFraction[row]! + r.groundFraction[row]! + r.otherFraction[row]!;
  for (let j = r.rowStart[row]!; j < r.rowStart[row + 1]!; j++) s += r.fraction[j]!;
  return s;
}

describe('surfaceViews', () => {
  it('a point sees a parallel coaxial disc with R²/(R² + h²)', () => {
    // source: standard configuration factor, differential element to a coaxial parallel disc
    // (REFERENCE-VALUES §9.2): R = h → 0.5, R = 2h → 0.8. Disc as a 256-gon (area 1e-4 short).
    const h = 2;
    for (const [R, expected] of [[2, 0.5], [4, 0.8], [1, 0.2]] as const) {
      expect(R * R / (R * R + h * h)).toBeCloseTo(expected, 12);
      const m = new MeshBuilder();
      m.disc(0, 0, h, R, 256, 0);
      const bvh = buildBvh(m.positions(), m.indices());
      const normal = surfaceViews(bvh, { points: Float32Array.of(0, 0, 0), normals: Float32Array.of(0, 0, 1), trianglePatch: m.trianglePatch(), patchCount: 1 });
      expect(Math.abs(rowPatchFraction(normal, 0, 0) - expected)).toBeLessThan(0.01);
      expect(Math.abs(normal.skyFraction[0]! - (1 - expected))).toBeLessThan(0.01);
      // the same through the sensor mode's "up" direction
      const six = surfaceViews(bvh, { points: Float32Array.of(0, 0, 0), trianglePatch: m.trianglePatch(), patchCount: 1 });
      expect(six.directionsPerReceiver).toBe(6);
      expect(Math.abs(rowPatchFraction(six, 0, 0) - expected)).toBeLessThan(0.01);
      expect(rowPatchFraction(six, 1, 0)).toBe(0); // "down" cannot see it
    }
  });

  it('six directions in an open field: up all sky, down all ground, sideways half and half', () => {
    // source: analytic (common practice): a vertical plane over level ground sees 1/2 sky, 1/2 ground
    const m = new MeshBuilder();
    m.box(500, 500, 0, 501, 501, 1);
    const bvh = buildBvh(m.positions(), m.indices());
    const r = surfaceViews(bvh, { points: Float32Array.of(0, 0, 1.1), trianglePatch: m.trianglePatch(), patchCount: 0, ground: { z: 0 } });
    expect(SIX_DIRECTION_NAMES).toEqual(['up', 'down', 'east', 'south', 'west', 'north']);
    expect(r.skyFraction[0]).toBe(1);
    expect(r.groundFraction[1]).toBe(1);
    for (let d = 2; d < 6; d++) {
      expect(Math.abs(r.skyFraction[d]! - 0.5)).toBeLessThan(0.01);
      expect(Math.abs(r.groundFraction[d]! - 0.5)).toBeLessThan(0.01);
    }
  });

  it('view fractions sum to 1 per receiver (sky + ground + other + patches) on a random scene', () => {
    const rnd = testRandom(777);
    const m = new MeshBuilder();
    let tag = 0;
    for (let b = 0; b < 25; b++) {
      const x = rnd() * 40, y = rnd() * 40, w = 2 + rnd() * 6, h = 3 + rnd() * 15;
      m.box(x, y, 0, x + w, y + w, h, b % 5 === 4 ? -1 : tag++); // every fifth box is no patch
    }
    const bvh = buildBvh(m.positions(), m.indices());
    const R = 30;
    const pts = new Float32Array(R * 3);
    const nrm = new Float32Array(R * 3);
    for (let i = 0; i < R; i++) {
      pts.set([rnd() * 45, rnd() * 45, 0.5 + rnd() * 3], i * 3);
      const a = rnd() * 2 * Math.PI, c = rnd() * 2 - 1, s = Math.sqrt(1 - c * c);
      nrm.set([s * Math.cos(a), s * Math.sin(a), c], i * 3);
    }
    for (const directions of ['normal', 'six'] as const) {
      const r = surfaceViews(bvh, { points: pts, normals: nrm, directions, trianglePatch: m.trianglePatch(), patchCount: tag, ground: { z: 0 }, samplesPerDirection: 256 });
      const rows = R * r.directionsPerReceiver;
      let seesPatches = 0, seesOther = 0;
      for (let row = 0; row < rows; row++) {
        expect(Math.abs(rowSum(r, row) - 1)).toBeLessThan(1e-5);
        for (let j = r.rowStart[row]! + 1; j < r.rowStart[row + 1]!; j++) expect(r.patchIndex[j]!).toBeGreaterThan(r.patchIndex[j - 1]!);
        if (r.rowStart[row + 1]! > r.rowStart[row]!) seesPatches++;
        if (r.otherFraction[row]! > 0) seesOther++;
      }
      expect(seesPatches).toBeGreaterThan(rows / 4);
      expect(seesOther).toBeGreaterThan(0);
      // chunked rows equal the full run
      const part = surfaceViews(bvh, { points: pts, normals: nrm, directions, trianglePatch: m.trianglePatch(), patchCount: tag, ground: { z: 0 }, samplesPerDirection: 256 }, 7, 19);
      const D = r.directionsPerReceiver;
      const off = r.rowStart[7 * D]!;
      expect(Array.from(part.patchIndex)).toEqual(Array.from(r.patchIndex.subarray(off, r.rowStart[19 * D])));
      expect(Array.from(part.rowStart)).toEqual(Array.from(r.rowStart.subarray(7 * D, 19 * D + 1)).map((x) => x - off));
      expect(Array.from(part.skyFraction)).toEqual(Array.from(r.skyFraction.subarray(7 * D, 19 * D)));
    }
  });

  it('canyon: the sky fraction agrees with skyVisibility and the closed form; each wall gets (1 − ψ)/2', () => {
    // source: REFERENCE-VALUES §9.1 (floor centre ψ_s = cos(atan(2H/W))); by symmetry each wall
    // takes half of the rest. Consistency tolerance 0.01 (independent samples in both queries).
    for (const hw of [0.5, 1, 2]) {
      const { bvh, mesh, W } = canyon(hw);
      const psi = Math.cos(Math.atan(2 * hw));
      const R = 6;
      const pts = new Float32Array(R * 3);
      for (let i = 0; i < R; i++) pts[i * 3 + 1] = (i - 3) * W * 0.3;
      const v = surfaceViews(bvh, { points: pts, trianglePatch: mesh.trianglePatch(), patchCount: 2, ground: { z: 0 } });
      const s = skyVisibility(bvh, { points: pts, ground: { z: 0 } });
      for (let i = 0; i < R; i++) {
        const up = i * 6;
        expect(Math.abs(v.skyFraction[up]! - psi)).toBeLessThan(0.01);
        expect(Math.abs(v.skyFraction[up]! - s.skyViewFactor[i]!)).toBeLessThan(0.01);
        expect(Math.abs(rowPatchFraction(v, up, 0) - (1 - psi) / 2)).toBeLessThan(0.01);
        expect(Math.abs(rowPatchFraction(v, up, 1) - (1 - psi) / 2)).toBeLessThan(0.01);
        expect(v.groundFraction[up]).toBe(0);
      }
    }
  });

  it('a tilted wall receiver: sky and ground fractions agree with skyVisibility', () => {
    const { bvh, mesh, W, H } = canyon(1);
    const R = 8;
    const pts = new Float32Array(R * 3);
    const nrm = new Float32Array(R * 3);
    for (let i = 0; i < R; i++) {
      pts.set([-W / 2, i - 4, ((i + 0.5) / R) * H], i * 3);
      nrm.set([1, 0, 0], i * 3);
    }
    const v = surfaceViews(bvh, { points: pts, normals: nrm, trianglePatch: mesh.trianglePatch(), patchCount: 2, ground: { z: 0 } });
    const s = skyVisibility(bvh, { points: pts, normals: nrm, ground: { z: 0 } });
    for (let i = 0; i < R; i++) {
      expect(Math.abs(v.skyFraction[i]! - s.skyViewFactor[i]!)).toBeLessThan(0.012);
      expect(Math.abs(v.groundFraction[i]! - s.groundViewFactor[i]!)).toBeLessThan(0.012);
      expect(rowPatchFraction(v, i, 0)).toBe(0); // a flat wall never sees itself
    }
  });

  it('batchRays: a paving quad on the ground plane is counted as on the per-ray path (hits at the plane are re-traced)', () => {
    // A patch lying exactly on the plane z = 0: every downward ray meets it at t = tG up to rounding,
    // the case where the batch path's float32 hit distance cannot decide and re-traces per ray.
    const m = new MeshBuilder();
    m.quad([-50, -50, 0], [50, -50, 0], [50, 50, 0], [-50, 50, 0], 0);
    m.box(5, -3, 0, 9, 3, 6, 1);
    const bvh = buildBvh(m.positions(), m.indices());
    const R = 8;
    const pts = new Float32Array(R * 3);
    for (let i = 0; i < R; i++) pts.set([i * 0.7 - 2, i * 0.3 - 1, 0.3 + 0.2 * i], i * 3);
    const input = { points: pts, trianglePatch: m.trianglePatch(), patchCount: 2, ground: { z: 0 }, samplesPerDirection: 256 };
    const ref = surfaceViews(bvh, input);
    const bat = surfaceViews(bvh, { ...input, batchRays: true });
    let onPaving = 0;
    for (let i = 0; i < R; i++) {
      const down = i * 6 + 1;
      expect(rowPatchFraction(bat, down, 0)).toBe(rowPatchFraction(ref, down, 0));
      expect(bat.groundFraction[down]).toBe(ref.groundFraction[down]);
      onPaving += rowPatchFraction(bat, down, 0);
    }
    expect(onPaving).toBeGreaterThan(0); // some downward rays do land on the paving
    for (let row = 0; row < R * 6; row++) {
      expect(Math.abs(rowSum(bat, row) - 1)).toBeLessThan(1e-5);
      expect(Math.abs(bat.skyFraction[row]! - ref.skyFraction[row]!)).toBeLessThan(2 / 256); // float32 rays: a grazing ray may flip
      expect(Math.abs(rowPatchFraction(bat, row, 1) - rowPatchFraction(ref, row, 1))).toBeLessThan(2 / 256);
    }
    expect(rowPatchFraction(bat, 2, 1)).toBeGreaterThan(0.05); // the east-facing view of receiver 0 sees the box
  });

  it('batchRays: fractions close to the per-ray path on a random scene, rows sum to 1, range-independent', () => {
    const rnd = testRandom(778);
    const m = new MeshBuilder();
    let tag = 0;
    for (let b = 0; b < 25; b++) {
      const x = rnd() * 40, y = rnd() * 40, w = 2 + rnd() * 6, h = 3 + rnd() * 15;
      m.box(x, y, 0, x + w, y + w, h, b % 5 === 4 ? -1 : tag++);
    }
    const bvh = buildBvh(m.positions(), m.indices());
    const R = 24;
    const pts = new Float64Array(R * 3), nrm = new Float64Array(R * 3);
    for (let i = 0; i < R; i++) {
      pts.set([rnd() * 45, rnd() * 45, 0.5 + rnd() * 3], i * 3);
      const a = rnd() * 2 * Math.PI, c = rnd() * 2 - 1, q = Math.sqrt(1 - c * c);
      nrm.set([q * Math.cos(a), q * Math.sin(a), c], i * 3);
    }
    for (const directions of ['normal', 'six'] as const) {
      for (const ground of [{ z: 0 }, null]) {
        const input = { points: pts, normals: nrm, directions, trianglePatch: m.trianglePatch(), patchCount: tag, ground, samplesPerDirection: 256 };
        const ref = surfaceViews(bvh, input);
        const bat = surfaceViews(bvh, { ...input, batchRays: true });
        const rows = R * bat.directionsPerReceiver;
        let seen = 0;
        for (let row = 0; row < rows; row++) {
          expect(Math.abs(rowSum(bat, row) - 1)).toBeLessThan(1e-5);
          expect(Math.abs(bat.skyFraction[row]! - ref.skyFraction[row]!)).toBeLessThan(2 / 256);
          expect(Math.abs(bat.groundFraction[row]! - ref.groundFraction[row]!)).toBeLessThan(2 / 256);
          expect(Math.abs(bat.otherFraction[row]! - ref.otherFraction[row]!)).toBeLessThan(2 / 256);
          for (let p = 0; p < tag; p++) expect(Math.abs(rowPatchFraction(bat, row, p) - rowPatchFraction(ref, row, p))).toBeLessThan(2 / 256);
          seen += bat.rowStart[row + 1]! - bat.rowStart[row]!;
        }
        expect(seen).toBeGreaterThan(rows / 4);
        const part = surfaceViews(bvh, { ...input, batchRays: true }, 5, 17);
        const D = bat.directionsPerReceiver;
        const off = bat.rowStart[5 * D]!;
        expect(Array.from(part.patchIndex)).toEqual(Array.from(bat.patchIndex.subarray(off, bat.rowStart[17 * D])));
        expect(Array.from(part.fraction)).toEqual(Array.from(bat.fraction.subarray(off, bat.rowStart[17 * D])));
        expect(Array.from(part.groundFraction)).toEqual(Array.from(bat.groundFraction.subarray(5 * D, 17 * D)));
      }
    }
  });

  it('checks its arguments', () => {
    const m = new MeshBuilder();
    m.disc(0, 0, 1, 1, 8, 0);
    const bvh = buildBvh(m.positions(), m.indices());
    expect(() => surfaceViews(bvh, { points: Float32Array.of(0, 0, 0), trianglePatch: new Int32Array(3), patchCount: 1 })).toThrow(/trianglePatch/);
    expect(() => surfaceViews(bvh, { points: Float32Array.of(0, 0, 0), directions: 'normal', trianglePatch: m.trianglePatch(), patchCount: 1 })).toThrow(/normals/);
    expect(() => surfaceViews(bvh, { points: Float32Array.of(0, 0, 0), trianglePatch: m.trianglePatch(), patchCount: 0 })).toThrow(/patch index/);
  });
});
