/**
 * The project file (DESIGN §4, contract version 1): parse, validate and fill defaults. Every bad
 * key gives an InputError naming the file, the key path, the value and what was expected.
 * Pure: paths are checked (no leaving the project folder) but not read here.
 */
import { Validator, join } from './validate.ts';
import { parseIsoTime, zoneOffsetMinutes } from '../physics/time.ts';
import { InputError } from '../physics/errors.ts';
import { resolveMaterial } from '../physics/materials.ts';
import { validateDevices, type DeviceSpec } from '../geometry/devices.ts';

export type Posture = 'standing' | 'seated';

export interface ZoneSpec {
  name: string;
  /** Polygon vertices x, y [m] in engine coordinates (after north rotation), or a named mesh. */
  polygon?: [number, number][];
  mesh?: string;
  floorZ: number;
  sensorHeightM: number;
  spacingM: number;
  posture: Posture;
}

export type MaterialAssignment = string | ({ preset?: string } & Record<string, unknown>);

export interface PeriodSpec {
  kind: 'range' | 'year';
  startMs: number;
  endMs: number;
  stepMinutes: number;
  /** Offset used to print times [minutes east of UTC]. */
  offsetMinutes: number;
}

export type WeatherSpec =
  | {
      source: 'clear-sky';
      airTempC: number | { min: number; max: number } | number[];
      relativeHumidityPct: number;
      windMs: number;
      linkeTurbidity?: number;
    }
  | { source: 'file'; file: string };

export interface SamplingSpec {
  seed: number;
  /** Rays per sky patch for sky-patch visibility (stratified). */
  skyRaysPerPatch: number;
  /** Rays per receiver hemisphere for surface views. */
  viewRays: number;
}

export interface Project {
  sunfacet: 1;
  name: string;
  site: { latitudeDeg: number; longitudeDeg: number; elevationM: number; timeZone: string; northDeg: number };
  model: { file: string; upAxis: 'y' | 'z'; unitsPerMeter: number };
  materials: Record<string, MaterialAssignment>;
  defaultMaterial: MaterialAssignment;
  ground?: { material: MaterialAssignment; z: number };
  zones: ZoneSpec[];
  period: PeriodSpec;
  weather: WeatherSpec;
  sampling: SamplingSpec;
  /** Points with a view (a driver on the lane, a window across the street) that get a glare count. */
  viewpoints: ViewpointSpec[];
  /** Shading devices and trees of the baseline (src/geometry/devices.ts). */
  devices: DeviceSpec[];
  /** Name of the baseline design (default "baseline"). */
  baselineName: string;
  /** Design options: each adds devices to the baseline's and overrides materials. */
  options: DesignOptionSpec[];
}

/**
 * A project viewpoint (key `viewpoints`): an eye position with an optional horizontal view
 * direction. Glare is counted when the reflected sun lies within `fieldDeg` of the line of sight:
 * of the view direction when given, else of the nearest horizontal direction (a person who turns
 * around). See src/audit/stages/glare.ts.
 */
export interface ViewpointSpec {
  name: string;
  /** Eye position [m], engine coordinates (x east, y north, z up; after north rotation). */
  position: [number, number, number];
  /** Azimuth of the horizontal line of sight [°], clockwise from north; absent = all around. */
  viewDirectionDeg?: number;
  /** Half-width of the field of view around the line of sight [°], default 30. */
  fieldDeg: number;
}

const TOP_KEYS = ['sunfacet', 'name', 'notes', 'site', 'model', 'materials', 'defaultMaterial', 'ground', 'zones', 'period', 'weather', 'sampling', 'viewpoints', 'devices', 'baselineName', 'options'] as const;

/** A design option: devices added to the baseline's, and material assignments that replace the baseline's. */
export interface DesignOptionSpec {
  name: string;
  notes?: string;
  devices: DeviceSpec[];
  materials: Record<string, MaterialAssignment>;
}

/** Largest |ground.z| accepted [m] (model coordinates are around the site, not kilometres away). */
export const GROUND_Z_LIMIT_M = 1000;

export const DEFAULT_SAMPLING: SamplingSpec = { seed: 1, skyRaysPerPatch: 16, viewRays: 256 };

