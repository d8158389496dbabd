import { describe, it, expect } from 'vitest';
import { buildDevices, validateDevices } from '../../../src/geometry/devices.ts';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import { isOccludedMasked } from '../../../src/trace/bvh/query.ts';
import { sheetTransmittance } from '../../../src/trace/crowns.ts';
import { isClosed, signedVolumeM3 } from './meshChecks.ts';

const R = 1.5, N = 24, TAU = 0.1;
const b = buildDevices(validateDevices([{ type: 'umbrella', points: [[2, 3], [8, 3, 0.5]], radiusM: R, heightM: 2.2, transmittance: TAU, segments: N }]));
const bvh = buildBvh(b.scene.positions, b.scene.indices);

describe('umbrella geometry', () => {
  it('disc (4n triangles) + pole (12) per umbrella, closed, named surfaces', () => {
    expect(b.scene.indices.length / 3).toBe(2 * 4 * N + 2 * 12);
    expect(b.scene.surfaceNames).toEqual(['umbrella-1', 'umbrella-1-pole']);
    expect(isClosed(b.scene, 0, 4 * N)).toBe(true);
    expect(isClosed(b.scene, 8 * N, 8 * N + 12)).toBe(true);
    expect(signedVolumeM3(b.scene, 0, 4 * N)).toBeGreaterThan(0);
  });
  it('the disc covers π r² in plan (equal-area polygon)', () => {
    // source: common practice (circle area π r²); the top fan's plan area
    let a = 0;
    const p = b.scene.positions;
    for (let t = 0; t < 4 * N; t++) {
      const i = b.scene.indices;
      const [ax, ay, az] = [p[i[t * 3]! * 3]!, p[i[t * 3]! * 3 + 1]!, p[i[t * 3]! * 3 + 2]!];
      const [bx, by] = [p[i[t * 3 + 1]! * 3]!, p[i[t * 3 + 1]! * 3 + 1]!];
      const [cx, cy] = [p[i[t * 3 + 2]! * 3]!, p[i[t * 3 + 2]! * 3 + 1]!];
      const signed = ((bx - ax) * (cy - ay) - (cx - ax) * (by - ay)) / 2;
      if (signed > 0 && az > 2.2 + 0.002) a += signed; // top faces (fan around the upper apex)
    }
    expect(a).toBeCloseTo(Math.PI * R * R, 4);
  });
  it('rays inside 0.95 r meet the fabric, outside 1.05 r miss; τ passes; pole is opaque', () => {
    const up = (x: number, y: number) => sheetTransmittance(bvh, x, y, 0.1, 0, 0, 1, 0, Infinity, b.triangleTransmittance, b.skipOpaque);
    for (let k = 0; k < 12; k++) {
      const a = (k / 12) * 2 * Math.PI + 0.1;
      // source: common practice (a sheet of transmittance τ passes τ)
      expect(up(2 + 0.95 * R * Math.cos(a), 3 + 0.95 * R * Math.sin(a))).toBeCloseTo(TAU, 6);
      expect(up(2 + 1.05 * R * Math.cos(a), 3 + 1.05 * R * Math.sin(a))).toBe(1);
    }
    // the fabric does not block the opaque test; the pole does
    expect(isOccludedMasked(bvh, 2.5, 3, 0.1, 0, 0, 1, 0, Infinity, b.skipSemiTransparent)).toBe(false);
    expect(isOccludedMasked(bvh, 1, 3, 1.0, 1, 0, 0, 0, Infinity, b.skipSemiTransparent)).toBe(true);
  });
  it('a shallow cone lifts the centre by riseM', () => {
    const c = buildDevices(validateDevices([{ type: 'umbrella', points: [[0, 0]], radiusM: R, heightM: 2, riseM: 0.4 }]));
    let zmax = -Infinity;
    for (let i = 2; i < c.scene.positions.length; i += 3) zmax = Math.max(zmax, c.scene.positions[i]!);
    expect(zmax).toBeCloseTo(2 + 0.4 + 0.003, 5);
  });
});
