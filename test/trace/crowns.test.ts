import { describe, it, expect } from 'vitest';
import { crownExtinctionForDay, crownTransmittance, crownTransmittanceBatch, ellipsoidChordM } from '../../src/trace/crowns.ts';
import { makeCrownSet } from '../../src/geometry/generators/tree.ts';
import { buildDevices, validateDevices } from '../../src/geometry/devices.ts';
import { buildBvh } from '../../src/trace/bvh/build.ts';
import { isOccludedMasked } from '../../src/trace/bvh/query.ts';
import { crownExtinctionPerM, dayOfYearFromMonthDay } from '../../src/physics/vegetation.ts';

// Deterministic pseudo-random numbers (no Math.random in tests).
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296);
}

describe('ellipsoidChordM against closed forms', () => {
  it('sphere: a line at distance p from the centre has chord 2√(R² − p²)', () => {
    // source: common practice (chord of a circle through a great-circle plane)
    const R = 2.5;
    for (const p of [0, 0.3, 1.2, 2.0, 2.49]) {
      expect(ellipsoidChordM(1, 2, 3, R, R, R, 1 - 10, 2 + p, 3, 1, 0, 0, Infinity)).toBeCloseTo(2 * Math.sqrt(R * R - p * p), 12);
    }
    expect(ellipsoidChordM(1, 2, 3, R, R, R, -9, 2 + 2.51, 3, 1, 0, 0, Infinity)).toBe(0);
  });
  it('ellipsoid: a line through the centre along unit u has chord 2/√(Σ u_i²/r_i²)', () => {
    // source: common practice (radius of an ellipsoid in direction u)
    const rnd = lcg(7);
    for (let k = 0; k < 50; k++) {
      const rx = 0.5 + 3 * rnd(), ry = 0.5 + 3 * rnd(), rz = 0.5 + 3 * rnd();
      let ux = rnd() - 0.5, uy = rnd() - 0.5, uz = rnd() - 0.5;
      const n = Math.hypot(ux, uy, uz); ux /= n; uy /= n; uz /= n;
      const expected = 2 / Math.sqrt((ux / rx) ** 2 + (uy / ry) ** 2 + (uz / rz) ** 2);
      const scale = 0.2 + 5 * rnd(); // direction need not be unit: the answer is in metres
      const got = ellipsoidChordM(3, -1, 4, rx, ry, rz, 3 - 20 * ux, -1 - 20 * uy, 4 - 20 * uz, ux * scale, uy * scale, uz * scale, Infinity);
      expect(got).toBeCloseTo(expected, 10);
    }
  });
  it('ellipsoid: an offset line matches the scaled-sphere closed form', () => {
    // Along x at offsets (y0, z0): chord = 2 rx √(1 − y0²/ry² − z0²/rz²). source: common practice
    const rx = 3, ry = 2, rz = 1.5;
    for (const [y0, z0] of [[0.5, 0.2], [1.5, 0.5], [0, 1.4]] as const) {
      expect(ellipsoidChordM(0, 0, 0, rx, ry, rz, -10, y0, z0, 1, 0, 0, Infinity)).toBeCloseTo(2 * rx * Math.sqrt(1 - (y0 / ry) ** 2 - (z0 / rz) ** 2), 12);
    }
  });
  it('clipping to [0, tMax]: origin inside, ray ending inside, ray pointing away', () => {
    expect(ellipsoidChordM(0, 0, 0, 2, 2, 2, 0, 0, 0, 0, 0, 1, Infinity)).toBeCloseTo(2, 12);
    expect(ellipsoidChordM(0, 0, 0, 2, 2, 2, 0, 0, -5, 0, 0, 1, 4)).toBeCloseTo(1, 12);
    expect(ellipsoidChordM(0, 0, 0, 2, 2, 2, 0, 0, -5, 0, 0, 2, 2.5)).toBeCloseTo(2, 12); // t in units of |d|: ends at z = 0
    expect(ellipsoidChordM(0, 0, 0, 2, 2, 2, 0, 0, 5, 0, 0, 1, Infinity)).toBe(0);
  });
});