/** Parses project JSON text. `file` is used in messages only. */
export function parseProjectText(text: string, file: string): Project {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    const msg = e instanceof Error ? e.message : String(e);
    const pos = /position (\d+)/.exec(msg);
    let place = 'JSON';
    if (pos) {
      const upto = text.slice(0, Number(pos[1]));
      const line = upto.split('\n').length;
      place = `line ${line}, column ${Number(pos[1]) - upto.lastIndexOf('\n')}`;
    }
    throw new InputError({ file, place, problem: `not valid JSON (${msg})`, expected: 'a JSON object (see README: the project file)' });
  }
  return validateProject(raw, file);
}

export function validateProject(raw: unknown, file: string): Project {
  const v = new Validator(file);
  const o = v.object(raw, '(top level)');
  v.keys(o, '', TOP_KEYS);
  if (o.sunfacet !== 1) v.fail('sunfacet', 'unsupported contract version', 'the number 1', o.sunfacet);
  const name = o.name === undefined ? 'Untitled project' : v.string(o.name, 'name');

  const s = v.object(o.site, 'site');
  v.keys(s, 'site', ['latitudeDeg', 'longitudeDeg', 'elevationM', 'timeZone', 'northDeg']);
  const site = {
    latitudeDeg: v.number(s.latitudeDeg, 'site.latitudeDeg', { min: -90, max: 90, unit: '°' }),
    longitudeDeg: v.number(s.longitudeDeg, 'site.longitudeDeg', { min: -180, max: 180, unit: '°' }),
    elevationM: s.elevationM === undefined ? 0 : v.number(s.elevationM, 'site.elevationM', { min: -500, max: 9000, unit: 'm' }),
    timeZone: v.string(s.timeZone, 'site.timeZone', 'a UTC offset such as "+01:00" or an IANA zone such as "Europe/Berlin"'),
    northDeg: s.northDeg === undefined ? 0 : v.number(s.northDeg, 'site.northDeg', { min: -360, max: 360, unit: '°' }),
  };
  zoneOffsetMinutes(site.timeZone, 0, `${file}: site.timeZone`);

  const m = v.object(o.model, 'model');
  v.keys(m, 'model', ['file', 'upAxis', 'unitsPerMeter']);
  const modelFile = safeRelativePath(v, m.file, 'model.file');
  const ext = modelFile.toLowerCase().split('.').pop();
  if (!['glb', 'gltf', 'obj'].includes(ext ?? '')) v.fail('model.file', 'unsupported model format', 'a .glb, .gltf or .obj file', m.file);
  const model = {
    file: modelFile,
    upAxis: m.upAxis === undefined ? (ext === 'obj' ? 'z' : 'y') : v.oneOf(m.upAxis, 'model.upAxis', ['y', 'z'] as const),
    unitsPerMeter: m.unitsPerMeter === undefined ? 1 : v.number(m.unitsPerMeter, 'model.unitsPerMeter', { min: 0, exclusiveMin: true }),
  } as Project['model'];

  const materials: Record<string, MaterialAssignment> = {};
  if (o.materials !== undefined) {
    const mo = v.object(o.materials, 'materials');
    for (const [k, val] of Object.entries(mo)) materials[k] = materialAssignment(v, val, `materials[${JSON.stringify(k)}]`);
  }
  const defaultMaterial = o.defaultMaterial === undefined ? 'concrete-light' : materialAssignment(v, o.defaultMaterial, 'defaultMaterial');

  let ground: Project['ground'];
  if (o.ground !== undefined) {
    const g = v.object(o.ground, 'ground');
    v.keys(g, 'ground', ['material', 'z']);
    ground = {
      material: g.material === undefined ? 'stone-paving' : materialAssignment(v, g.material, 'ground.material'),
      // Bounded: the ground apron around the model grows with the model's height above the ground.
      z: g.z === undefined ? 0 : v.number(g.z, 'ground.z', { min: -GROUND_Z_LIMIT_M, max: GROUND_Z_LIMIT_M, unit: 'm' }),
    };
  }

  const zonesRaw = o.zones === undefined ? [] : v.array(o.zones, 'zones');
  const zones = zonesRaw.map((z, i) => zoneSpec(v, z, join('zones', i), ground?.z ?? 0));
  const seen = new Set<string>();
  zones.forEach((z, i) => {
    if (seen.has(z.name)) v.fail(`zones[${i}].name`, 'duplicate zone name', 'a name unique within the project', z.name);
    seen.add(z.name);
  });

  const weather = weatherSpec(v, o.weather);
  const period = periodSpec(v, o.period, site.timeZone, weather);

  let sampling = { ...DEFAULT_SAMPLING };
  if (o.sampling !== undefined) {
    const sp = v.object(o.sampling, 'sampling');
    v.keys(sp, 'sampling', ['seed', 'skyRaysPerPatch', 'viewRays']);
    sampling = {
      seed: sp.seed === undefined ? sampling.seed : v.number(sp.seed, 'sampling.seed', { min: 0, max: 2 ** 32 - 1, integer: true }),
      skyRaysPerPatch: sp.skyRaysPerPatch === undefined ? sampling.skyRaysPerPatch : v.number(sp.skyRaysPerPatch, 'sampling.skyRaysPerPatch', { min: 1, max: 4096, integer: true }),
      viewRays: sp.viewRays === undefined ? sampling.viewRays : v.number(sp.viewRays, 'sampling.viewRays', { min: 4, max: 65536, integer: true }),
    };
    // The stratified samplers lay rays on a side × side jittered grid.
    for (const key of ['skyRaysPerPatch', 'viewRays'] as const) {
      const n = sampling[key];
      if (Math.round(Math.sqrt(n)) ** 2 !== n) v.fail(`sampling.${key}`, 'not a square number', 'a square number such as 4, 9, 16, 25, 64, 256 (rays on a jittered square grid)', n);
    }
  }
  const viewpoints = o.viewpoints === undefined ? [] : v.array(o.viewpoints, 'viewpoints').map((raw, i) => viewpointSpec(v, raw, join('viewpoints', i)));
  viewpoints.forEach((p, i) => {
    if (viewpoints.findIndex((q) => q.name === p.name) !== i) v.fail(`viewpoints[${i}].name`, 'duplicate viewpoint name', 'a name unique among the viewpoints', p.name);
  });
  const devices = validateDevices(o.devices, file, { latitudeDeg: site.latitudeDeg });
  const baselineName = o.baselineName === undefined ? 'baseline' : v.string(o.baselineName, 'baselineName');
  const options = o.options === undefined ? [] : v.array(o.options, 'options').map((raw, i) => {
    const path = join('options', i);
    const op = v.object(raw, path);
    v.keys(op, path, ['name', 'notes', 'devices', 'materials']);
    const optName = v.string(op.name, join(path, 'name'));
    const optMaterials: Record<string, MaterialAssignment> = {};
    if (op.materials !== undefined) {
      for (const [k, val] of Object.entries(v.object(op.materials, join(path, 'materials')))) optMaterials[k] = materialAssignment(v, val, `${path}.materials[${JSON.stringify(k)}]`);
    }
    const optDevices = validateDevices(op.devices, file, { latitudeDeg: site.latitudeDeg, place: join(path, 'devices') });
    const clash = optDevices.find((d) => devices.some((b) => b.name === d.name));
    if (clash) v.fail(join(path, 'devices'), `device name "${clash.name}" is already used by the baseline`, 'names unique across the baseline and the option');
    return { name: optName, ...(typeof op.notes === 'string' ? { notes: op.notes } : {}), devices: optDevices, materials: optMaterials };
  });
  const names = [baselineName, ...options.map((o) => o.name)];
  names.forEach((n, i) => {
    if (names.indexOf(n) !== i) v.fail(i === 0 ? 'baselineName' : `options[${i - 1}].name`, 'duplicate design name', 'names unique among the baseline and the options', n);
  });
  return { sunfacet: 1, name, site, model, materials, defaultMaterial, ground, zones, period, weather, sampling, viewpoints, devices, baselineName, options };
}

