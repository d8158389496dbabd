import { describe, it, expect } from 'vitest';
import { buildDevices, validateDevices } from '../../../src/geometry/devices.ts';
import { buildBvh } from '../../../src/trace/bvh/build.ts';
import { isOccluded } from '../../../src/trace/bvh/query.ts';
import { areaM2, isClosed, signedVolumeM3, sunDirection, DEG } from './meshChecks.ts';

// A south façade: wall from (0,0) to (10,0); the right of east is south (outward normal −y).
const D = 0.5, S = 1.0, T = 0.05, H = 3;
const fins = (extra: Record<string, unknown> = {}) =>
  buildDevices(validateDevices([{ type: 'fins', from: [0, 0], to: [10, 0], outside: 'right', bottomM: 0, topM: H, depthM: D, spacingM: S, thicknessM: T, ...extra }], 'p.json'));

describe('fins: generated geometry', () => {
  const b = fins();
  it('count, triangles, surface and material names', () => {
    // floor(10 / 1) + 1 = 11 fins centred on the segment, 12 triangles each (closed boxes)
    expect(b.scene.indices.length / 3).toBe(11 * 12);
    expect(b.scene.surfaceNames).toEqual(['fins-1']);
    expect(b.scene.materialNames).toEqual(['aluminium-anodised']);
    expect(Array.from(b.triangleTransmittance).every((t) => t === 0)).toBe(true);
  });
  it('each fin is a closed outward box with the closed-form area and volume', () => {
    for (let j = 0; j < 11; j++) {
      const t0 = j * 12, t1 = t0 + 12;
      expect(isClosed(b.scene, t0, t1)).toBe(true);
      // source: common practice (box surface 2(hd + ht + dt), volume h·d·t); float32 vertices
      expect(areaM2(b.scene, t0, t1)).toBeCloseTo(2 * (H * D + H * T + D * T), 4);
      expect(signedVolumeM3(b.scene, t0, t1)).toBeCloseTo(H * D * T, 5);
    }
  });
  it('fins are spaced spacingM apart, stand out depthM to the south', () => {
    const p = b.scene.positions;
    const centres: number[] = [];
    for (let j = 0; j < 11; j++) {
      let sx = 0, ymin = Infinity, ymax = -Infinity;
      for (let k = j * 12 * 3; k < (j + 1) * 12 * 3; k++) {
        const v = b.scene.indices[k]! * 3;
        sx += p[v]!; ymin = Math.min(ymin, p[v + 1]!); ymax = Math.max(ymax, p[v + 1]!);
      }
      centres.push(sx / 36);
      expect(ymax).toBeCloseTo(0, 6);
      expect(ymin).toBeCloseTo(-D, 6);
    }
    for (let j = 1; j < 11; j++) expect(centres[j]! - centres[j - 1]!).toBeCloseTo(S, 5);
    expect(centres[0]).toBeCloseTo(0, 5);
  });
});

describe('fins: shade by closed-form plan geometry', () => {
  const b = fins();
  const bvh = buildBvh(b.scene.positions, b.scene.indices);
  const eps = 0.01;
  // A point on the wall midway between the fins at x = 5 and 6. The ray toward a sun whose azimuth
  // differs from the wall normal's by the horizontal shadow angle h runs along the wall by tan h per
  // metre out; it meets the next fin's face (S/2 − T/2 away) within the depth D − eps iff
  // (D − eps)·tan h >= S/2 − T/2. source: common practice (shadow-angle geometry of vertical fins)
  const hCrit = Math.atan((S / 2 - T / 2) / (D - eps)) / DEG;
  const blocked = (hDeg: number, altDeg: number) => {
    const [dx, dy, dz] = sunDirection(altDeg, 180 + hDeg);
    return isOccluded(bvh, 5.5, -eps, 1.5, dx, dy, dz, 1e-6, Infinity);
  };
  it('lit below the cutoff shadow angle, shaded above (both sides)', () => {
    expect(hCrit).toBeGreaterThan(40);
    for (const alt of [15, 40]) {
      expect(blocked(hCrit - 2, alt)).toBe(false);
      expect(blocked(hCrit + 2, alt)).toBe(true);
      expect(blocked(-(hCrit - 2), alt)).toBe(false);
      expect(blocked(-(hCrit + 2), alt)).toBe(true);
    }
    expect(blocked(0, 60)).toBe(false); // noon: sun square to the wall, between the fins
  });
  it('fins turned 45° from the normal shade the wall behind them at noon', () => {
    const bt = fins({ angleDeg: 45 });
    const bvhT = buildBvh(bt.scene.positions, bt.scene.indices);
    const [dx, dy, dz] = sunDirection(50, 180); // noon: due south
    // the fin rooted at x = 5 leans toward +x: at noon its shadow on the wall is x in ≈ [5, 5 + D sin 45°]
    // source: common practice (plan projection of a slanted fin along the normal)
    const lean = D * Math.sin(45 * DEG);
    expect(isOccluded(bvhT, 5 + lean / 2, -eps, 1.5, dx, dy, dz, 1e-6, Infinity)).toBe(true);
    expect(isOccluded(bvhT, 5 + lean + 0.15, -eps, 1.5, dx, dy, dz, 1e-6, Infinity)).toBe(false);
    expect(isOccluded(bvhT, 5 - 0.15, -eps, 1.5, dx, dy, dz, 1e-6, Infinity)).toBe(false);
  });
});