describe('crownTransmittance', () => {
  const tau = 0.3, H = 6, R = 2.5;
  const crowns = makeCrownSet([0, 0, 5, R, R, H / 2, 20, 0, 5, R, R, H / 2], [tau, 0.7, 121, 305, 0, tau, 0.7, 121, 305, 0]);
  const k = new Float64Array([crownExtinctionPerM(tau, H), crownExtinctionPerM(tau, H)]);
  it('a vertical ray through a crown centre passes exactly the configured τ', () => {
    // source: vegetation.ts convention (k = −ln τ / crown height), Beer–Lambert
    expect(crownTransmittance(crowns, 0, 0, 0, 0, 0, 1, Infinity, k)).toBeCloseTo(tau, 12);
    expect(crownTransmittance(crowns, 20, 0, 20, 0, 0, -3, Infinity, k)).toBeCloseTo(tau, 12);
  });
  it('an off-centre ray passes τ^(chord/height); rays missing every crown pass 1', () => {
    const p = 1.5;
    const chord = H * Math.sqrt(1 - (p / R) ** 2);
    expect(crownTransmittance(crowns, p, 0, 0, 0, 0, 1, Infinity, k)).toBeCloseTo(tau ** (chord / H), 12);
    expect(crownTransmittance(crowns, 0, 2.6, 0, 0, 0, 1, Infinity, k)).toBe(1);
    expect(crownTransmittance(crowns, 0, 0, 0, 0, 0, 1, 1.9, k)).toBe(1); // stops below the crown (base at z = 2)
    expect(crownTransmittance(crowns, 0, 0, 9, 0, 0, 1, Infinity, k)).toBe(1); // starts above it
  });
  it('a horizontal ray through both crowns multiplies their transmittances', () => {
    const each = Math.exp(-k[0]! * 2 * R);
    expect(crownTransmittance(crowns, -10, 0, 5, 1, 0, 0, Infinity, k)).toBeCloseTo(each * each, 12);
    expect(crownTransmittance(crowns, -10, 0, 5, 1, 0, 0, 20, k)).toBeCloseTo(each, 12);
  });
  it('batch equals scalar', () => {
    const rnd = lcg(3);
    const n = 200;
    const rays = new Float32Array(n * 6);
    for (let i = 0; i < n * 6; i += 6) {
      rays.set([-5 + 30 * rnd(), -5 + 10 * rnd(), 10 * rnd(), rnd() - 0.5, rnd() - 0.5, rnd() - 0.3], i);
    }
    const out = new Float32Array(n);
    crownTransmittanceBatch(crowns, rays, 50, k, out);
    for (let i = 0; i < n; i++) {
      const o = i * 6;
      expect(out[i]).toBeCloseTo(crownTransmittance(crowns, rays[o]!, rays[o + 1]!, rays[o + 2]!, rays[o + 3]!, rays[o + 4]!, rays[o + 5]!, 50, k), 6);
    }
    expect(Array.from(out).some((v) => v < 1)).toBe(true);
  });
});

describe('a tree passes the seasonal beam transmittance (issue 6)', () => {
  // A spherical crown (height = 2 × radius), so every ray through the centre has chord = height.
  const b = buildDevices(validateDevices([{ type: 'tree', points: [[0, 0]], crownBaseM: 3, crownHeightM: 6, crownRadiusM: 3, crown: 'deciduous-open', transitionDays: 20 }]));
  const bvh = buildBvh(b.scene.positions, b.scene.indices);
  // sensor 1.1 m above ground, 2 m south-west of the trunk; the sun ray aimed through the crown centre
  const px = -2, py = -2, pz = 1.1;
  const dx = 0 - px, dy = 0 - py, dz = 6 - pz;
  const beam = (day: number) => {
    expect(isOccludedMasked(bvh, px, py, pz, dx, dy, dz, 1e-6, Infinity, b.skipSemiTransparent)).toBe(false); // trunk not in the way
    const k = crownExtinctionForDay(b.crowns, day);
    return crownTransmittance(b.crowns, px, py, pz, dx, dy, dz, Infinity, k);
  };
  it('leaf-off season passes the winter transmittance within 2 %', () => {
    // source: Heisler 1986 (REFERENCE-VALUES §12): leafless τ 0.66–0.70, preset 0.68
    for (const day of [dayOfYearFromMonthDay(1, 15), dayOfYearFromMonthDay(3, 20), dayOfYearFromMonthDay(12, 1)]) {
      expect(Math.abs(beam(day) / 0.68 - 1)).toBeLessThan(0.02);
    }
  });
  it('leaf-on season passes the summer transmittance within 2 %', () => {
    // source: Heisler 1986 (REFERENCE-VALUES §12): in leaf τ 0.25–0.35, preset 0.30
    for (const day of [dayOfYearFromMonthDay(6, 21), dayOfYearFromMonthDay(8, 1), dayOfYearFromMonthDay(10, 15)]) {
      expect(Math.abs(beam(day) / 0.3 - 1)).toBeLessThan(0.02);
    }
  });
  it('during leaf-out the beam lies between the two', () => {
    const t = beam(dayOfYearFromMonthDay(5, 1));
    expect(t).toBeGreaterThan(0.3 * 1.02);
    expect(t).toBeLessThan(0.68 / 1.02);
  });
  it('crownExtinctionForDay refuses a short target', () => {
    expect(() => crownExtinctionForDay(b.crowns, 10, new Float64Array(0))).toThrow(/at least 1/);
  });
});