/** Default half-width of a viewpoint's field of view [°] (glare.ts DEFAULT_GLARE_FIELD_DEG). */
export const DEFAULT_VIEWPOINT_FIELD_DEG = 30;

function viewpointSpec(v: Validator, raw: unknown, path: string): ViewpointSpec {
  const o = v.object(raw, path);
  v.keys(o, path, ['name', 'position', 'viewDirectionDeg', 'fieldDeg']);
  const name = v.string(o.name, join(path, 'name'));
  const pp = join(path, 'position');
  const a = v.array(o.position, pp);
  if (a.length !== 3) v.fail(pp, 'not an [x, y, z] triple', 'three numbers [x, y, z] in metres (x east, y north, z up)', o.position);
  const position: [number, number, number] = [v.number(a[0], join(pp, 0), { unit: 'm' }), v.number(a[1], join(pp, 1), { unit: 'm' }), v.number(a[2], join(pp, 2), { unit: 'm' })];
  const out: ViewpointSpec = {
    name,
    position,
    fieldDeg: o.fieldDeg === undefined ? DEFAULT_VIEWPOINT_FIELD_DEG : v.number(o.fieldDeg, join(path, 'fieldDeg'), { min: 0, max: 180, exclusiveMin: true, unit: '°' }),
  };
  if (o.viewDirectionDeg !== undefined) out.viewDirectionDeg = v.number(o.viewDirectionDeg, join(path, 'viewDirectionDeg'), { min: 0, max: 360, unit: '° clockwise from north' });
  return out;
}

