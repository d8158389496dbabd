/**
 * Shading devices and trees (issue 6): the project file's `devices: [...]` list — its types, the
 * validator (errors name the key path, e.g. `devices[2].spacingM`) and the builder that turns the
 * list into generated geometry (closed thin solids, each device with its own surface and material
 * names) plus the crowns of trees (semi-transparent ellipsoids for the tracer, not triangles).
 *
 * Coordinates are the engine's (x east, y north, z up [m]); every z key is an engine z on the same
 * datum as the model, except heights of umbrellas and trees, which are above their foot point.
 * Angles in degrees; azimuths clockwise from north.
 */
import { InputError } from '../physics/errors.ts';
import { CROWN_PRESETS, crownPresetIds, parseMonthDay, shiftSeasonHalfYear, type CrownPresetId, type CrownSeason } from '../physics/vegetation.ts';
import type { SceneArrays } from './sceneArrays.ts';
import { DeviceMesh } from './generators/mesh.ts';
import { generateFins, type FinsSpec } from './generators/fins.ts';
import { generateSlats, type SlatsSpec } from './generators/slats.ts';
import { generateOverhang, type OverhangSpec } from './generators/overhang.ts';
import { generateCanopy, type CanopySpec } from './generators/canopy.ts';
import { generateUmbrellas, type UmbrellaSpec } from './generators/umbrella.ts';
import { CrownCollector, generateTrees, type CrownSet, type TreeSpec } from './generators/tree.ts';

export type { FinsSpec, SlatsSpec, OverhangSpec, CanopySpec, UmbrellaSpec, TreeSpec, CrownSet };

/** One validated device, every default filled in. */
export type DeviceSpec = FinsSpec | SlatsSpec | OverhangSpec | CanopySpec | UmbrellaSpec | TreeSpec;
export type DeviceType = DeviceSpec['type'];
export const DEVICE_TYPES: readonly DeviceType[] = ['fins', 'slats', 'overhang', 'canopy', 'umbrella', 'tree'];

/** Default materials (preset ids of src/physics/materials.ts). */
export const DEVICE_DEFAULT_MATERIALS = Object.freeze({
  fins: 'aluminium-anodised',
  slats: 'timber',
  overhang: 'concrete',
  canopy: 'steel-dark-painted',
  /** fabric (transmittance > 0) of overhangs, canopies and umbrellas: no fabric preset exists yet */
  fabric: 'paint-white',
  umbrellaPole: 'aluminium-anodised',
  trunk: 'timber',
});

/** Default solar transmittance of umbrella fabric [-] (from memory: dense woven canvas passes a few per cent). */
export const DEFAULT_UMBRELLA_TRANSMITTANCE = 0.05;

// ---------------------------------------------------------------------------------------------
// validation

class Check {
  constructor(readonly file: string | undefined) {}

  fail(place: string, problem: string, expected: string, value?: unknown): never {
    throw new InputError({ ...(this.file === undefined ? {} : { file: this.file }), place, problem, expected, value });
  }

  object(v: unknown, place: string): Record<string, unknown> {
    if (typeof v !== 'object' || v === null || Array.isArray(v)) this.fail(place, 'wrong type', 'an object', v);
    return v as Record<string, unknown>;
  }

  keys(o: Record<string, unknown>, place: string, known: readonly string[]): void {
    for (const k of Object.keys(o)) {
      if (!known.includes(k)) this.fail(`${place}.${k}`, 'unknown key', `one of ${known.join(', ')}`);
    }
  }

  num(o: Record<string, unknown>, key: string, place: string, opts: { min?: number; max?: number; above?: number; below?: number; integer?: boolean; def?: number; unit?: string }): number {
    const v = o[key];
    const p = `${place}.${key}`;
    const unit = opts.unit ? ` ${opts.unit}` : '';
    const parts: string[] = [];
    if (opts.min !== undefined) parts.push(`≥ ${opts.min}`);
    if (opts.above !== undefined) parts.push(`> ${opts.above}`);
    if (opts.max !== undefined) parts.push(`≤ ${opts.max}`);
    if (opts.below !== undefined) parts.push(`< ${opts.below}`);
    const expected = `a${opts.integer ? 'n integer' : ' number'}${parts.length ? ' ' + parts.join(' and ') : ''}${unit}`;
    if (v === undefined) {
      if (opts.def !== undefined) return opts.def;
      this.fail(p, 'missing', expected);
    }
    if (typeof v !== 'number' || !Number.isFinite(v)) this.fail(p, 'not a finite number', expected, v);
    const n = v as number;
    if (opts.integer && !Number.isInteger(n)) this.fail(p, 'not an integer', expected, v);
    if ((opts.min !== undefined && n < opts.min) || (opts.above !== undefined && n <= opts.above) ||
        (opts.max !== undefined && n > opts.max) || (opts.below !== undefined && n >= opts.below)) {
      this.fail(p, 'outside the valid range', expected, v);
    }
    return n;
  }

