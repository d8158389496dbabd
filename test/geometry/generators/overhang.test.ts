import { describe, it, expect } from 'vitest';
import { buildDevices, validateDevices } from '../../../src/geometry/devices.ts';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import { isOccluded, isOccludedMasked } from '../../../src/trace/bvh/query.ts';
import { sheetTransmittance } from '../../../src/trace/crowns.ts';
import { isClosed, signedVolumeM3, sunDirection, DEG } from './meshChecks.ts';

// An overhang on a south wall (0,0)–(10,0): underside at z = 3, projecting 1.2 m.
const P = 1.2, Z = 3;
const opaque = buildDevices(validateDevices([{ type: 'overhang', from: [0, 0], to: [10, 0], outside: 'right', heightM: Z, projectionM: P }]));
const bvh = buildBvh(opaque.scene.positions, opaque.scene.indices);
const eps = 0.005;

describe('overhang geometry', () => {
  it('one closed plate, underside at heightM, projection to the south', () => {
    expect(opaque.scene.indices.length / 3).toBe(12);
    expect(isClosed(opaque.scene)).toBe(true);
    // source: common practice (box volume: width × projection × thickness 0.1 default)
    expect(signedVolumeM3(opaque.scene)).toBeCloseTo(10 * P * 0.1, 4);
    const p = opaque.scene.positions;
    let zmin = Infinity, ymin = Infinity;
    for (let i = 0; i < p.length; i += 3) { ymin = Math.min(ymin, p[i + 1]!); zmin = Math.min(zmin, p[i + 2]!); }
    expect(zmin).toBeCloseTo(Z, 6);
    expect(ymin).toBeCloseTo(-P, 6);
  });
});

describe('overhang shade depth = projection × tan(profile angle)', () => {
  // source: common practice (overhang shadow on the wall below: depth = P·tan φ, tan φ = tan(alt)/cos(h))
  const check = (altDeg: number, hDeg: number) => {
    const phi = Math.atan(Math.tan(altDeg * DEG) / Math.cos(hDeg * DEG));
    const depth = (P - eps) * Math.tan(phi);
    const [dx, dy, dz] = sunDirection(altDeg, 180 + hDeg);
    const shaded = (h: number) => isOccluded(bvh, 5, -eps, Z - h, dx, dy, dz, 1e-6, Infinity);
    expect(shaded(depth - 0.03)).toBe(true);
    expect(shaded(depth + 0.03)).toBe(false);
  };
  it('noon, sun square to the wall', () => { check(60, 0); check(35, 0); });
  it('sun 40° off the normal', () => { check(50, 40); check(30, -40); });
  it('an awning tilted 20° (outer edge down) shades deeper', () => {
    const tilted = buildDevices(validateDevices([{ type: 'overhang', from: [0, 0], to: [10, 0], outside: 'right', heightM: Z, projectionM: P, tiltDeg: 20 }]));
    const bvhT = buildBvh(tilted.scene.positions, tilted.scene.indices);
    const [dx, dy, dz] = sunDirection(50, 180);
    // outer edge at (−P, Z − P tan 20°): shadow edge depth P·tan 20° + P·tan 50° below Z
    const depth = P * Math.tan(20 * DEG) + (P - eps) * Math.tan(50 * DEG);
    expect(isOccluded(bvhT, 5, -eps, Z - depth + 0.04, dx, dy, dz, 1e-6, Infinity)).toBe(true);
    expect(isOccluded(bvhT, 5, -eps, Z - depth - 0.04, dx, dy, dz, 1e-6, Infinity)).toBe(false);
  });
});

describe('fabric awning: semi-transparent sheet', () => {
  const fabric = buildDevices(validateDevices([{ type: 'overhang', from: [0, 0], to: [10, 0], outside: 'right', heightM: Z, projectionM: P, transmittance: 0.25 }]));
  const bvhF = buildBvh(fabric.scene.positions, fabric.scene.indices);
  it('flags its triangles with the transmittance and a default fabric material', () => {
    expect(Array.from(fabric.triangleTransmittance).every((t) => Math.abs(t - 0.25) < 1e-7)).toBe(true);
    expect(fabric.hasSemiTransparent).toBe(true);
    expect(fabric.scene.materialNames).toEqual(['paint-white']);
  });
  it('does not block the opaque test and passes τ along the beam', () => {
    const [dx, dy, dz] = sunDirection(60, 180);
    const z = Z - 0.5 * (P - eps) * Math.tan(60 * DEG);
    expect(isOccluded(bvhF, 5, -eps, z, dx, dy, dz, 1e-6, Infinity)).toBe(true);
    expect(isOccludedMasked(bvhF, 5, -eps, z, dx, dy, dz, 1e-6, Infinity, fabric.skipSemiTransparent)).toBe(false);
    // one sheet passes its τ (two faces, √τ each); source: common practice (thin-sheet transmittance)
    expect(sheetTransmittance(bvhF, 5, -eps, z, dx, dy, dz, 1e-6, Infinity, fabric.triangleTransmittance, fabric.skipOpaque)).toBeCloseTo(0.25, 6);
    // below the shadow: nothing in the way
    const zLow = Z - 1.5 * (P - eps) * Math.tan(60 * DEG);
    expect(sheetTransmittance(bvhF, 5, -eps, zLow, dx, dy, dz, 1e-6, Infinity, fabric.triangleTransmittance, fabric.skipOpaque)).toBe(1);
  });
});

describe('canopy', () => {
  it('a free plate of width × depth at its height', () => {
    const b = buildDevices(validateDevices([{ type: 'canopy', center: [2, 3], heightM: 2.5, widthM: 4, depthM: 3, azimuthDeg: 90 }]));
    expect(b.scene.indices.length / 3).toBe(12);
    expect(isClosed(b.scene)).toBe(true);
    const bvhC = buildBvh(b.scene.positions, b.scene.indices);
    // width runs east (x 0..4), depth north–south (y 1.5..4.5)
    expect(isOccluded(bvhC, 3.9, 4.4, 0, 0, 0, 1, 0, Infinity)).toBe(true);
    expect(isOccluded(bvhC, 4.1, 3, 0, 0, 0, 1, 0, Infinity)).toBe(false);
    expect(isOccluded(bvhC, 2, 4.6, 0, 0, 0, 1, 0, Infinity)).toBe(false);
  });
});
