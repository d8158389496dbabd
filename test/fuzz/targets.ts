/**
 * What the fuzz campaign feeds, and how one input is judged.
 *
 * Targets: `glb`, `gltf` (JSON with an external .bin), `gltf-bin` (the external .bin itself),
 * `obj`, `epw`, `csv` (weather) and `project` (project JSON through `loadProject`, for a share of
 * them also `prepareModel`: model import + ground apron + patches + sensors; the campaign can run
 * full audits on a few). Seeds are the test fixtures and the demo project.
 *
 * An input passes when it ends in a valid result (checked for sane shape: finite positions,
 * indices in range, increasing times) or in an `InputError` whose message names the file; any
 * other exception, an `InputError` without the file, a result that breaks the invariants, or a run
 * over the time budget is a failure.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import path from 'node:path';
import { InputError } from '../../src/physics/errors.ts';
import { importModel } from '../../src/geometry/import/index.ts';
import { parseEpw } from '../../src/physics/weather/epw.ts';
import { parseWeatherCsv } from '../../src/physics/weather/csv.ts';
import type { WeatherSeries } from '../../src/physics/weather/types.ts';
import type { SceneArrays } from '../../src/geometry/sceneArrays.ts';
import { loadProject, type LoadedProject } from '../../src/audit/load.ts';
import { prepareModel } from '../../src/audit/stages/model.ts';
import { runAudit } from '../../src/audit/pipeline.ts';
import { int, mutateBytes, mutateGlb, mutateJson, mutateText, pick, type Rand } from './mutate.ts';

const root = fileURLToPath(new URL('../../', import.meta.url));
const read = (rel: string) => new Uint8Array(readFileSync(path.join(root, rel)));
const readText = (rel: string) => readFileSync(path.join(root, rel), 'utf8');

export const TARGETS = ['glb', 'gltf', 'gltf-bin', 'obj', 'epw', 'csv', 'project'] as const;
export type TargetName = (typeof TARGETS)[number];

/** File extension a target's inputs are saved under in regressions/. */
export const TARGET_EXT: Record<TargetName, string> = { glb: 'glb', gltf: 'gltf', 'gltf-bin': 'bin', obj: 'obj', epw: 'epw', csv: 'csv', project: 'json' };

/** An invented OBJ exercising groups, materials, negative indices, a concave polygon and v/vt/vn forms. */
const INVENTED_OBJ = [
  '# invented fuzz seed: an L-shaped slab and a leaning quad',
  'o slab',
  'usemtl paving',
  'v 0 0 0', 'v 4 0 0', 'v 4 1 0', 'v 1 1 0', 'v 1 3 0', 'v 0 3 0',
  'vt 0 0', 'vn 0 0 1',
  'f 1/1/1 2/1/1 3/1/1 4/1/1 5/1/1 6/1/1',
  'g wall',
  'usemtl render',
  'v 0 0 0', 'v 4 0 0', 'v 4 0.2 2.5', 'v 0 0.2 2.5',
  'f -4//1 -3//1 -2//1 -1//1',
  's off',
  'l 1 2',
  '',
].join('\n');

function gltfWithDataUri(): string {
  const j = JSON.parse(readText('test/fixtures/models/box.gltf')) as { buffers: { uri: string }[] };
  j.buffers[0]!.uri = 'data:application/octet-stream;base64,' + Buffer.from(read('test/fixtures/models/box.bin')).toString('base64');
  return JSON.stringify(j);
}

/** EPW header plus two days of the real TMY file (a short, fast seed). */
function shortTmy(): string {
  const lines = readText('test/fixtures/weather/tmy-45.000N-8.000E-2005-2023.epw').split(/\r?\n/);
  return lines.slice(0, 8 + 48).join('\n') + '\n';
}

/** A tiny box project: fast enough to run the model stage (and a full audit) per input. */
function boxProject(modelFile: string, weather: unknown): string {
  return JSON.stringify({
    sunfacet: 1,
    name: 'fuzz box',
    site: { latitudeDeg: 45, longitudeDeg: 8, elevationM: 250, timeZone: '+01:00', northDeg: 10 },
    model: { file: modelFile },
    materials: { box: 'concrete-light', concrete: { preset: 'concrete-dark', albedo: 0.3 } },
    defaultMaterial: 'concrete-light',
    ground: { material: 'grass', z: 0 },
    zones: [{ name: 'side', polygon: [[-3, -3], [5, -3], [5, -0.5], [-3, -0.5]], spacingM: 2, sensorHeightM: 1.1, posture: 'standing' }],
    period: { start: '2018-01-01T11:00:00+01:00', end: '2018-01-01T13:00:00+01:00', stepMinutes: 60 },
    weather,
    sampling: { seed: 3, skyRaysPerPatch: 1, viewRays: 4 },
  });
}

export interface Seeds {
  glb: Uint8Array[];
  gltf: string[];
  gltfBin: Uint8Array;
  obj: string[];
  epw: string[];
  csv: string[];
  project: string[];
  /** Files a project may refer to (valid). */
  files: Map<string, Uint8Array>;
}

