/**
 * The project's designs as the viewer edits them: the baseline (project `devices`, `baselineName`)
 * and the options (`options[i]`: name, notes, devices, materials). Pure reducers over the raw
 * document; the audit's `validateProject` checks the result before a run.
 */
import type { ProjectDoc } from './projectDoc.ts';
import { DEVICE_TYPES, type DeviceType } from '../../geometry/devices.ts';

/** A device as written in the project file (before defaults are filled in). */
export type DeviceDoc = Record<string, unknown> & { type: string; name?: string };

export interface OptionDoc {
  name: string;
  notes?: string;
  devices?: DeviceDoc[];
  materials?: Record<string, unknown>;
}

/** The design fields of a document (ProjectDoc keeps unknown keys as they were read). */
export interface DesignFields {
  devices?: DeviceDoc[];
  baselineName?: string;
  options?: OptionDoc[];
  viewpoints?: unknown[];
}

function fields(doc: ProjectDoc): DesignFields {
  return doc as ProjectDoc & DesignFields;
}

/** The default baseline name of the audit (src/audit/project.ts). */
export const DEFAULT_BASELINE_NAME = 'baseline';

export function baselineName(doc: ProjectDoc): string {
  return fields(doc).baselineName ?? DEFAULT_BASELINE_NAME;
}

/** Design names: the baseline first, then the options in order. */
export function designNames(doc: ProjectDoc): string[] {
  return [baselineName(doc), ...(fields(doc).options ?? []).map((o) => o.name)];
}

/** Index of the option called `name` (−1 for the baseline or an unknown name). */
export function optionIndex(doc: ProjectDoc, name: string): number {
  return (fields(doc).options ?? []).findIndex((o) => o.name === name);
}

/** The devices a design adds itself (the baseline's own for the baseline). */
export function ownDevices(doc: ProjectDoc, design: string): DeviceDoc[] {
  const i = optionIndex(doc, design);
  return i < 0 ? (fields(doc).devices ?? []) : (fields(doc).options?.[i]?.devices ?? []);
}

/** Every device standing in a design: the baseline's, then the option's own. */
export function designDevices(doc: ProjectDoc, design: string): DeviceDoc[] {
  const base = fields(doc).devices ?? [];
  return optionIndex(doc, design) < 0 ? base : [...base, ...ownDevices(doc, design)];
}

/** Replaces the devices a design adds (the option's `devices`, or the baseline's). */
export function setOwnDevices(doc: ProjectDoc, design: string, devices: DeviceDoc[]): ProjectDoc {
  const i = optionIndex(doc, design);
  if (i < 0) return { ...doc, devices } as ProjectDoc;
  const options = [...(fields(doc).options ?? [])];
  options[i] = { ...options[i]!, devices };
  return { ...doc, options } as ProjectDoc;
}

/** A device name not used anywhere in the document ("tree-2" after "tree-1"). */
export function nextDeviceName(doc: ProjectDoc, type: string): string {
  const used = new Set<string>();
  for (const d of fields(doc).devices ?? []) if (d.name) used.add(d.name);
  for (const o of fields(doc).options ?? []) for (const d of o.devices ?? []) if (d.name) used.add(d.name);
  let k = 1;
  while (used.has(`${type}-${k}`)) k++;
  return `${type}-${k}`;
}

/** Adds an option with no changes yet (name made unique). */
export function addOption(doc: ProjectDoc, name = 'new option'): { doc: ProjectDoc; name: string } {
  const names = new Set(designNames(doc));
  let n = name;
  for (let k = 2; names.has(n); k++) n = `${name} ${k}`;
  return { doc: { ...doc, options: [...(fields(doc).options ?? []), { name: n, devices: [] }] } as ProjectDoc, name: n };
}

/** Where a device is placed: a point on a floor, or a point on a wall with the wall's outward plan normal. */
export type Placement = { kind: 'floor'; point: [number, number, number] } | { kind: 'wall'; point: [number, number, number]; normal: [number, number] };

/** Device types placed on a wall (along it) and on a floor (at a point). */
export const WALL_TYPES: readonly DeviceType[] = ['fins', 'slats', 'overhang'];
export const FLOOR_TYPES: readonly DeviceType[] = ['tree', 'umbrella', 'canopy'];
export { DEVICE_TYPES };

/** The main sizes asked for when adding each type, with defaults [m]. */
export const MAIN_SIZES: Record<DeviceType, { key: string; label: string; def: number }[]> = {
  tree: [
    { key: 'crownRadiusM', label: 'crown radius', def: 2.5 },
    { key: 'crownHeightM', label: 'crown height', def: 5 },
    { key: 'crownBaseM', label: 'trunk height', def: 2.5 },
  ],
  umbrella: [
    { key: 'radiusM', label: 'radius', def: 1.5 },
    { key: 'heightM', label: 'height', def: 2.3 },
  ],
  canopy: [
    { key: 'widthM', label: 'width', def: 6 },
    { key: 'depthM', label: 'depth', def: 3 },
    { key: 'heightM', label: 'height', def: 3 },
  ],
  overhang: [
    { key: 'lengthM', label: 'length along the wall', def: 6 },
    { key: 'projectionM', label: 'projection', def: 1.5 },
    { key: 'heightM', label: 'height', def: 3 },
  ],
  fins: [
    { key: 'lengthM', label: 'length along the wall', def: 6 },
    { key: 'depthM', label: 'fin depth', def: 0.4 },
    { key: 'spacingM', label: 'spacing', def: 0.8 },
    { key: 'topM', label: 'top', def: 3 },
  ],
  slats: [
    { key: 'lengthM', label: 'length along the wall', def: 6 },
    { key: 'depthM', label: 'slat depth', def: 0.15 },
    { key: 'spacingM', label: 'spacing', def: 0.3 },
    { key: 'topM', label: 'top', def: 3 },
  ],
};

