import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import {
  addZone, airTempRangeOf, assignedPreset, checkDoc, designDayOf, nextZoneName, parseProjectDoc, removeZone, setClearSkyWeather, setDesignDay, setMaterial, setSite, updateZone,
  type ProjectDoc,
} from '../../src/app/state/projectDoc.ts';
import { AUTOSAVE_KEY, base64ToBytes, bytesToBase64, makeSavedState, MAX_STORED_MODEL_BYTES, readAutosave, writeAutosave, type KeyValueStore } from '../../src/app/state/persist.ts';
import { displayFromEngine, engineFromDisplay, sunDirection } from '../../src/app/compute/frames.ts';

const demoText = readFileSync(new URL('../../public/demo/project.json', import.meta.url), 'utf8');
const demo = (): ProjectDoc => parseProjectDoc(demoText, 'project.json');

function memoryStore(limit = Infinity): KeyValueStore & { map: Map<string, string> } {
  const map = new Map<string, string>();
  return {
    map,
    getItem: (k) => map.get(k) ?? null,
    setItem: (k, v) => {
      if (v.length > limit) throw new Error('QuotaExceededError');
      map.set(k, v);
    },
    removeItem: (k) => void map.delete(k),
  };
}

describe('project document reducers', () => {
  it('reads the demo and validates edits with the audit validator', () => {
    const d = demo();
    expect(checkDoc(d).ok).toBe(true);
    const bad = setSite(d, { latitudeDeg: 123 });
    const c = checkDoc(bad);
    expect(c.ok).toBe(false);
    if (!c.ok) expect(c.message).toMatch(/site\.latitudeDeg/);
    expect(d.site.latitudeDeg).toBe(52.8); // not mutated
  });

  it('refuses a broken project file with the key path in the message', () => {
    expect(() => parseProjectDoc('{"sunfacet":1}', 'p.json')).toThrow(/p\.json: site/);
    expect(() => parseProjectDoc('{ nope', 'p.json')).toThrow(/p\.json/);
  });

  it('resolves presets: surface name, then material name, then default', () => {
    const d = demo();
    expect(assignedPreset(d, 'podium-south', 'cladding-dark-steel')).toEqual({ preset: 'steel-dark-painted', key: 'cladding-dark-steel' });
    expect(assignedPreset(d, 'x', 'unknown')).toEqual({ preset: 'concrete-light', key: null });
    const d2 = setMaterial(d, 'podium-south', 'timber');
    expect(assignedPreset(d2, 'podium-south', 'cladding-dark-steel')).toEqual({ preset: 'timber', key: 'podium-south' });
    expect(assignedPreset(setMaterial(d2, 'podium-south', null), 'podium-south', 'cladding-dark-steel').preset).toBe('steel-dark-painted');
  });

  it('adds, renames, edits and removes zones with unique names', () => {
    let d = demo();
    expect(nextZoneName(d)).toBe('zone 1');
    d = addZone(d, { name: 'zone 1', polygon: [[0, 0], [4, 0], [4, 4]], floorZ: 0 });
    d = addZone(d, { name: 'zone 1', polygon: [[0, 0], [4, 0], [4, 4]], floorZ: 0 });
    expect(d.zones!.map((z) => z.name)).toEqual(['café terrace', 'roof terrace', 'zone 1', 'zone 2']);
    d = updateZone(d, 2, { spacingM: 2, posture: 'seated' });
    expect(d.zones![2]).toMatchObject({ spacingM: 2, posture: 'seated' });
    expect(checkDoc(d).ok).toBe(true);
    d = removeZone(d, 0);
    expect(d.zones!.length).toBe(3);
  });

  it('sets a design day at the site offset and the clear-sky weather', () => {
    let d = setDesignDay(demo(), '2026-08-03');
    expect(d.period).toEqual({ start: '2026-08-03T00:00:00+02:00', end: '2026-08-03T23:00:00+02:00', stepMinutes: 60 });
    expect(designDayOf(d)).toBe('2026-08-03');
    d = setClearSkyWeather(d, { maxC: 35, windMs: 1 });
    expect(airTempRangeOf(d)).toEqual({ minC: 17, maxC: 35 });
    expect(checkDoc(d).ok).toBe(true);
    expect(() => setDesignDay(d, '2026-13-40')).toThrow(/design day/);
  });
});

describe('autosave', () => {
  it('round-trips a document and a small model through storage', () => {
    const s = memoryStore();
    const bytes = new Uint8Array([0, 1, 2, 250, 255]);
    expect(writeAutosave(s, makeSavedState(demo(), { demo: false, fileName: 'm.obj', bytes }))).toBe(true);
    const back = readAutosave(s)!;
    expect(back.doc.site.latitudeDeg).toBe(52.8);
    expect(back.model.kind).toBe('stored');
    if (back.model.kind === 'stored') expect(Array.from(base64ToBytes(back.model.base64))).toEqual(Array.from(bytes));
  });

  it('keeps the document when the model is too big, and drops an unreadable entry', () => {
    const s = memoryStore();
    const st = makeSavedState(demo(), { demo: false, fileName: 'big.glb', bytes: new Uint8Array(MAX_STORED_MODEL_BYTES + 1) });
    expect(st.model).toEqual({ kind: 'missing', fileName: 'big.glb' });
    const tight = memoryStore(20_000);
    expect(writeAutosave(tight, makeSavedState(demo(), { demo: false, fileName: 'm.glb', bytes: new Uint8Array(100_000) }))).toBe(true);
    expect(readAutosave(tight)!.model.kind).toBe('missing');
    s.setItem(AUTOSAVE_KEY, '{oops');
    expect(readAutosave(s)).toBeNull();
    expect(s.map.has(AUTOSAVE_KEY)).toBe(false);
    expect(bytesToBase64(new Uint8Array([104, 105]))).toBe('aGk=');
  });
});

describe('frames', () => {
  it('turns the model by north as src/geometry/transform.ts documents', () => {
    // northDeg 90: model +y points east, so model +y → engine +x, model +x → engine −y.
    const a = engineFromDisplay(0, 1, 90);
    expect(a[0]).toBeCloseTo(1, 12);
    expect(a[1]).toBeCloseTo(0, 12);
    const b = engineFromDisplay(1, 0, 90);
    expect(b[0]).toBeCloseTo(0, 12);
    expect(b[1]).toBeCloseTo(-1, 12);
    const back = displayFromEngine(...engineFromDisplay(3, -2, 37), 37);
    expect(back[0]).toBeCloseTo(3, 12);
    expect(back[1]).toBeCloseTo(-2, 12);
  });

  it('points the sun vector by azimuth clockwise from north', () => {
    const e = sunDirection(0, 90);
    expect(e[0]).toBeCloseTo(1, 12);
    expect(e[1]).toBeCloseTo(0, 12);
    const s = sunDirection(30, 180);
    expect(s[1]).toBeCloseTo(-Math.cos(Math.PI / 6), 12);
    expect(s[2]).toBeCloseTo(0.5, 12);
  });
});
