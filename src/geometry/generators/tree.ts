/**
 * Trees at points: an opaque square trunk (a closed box up to the crown base) and an ellipsoidal
 * crown. The crown is NOT triangles: it goes into a `CrownSet`, a flat list of axis-aligned
 * ellipsoids with their seasonal transmittance, which the tracer treats as a semi-transparent
 * volume (src/trace/crowns.ts: Beer–Lambert attenuation by the chord length).
 */
import type { CrownSeason } from '../../physics/vegetation.ts';
import type { DeviceMesh } from './mesh.ts';

export interface TreeSpec {
  type: 'tree';
  name: string;
  trunkMaterial: string;
  /** Trunk foot positions x, y [m], with z (default 0) [m]. */
  points: [number, number, number][];
  /** Height from the foot to the crown's base [m]. */
  crownBaseM: number;
  /** Crown height (vertical axis of the ellipsoid) [m]. */
  crownHeightM: number;
  /** Crown radius (horizontal semi-axis) [m]. */
  crownRadiusM: number;
  /** Trunk width (square section) [m]. */
  trunkWidthM: number;
  /** Seasonal transmittance of the crown (days of year). */
  season: CrownSeason;
}

/** Numbers per crown in `CrownSet.ellipsoids`: centre x, y, z, semi-axes rx, ry, rz [m]. */
export const CROWN_SHAPE_FLOATS = 6;
/** Numbers per crown in `CrownSet.seasons`: summer τ, winter τ, leaf-on day, leaf-off day, transition days. */
export const CROWN_SEASON_FLOATS = 5;

/** Semi-transparent crowns in flat arrays (no object per crown in the hot path). */
export interface CrownSet {
  count: number;
  /** CROWN_SHAPE_FLOATS per crown: cx, cy, cz, rx, ry, rz [m] (axis-aligned ellipsoid). */
  ellipsoids: Float64Array;
  /** Union box of all crowns: min x, y, z, max x, y, z [m] (+∞/−∞ when empty). */
  bounds: Float64Array;
  /** CROWN_SEASON_FLOATS per crown (see CrownSeason). */
  seasons: Float64Array;
  /** Per crown: "<device name>/<k>" (k from 1). */
  names: string[];
  /** Per crown: index of its device in the devices list. */
  device: Int32Array;
}

/** Collects crowns before packing them. */
export class CrownCollector {
  private readonly shapes: number[] = [];
  private readonly seasons: number[] = [];
  private readonly names: string[] = [];
  private readonly devices: number[] = [];

  add(name: string, deviceIndex: number, cx: number, cy: number, cz: number, rx: number, ry: number, rz: number, season: CrownSeason): void {
    this.shapes.push(cx, cy, cz, rx, ry, rz);
    this.seasons.push(season.summerTransmittance, season.winterTransmittance, season.leafOnDayOfYear, season.leafOffDayOfYear, season.transitionDays);
    this.names.push(name);
    this.devices.push(deviceIndex);
  }

  build(): CrownSet {
    return makeCrownSet(this.shapes, this.seasons, this.names, this.devices);
  }
}

/** Packs crowns (e.g. for tests): shapes 6 per crown, seasons 5 per crown. */
export function makeCrownSet(shapes: readonly number[], seasons: readonly number[], names?: readonly string[], devices?: readonly number[]): CrownSet {
  const count = shapes.length / CROWN_SHAPE_FLOATS;
  const bounds = new Float64Array([Infinity, Infinity, Infinity, -Infinity, -Infinity, -Infinity]);
  for (let i = 0; i < count; i++) {
    const o = i * CROWN_SHAPE_FLOATS;
    for (let a = 0; a < 3; a++) {
      const c = shapes[o + a]!, r = shapes[o + 3 + a]!;
      if (c - r < bounds[a]!) bounds[a] = c - r;
      if (c + r > bounds[3 + a]!) bounds[3 + a] = c + r;
    }
  }
  return {
    count,
    ellipsoids: Float64Array.from(shapes),
    bounds,
    seasons: Float64Array.from(seasons),
    names: names ? [...names] : Array.from({ length: count }, (_, i) => `crown/${i + 1}`),
    device: devices ? Int32Array.from(devices) : new Int32Array(count).fill(-1),
  };
}

/** The season of crown i (allocates; not for hot loops). */
export function crownSeasonOf(crowns: CrownSet, i: number): CrownSeason {
  const o = i * CROWN_SEASON_FLOATS;
  const s = crowns.seasons;
  return { summerTransmittance: s[o]!, winterTransmittance: s[o + 1]!, leafOnDayOfYear: s[o + 2]!, leafOffDayOfYear: s[o + 3]!, transitionDays: s[o + 4]! };
}

/** Adds each tree's trunk (12 triangles, surface "<name>-trunk") to `mesh` and its crown to `crowns`. */
export function generateTrees(spec: TreeSpec, mesh: DeviceMesh, crowns: CrownCollector, deviceIndex: number): void {
  mesh.begin(`${spec.name}-trunk`, spec.trunkMaterial, 0, deviceIndex);
  const hw = spec.trunkWidthM / 2;
  spec.points.forEach(([x, y, z0], k) => {
    mesh.box(x, y, z0 + spec.crownBaseM / 2, 1, 0, 0, hw, 0, 1, 0, hw, 0, 0, 1, spec.crownBaseM / 2);
    const rz = spec.crownHeightM / 2;
    crowns.add(`${spec.name}/${k + 1}`, deviceIndex, x, y, z0 + spec.crownBaseM + rz, spec.crownRadiusM, spec.crownRadiusM, rz, spec.season);
  });
}