  str(o: Record<string, unknown>, key: string, place: string, def?: string): string {
    const v = o[key];
    if (v === undefined && def !== undefined) return def;
    if (typeof v !== 'string' || v.trim() === '') this.fail(`${place}.${key}`, v === undefined ? 'missing' : 'not a non-empty string', 'a non-empty string', v);
    return v as string;
  }

  point2(v: unknown, place: string): [number, number] {
    if (!Array.isArray(v) || v.length !== 2 || !v.every((c) => typeof c === 'number' && Number.isFinite(c))) {
      this.fail(place, v === undefined ? 'missing' : 'not a plan point', 'an array [x, y] of two finite numbers [m]', v);
    }
    return [v[0] as number, v[1] as number];
  }

  /** [x, y] or [x, y, z]; z defaults to 0. */
  point23(v: unknown, place: string): [number, number, number] {
    if (!Array.isArray(v) || (v.length !== 2 && v.length !== 3) || !v.every((c) => typeof c === 'number' && Number.isFinite(c))) {
      this.fail(place, 'not a point', 'an array [x, y] or [x, y, z] of finite numbers [m]', v);
    }
    return [v[0] as number, v[1] as number, (v[2] as number | undefined) ?? 0];
  }

  points(o: Record<string, unknown>, key: string, place: string): [number, number, number][] {
    const v = o[key];
    if (!Array.isArray(v) || v.length === 0) this.fail(`${place}.${key}`, v === undefined ? 'missing' : 'not a non-empty array', 'a non-empty array of [x, y] or [x, y, z] points [m]', v);
    return (v as unknown[]).map((p, k) => this.point23(p, `${place}.${key}[${k}]`));
  }
}

const COMMON_KEYS = ['type', 'name', 'material'] as const;
const WALL_KEYS = ['from', 'to', 'outside', 'outwardNormal'] as const;

interface Wall {
  from: [number, number];
  to: [number, number];
  outside: 'left' | 'right' | [number, number];
}

function wallOf(c: Check, o: Record<string, unknown>, place: string): Wall {
  const from = c.point2(o.from, `${place}.from`);
  const to = c.point2(o.to, `${place}.to`);
  const tx = to[0] - from[0], ty = to[1] - from[1];
  const len = Math.hypot(tx, ty);
  if (!(len >= 0.01)) c.fail(`${place}.to`, 'wall segment too short', 'a point at least 0.01 m from "from"', o.to);
  if (o.outside !== undefined && o.outwardNormal !== undefined) c.fail(`${place}.outwardNormal`, 'both "outside" and "outwardNormal" given', 'only one of them');
  if (o.outwardNormal !== undefined) {
    const n = c.point2(o.outwardNormal, `${place}.outwardNormal`);
    const nl = Math.hypot(n[0], n[1]);
    if (!(nl > 0) || Math.abs((n[0] * -ty + n[1] * tx) / (nl * len)) < 0.1) {
      c.fail(`${place}.outwardNormal`, 'not pointing to a side of the wall', 'a plan vector [nx, ny] across the segment (not along it)', o.outwardNormal);
    }
    return { from, to, outside: n };
  }
  if (o.outside !== 'left' && o.outside !== 'right') {
    c.fail(`${place}.outside`, o.outside === undefined ? 'missing' : 'not an accepted value', '"left" or "right" (of from → to seen from above), or give "outwardNormal": [nx, ny]', o.outside);
  }
  return { from, to, outside: o.outside as 'left' | 'right' };
}