const r2 = (v: number) => Math.round(v * 100) / 100;

/**
 * A new device of `type` at a placement, in project keys (see src/geometry/devices.ts). Wall types
 * run along the wall (horizontal, perpendicular to its normal), centred on the click, on the side
 * the normal points to; floor types stand at the clicked point.
 * @param sizes the MAIN_SIZES values [m]
 */
export function makeDevice(type: DeviceType, name: string, at: Placement, sizes: Record<string, number>): DeviceDoc {
  const get = (key: string) => sizes[key] ?? MAIN_SIZES[type].find((s) => s.key === key)?.def ?? 1;
  const [x, y, z] = at.point.map(r2) as [number, number, number];
  if (at.kind === 'wall' && WALL_TYPES.includes(type)) {
    const [nx, ny] = at.normal;
    const nl = Math.hypot(nx, ny) || 1;
    const ux = -ny / nl, uy = nx / nl; // along the wall
    const half = get('lengthM') / 2;
    const wall = { from: [r2(x - ux * half), r2(y - uy * half)], to: [r2(x + ux * half), r2(y + uy * half)], outwardNormal: [r2(nx / nl), r2(ny / nl)] };
    if (type === 'overhang') return { type, name, ...wall, heightM: get('heightM'), projectionM: get('projectionM') };
    if (type === 'fins') return { type, name, ...wall, bottomM: r2(z), topM: Math.max(r2(z) + 0.5, get('topM')), depthM: get('depthM'), spacingM: get('spacingM') };
    return { type, name, layout: 'screen', ...wall, bottomM: r2(z), topM: Math.max(r2(z) + 0.5, get('topM')), depthM: get('depthM'), spacingM: get('spacingM') };
  }
  if (type === 'tree') return { type, name, points: [[x, y, z]], crownRadiusM: get('crownRadiusM'), crownHeightM: get('crownHeightM'), crownBaseM: get('crownBaseM'), crown: 'deciduous-dense' };
  if (type === 'umbrella') return { type, name, points: [[x, y, z]], radiusM: get('radiusM'), heightM: get('heightM') };
  if (type === 'canopy') return { type, name, center: [x, y], widthM: get('widthM'), depthM: get('depthM'), heightM: r2(z + get('heightM')) };
  // a wall type placed on a floor: a wall segment running east–west with its outside to the south
  return makeDevice(type, name, { kind: 'wall', point: at.point, normal: [0, -1] }, sizes);
}

/** The device with its numeric entry at `path` (e.g. ["points", 0, 1] or ["radiusM"]) set to `value`. */
export function setDeviceNumber(device: DeviceDoc, path: (string | number)[], value: number): DeviceDoc {
  const copy = structuredClone(device) as Record<string, unknown>;
  let at: unknown = copy;
  for (let i = 0; i < path.length - 1; i++) at = (at as Record<string | number, unknown>)[path[i]!];
  (at as Record<string | number, unknown>)[path[path.length - 1]!] = value;
  return copy as DeviceDoc;
}

/** Moves a device in plan by dx, dy [m] (points, center, from/to). */
export function moveDevice(device: DeviceDoc, dxM: number, dyM: number): DeviceDoc {
  const copy = structuredClone(device) as Record<string, unknown>;
  const shift = (p: unknown) => {
    if (Array.isArray(p) && typeof p[0] === 'number' && typeof p[1] === 'number') {
      p[0] = r2(p[0] + dxM);
      p[1] = r2(p[1] + dyM);
    }
  };
  for (const key of ['center', 'from', 'to']) shift(copy[key]);
  for (const key of ['points', 'polygon']) if (Array.isArray(copy[key])) (copy[key] as unknown[]).forEach(shift);
  return copy as DeviceDoc;
}

/** The numeric entries of a device as editable fields: key path and current value (positions first). */
export function deviceNumbers(device: DeviceDoc): { path: (string | number)[]; label: string; value: number }[] {
  const out: { path: (string | number)[]; label: string; value: number }[] = [];
  const axes = ['x', 'y', 'z'];
  const pushPoint = (key: string, p: unknown, label: string, idx?: number) => {
    if (!Array.isArray(p)) return;
    p.forEach((v, a) => {
      if (typeof v === 'number') out.push({ path: idx === undefined ? [key, a] : [key, idx, a], label: `${label} ${axes[a]}`, value: v });
    });
  };
  for (const key of ['center', 'from', 'to', 'outwardNormal']) pushPoint(key, device[key], key === 'outwardNormal' ? 'outside' : key);
  for (const key of ['points', 'polygon']) {
    const list = device[key];
    if (Array.isArray(list)) list.forEach((p, i) => pushPoint(key, p, list.length > 1 ? `${key === 'points' ? 'point' : 'corner'} ${i + 1}` : key === 'points' ? 'at' : 'corner', i));
  }
  for (const [key, v] of Object.entries(device)) if (typeof v === 'number') out.push({ path: [key], label: key, value: v });
  return out;
}
