import { describe, it, expect } from 'vitest';
import { buildDevices, validateDevices } from '../../../src/geometry/devices.ts';
import { InputError } from '../../../src/physics/errors.ts';
import type { SceneArrays } from '../../../src/geometry/sceneArrays.ts';

const wall = { from: [0, 0], to: [10, 0], outside: 'right' };
const fin = { type: 'fins', ...wall, bottomM: 0, topM: 3, depthM: 0.5, spacingM: 1 };

function placeOf(raw: unknown): string | undefined {
  try {
    validateDevices(raw, 'project.json');
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    expect((e as InputError).message).toContain('project.json');
    return (e as InputError).place;
  }
  return undefined;
}

describe('validateDevices: bad specs name devices[i].key', () => {
  it.each([
    [[fin, { ...fin, spacingM: undefined }], 'devices[1].spacingM'],
    [[{ ...fin, spacingM: 0.01 }], 'devices[0].spacingM'],
    [[{ ...fin, depthM: -1 }], 'devices[0].depthM'],
    [[{ ...fin, topM: -1 }], 'devices[0].topM'],
    [[{ ...fin, angleDeg: 90 }], 'devices[0].angleDeg'],
    [[{ ...fin, outside: 'up' }], 'devices[0].outside'],
    [[{ ...fin, outside: undefined, outwardNormal: [1, 0] }], 'devices[0].outwardNormal'],
    [[{ ...fin, to: [0, 0] }], 'devices[0].to'],
    [[{ ...fin, spacing: 1 }], 'devices[0].spacing'],
    [[{ ...fin, type: 'fin' }], 'devices[0].type'],
    [[fin, 'x'], 'devices[1]'],
    [[{ ...fin, name: 'a' }, { ...fin, name: 'a' }], 'devices[1].name'],
    [[{ type: 'slats', layout: 'pergola', polygon: [[0, 0], [1, 0]], heightM: 3, depthM: 0.1, spacingM: 0.3 }], 'devices[0].polygon'],
    [[{ type: 'overhang', ...wall, heightM: 3, projectionM: 1, transmittance: 1.2 }], 'devices[0].transmittance'],
    [[{ type: 'umbrella', points: [], radiusM: 1 }], 'devices[0].points'],
    [[{ type: 'umbrella', points: [[0, 0, 0, 0]], radiusM: 1 }], 'devices[0].points[0]'],
    [[{ type: 'tree', points: [[0, 0]], crownBaseM: 2, crownHeightM: 4, crownRadiusM: 2, leafOnDate: '13-01' }], 'devices[0].leafOnDate'],
    [[{ type: 'tree', points: [[0, 0]], crownBaseM: 2, crownHeightM: 4, crownRadiusM: 2, crown: 'palm' }], 'devices[0].crown'],
    [[{ type: 'tree', points: [[0, 0]], crownBaseM: 2, crownHeightM: 4, crownRadiusM: 2, summerTransmittance: 0 }], 'devices[0].summerTransmittance'],
    [[{ type: 'tree', points: [[0, 0]], crownBaseM: 2, crownHeightM: 4, crownRadiusM: 2, transitionDays: 300 }], 'devices[0].transitionDays'],
    [{ type: 'fins' }, 'devices'],
  ])('%# → %s', (raw, place) => {
    expect(placeOf(raw)).toBe(place);
  });
  it('a good list passes, with defaults filled and names per type', () => {
    const d = validateDevices([fin, fin, { type: 'tree', points: [[0, 0]], crownBaseM: 2, crownHeightM: 4, crownRadiusM: 2 }], 'p.json');
    expect(d.map((x) => x.name)).toEqual(['fins-1', 'fins-2', 'tree-1']);
    const f = d[0]!;
    if (f.type !== 'fins') throw new Error('not fins');
    expect([f.thicknessM, f.angleDeg, f.offsetM, f.material]).toEqual([0.02, 0, 0, 'aluminium-anodised']);
    expect(validateDevices(undefined)).toEqual([]);
  });
});

describe('buildDevices appended to a base scene', () => {
  const base: SceneArrays = {
    positions: new Float32Array([0, 0, 0, 1, 0, 0, 0, 1, 0]),
    indices: new Uint32Array([0, 1, 2]),
    surfaceIds: new Uint32Array([0]),
    materialIds: new Uint32Array([0]),
    surfaceNames: ['fins-1'],
    materialNames: ['timber'],
    warnings: [],
  };
  const devices = validateDevices([fin, { type: 'slats', ...wall, bottomM: 0, topM: 1, depthM: 0.1, spacingM: 0.5, standoffM: 0.6 }]);
  const b = buildDevices(devices, base);
  it('offsets, unique names, shared material names, per-device ranges', () => {
    expect(b.firstDeviceTriangle).toBe(1);
    expect(b.scene.indices.length / 3).toBe(1 + 11 * 12 + 2 * 12);
    expect(Array.from(b.deviceTriangleStart)).toEqual([1, 1 + 132, 1 + 132 + 24]);
    expect(b.scene.surfaceNames).toEqual(['fins-1', 'fins-1#2', 'slats-1']);
    expect(b.scene.materialNames).toEqual(['timber', 'aluminium-anodised']);
    expect(b.scene.warnings.length).toBe(1);
    expect(b.triangleDevice[0]).toBe(-1);
    expect(b.triangleDevice[1]).toBe(0);
    expect(b.triangleDevice[b.scene.indices.length / 3 - 1]).toBe(1);
    expect(b.scene.materialIds[b.scene.indices.length / 3 - 1]).toBe(0); // slats default timber = base's id 0
    // every index points at an existing vertex; the base vertices are untouched
    const nv = b.scene.positions.length / 3;
    expect(Math.max(...b.scene.indices)).toBeLessThan(nv);
    expect(Array.from(b.scene.positions.subarray(0, 9))).toEqual(Array.from(base.positions));
    expect(b.skipOpaque[0]).toBe(1);
    expect(b.hasSemiTransparent).toBe(false);
  });
  it('no devices: an empty device scene and no crowns', () => {
    const e = buildDevices([]);
    expect(e.scene.indices.length).toBe(0);
    expect(e.crowns.count).toBe(0);
  });
});
