/**
 * Project validation as a user meets it: bad keys give an InputError naming the file, the key path
 * and what was expected (DESIGN §4: "a clear error names the bad key and its path").
 */
import { describe, it, expect } from 'vitest';
import { parseProjectText } from '../../src/audit/project.ts';
import { loadProject } from '../../src/audit/load.ts';
import { runAudit } from '../../src/audit/pipeline.ts';
import { InputError } from '../../src/physics/errors.ts';
import { materialPresetIds } from '../../src/physics/materials.ts';
import { ObjScene, sceneProject, runScene, inMemoryReader } from '../helpers/auditScenes.ts';

const FILE = 'test.json';

function valid(): Record<string, unknown> {
  return sceneProject({ firstHour: 12, lastHour: 12, zones: [{ name: 'terrace', polygon: [[10, -4], [12, -4], [12, -2], [10, -2]], spacingM: 1 }] });
}

/** Runs `f`, expects an InputError, returns it. */
function inputError(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('expected an InputError, nothing was thrown');
}

async function inputErrorAsync(p: Promise<unknown>): Promise<InputError> {
  try {
    await p;
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('expected an InputError, the promise resolved');
}

const parse = (o: unknown) => parseProjectText(JSON.stringify(o), FILE);

describe('project validation', () => {
  it('accepts the valid base project and fills defaults', () => {
    const p = parse(valid());
    expect(p.zones[0]!.sensorHeightM).toBe(1.1); // standing default (DESIGN §4)
    expect(p.model.upAxis).toBe('z');
    expect(p.period.kind).toBe('range');
  });

  it('a value out of range names the file, the key path and the expected range', () => {
    const o = valid();
    (o.zones as Record<string, unknown>[])[0]!.spacingM = -1;
    const e = inputError(() => parse(o));
    expect(e.file).toBe(FILE);
    expect(e.place).toBe('zones[0].spacingM');
    expect(e.message).toContain('test.json');
    expect(e.message).toContain('zones[0].spacingM');
    expect(e.message).toContain('-1');
    expect(e.message).toContain('[0.1, 50]');
  });

  it('an unknown key is refused with a did-you-mean', () => {
    const o = valid();
    const z = (o.zones as Record<string, unknown>[])[0]!;
    z.spacing = z.spacingM;
    delete z.spacingM;
    const e = inputError(() => parse(o));
    expect(e.place).toBe('zones[0].spacing');
    expect(e.message).toContain('test.json');
    expect(e.message).toMatch(/unknown key/);
    expect(e.message).toContain('did you mean "spacingM"');

    const top = valid();
    top.perod = top.period;
    delete top.period;
    const e2 = inputError(() => parse(top));
    expect(e2.place).toBe('perod');
    expect(e2.message).toContain('did you mean "period"');
  });

  it('a model path that leaves the project folder is refused (and absolute paths too)', () => {
    for (const bad of ['../x.glb', 'models/../../x.glb', '/etc/x.glb', 'C:/models/x.glb']) {
      const o = valid();
      (o.model as Record<string, unknown>).file = bad;
      const e = inputError(() => parse(o));
      expect(e.file).toBe(FILE);
      expect(e.place).toBe('model.file');
      expect(e.message).toMatch(/leaves the project folder|absolute paths/);
    }
    // Staying inside is fine, and normalised.
    const ok = valid();
    (ok.model as Record<string, unknown>).file = 'models/../scene.obj';
    expect(parse(ok).model.file).toBe('scene.obj');
  });

  it('a weather file outside the folder is refused the same way', () => {
    const o = valid();
    o.weather = { source: 'file', file: '../site.epw' };
    const e = inputError(() => parse(o));
    expect(e.place).toBe('weather.file');
    expect(e.message).toContain('leaves the project folder');
  });

  it('an unknown material preset names the preset, where it was given, and lists the known ones', async () => {
    const obj = new ObjScene().box('wall', 'paint', [0, 0, 0], [3, 1, 3]).text();
    const o = valid();
    o.materials = { wall: 'steel-shinny' };
    const e = await inputErrorAsync(runScene(obj, o));
    expect(e.file).toBe(FILE);
    expect(e.message).toContain('materials["wall"]');
    expect(e.message).toContain('"steel-shinny"');
    for (const id of materialPresetIds()) expect(e.message).toContain(id);

    const d = valid();
    d.defaultMaterial = 'concrete-pink';
    const e2 = await inputErrorAsync(runScene(obj, d));
    expect(e2.message).toContain('defaultMaterial');
    expect(e2.message).toContain('"concrete-pink"');
    expect(e2.message).toContain('steel-dark-painted');
  });

  it('a period that ends before it starts is refused', () => {
    const o = valid();
    o.period = { start: '2026-06-21T18:00:00+00:00', end: '2026-06-21T06:00:00+00:00', stepMinutes: 60 };
    const e = inputError(() => parse(o));
    expect(e.file).toBe(FILE);
    expect(e.place).toBe('period.end');
    expect(e.message).toContain('before period.start');
  });

  it('a ray count the samplers cannot use is refused at load, naming the key (not later by the tracer)', async () => {
    // The tracer lays rays on a side × side jittered grid; 128 is not a square.
    const o = valid();
    o.sampling = { seed: 1, skyRaysPerPatch: 9, viewRays: 128 };
    const e = await inputErrorAsync(loadProject(JSON.stringify(o), FILE, inMemoryReader('')));
    expect(e.file).toBe(FILE);
    expect(e.place).toBe('sampling.viewRays');
  });

  it('a missing model file names the project file and the key', async () => {
    const o = valid();
    (o.model as Record<string, unknown>).file = 'missing.obj';
    const loaded = await loadProject(JSON.stringify(o), FILE, inMemoryReader(''));
    const e = await inputErrorAsync(runAudit(loaded));
    expect(e.file).toBe(FILE);
    expect(e.place).toBe('model.file');
    expect(e.message).toContain('missing.obj');
  });
});
