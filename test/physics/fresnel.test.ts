import { describe, it, expect } from 'vitest';
import {
  fresnelReflectance, fresnelReflectanceSP, makeFresnelSP, paneStackReflectance, schlickReflectance,
  specularReflectanceCos, reflectDirection, SUN_ANGULAR_DIAMETER_RAD,
} from '../../src/physics/fresnel.ts';
import { InputError } from '../../src/physics/errors.ts';

const DEG = Math.PI / 180;

/**
 * The Fresnel formulae in their angle form, written independently of the implementation (which
 * uses the cosine form): R_s = sin²(θi − θt)/sin²(θi + θt), R_p = tan²(θi − θt)/tan²(θi + θt),
 * sin θt = sin θi / n.
 * source: Born & Wolf, Principles of Optics, 7th ed., 1999, sec. 1.5.3; Hecht, Optics, sec. 4.6.
 */
function fresnelAngleForm(thetaDeg: number, n: number): { rs: number; rp: number } {
  const ti = thetaDeg * DEG;
  const tt = Math.asin(Math.sin(ti) / n);
  return {
    rs: Math.sin(ti - tt) ** 2 / Math.sin(ti + tt) ** 2,
    rp: Math.tan(ti - tt) ** 2 / Math.tan(ti + tt) ** 2,
  };
}

describe('Fresnel reflectance of uncoated glass (n = 1.52)', () => {
  it('reflects ≈ 4 % at normal incidence', () => {
    // source: REFERENCE-VALUES §10.1 [derived]: R(0°) = ((n − 1)/(n + 1))² = 0.04258; tolerance 1e-5
    expect(fresnelReflectance(0, 1.52)).toBeCloseTo(0.04258, 5);
    expect(Math.abs(fresnelReflectance(0, 1.52) - (0.52 / 2.52) ** 2)).toBeLessThan(1e-15);
  });

  it('matches the tabulated values at 30°, 45°, 60°, 70°, 80° and 85°', () => {
    // source: REFERENCE-VALUES §10.1 [derived from the Fresnel equations]; tolerance 1e-5
    const table: [number, number, number | null, number | null][] = [
      [30, 0.04414, 0.06121, 0.02708],
      [45, 0.05305, 0.09673, 0.00936],
      [60, 0.09248, 0.18344, 0.00153],
      [70, 0.17471, 0.30789, 0.04153],
      [80, 0.39095, 0.54636, 0.23554],
      [85, 0.61492, null, null],
      [89, 0.90469, null, null],
    ];
    const sp = makeFresnelSP();
    for (const [deg, r, rs, rp] of table) {
      expect(Math.abs(fresnelReflectance(deg, 1.52) - r)).toBeLessThan(1e-5);
      fresnelReflectanceSP(deg, 1.52, sp);
      if (rs !== null) expect(Math.abs(sp.rs - rs)).toBeLessThan(1e-5);
      if (rp !== null) expect(Math.abs(sp.rp - rp)).toBeLessThan(1e-5);
    }
  });

  it('at 75° equals the angle form of the Fresnel equations (R ≈ 0.2567)', () => {
    // source: Born & Wolf 1999 sec. 1.5.3 / Hecht sec. 4.6 (angle form, computed in this test);
    // 75° is not in REFERENCE-VALUES §10.1, so the expected value comes from the closed form above.
    const f = fresnelAngleForm(75, 1.52);
    const expected = (f.rs + f.rp) / 2;
    expect(Math.abs(fresnelReflectance(75, 1.52) - expected)).toBeLessThan(1e-12);
    expect(expected).toBeGreaterThan(0.2567); // ≈ 0.25672 by the closed form
    expect(expected).toBeLessThan(0.2568);
    // and the same agreement at other angles and indices (water 1.33, dense flint 1.9)
    for (const n of [1.33, 1.52, 1.9]) {
      for (const deg of [5, 20, 40, 55, 65, 75, 85]) {
        const g = fresnelAngleForm(deg, n);
        expect(Math.abs(fresnelReflectance(deg, n) - (g.rs + g.rp) / 2)).toBeLessThan(1e-12);
      }
    }
  });

  it('p reflectance vanishes at Brewster\'s angle and everything tends to 1 at grazing incidence', () => {
    // source: Born & Wolf 1999 sec. 1.5.3: tan θB = n; REFERENCE-VALUES §10.1: θB = 56.66° for n = 1.52
    const thetaB = Math.atan(1.52) / DEG;
    expect(thetaB).toBeCloseTo(56.66, 2);
    const sp = fresnelReflectanceSP(thetaB, 1.52, makeFresnelSP());
    expect(sp.rp).toBeLessThan(1e-20);
    expect(fresnelReflectance(90, 1.52)).toBeCloseTo(1, 12);
    expect(paneStackReflectance(90, 1.52, 2)).toBeCloseTo(1, 12);
  });
});