function materialAssignment(v: Validator, val: unknown, path: string): MaterialAssignment {
  const spec: MaterialAssignment = typeof val === 'string' ? v.string(val, path, 'a material preset id') : (v.object(val, path) as MaterialAssignment);
  // Checked now (unknown preset, bad override) so a typo never waits for the run to fail.
  resolveMaterial(spec, path, v.file);
  return spec;
}

function zoneSpec(v: Validator, raw: unknown, path: string, groundZ: number): ZoneSpec {
  const z = v.object(raw, path);
  v.keys(z, path, ['name', 'polygon', 'mesh', 'floorZ', 'sensorHeightM', 'spacingM', 'posture']);
  const name = v.string(z.name, join(path, 'name'));
  const posture = z.posture === undefined ? 'standing' : v.oneOf(z.posture, join(path, 'posture'), ['standing', 'seated'] as const);
  const out: ZoneSpec = {
    name,
    floorZ: z.floorZ === undefined ? groundZ : v.number(z.floorZ, join(path, 'floorZ'), { unit: 'm' }),
    sensorHeightM: z.sensorHeightM === undefined ? (posture === 'seated' ? 0.6 : 1.1) : v.number(z.sensorHeightM, join(path, 'sensorHeightM'), { min: 0.05, max: 3, unit: 'm' }),
    spacingM: z.spacingM === undefined ? 1 : v.number(z.spacingM, join(path, 'spacingM'), { min: 0.1, max: 50, unit: 'm' }),
    posture,
  };
  if (z.polygon !== undefined) {
    const poly = v.array(z.polygon, join(path, 'polygon'), { minLength: 3 });
    out.polygon = poly.map((p, i) => {
      const pp = join(join(path, 'polygon'), i);
      const a = v.array(p, pp);
      if (a.length !== 2) v.fail(pp, 'not an [x, y] pair', 'two numbers [x, y] in metres', p);
      return [v.number(a[0], join(pp, 0), { unit: 'm' }), v.number(a[1], join(pp, 1), { unit: 'm' })];
    });
  } else if (z.mesh !== undefined) {
    out.mesh = v.string(z.mesh, join(path, 'mesh'), 'the name of a mesh/node in the model');
  } else {
    v.fail(path, 'zone has neither a polygon nor a mesh', 'a "polygon": [[x, y], ...] or a "mesh": "<node name>"');
  }
  return out;
}

