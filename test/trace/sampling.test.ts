import { describe, it, expect } from 'vitest';
import {
  buildFrame,
  cosineHemispherePdf,
  frameToWorld,
  invertCosineHemisphere,
  invertSkyCell,
  projectedSolidAngleOfCell,
  sampleCosineHemisphere,
  sampleSkyCell,
  skyCellPdf,
} from '../../src/trace/sampling.ts';
import { createRandomState, hash32, nextFloat, nextUint32, seedRandom } from '../../src/trace/random.ts';
import { skySubdivision } from '../../src/physics/skySubdivision.ts';

/** A fixed stratified set of (u1, u2), cell centres of an n × n grid (STYLE §8). */
function stratified(n: number): [number, number][] {
  const out: [number, number][] = [];
  for (let a = 0; a < n; a++) for (let b = 0; b < n; b++) out.push([(a + 0.5) / n, (b + 0.5) / n]);
  return out;
}

describe('random', () => {
  it('xoshiro128** first output from state (1, 2, 3, 4) is 11520', () => {
    // source: Blackman & Vigna reference C code xoshiro128starstar.c: rotl(s[1]*5, 7)*9 with s[1] = 2
    // gives rotl(10, 7)*9 = 1280*9 = 11520 (worked by hand).
    const s = Uint32Array.of(1, 2, 3, 4);
    expect(nextUint32(s)).toBe(11520);
    // the state update of the reference code: s2^=s0 (2), s3^=s1 (6), s1^=s2 (0), s0^=s3 (7), s2^=t (1026), s3=rotl(6,11)
    expect(Array.from(s)).toEqual([7, 0, 2 ^ (2 << 9), 6 << 11]);
  });

  it('the same (seed, stream) gives the same numbers; neighbouring streams differ', () => {
    const a = createRandomState(), b = createRandomState();
    seedRandom(a, 42, 7);
    const first = Array.from({ length: 8 }, () => nextUint32(a));
    seedRandom(b, 42, 7);
    expect(Array.from({ length: 8 }, () => nextUint32(b))).toEqual(first);
    seedRandom(b, 42, 8);
    expect(Array.from({ length: 8 }, () => nextUint32(b))).not.toEqual(first);
    seedRandom(b, 43, 7);
    expect(Array.from({ length: 8 }, () => nextUint32(b))).not.toEqual(first);
    seedRandom(b, 42, 7, 1);
    expect(Array.from({ length: 8 }, () => nextUint32(b))).not.toEqual(first);
  });

  it('floats are in [0, 1) with mean 1/2 and variance 1/12', () => {
    // common practice: moments of U(0,1); 1e5 draws → standard error of the mean ≈ 0.0009
    const s = createRandomState();
    let sum = 0, sum2 = 0, lo = 1, hi = 0;
    const n = 100000;
    for (let i = 0; i < n; i++) {
      seedRandom(s, 1, i); // first draw of many streams: checks the seeding decorrelates
      const u = nextFloat(s);
      sum += u;
      sum2 += u * u;
      lo = Math.min(lo, u);
      hi = Math.max(hi, u);
    }
    expect(lo).toBeGreaterThanOrEqual(0);
    expect(hi).toBeLessThan(1);
    expect(Math.abs(sum / n - 0.5)).toBeLessThan(0.005);
    expect(Math.abs(sum2 / n - (sum / n) ** 2 - 1 / 12)).toBeLessThan(0.003);
  });

  it('hash32 is a bijection on a sample (no collisions in 2^16 inputs)', () => {
    const seen = new Set<number>();
    for (let i = 0; i < 65536; i++) seen.add(hash32(i));
    expect(seen.size).toBe(65536);
  });
});