function validateOne(c: Check, raw: unknown, place: string, name: string, southern: boolean): DeviceSpec {
  const o = c.object(raw, place);
  const type = o.type as DeviceType;
  const material = (def: string) => c.str(o, 'material', place, def);
  switch (type) {
    case 'fins': {
      c.keys(o, place, [...COMMON_KEYS, ...WALL_KEYS, 'bottomM', 'topM', 'depthM', 'spacingM', 'thicknessM', 'angleDeg', 'offsetM']);
      const wall = wallOf(c, o, place);
      const bottomM = c.num(o, 'bottomM', place, { unit: '[m]' });
      const topM = c.num(o, 'topM', place, { above: bottomM, unit: '[m] (above bottomM)' });
      const depthM = c.num(o, 'depthM', place, { above: 0, unit: '[m]' });
      const thicknessM = c.num(o, 'thicknessM', place, { min: 0.001, def: 0.02, unit: '[m]' });
      const angleDeg = c.num(o, 'angleDeg', place, { above: -85, below: 85, def: 0, unit: '[deg]' });
      const spacingM = c.num(o, 'spacingM', place, { above: thicknessM / Math.cos(angleDeg * Math.PI / 180), unit: '[m] (fins must not touch: spacing·cos(angle) > thickness)' });
      const offsetM = c.num(o, 'offsetM', place, { min: 0, def: 0, unit: '[m]' });
      return { type, name, material: material(DEVICE_DEFAULT_MATERIALS.fins), ...wall, bottomM, topM, depthM, spacingM, thicknessM, angleDeg, offsetM };
    }
    case 'slats': {
      const layout = o.layout === undefined ? (o.polygon !== undefined ? 'pergola' : 'screen') : o.layout;
      if (layout !== 'screen' && layout !== 'pergola') c.fail(`${place}.layout`, 'not an accepted value', '"screen" (in front of a wall) or "pergola" (over a polygon)', o.layout);
      const common = ['layout', 'depthM', 'spacingM', 'thicknessM', 'tiltDeg'];
      const depthM = () => c.num(o, 'depthM', place, { above: 0, unit: '[m]' });
      const thicknessM = () => c.num(o, 'thicknessM', place, { min: 0.001, def: 0.02, unit: '[m]' });
      const tiltDeg = () => c.num(o, 'tiltDeg', place, { min: -89, max: 89, def: 0, unit: '[deg]' });
      if (layout === 'screen') {
        c.keys(o, place, [...COMMON_KEYS, ...WALL_KEYS, ...common, 'bottomM', 'topM', 'standoffM']);
        const wall = wallOf(c, o, place);
        const d = depthM(), t = thicknessM(), tilt = tiltDeg();
        const bottomM = c.num(o, 'bottomM', place, { unit: '[m]' });
        const topM = c.num(o, 'topM', place, { above: bottomM, unit: '[m] (above bottomM)' });
        const spacingM = c.num(o, 'spacingM', place, { above: t, unit: '[m] (more than thicknessM)' });
        // a tilted blade reaches back by (d/2)(1 − cos) + (t/2) sin toward the wall
        const tr = Math.abs(tilt) * Math.PI / 180;
        const reach = (d / 2) * (1 - Math.cos(tr)) + (t / 2) * Math.sin(tr);
        const standoffM = c.num(o, 'standoffM', place, { above: reach, def: Math.max(0.1, reach + 0.01), unit: '[m] (tilted blades must clear the wall)' });
        return { type, layout, name, material: material(DEVICE_DEFAULT_MATERIALS.slats), ...wall, bottomM, topM, standoffM, depthM: d, spacingM, thicknessM: t, tiltDeg: tilt };
      }
      c.keys(o, place, [...COMMON_KEYS, ...common, 'polygon', 'heightM', 'slatAzimuthDeg']);
      const pv = o.polygon;
      if (!Array.isArray(pv) || pv.length < 3) c.fail(`${place}.polygon`, pv === undefined ? 'missing' : 'not a polygon', 'an array of at least 3 [x, y] points [m]', pv);
      const polygon = (pv as unknown[]).map((p, k) => c.point2(p, `${place}.polygon[${k}]`));
      let area2 = 0;
      for (let k = 0; k < polygon.length; k++) {
        const [x0, y0] = polygon[k]!, [x1, y1] = polygon[(k + 1) % polygon.length]!;
        area2 += x0 * y1 - x1 * y0;
      }
      if (!(Math.abs(area2) > 1e-6)) c.fail(`${place}.polygon`, 'zero area', 'a polygon enclosing an area', pv);
      const d = depthM(), t = thicknessM(), tilt = tiltDeg();
      const spacingM = c.num(o, 'spacingM', place, { above: d * Math.cos(tilt * Math.PI / 180), unit: '[m] (blades must not touch: more than depthM·cos(tilt))' });
      const heightM = c.num(o, 'heightM', place, { unit: '[m]' });
      const slatAzimuthDeg = c.num(o, 'slatAzimuthDeg', place, { min: -360, max: 360, def: 90, unit: '[deg]' });
      return { type, layout, name, material: material(DEVICE_DEFAULT_MATERIALS.slats), polygon, heightM, slatAzimuthDeg, depthM: d, spacingM, thicknessM: t, tiltDeg: tilt };
    }
    case 'overhang': {
      c.keys(o, place, [...COMMON_KEYS, ...WALL_KEYS, 'heightM', 'projectionM', 'tiltDeg', 'thicknessM', 'transmittance']);
      const wall = wallOf(c, o, place);
      const heightM = c.num(o, 'heightM', place, { unit: '[m]' });
      const projectionM = c.num(o, 'projectionM', place, { above: 0, unit: '[m]' });
      const tiltDeg = c.num(o, 'tiltDeg', place, { above: -80, below: 80, def: 0, unit: '[deg]' });
      const transmittance = c.num(o, 'transmittance', place, { min: 0, below: 1, def: 0, unit: '[-]' });
      const thicknessM = c.num(o, 'thicknessM', place, { min: 0.001, def: transmittance > 0 ? 0.002 : 0.1, unit: '[m]' });
      const mat = material(transmittance > 0 ? DEVICE_DEFAULT_MATERIALS.fabric : DEVICE_DEFAULT_MATERIALS.overhang);
      return { type, name, material: mat, ...wall, heightM, projectionM, tiltDeg, thicknessM, transmittance };
    }
    case 'canopy': {
      c.keys(o, place, [...COMMON_KEYS, 'center', 'heightM', 'widthM', 'depthM', 'azimuthDeg', 'tiltDeg', 'thicknessM', 'transmittance']);
      const center = c.point2(o.center, `${place}.center`);
      const heightM = c.num(o, 'heightM', place, { unit: '[m]' });
      const widthM = c.num(o, 'widthM', place, { above: 0, unit: '[m]' });
      const depthM = c.num(o, 'depthM', place, { above: 0, unit: '[m]' });
      const azimuthDeg = c.num(o, 'azimuthDeg', place, { min: -360, max: 360, def: 90, unit: '[deg]' });
      const tiltDeg = c.num(o, 'tiltDeg', place, { above: -80, below: 80, def: 0, unit: '[deg]' });
      const transmittance = c.num(o, 'transmittance', place, { min: 0, below: 1, def: 0, unit: '[-]' });
      const thicknessM = c.num(o, 'thicknessM', place, { min: 0.001, def: transmittance > 0 ? 0.002 : 0.1, unit: '[m]' });
      const mat = material(transmittance > 0 ? DEVICE_DEFAULT_MATERIALS.fabric : DEVICE_DEFAULT_MATERIALS.canopy);
      return { type, name, material: mat, center, heightM, widthM, depthM, azimuthDeg, tiltDeg, thicknessM, transmittance };
    }
    case 'umbrella': {
      c.keys(o, place, [...COMMON_KEYS, 'points', 'radiusM', 'heightM', 'riseM', 'thicknessM', 'transmittance', 'poleWidthM', 'poleMaterial', 'segments']);
      const points = c.points(o, 'points', place);
      const radiusM = c.num(o, 'radiusM', place, { above: 0, unit: '[m]' });
      const heightM = c.num(o, 'heightM', place, { above: 0, def: 2.2, unit: '[m]' });
      const riseM = c.num(o, 'riseM', place, { min: 0, max: radiusM, def: 0, unit: '[m] (at most radiusM)' });
      const thicknessM = c.num(o, 'thicknessM', place, { min: 0.001, def: 0.003, unit: '[m]' });
      const transmittance = c.num(o, 'transmittance', place, { min: 0, below: 1, def: DEFAULT_UMBRELLA_TRANSMITTANCE, unit: '[-]' });
      const poleWidthM = c.num(o, 'poleWidthM', place, { above: 0, below: radiusM, def: Math.min(0.05, radiusM / 2), unit: '[m] (less than radiusM)' });
      const segments = c.num(o, 'segments', place, { min: 6, max: 256, integer: true, def: 24 });
      return {
        type, name, material: material(DEVICE_DEFAULT_MATERIALS.fabric), poleMaterial: c.str(o, 'poleMaterial', place, DEVICE_DEFAULT_MATERIALS.umbrellaPole),
        points, radiusM, heightM, riseM, thicknessM, transmittance, poleWidthM, segments,
      };
    }
    case 'tree': {
      c.keys(o, place, ['type', 'name', 'trunkMaterial', 'points', 'crownBaseM', 'crownHeightM', 'crownRadiusM', 'trunkWidthM', 'crown',
        'summerTransmittance', 'winterTransmittance', 'leafOnDate', 'leafOffDate', 'transitionDays']);
      const points = c.points(o, 'points', place);
      const crownBaseM = c.num(o, 'crownBaseM', place, { above: 0, unit: '[m]' });
      const crownHeightM = c.num(o, 'crownHeightM', place, { above: 0, unit: '[m]' });
      const crownRadiusM = c.num(o, 'crownRadiusM', place, { above: 0, unit: '[m]' });
      const trunkWidthM = c.num(o, 'trunkWidthM', place, { above: 0, below: 2 * crownRadiusM, def: Math.min(0.3, crownRadiusM), unit: '[m]' });
      const presetId = (o.crown ?? 'deciduous-open') as CrownPresetId;
      if (!crownPresetIds().includes(presetId)) c.fail(`${place}.crown`, 'unknown crown kind', `one of ${crownPresetIds().map((s) => JSON.stringify(s)).join(', ')}`, o.crown);
      const preset = CROWN_PRESETS[presetId];
      const summerTransmittance = c.num(o, 'summerTransmittance', place, { above: 0, max: 1, def: preset.summerTransmittance, unit: '[-]' });
      const winterTransmittance = c.num(o, 'winterTransmittance', place, { above: 0, max: 1, def: preset.winterTransmittance, unit: '[-]' });
      const date = (key: 'leafOnDate' | 'leafOffDate') => {
        const v = o[key] ?? preset[key];
        const d = typeof v === 'string' ? parseMonthDay(v) : undefined;
        if (d === undefined) c.fail(`${place}.${key}`, 'not a month-day date', 'a date "MM-DD" (e.g. "05-01")', v);
        return d;
      };
      const leafOnDayOfYear = date('leafOnDate'), leafOffDayOfYear = date('leafOffDate');
      if (leafOnDayOfYear === leafOffDayOfYear) c.fail(`${place}.leafOffDate`, 'same as leafOnDate', 'a different date');
      const inLeaf = (((leafOffDayOfYear - leafOnDayOfYear) % 365) + 365) % 365;
      const transitionDays = c.num(o, 'transitionDays', place, { min: 0, max: Math.min(inLeaf, 365 - inLeaf), def: preset.transitionDays, unit: '[days] (at most the shorter season)' });
      let season: CrownSeason = { summerTransmittance, winterTransmittance, leafOnDayOfYear, leafOffDayOfYear, transitionDays };
      // preset dates are northern temperate; move them half a year for a southern site
      if (southern && o.leafOnDate === undefined && o.leafOffDate === undefined) season = shiftSeasonHalfYear(season);
      return { type, name, trunkMaterial: c.str(o, 'trunkMaterial', place, DEVICE_DEFAULT_MATERIALS.trunk), points, crownBaseM, crownHeightM, crownRadiusM, trunkWidthM, season };
    }
    default:
      return c.fail(`${place}.type`, o.type === undefined ? 'missing' : 'unknown device type', `one of ${DEVICE_TYPES.map((s) => JSON.stringify(s)).join(', ')}`, o.type);
  }
}

