import { describe, it, expect } from 'vitest';
import {
  cosIncidence,
  angleOfIncidenceDeg,
  beamOnSurfaceWm2,
  groundReflectedOnTiltWm2,
  surfaceTiltAzimuthFromNormal,
  type SurfaceOrientation,
} from '../../src/physics/irradiance.ts';
import { sunPosition } from '../../src/physics/solarPosition.ts';
import { InputError } from '../../src/physics/errors.ts';

const D = Math.PI / 180;

/** Outward unit normal of a surface with tilt S and facing azimuth γ (x east, y north, z up). */
function normalOf(tiltDeg: number, azimuthDeg: number): [number, number, number] {
  const s = tiltDeg * D;
  const g = azimuthDeg * D;
  return [Math.sin(s) * Math.sin(g), Math.sin(s) * Math.cos(g), Math.cos(s)];
}

describe('angleOfIncidenceDeg', () => {
  it('SPA example surface (slope 30°, azimuth 170°) with the published sun → 25.1870002°', () => {
    // source: REFERENCE-VALUES §1.1: pvlib aoi(30, 170, 50.111622, 194.340241) = 25.1870002 [lib-run];
    // Reda & Andreas 2004 print 25.18700°. Same closed form, so 1e-6°.
    expect(angleOfIncidenceDeg(30, 170, 50.111622, 194.340241)).toBeCloseTo(25.1870002, 6);
  });

  it('SPA example with our own sun position → 25.18700° to 0.02°', () => {
    // source: Reda & Andreas 2004, Table A4.1 example: incidence 25.18700° (surface slope 30°,
    // azimuth rotation −10° ⇒ facing 170° from north). Sun from sunPosition (suncalc-based).
    const sun = sunPosition(Date.parse('2003-10-17T12:30:30-07:00'), 39.742476, -105.1786, {
      elevationM: 1830.14,
      pressureHpa: 820,
      tempC: 11,
    });
    const theta = angleOfIncidenceDeg(30, 170, sun.zenithDeg, sun.azimuthDeg);
    expect(Math.abs(theta - 25.187)).toBeLessThan(0.02);
    // The vector form gives the same angle.
    const [nx, ny, nz] = normalOf(30, 170);
    const c = cosIncidence(sun.dirX, sun.dirY, sun.dirZ, nx, ny, nz);
    expect(Math.acos(c) / D).toBeCloseTo(theta, 9);
  });

  it('the three façade cases of §5.2', () => {
    // source: REFERENCE-VALUES §5.2 [derived/lib-run]: cos θ = cos z cos S + sin z sin S cos(γs − γ).
    expect(angleOfIncidenceDeg(90, 180, 40, 180)).toBeCloseTo(50, 9);
    expect(angleOfIncidenceDeg(90, 180, 60, 135)).toBeCloseTo(52.2388, 4);
    expect(angleOfIncidenceDeg(90, 90, 50, 200)).toBeCloseTo(105.19, 2);
  });

  it('refuses out-of-range angles', () => {
    expect(() => angleOfIncidenceDeg(190, 180, 40, 180)).toThrow(/surfaceTiltDeg/);
    expect(() => angleOfIncidenceDeg(30, 180, NaN, 180)).toThrow(/solarZenithDeg/);
  });
});

describe('cosIncidence and beamOnSurfaceWm2', () => {
  it('agrees with the angle form on a grid of orientations (slow oracle)', () => {
    // source: common practice — the dot product of unit vectors equals the spherical-trig form.
    for (let tilt = 0; tilt <= 180; tilt += 30) {
      for (let az = 0; az < 360; az += 45) {
        for (let zen = 0; zen <= 90; zen += 15) {
          for (let saz = 0; saz < 360; saz += 60) {
            const [nx, ny, nz] = normalOf(tilt, az);
            const [sx, sy, sz] = normalOf(zen, saz); // the sun direction has the same form
            const c = cosIncidence(sx, sy, sz, nx, ny, nz);
            expect(c).toBeCloseTo(Math.cos(angleOfIncidenceDeg(tilt, az, zen, saz) * D), 9);
          }
        }
      }
    }
  });

  it('beam = DNI·cos θ in front, 0 on the back', () => {
    // source: REFERENCE-VALUES §5.2: the east façade with the sun at azimuth 200°, zenith 50° has
    // θ = 105.19° (back side, so no beam); the south façade case θ = 50° gets 800·cos 50°.
    expect(beamOnSurfaceWm2(800, Math.cos(50 * D))).toBeCloseTo(514.2300877, 6);
    const c = Math.cos(angleOfIncidenceDeg(90, 90, 50, 200) * D);
    expect(c).toBeLessThan(0);
    expect(beamOnSurfaceWm2(800, c)).toBe(0);
    expect(beamOnSurfaceWm2(800, 0)).toBe(0);
  });
});

