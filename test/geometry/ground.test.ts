import { describe, it, expect } from 'vitest';
import { groundPlaneFromProject, heightAboveGroundM, rayGroundDistanceM, rayHitsGroundFromAbove } from '../../src/geometry/ground.ts';
import { InputError } from '../../src/physics/errors.ts';

describe('ground plane', () => {
  it('reads the project key, z defaults to 0, absent key gives undefined', () => {
    expect(groundPlaneFromProject({ material: 'grass', z: -0.5 })).toEqual({ material: 'grass', zM: -0.5 });
    expect(groundPlaneFromProject({ material: 'grass' })).toEqual({ material: 'grass', zM: 0 });
    expect(groundPlaneFromProject(undefined)).toBeUndefined();
    expect(() => groundPlaneFromProject({ z: 0 }, 'ground', 'p.json')).toThrow(InputError);
    expect(() => groundPlaneFromProject({ z: 0 }, 'ground', 'p.json')).toThrow(/p\.json: ground\.material/);
    expect(() => groundPlaneFromProject({ material: 'grass', z: '1' })).toThrow(/ground\.z/);
  });

  it('ray–plane distance: t = (z_g − z_o) / d_z, Infinity when parallel, away or too close', () => {
    const g = { material: 'grass', zM: 1 };
    // From (·, ·, 11) going down at 30° below the horizon: d_z = −sin 30° = −0.5 → t = 20.
    expect(rayGroundDistanceM(g, 11, -0.5)).toBeCloseTo(20, 12);
    expect(rayGroundDistanceM(g, 11, 0)).toBe(Infinity);
    expect(rayGroundDistanceM(g, 11, 0.3)).toBe(Infinity);
    expect(rayGroundDistanceM(g, 1, -1, 1e-6)).toBe(Infinity);
    expect(rayHitsGroundFromAbove(g, 11, -0.5)).toBe(true);
    expect(rayHitsGroundFromAbove(g, 0, 0.5)).toBe(false);
    expect(heightAboveGroundM(g, 2.5)).toBe(1.5);
  });
});