export interface ValidateDevicesOptions {
  /** Site latitude [deg]; below 0 moves the crown presets' leaf dates by half a year. */
  latitudeDeg?: number;
  /** Key path of the list (default "devices"). */
  place?: string;
}

/**
 * Checks a project's `devices` value and fills the defaults. Throws InputError naming the file and
 * the key path (`devices[2].spacingM`) with what was expected.
 * @param raw the parsed JSON value (undefined gives [])
 * @param file the project file's name, for the messages
 */
export function validateDevices(raw: unknown, file?: string, opts: ValidateDevicesOptions = {}): DeviceSpec[] {
  const place = opts.place ?? 'devices';
  const c = new Check(file);
  if (raw === undefined) return [];
  if (!Array.isArray(raw)) c.fail(place, 'wrong type', 'an array of devices', raw);
  const southern = (opts.latitudeDeg ?? 0) < 0;
  const used = new Set<string>();
  const perType = new Map<string, number>();
  return (raw as unknown[]).map((d, i) => {
    const p = `${place}[${i}]`;
    const o = c.object(d, p);
    let name: string;
    if (o.name !== undefined) {
      name = c.str(o, 'name', p);
      if (used.has(name)) c.fail(`${p}.name`, 'name used by an earlier device', 'a name unique among the devices', name);
    } else {
      const t = typeof o.type === 'string' ? o.type : 'device';
      let k = perType.get(t) ?? 0;
      do { k++; name = `${t}-${k}`; } while (used.has(name));
      perType.set(t, k);
    }
    used.add(name);
    return validateOne(c, o, p, name, southern);
  });
}