let cached: Seeds | undefined;
export function loadSeeds(): Seeds {
  if (cached) return cached;
  const files = new Map<string, Uint8Array>([
    ['demo-terrace.glb', read('public/demo/demo-terrace.glb')],
    ['box.glb', read('test/fixtures/models/box.glb')],
    ['box.gltf', read('test/fixtures/models/box.gltf')],
    ['box.bin', read('test/fixtures/models/box.bin')],
    ['box.obj', read('test/fixtures/models/box.obj')],
    ['site.epw', new TextEncoder().encode(shortTmy())],
    ['site.csv', read('test/fixtures/weather/invented-hourly.csv')],
  ]);
  const clear = { source: 'clear-sky', airTempC: { min: 18, max: 30 }, relativeHumidityPct: 50, windMs: 2 };
  cached = {
    glb: [read('test/fixtures/models/box.glb'), read('public/demo/demo-terrace.glb')],
    gltf: [readText('test/fixtures/models/box.gltf'), gltfWithDataUri()],
    gltfBin: read('test/fixtures/models/box.bin'),
    obj: [readText('test/fixtures/models/box.obj'), INVENTED_OBJ],
    epw: [readText('test/fixtures/weather/missing-markers.epw'), shortTmy()],
    csv: [readText('test/fixtures/weather/invented-hourly.csv')],
    project: [
      readText('public/demo/project.json'),
      boxProject('box.obj', clear),
      boxProject('box.glb', clear),
      boxProject('box.gltf', { source: 'file', file: 'site.epw' }),
      boxProject('box.obj', { source: 'file', file: 'site.csv' }).replace('2018-01-01T11:00:00+01:00', '2026-07-21T10:00:00+02:00').replace('2018-01-01T13:00:00+01:00', '2026-07-21T13:00:00+02:00'),
    ],
    files,
  };
  return cached;
}

/** One generated input: the bytes and what to do with them. */
export interface FuzzInput {
  target: TargetName;
  bytes: Uint8Array;
  /** For `project`: also run the model stage / a full audit. */
  depth: 'load' | 'model' | 'audit';
}

const enc = (s: string) => new TextEncoder().encode(s);

/** A mutated input for `target` from the stream `r`. `allowAudit`: may pick a full audit (campaign only). */
export function generate(r: Rand, target: TargetName, allowAudit = false): FuzzInput {
  const s = loadSeeds();
  const raw = r() < 0.15;
  switch (target) {
    case 'glb':
      return { target, depth: 'load', bytes: raw ? mutateBytes(r, pick(r, s.glb)) : mutateGlb(r, pick(r, s.glb)) };
    case 'gltf': {
      const seed = pick(r, s.gltf);
      return { target, depth: 'load', bytes: raw ? mutateBytes(r, enc(seed)) : enc(mutateJson(r, seed)) };
    }
    case 'gltf-bin':
      return { target, depth: 'load', bytes: mutateBytes(r, s.gltfBin) };
    case 'obj': {
      const seed = pick(r, s.obj);
      return { target, depth: 'load', bytes: raw ? mutateBytes(r, enc(seed)) : enc(mutateText(r, seed, /\s+/)) };
    }
    case 'epw': {
      const seed = pick(r, s.epw);
      return { target, depth: 'load', bytes: raw ? mutateBytes(r, enc(seed)) : enc(mutateText(r, seed, /,/)) };
    }
    case 'csv': {
      const seed = pick(r, s.csv);
      return { target, depth: 'load', bytes: raw ? mutateBytes(r, enc(seed)) : enc(mutateText(r, seed, /,/)) };
    }
    case 'project': {
      const which = int(r, s.project.length);
      const seed = s.project[which]!;
      const text = raw ? new TextDecoder().decode(mutateBytes(r, enc(seed))) : mutateJson(r, seed);
      // The demo's model stage takes ~0.3 s: run it rarely; box projects often.
      const x = r();
      const depth = which === 0 ? (x < 0.02 ? 'model' : 'load') : allowAudit && x < 0.01 ? 'audit' : x < 0.3 ? 'model' : 'load';
      return { target, depth, bytes: enc(text) };
    }
  }
}

export type Outcome =
  | { kind: 'ok' }
  | { kind: 'input-error'; problem: string }
  | { kind: 'failure'; why: string; detail: string };

/** The file name an input is presented under (the message must name it). */
export function fileNameFor(target: TargetName): string {
  return target === 'gltf-bin' ? 'fuzz.gltf' : `fuzz.${TARGET_EXT[target]}`;
}