describe('groundReflectedOnTiltWm2', () => {
  it('pvlib get_ground_diffuse(40, 900, albedo 0.25) = 26.32000014911496', () => {
    // source: pvlib tests/test_irradiance.py test_get_ground_diffuse_simple_float (REFERENCE-VALUES §5.2).
    expect(groundReflectedOnTiltWm2(40, 900, 0.25)).toBeCloseTo(26.32000014911496, 10);
  });

  it('vertical surface, GHI 800, albedo 0.2 → 80; horizontal roof → 0; facing down → full', () => {
    // source: REFERENCE-VALUES §5.2 [derived] (vertical case); common practice (the two limits).
    expect(groundReflectedOnTiltWm2(90, 800, 0.2)).toBeCloseTo(80, 9);
    expect(groundReflectedOnTiltWm2(0, 800, 0.2)).toBe(0);
    expect(groundReflectedOnTiltWm2(180, 800, 0.2)).toBeCloseTo(160, 9);
  });

  it('refuses bad albedo or irradiance', () => {
    expect(() => groundReflectedOnTiltWm2(90, 800, 1.2)).toThrow(/albedo/);
    expect(() => groundReflectedOnTiltWm2(90, -5, 0.2)).toThrow(/ghiWm2/);
  });
});

describe('surfaceTiltAzimuthFromNormal', () => {
  it('walls, roofs and soffits', () => {
    // source: common practice / DESIGN.md §3 (x east, y north, z up; azimuth clockwise from north).
    expect(surfaceTiltAzimuthFromNormal(0, -1, 0)).toEqual({ tiltDeg: 90, azimuthDeg: 180 });
    const e = surfaceTiltAzimuthFromNormal(2, 0, 0); // not unit length
    expect(e.tiltDeg).toBeCloseTo(90, 12);
    expect(e.azimuthDeg).toBeCloseTo(90, 12);
    const w = surfaceTiltAzimuthFromNormal(-1, 0, 0);
    expect(w.azimuthDeg).toBeCloseTo(270, 12);
    const n = surfaceTiltAzimuthFromNormal(0, 1, 0);
    expect(n.azimuthDeg).toBe(0);
    expect(surfaceTiltAzimuthFromNormal(0, 0, 1)).toEqual({ tiltDeg: 0, azimuthDeg: 180 });
    expect(surfaceTiltAzimuthFromNormal(0, 0, -3).tiltDeg).toBe(180);
  });

  it('round-trips with the normal of a tilt/azimuth pair, into a target', () => {
    // source: common practice (inverse of n = (sin S sin γ, sin S cos γ, cos S)).
    const target: SurfaceOrientation = { tiltDeg: 0, azimuthDeg: 0 };
    for (let tilt = 5; tilt < 180; tilt += 25) {
      for (let az = 0; az < 360; az += 20) {
        const [nx, ny, nz] = normalOf(tilt, az);
        const r = surfaceTiltAzimuthFromNormal(nx, ny, nz, target);
        expect(r).toBe(target);
        expect(r.tiltDeg).toBeCloseTo(tilt, 9);
        expect(((r.azimuthDeg - az + 540) % 360) - 180).toBeCloseTo(0, 9);
      }
    }
  });

  it('refuses a zero or non-finite normal', () => {
    expect(() => surfaceTiltAzimuthFromNormal(0, 0, 0)).toThrow(InputError);
    expect(() => surfaceTiltAzimuthFromNormal(NaN, 0, 1)).toThrow(/normal/);
  });
});