describe('cosine-weighted hemisphere', () => {
  it('invert(sample(u)) ≈ u over a stratified set', () => {
    const v = new Float64Array(3), u = new Float64Array(2);
    for (const [u1, u2] of stratified(16)) {
      sampleCosineHemisphere(u1, u2, v);
      expect(Math.hypot(v[0]!, v[1]!, v[2]!)).toBeCloseTo(1, 12);
      expect(v[2]!).toBeGreaterThan(0);
      invertCosineHemisphere(v, u);
      expect(u[0]!).toBeCloseTo(u1, 10);
      expect(u[1]!).toBeCloseTo(u2, 10);
    }
  });

  it('the samples follow cos θ / π: E[cos θ] = 2/3 and the pdf integrates to 1', () => {
    // source: analytic, ∫ cos θ · (cos θ / π) dω over the hemisphere = 2/3 (common practice)
    const v = new Float64Array(3);
    let sumCos = 0;
    const pts = stratified(64);
    for (const [u1, u2] of pts) {
      sampleCosineHemisphere(u1, u2, v);
      sumCos += v[2]!;
    }
    // midpoint rule on √(1 − u1) near u1 = 1 converges slowly: tolerance 5e-4
    expect(sumCos / pts.length).toBeCloseTo(2 / 3, 3);
    // ∫ pdf dω by midpoint quadrature in (θ, φ)
    let integral = 0;
    const nT = 2000;
    for (let j = 0; j < nT; j++) {
      const th = ((j + 0.5) / nT) * (Math.PI / 2);
      integral += cosineHemispherePdf(Math.cos(th)) * Math.sin(th) * (Math.PI / 2 / nT) * 2 * Math.PI;
    }
    expect(integral).toBeCloseTo(1, 5);
    expect(cosineHemispherePdf(-0.1)).toBe(0);
  });
});

describe('orthonormal frame', () => {
  it('is orthonormal and right-handed with n as its third axis, also near n = -z', () => {
    const f = new Float64Array(9), w = new Float64Array(3);
    const normals = [
      [0, 0, 1], [0, 0, -1], [1, 0, 0], [0, -1, 0], [0.3, -0.4, Math.sqrt(1 - 0.25)],
      [1e-5, 0, -Math.sqrt(1 - 1e-10)], [-0.6, 0.8, 0],
    ];
    for (const n of normals) {
      buildFrame(n[0]!, n[1]!, n[2]!, f);
      const t = [f[0]!, f[1]!, f[2]!], b = [f[3]!, f[4]!, f[5]!], m = [f[6]!, f[7]!, f[8]!];
      const dot = (p: number[], q: number[]) => p[0]! * q[0]! + p[1]! * q[1]! + p[2]! * q[2]!;
      expect(dot(t, t)).toBeCloseTo(1, 9);
      expect(dot(b, b)).toBeCloseTo(1, 9);
      expect(dot(t, b)).toBeCloseTo(0, 9);
      expect(dot(t, m)).toBeCloseTo(0, 9);
      expect(dot(b, m)).toBeCloseTo(0, 9);
      // t × b = n
      expect(t[1]! * b[2]! - t[2]! * b[1]!).toBeCloseTo(m[0]!, 9);
      expect(t[2]! * b[0]! - t[0]! * b[2]!).toBeCloseTo(m[1]!, 9);
      expect(t[0]! * b[1]! - t[1]! * b[0]!).toBeCloseTo(m[2]!, 9);
      frameToWorld(f, 0, 0, 1, w);
      expect([w[0]!, w[1]!, w[2]!].map((x, i) => x - m[i]!).every((x) => Math.abs(x) < 1e-12)).toBe(true);
    }
  });
});