// ---------------------------------------------------------------------------------------------
// build

/** What `buildDevices` returns. All per-triangle arrays follow `scene`'s triangles. */
export interface DeviceBuild {
  /** The device triangles (after the base scene's, when one was given). */
  scene: SceneArrays;
  /** Per triangle: solar transmittance of the sheet it belongs to, 0 = opaque [-]. See `sheetTransmittance` (trace/crowns.ts). */
  triangleTransmittance: Float32Array;
  /** Per surface of `scene`: the same transmittance (survives patch subdivision by surface id) [-]. */
  surfaceTransmittance: Float32Array;
  /** Per triangle: 1 where transmittance > 0 — the skip mask for the OPAQUE test (isOccludedMasked). */
  skipSemiTransparent: Uint8Array;
  /** Per triangle: 1 where transmittance = 0 — the skip mask for walking the fabric sheets. */
  skipOpaque: Uint8Array;
  /** True when any triangle is semi-transparent. */
  hasSemiTransparent: boolean;
  /** Per triangle: index of its device in the list, −1 for the base scene's triangles. */
  triangleDevice: Int32Array;
  /** Device d's triangles are [deviceTriangleStart[d], deviceTriangleStart[d + 1]) of `scene`. */
  deviceTriangleStart: Uint32Array;
  /** Per device: box min x, y, z, max x, y, z [m] of its triangles and crowns (6 per device). */
  deviceBounds: Float64Array;
  /** Triangles before the first device triangle (the base scene's count, or 0). */
  firstDeviceTriangle: number;
  /** Tree crowns (semi-transparent volumes for trace/crowns.ts). */
  crowns: CrownSet;
}