/** Runs one input to its end and judges it (no time limit here; the caller measures). */
export async function runInput(input: FuzzInput): Promise<Outcome> {
  const s = loadSeeds();
  const file = fileNameFor(input.target);
  try {
    switch (input.target) {
      case 'glb': case 'gltf': case 'obj': {
        const files = new Map(s.files);
        const scene = await importModel(input.bytes, file, { readExternal: async (uri) => externalFile(files, uri) });
        return checkScene(scene);
      }
      case 'gltf-bin': {
        const files = new Map(s.files);
        files.set('box.bin', input.bytes);
        const scene = await importModel(files.get('box.gltf')!, file, { readExternal: async (uri) => externalFile(files, uri) });
        return checkScene(scene);
      }
      case 'epw':
        return checkWeather(parseEpw(new TextDecoder().decode(input.bytes), file));
      case 'csv':
        return checkWeather(parseWeatherCsv(new TextDecoder().decode(input.bytes), file));
      case 'project': {
        const loaded = await loadProject(new TextDecoder().decode(input.bytes), file, async (rel) => externalFile(s.files, rel));
        if (input.depth === 'load') return checkLoaded(loaded);
        if (input.depth === 'model') {
          const m = await prepareModel(loaded);
          return checkScene(m.scene);
        }
        const results = await runAudit(loaded);
        for (const z of results.zones) for (const sensor of z.sensors) for (const v of sensor.mrtC) if (!Number.isFinite(v)) return { kind: 'failure', why: 'non-finite MRT in results', detail: String(v) };
        return { kind: 'ok' };
      }
    }
  } catch (e) {
    return judgeError(e, file, input);
  }
}

async function externalFile(files: Map<string, Uint8Array>, rel: string): Promise<Uint8Array> {
  const f = files.get(rel);
  if (f === undefined) throw Object.assign(new Error(`ENOENT: no such file ${rel}`), { code: 'ENOENT' });
  return f;
}

function judgeError(e: unknown, file: string, input: FuzzInput): Outcome {
  if (e instanceof InputError) {
    // A project's message may name the project file or the file it refers to (model, weather).
    const named = e.message.includes(file) || (input.target === 'project' && /\.(glb|gltf|bin|obj|epw|csv)\b/.test(e.message)) || (input.target === 'gltf-bin' && e.message.includes('box.bin'));
    if (!named) return { kind: 'failure', why: 'InputError without the file name', detail: e.message };
    return { kind: 'input-error', problem: e.problem };
  }
  const err = e instanceof Error ? e : new Error(String(e));
  return { kind: 'failure', why: `${err.name} (not an InputError)`, detail: `${err.message}\n${err.stack ?? ''}` };
}

function checkScene(sc: SceneArrays): Outcome {
  const nv = sc.positions.length / 3;
  if (!Number.isInteger(nv)) return { kind: 'failure', why: 'positions not xyz triples', detail: String(sc.positions.length) };
  for (let i = 0; i < sc.positions.length; i++) if (!Number.isFinite(sc.positions[i]!)) return { kind: 'failure', why: 'non-finite vertex in a valid scene', detail: `positions[${i}] = ${sc.positions[i]}` };
  const nt = sc.indices.length / 3;
  if (!Number.isInteger(nt) || sc.surfaceIds.length !== nt || sc.materialIds.length !== nt) return { kind: 'failure', why: 'per-triangle arrays disagree', detail: `${sc.indices.length} ${sc.surfaceIds.length} ${sc.materialIds.length}` };
  for (let i = 0; i < sc.indices.length; i++) if (sc.indices[i]! >= nv) return { kind: 'failure', why: 'vertex index out of range in a valid scene', detail: `indices[${i}] = ${sc.indices[i]} of ${nv}` };
  for (let t = 0; t < nt; t++) {
    if (sc.surfaceIds[t]! >= sc.surfaceNames.length) return { kind: 'failure', why: 'surface id out of range', detail: String(sc.surfaceIds[t]) };
    if (sc.materialIds[t]! >= Math.max(1, sc.materialNames.length)) return { kind: 'failure', why: 'material id out of range', detail: String(sc.materialIds[t]) };
  }
  return { kind: 'ok' };
}

function checkWeather(w: WeatherSeries): Outcome {
  if (!(w.count > 0)) return { kind: 'failure', why: 'empty weather series accepted', detail: String(w.count) };
  const t = w.midpointTimeMs;
  if (t.length !== w.count) return { kind: 'failure', why: 'time column length differs from count', detail: `${t.length} vs ${w.count}` };
  for (let i = 0; i < t.length; i++) {
    if (!Number.isFinite(t[i]!)) return { kind: 'failure', why: 'non-finite time in weather', detail: `record ${i}` };
    if (i > 0 && !(t[i]! > t[i - 1]!)) return { kind: 'failure', why: 'weather times not increasing', detail: `record ${i}` };
  }
  return { kind: 'ok' };
}

function checkLoaded(l: LoadedProject): Outcome {
  const p = l.project.period;
  if (!Number.isFinite(p.startMs) || !Number.isFinite(p.endMs) || p.endMs < p.startMs) return { kind: 'failure', why: 'bad period accepted', detail: JSON.stringify(p) };
  if (l.weather) return checkWeather(l.weather);
  return { kind: 'ok' };
}