describe('pane and pane-stack reflectance (incoherent, per polarisation)', () => {
  it('a single pane follows R_pane = 2R/(1 + R) per polarisation', () => {
    // source: REFERENCE-VALUES §10.1: 0° 0.0817, 60° 0.1565, 70° 0.2753, 80° 0.5440 (4 digits; tolerance 6e-5)
    for (const [deg, want] of [[0, 0.0817], [60, 0.1565], [70, 0.2753], [80, 0.544]] as const) {
      expect(Math.abs(paneStackReflectance(deg, 1.52, 1) - want)).toBeLessThan(6e-5);
    }
  });

  it('N panes equal adding one pane at a time with the multiple-reflection sum', () => {
    // source: Duffie & Beckman 2013 sec. 5.1 (N covers: τ = (1 − r)/(1 + (2N − 1)r) per
    // polarisation) against the layer-adding rule R₁₂ = R₁ + T₁²R₂/(1 − R₁R₂) (common practice),
    // applied here to one polarisation at a time.
    const sp = makeFresnelSP();
    for (const deg of [0, 35, 60, 80]) {
      fresnelReflectanceSP(deg, 1.52, sp);
      const stack = (r: number, surfaces: number) => {
        let R = r;
        for (let k = 1; k < surfaces; k++) R = R + ((1 - R) ** 2 * r) / (1 - R * r);
        return R;
      };
      for (const panes of [1, 2, 3]) {
        const want = (stack(sp.rs, 2 * panes) + stack(sp.rp, 2 * panes)) / 2;
        expect(Math.abs(paneStackReflectance(deg, 1.52, panes) - want)).toBeLessThan(1e-12);
      }
    }
    // Clear double glazing at normal incidence: ≈ 0.151 (no absorption).
    expect(paneStackReflectance(0, 1.52, 2)).toBeCloseTo(0.151, 3);
  });
});

describe('Schlick angular model (metals and coated finishes)', () => {
  it('starts at R₀, rises as (1 − cos θ)⁵ and reaches 1 at grazing incidence', () => {
    // source: Schlick 1994, eq. (24): R = R₀ + (1 − R₀)(1 − cos θ)⁵
    expect(schlickReflectance(0, 0.67)).toBeCloseTo(0.67, 12);
    expect(schlickReflectance(60, 0.7)).toBeCloseTo(0.7 + 0.3 / 32, 12);
    expect(schlickReflectance(90, 0.2)).toBeCloseTo(1, 12);
    // close to exact Fresnel for glass: within 0.035 over 0–85° (documented bound; common practice)
    const r0 = fresnelReflectance(0, 1.52);
    for (let deg = 0; deg <= 85; deg += 5) expect(Math.abs(schlickReflectance(deg, r0) - fresnelReflectance(deg, 1.52))).toBeLessThan(0.035);
  });

  it('the dispatcher picks the model', () => {
    const c = Math.cos(60 * DEG);
    expect(specularReflectanceCos({ kind: 'fresnel-interface', refractiveIndex: 1.52 }, c)).toBeCloseTo(fresnelReflectance(60, 1.52), 12);
    expect(specularReflectanceCos({ kind: 'pane-stack', refractiveIndex: 1.52, panes: 2 }, c)).toBeCloseTo(paneStackReflectance(60, 1.52, 2), 12);
    expect(specularReflectanceCos({ kind: 'schlick', normalReflectance: 0.5 }, c)).toBeCloseTo(schlickReflectance(60, 0.5), 12);
  });
});

describe('reflection geometry and the sun\'s size', () => {
  it('the reflected direction keeps the angle to the normal and lies in the plane of incidence', () => {
    // source: law of reflection (Hecht sec. 4.3): θr = θi, r, s, n coplanar
    const s = [0.3, -0.5, Math.sqrt(1 - 0.34)];
    const n = [0, -1, 0];
    const r = reflectDirection(s[0]!, s[1]!, s[2]!, n[0]!, n[1]!, n[2]!, new Float64Array(3));
    const dot = (a: ArrayLike<number>, b: ArrayLike<number>) => a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
    expect(dot(r, n)).toBeCloseTo(dot(s, n), 12);
    expect(Math.hypot(r[0]!, r[1]!, r[2]!)).toBeCloseTo(1, 12);
    // r + s = 2(n·s)·n: along the normal
    const ns = dot(n, s);
    for (let k = 0; k < 3; k++) expect(r[k]! + s[k]!).toBeCloseTo(2 * ns * n[k]!, 12);
    expect(ns).toBeCloseTo(0.5, 12);
    expect(Array.from(reflectDirection(0, -0.6, 0.8, 0, -1, 0, new Float64Array(3)))).toEqual([0, -0.6, -0.8].map((x) => x + 0));
  });

  it('the sun subtends 9.30 mrad (0.533°)', () => {
    // source: REFERENCE-VALUES §11 [derived]: 2·atan(6.957e8 m / 1.495978707e11 m); tolerance 0.005 mrad
    expect(Math.abs(SUN_ANGULAR_DIAMETER_RAD * 1e3 - 9.30)).toBeLessThan(0.005);
    expect(SUN_ANGULAR_DIAMETER_RAD / DEG).toBeCloseTo(0.533, 3);
  });

  it('refuses angles outside 0–90° and indices below 1', () => {
    expect(() => fresnelReflectance(95, 1.52)).toThrow(InputError);
    expect(() => fresnelReflectance(30, 0.8)).toThrow(/refractiveIndex/);
    expect(() => paneStackReflectance(30, 1.52, 0)).toThrow(/panes/);
    expect(() => schlickReflectance(30, 1.2)).toThrow(/normalReflectance/);
  });
});