/**
 * Generates every device's geometry. With `base`, returns base + devices as one scene (device
 * surface names made unique against the base's with a "#n" suffix, material names shared by name).
 * @param devices validated devices (validateDevices)
 * @param base optional scene to append to
 */
export function buildDevices(devices: readonly DeviceSpec[], base?: SceneArrays): DeviceBuild {
  const mesh = new DeviceMesh();
  const crowns = new CrownCollector();
  const starts = new Uint32Array(devices.length + 1);
  devices.forEach((d, i) => {
    starts[i] = mesh.triangleCount;
    switch (d.type) {
      case 'fins': generateFins(d, mesh, i); break;
      case 'slats': generateSlats(d, mesh, i); break;
      case 'overhang': generateOverhang(d, mesh, i); break;
      case 'canopy': generateCanopy(d, mesh, i); break;
      case 'umbrella': generateUmbrellas(d, mesh, i); break;
      case 'tree': generateTrees(d, mesh, crowns, i); break;
    }
  });
  starts[devices.length] = mesh.triangleCount;
  const crownSet = crowns.build();

  const baseTris = base ? base.indices.length / 3 : 0;
  const baseVerts = base ? base.positions.length / 3 : 0;
  const devTris = mesh.triangleCount;
  const total = baseTris + devTris;

  const positions = new Float32Array((baseVerts + mesh.positions.length / 3) * 3);
  if (base) positions.set(base.positions, 0);
  for (let k = 0; k < mesh.positions.length; k++) positions[baseVerts * 3 + k] = mesh.positions[k]!;
  const indices = new Uint32Array(total * 3);
  if (base) indices.set(base.indices, 0);
  for (let k = 0; k < mesh.indices.length; k++) indices[baseTris * 3 + k] = mesh.indices[k]! + baseVerts;

  const surfaceNames = base ? [...base.surfaceNames] : [];
  const usedNames = new Set(surfaceNames);
  const warnings = base ? [...base.warnings] : [];
  const surfaceRemap = mesh.surfaceNames.map((name) => {
    let unique = name;
    for (let n = 2; usedNames.has(unique); n++) unique = `${name}#${n}`;
    if (unique !== name) warnings.push(`device surface "${name}" renamed "${unique}" (the model has a surface of that name)`);
    usedNames.add(unique);
    surfaceNames.push(unique);
    return surfaceNames.length - 1;
  });
  const materialNames = base ? [...base.materialNames] : [];
  const materialRemap = mesh.materialNames.map((name) => {
    const at = materialNames.indexOf(name);
    if (at >= 0) return at;
    materialNames.push(name);
    return materialNames.length - 1;
  });

  const surfaceIds = new Uint32Array(total);
  const materialIds = new Uint32Array(total);
  if (base) { surfaceIds.set(base.surfaceIds, 0); materialIds.set(base.materialIds, 0); }
  const triangleTransmittance = new Float32Array(total);
  const skipSemiTransparent = new Uint8Array(total);
  const skipOpaque = new Uint8Array(total).fill(1);
  const triangleDevice = new Int32Array(total).fill(-1);
  let hasSemiTransparent = false;
  for (let t = 0; t < devTris; t++) {
    const g = baseTris + t;
    surfaceIds[g] = surfaceRemap[mesh.triSurface[t]!]!;
    materialIds[g] = materialRemap[mesh.triMaterial[t]!]!;
    const tau = mesh.triTransmittance[t]!;
    triangleTransmittance[g] = tau;
    if (tau > 0) { skipSemiTransparent[g] = 1; skipOpaque[g] = 0; hasSemiTransparent = true; }
    triangleDevice[g] = mesh.triDevice[t]!;
  }
  const surfaceTransmittance = new Float32Array(surfaceNames.length);
  mesh.surfaceTransmittance.forEach((tau, s) => { surfaceTransmittance[surfaceRemap[s]!] = tau; });

  const deviceBounds = new Float64Array(devices.length * 6);
  for (let d = 0; d < devices.length; d++) {
    deviceBounds.set([Infinity, Infinity, Infinity, -Infinity, -Infinity, -Infinity], d * 6);
  }
  for (let t = 0; t < devTris; t++) {
    const o = mesh.triDevice[t]! * 6;
    for (let v = 0; v < 3; v++) {
      const p = mesh.indices[t * 3 + v]! * 3;
      for (let a = 0; a < 3; a++) {
        const x = mesh.positions[p + a]!;
        if (x < deviceBounds[o + a]!) deviceBounds[o + a] = x;
        if (x > deviceBounds[o + 3 + a]!) deviceBounds[o + 3 + a] = x;
      }
    }
  }
  for (let k = 0; k < crownSet.count; k++) {
    const o = crownSet.device[k]! * 6;
    for (let a = 0; a < 3; a++) {
      const c = crownSet.ellipsoids[k * 6 + a]!, r = crownSet.ellipsoids[k * 6 + 3 + a]!;
      if (c - r < deviceBounds[o + a]!) deviceBounds[o + a] = c - r;
      if (c + r > deviceBounds[o + 3 + a]!) deviceBounds[o + 3 + a] = c + r;
    }
  }
  for (let d = 0; d <= devices.length; d++) starts[d] = starts[d]! + baseTris;

  return {
    scene: { positions, indices, surfaceIds, materialIds, surfaceNames, materialNames, warnings },
    triangleTransmittance,
    surfaceTransmittance,
    skipSemiTransparent,
    skipOpaque,
    hasSemiTransparent,
    triangleDevice,
    deviceTriangleStart: starts,
    deviceBounds,
    firstDeviceTriangle: baseTris,
    crowns: crownSet,
  };
}
