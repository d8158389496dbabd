import { describe, it, expect } from 'vitest';
import { buildDevices, validateDevices } from '../../../src/geometry/devices.ts';
import { crownSeasonOf } from '../../../src/geometry/generators/tree.ts';
import { CROWN_PRESETS } from '../../../src/physics/vegetation.ts';
import { isClosed } from './meshChecks.ts';

describe('trees', () => {
  const b = buildDevices(validateDevices([{ type: 'tree', points: [[4, 5], [10, 5, 0.3]], crownBaseM: 2.5, crownHeightM: 5, crownRadiusM: 2, crown: 'deciduous-dense' }]));
  it('a closed opaque trunk per tree up to the crown base, no crown triangles', () => {
    expect(b.scene.indices.length / 3).toBe(24);
    expect(isClosed(b.scene)).toBe(true);
    expect(b.scene.surfaceNames).toEqual(['tree-1-trunk']);
    let zmax = -Infinity;
    for (let i = 2; i < b.scene.positions.length; i += 3) zmax = Math.max(zmax, b.scene.positions[i]!);
    expect(zmax).toBeCloseTo(0.3 + 2.5, 5);
  });
  it('crowns as ellipsoids: centre at base + crownBase + height/2, semi-axes r, r, h/2', () => {
    expect(b.crowns.count).toBe(2);
    expect(Array.from(b.crowns.ellipsoids)).toEqual([4, 5, 5, 2, 2, 2.5, 10, 5, 5.3, 2, 2, 2.5]);
    expect(b.crowns.names).toEqual(['tree-1/1', 'tree-1/2']);
    expect(Array.from(b.crowns.bounds)).toEqual([2, 3, 2.5, 12, 7, 7.8]);
    const s = crownSeasonOf(b.crowns, 1);
    expect(s.summerTransmittance).toBe(CROWN_PRESETS['deciduous-dense'].summerTransmittance);
    expect(s.leafOnDayOfYear).toBe(121);
    expect(s.leafOffDayOfYear).toBe(305);
  });
  it('device bounds include the crowns', () => {
    expect(Array.from(b.deviceBounds)).toEqual([2, 3, 0, 12, 7, 7.8]);
  });
  it('southern sites move the preset dates half a year; given dates stay', () => {
    const s = validateDevices([{ type: 'tree', points: [[0, 0]], crownBaseM: 2, crownHeightM: 4, crownRadiusM: 2 }], undefined, { latitudeDeg: -34 });
    const own = validateDevices([{ type: 'tree', points: [[0, 0]], crownBaseM: 2, crownHeightM: 4, crownRadiusM: 2, leafOnDate: '10-15', leafOffDate: '04-30' }], undefined, { latitudeDeg: -34 });
    if (s[0]!.type !== 'tree' || own[0]!.type !== 'tree') throw new Error('not a tree');
    expect(s[0]!.season.leafOnDayOfYear).toBe(121 + 182);
    expect(s[0]!.season.leafOffDayOfYear).toBe(305 + 182 - 365);
    expect(own[0]!.season.leafOnDayOfYear).toBe(288);
    expect(own[0]!.season.leafOffDayOfYear).toBe(120);
  });
});