describe('sky cell sampling', () => {
  const cell = [12 * (Math.PI / 180), 24 * (Math.PI / 180), -0.2, 0.25] as const;

  it('invert(sample(u)) ≈ u and samples stay inside the cell', () => {
    const v = new Float64Array(3), u = new Float64Array(2);
    for (const [u1, u2] of stratified(12)) {
      sampleSkyCell(cell[0], cell[1], cell[2], cell[3], u1, u2, v);
      const alt = Math.asin(v[2]!);
      expect(alt).toBeGreaterThanOrEqual(cell[0] - 1e-12);
      expect(alt).toBeLessThanOrEqual(cell[1] + 1e-12);
      invertSkyCell(cell[0], cell[1], cell[2], cell[3], v, u);
      expect(u[0]!).toBeCloseTo(u1, 10);
      expect(u[1]!).toBeCloseTo(u2, 10);
    }
  });

  it('the @example: u = (0.5, 0.25) over the whole sky is east at 30°', () => {
    // sin(alt) = 0.5 → alt = 30°; az = 90° (east): (cos 30°, 0, 0.5)
    const v = new Float64Array(3);
    sampleSkyCell(0, Math.PI / 2, 0, 2 * Math.PI, 0.5, 0.25, v);
    expect(v[0]!).toBeCloseTo(Math.cos(Math.PI / 6), 12);
    expect(v[1]!).toBeCloseTo(0, 12);
    expect(v[2]!).toBeCloseTo(0.5, 12);
  });

  it('uniform in solid angle: pdf × Ω = 1 and the mean of sin(alt) matches ∫ sin(alt) dω / Ω', () => {
    const [a0, a1, z0, z1] = cell;
    const omega = (Math.sin(a1) - Math.sin(a0)) * (z1 - z0);
    expect(skyCellPdf(a0, a1, z0, z1) * omega).toBeCloseTo(1, 12);
    const v = new Float64Array(3);
    let s = 0;
    const pts = stratified(32);
    for (const [u1, u2] of pts) s += sampleSkyCell(a0, a1, z0, z1, u1, u2, v)[2]!;
    const exact = (0.5 * (Math.sin(a1) ** 2 - Math.sin(a0) ** 2) * (z1 - z0)) / omega;
    expect(s / pts.length).toBeCloseTo(exact, 6);
  });
});

describe('projected solid angle of sky cells', () => {
  const sky = skySubdivision(1);
  function total(nx: number, ny: number, nz: number): number {
    let s = 0;
    for (let k = 0; k < sky.count; k++) {
      s += projectedSolidAngleOfCell(nx, ny, nz, sky.altMinRad[k]!, sky.altMaxRad[k]!, sky.azMinRad[k]!, sky.azMaxRad[k]!);
    }
    return s;
  }

  it('equals the horizontal projected solid angle for n = +z', () => {
    for (let k = 0; k < sky.count; k += 7) {
      const v = projectedSolidAngleOfCell(0, 0, 1, sky.altMinRad[k]!, sky.altMaxRad[k]!, sky.azMinRad[k]!, sky.azMaxRad[k]!);
      expect(v).toBeCloseTo(sky.horizontalProjectedSr[k]!, 12);
    }
  });

  it('sums over the sky to π(1 + cos β)/2 for a plane tilted by β', () => {
    // source: analytic; the sky view of an unobstructed tilted plane is (1 + cos β)/2 (common practice,
    // the isotropic-sky tilt factor). Tolerance 2e-4 covers the azimuth quadrature.
    for (const betaDeg of [0, 30, 60, 90, 120, 150, 180]) {
      const b = (betaDeg * Math.PI) / 180;
      for (const azDeg of [0, 37, 180]) {
        const az = (azDeg * Math.PI) / 180;
        const n = [Math.sin(b) * Math.sin(az), Math.sin(b) * Math.cos(az), Math.cos(b)];
        expect(Math.abs(total(n[0]!, n[1]!, n[2]!) / Math.PI - (1 + Math.cos(b)) / 2)).toBeLessThan(2e-4);
      }
    }
  });

  it('matches brute-force quadrature on a cell the receiver plane cuts', () => {
    // a south-facing vertical plane cuts the east-centred cell (az 75°..105°) through its middle
    const n = [0, -1, 0].map((x, i) => (i === 0 ? 0.2 : x));
    const len = Math.hypot(n[0]!, n[1]!, n[2]!);
    const [nx, ny, nz] = n.map((x) => x / len) as [number, number, number];
    const a0 = 0.1, a1 = 0.3, z0 = (75 * Math.PI) / 180, z1 = (105 * Math.PI) / 180;
    let brute = 0;
    const m = 400;
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < m; j++) {
        const a = a0 + ((i + 0.5) / m) * (a1 - a0), z = z0 + ((j + 0.5) / m) * (z1 - z0);
        const d = nx * Math.cos(a) * Math.sin(z) + ny * Math.cos(a) * Math.cos(z) + nz * Math.sin(a);
        brute += Math.max(0, d) * Math.cos(a) * ((a1 - a0) / m) * ((z1 - z0) / m);
      }
    }
    const v = projectedSolidAngleOfCell(nx, ny, nz, a0, a1, z0, z1, 64);
    expect(brute).toBeGreaterThan(0);
    expect(Math.abs(v - brute) / brute).toBeLessThan(1e-3);
  });
});
