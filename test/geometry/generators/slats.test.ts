import { describe, it, expect } from 'vitest';
import { buildDevices, validateDevices } from '../../../src/geometry/devices.ts';
import { pergolaSlatPieces, screenSlatHeightsM } from '../../../src/geometry/generators/slats.ts';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import { isOccluded } from '../../../src/trace/bvh/query.ts';
import { areaM2, isClosed, signedVolumeM3, sunDirection, DEG } from './meshChecks.ts';

// A louvred screen in front of a south wall (0,0)–(10,0): blades 0.2 m deep, 0.2 m apart, 0.3 m out.
const D = 0.2, S = 0.2, T = 0.02, OFF = 0.3;
const screen = buildDevices(validateDevices([{ type: 'slats', from: [0, 0], to: [10, 0], outside: 'right', bottomM: 0, topM: 3, depthM: D, spacingM: S, thicknessM: T, standoffM: OFF }], 'p.json'));

describe('slats: screen geometry', () => {
  it('blade count, closed boxes, spacing, depth', () => {
    // floor(3 / 0.2) = 15 blades, one centred in each 0.2 m band: z = 0.1, 0.3, …, 2.9
    expect(screenSlatHeightsM({ bottomM: 0, topM: 3, spacingM: S }).map((z) => Math.round(z * 1e9) / 1e9)).toEqual(Array.from({ length: 15 }, (_, k) => Math.round((0.1 + 0.2 * k) * 1e9) / 1e9));
    expect(screen.scene.indices.length / 3).toBe(15 * 12);
    expect(isClosed(screen.scene)).toBe(true);
    // source: common practice (box area and volume)
    expect(areaM2(screen.scene)).toBeCloseTo(15 * 2 * (10 * D + 10 * T + D * T), 2);
    expect(signedVolumeM3(screen.scene)).toBeCloseTo(15 * 10 * D * T, 4);
    const p = screen.scene.positions;
    let ymin = Infinity, ymax = -Infinity;
    for (let i = 1; i < p.length; i += 3) { ymin = Math.min(ymin, p[i]!); ymax = Math.max(ymax, p[i]!); }
    expect(ymax).toBeCloseTo(-OFF, 6);
    expect(ymin).toBeCloseTo(-OFF - D, 6);
  });
});

describe('slats: shade by the profile angle (closed form)', () => {
  const bvh = screen.scene && buildBvh(screen.scene.positions, screen.scene.indices);
  // Point between the screen and the wall, eps behind the blades' inner edge, just above the blade
  // at z = 1.3 (top face 1.31). The blade above (z = 1.5) has its underside at 1.49. A ray rising at
  // the profile angle φ meets that underside within the blade depth iff z0 + (eps + D)·tan φ >= 1.49.
  // source: common practice (profile-angle geometry of horizontal louvres, tan φ = tan(alt)/cos(h))
  const eps = 0.01, z0 = 1.32;
  const phiCrit = Math.atan((1.5 - T / 2 - z0) / (eps + D)) / DEG;
  const blocked = (altDeg: number, hDeg: number) => {
    const [dx, dy, dz] = sunDirection(altDeg, 180 + hDeg);
    return isOccluded(bvh, 5, -OFF + eps, z0, dx, dy, dz, 1e-6, Infinity);
  };
  it('at noon (profile angle = altitude): lit below the cutoff, shaded above', () => {
    expect(blocked(phiCrit - 2, 0)).toBe(false);
    expect(blocked(phiCrit + 2, 0)).toBe(true);
  });
  it('off-normal sun: the profile angle, not the altitude, decides', () => {
    const h = 40;
    const alt = (phi: number) => Math.atan(Math.tan(phi * DEG) * Math.cos(h * DEG)) / DEG;
    expect(blocked(alt(phiCrit - 2), h)).toBe(false);
    expect(blocked(alt(phiCrit + 2), h)).toBe(true);
    // the same altitude at noon would be lit: altitude alone is not the criterion
    expect(alt(phiCrit + 2)).toBeLessThan(phiCrit - 2);
  });
  it('tilting the blades (outer edge down) blocks a lower sun', () => {
    const tilted = buildDevices(validateDevices([{ type: 'slats', from: [0, 0], to: [10, 0], outside: 'right', bottomM: 0, topM: 3, depthM: D, spacingM: S, thicknessM: T, standoffM: OFF, tiltDeg: 30 }]));
    const bvhT = buildBvh(tilted.scene.positions, tilted.scene.indices);
    const [dx, dy, dz] = sunDirection(phiCrit - 6, 180);
    expect(isOccluded(bvh, 5, -OFF + eps, z0, dx, dy, dz, 1e-6, Infinity)).toBe(false);
    expect(isOccluded(bvhT, 5, -OFF + eps, z0, dx, dy, dz, 1e-6, Infinity)).toBe(true);
  });
});

describe('slats: pergola over a polygon', () => {
  it('east–west blades clipped to an L-shaped terrace', () => {
    // L shape: 0..6 × 0..2 plus 0..2 × 2..6 (area 20 m²)
    const polygon = [[0, 0], [6, 0], [6, 2], [2, 2], [2, 6], [0, 6]] as [number, number][];
    const pieces = pergolaSlatPieces({ polygon, slatAzimuthDeg: 90, spacingM: 0.5 });
    // 6 m across → 12 bands, blade lines at y = 0.25 … 5.75; those below y = 2 run 6 m, the rest 2 m
    let len = 0;
    for (const [, t0, t1] of pieces) len += t1 - t0;
    // source: common practice (total blade length = polygon area / spacing with band-centred lines)
    expect(pieces.length).toBe(12);
    expect(len).toBeCloseTo(20 / 0.5, 9);
    const b = buildDevices(validateDevices([{ type: 'slats', layout: 'pergola', polygon, heightM: 2.8, depthM: 0.1, spacingM: 0.5 }]));
    expect(b.scene.indices.length / 3).toBe(12 * 12);
    expect(isClosed(b.scene)).toBe(true);
    const p = b.scene.positions;
    for (let i = 2; i < p.length; i += 3) expect(Math.abs(p[i]! - 2.8)).toBeLessThanOrEqual(0.0100001);
  });
});