function weatherSpec(v: Validator, raw: unknown): WeatherSpec {
  const w = v.object(raw, 'weather');
  const source = v.oneOf(w.source, 'weather.source', ['clear-sky', 'file'] as const);
  if (source === 'file') {
    v.keys(w, 'weather', ['source', 'file']);
    const file = safeRelativePath(v, w.file, 'weather.file');
    if (!/\.(epw|csv)$/i.test(file)) v.fail('weather.file', 'unsupported weather file', 'an hourly .epw file or a .csv with named columns', w.file);
    return { source, file };
  }
  v.keys(w, 'weather', ['source', 'airTempC', 'relativeHumidityPct', 'windMs', 'linkeTurbidity']);
  let airTempC: number | { min: number; max: number } | number[];
  if (typeof w.airTempC === 'number') airTempC = v.number(w.airTempC, 'weather.airTempC', { min: -50, max: 60, unit: '°C' });
  else if (Array.isArray(w.airTempC)) airTempC = w.airTempC.map((t, i) => v.number(t, `weather.airTempC[${i}]`, { min: -50, max: 60, unit: '°C' }));
  else {
    const t = v.object(w.airTempC, 'weather.airTempC');
    v.keys(t, 'weather.airTempC', ['min', 'max']);
    const min = v.number(t.min, 'weather.airTempC.min', { min: -50, max: 60, unit: '°C' });
    const max = v.number(t.max, 'weather.airTempC.max', { min: -50, max: 60, unit: '°C' });
    if (max < min) v.fail('weather.airTempC.max', 'below the minimum', `a number ≥ weather.airTempC.min (${min})`, max);
    airTempC = { min, max };
  }
  return {
    source,
    airTempC,
    relativeHumidityPct: w.relativeHumidityPct === undefined ? 50 : v.number(w.relativeHumidityPct, 'weather.relativeHumidityPct', { min: 1, max: 100, unit: '%' }),
    windMs: w.windMs === undefined ? 2 : v.number(w.windMs, 'weather.windMs', { min: 0, max: 40, unit: 'm/s at 10 m' }),
    ...(w.linkeTurbidity === undefined ? {} : { linkeTurbidity: v.number(w.linkeTurbidity, 'weather.linkeTurbidity', { min: 1, max: 10 }) }),
  };
}

function periodSpec(v: Validator, raw: unknown, timeZone: string, weather: WeatherSpec): PeriodSpec {
  if (raw === 'year') {
    if (weather.source !== 'file') v.fail('period', '"year" needs an hourly weather file', 'weather.source "file" with an .epw or .csv, or a period { start, end, stepMinutes }', raw);
    // The year's bounds come from the weather file; filled in when the file is read.
    return { kind: 'year', startMs: NaN, endMs: NaN, stepMinutes: 60, offsetMinutes: zoneOffsetMinutes(timeZone, 0) };
  }
  const p = v.object(raw, 'period');
  v.keys(p, 'period', ['start', 'end', 'stepMinutes']);
  const start = parseIsoTime(v.string(p.start, 'period.start', 'an ISO 8601 time with offset'), `${v.file}: period.start`);
  const end = parseIsoTime(v.string(p.end, 'period.end', 'an ISO 8601 time with offset'), `${v.file}: period.end`);
  const stepMinutes = p.stepMinutes === undefined ? 60 : v.number(p.stepMinutes, 'period.stepMinutes', { min: 5, max: 180, integer: true, unit: 'min' });
  if (60 % stepMinutes !== 0 && stepMinutes % 60 !== 0) v.fail('period.stepMinutes', 'does not divide an hour', 'a divisor of 60 (5, 10, 15, 20, 30, 60) or a multiple of 60', stepMinutes);
  if (end.timeMs < start.timeMs) v.fail('period.end', 'before period.start', 'an end at or after the start', p.end);
  const steps = Math.floor((end.timeMs - start.timeMs) / (stepMinutes * 60000)) + 1;
  if (steps > 366 * 24 * (60 / Math.min(60, stepMinutes))) v.fail('period', 'longer than a year', 'at most one year of steps', steps);
  return { kind: 'range', startMs: start.timeMs, endMs: end.timeMs, stepMinutes, offsetMinutes: start.offsetMinutes };
}

/** A path relative to the project file that stays inside its folder. */
function safeRelativePath(v: Validator, raw: unknown, path: string): string {
  const p = v.string(raw, path, 'a file path relative to the project file');
  const norm = p.replace(/\\/g, '/');
  if (/^[a-z][a-z0-9+.-]*:/i.test(norm) || norm.startsWith('/') || norm.startsWith('//')) {
    v.fail(path, 'absolute paths and URLs are refused', 'a path relative to the project file, inside its folder', raw);
  }
  const parts: string[] = [];
  for (const seg of norm.split('/')) {
    if (seg === '' || seg === '.') continue;
    if (seg === '..') {
      if (parts.length === 0) v.fail(path, 'the path leaves the project folder', 'a path inside the project file\'s folder', raw);
      parts.pop();
    } else parts.push(seg);
  }
  return parts.join('/');
}
