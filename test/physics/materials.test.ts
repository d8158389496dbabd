import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/physics/errors.ts';
import { MATERIAL_PRESETS, materialPresetIds, resolveMaterial, solarAbsorptance } from '../../src/physics/materials.ts';
import { bandWeightedReflectance } from '../../src/physics/solarSpectrum.ts';

const REQUIRED = [
  'asphalt', 'concrete', 'concrete-light', 'concrete-dark', 'brick', 'grass', 'water', 'glass-clear', 'glass-low-e',
  'steel-dark-painted', 'steel-weathered', 'aluminium-anodised', 'paint-white', 'paint-cool-white', 'timber',
  'stone-paving', 'turf-artificial', 'gravel',
];
const PROPS = ['reflectanceVisible', 'reflectanceNir', 'emissivity', 'specularFraction', 'construction', 'back'];

describe('material presets', () => {
  it('has every required id with valid, sourced properties', () => {
    expect(materialPresetIds()).toEqual(expect.arrayContaining(REQUIRED));
    for (const id of materialPresetIds()) {
      const m = MATERIAL_PRESETS[id]!;
      expect(m.id).toBe(id);
      for (const v of [m.reflectanceVisible, m.reflectanceNir, m.transmittanceVisible, m.transmittanceNir, m.specularFraction]) {
        expect(v).toBeGreaterThanOrEqual(0);
        expect(v).toBeLessThanOrEqual(1);
      }
      expect(m.reflectanceVisible + m.transmittanceVisible).toBeLessThanOrEqual(1);
      expect(m.emissivity).toBeGreaterThan(0);
      expect(m.emissivity).toBeLessThanOrEqual(1);
      expect(m.construction.length).toBeGreaterThan(0);
      for (const l of m.construction) for (const x of [l.thicknessM, l.conductivityWmK, l.densityKgM3, l.specificHeatJkgK]) expect(x).toBeGreaterThan(0);
      for (const p of PROPS) expect(typeof m.sources[p]).toBe('string');
      if (m.specularFraction >= 0.5 && id !== 'aluminium-anodised') expect(m.refractiveIndex).toBeGreaterThan(1);
    }
  });

  it('emissivities sit in the REFERENCE-VALUES §6.3 ranges', () => {
    // from memory: REFERENCE-VALUES §6.3 (asphalt 0.93–0.97, brick 0.90–0.93, grass 0.90–0.98, water 0.95–0.97,
    // clear glass 0.837, painted metal 0.85–0.95, anodised Al ≈ 0.8); tol: the ranges
    const within = (id: string, lo: number, hi: number) => {
      const e = MATERIAL_PRESETS[id]!.emissivity;
      expect(e).toBeGreaterThanOrEqual(lo);
      expect(e).toBeLessThanOrEqual(hi);
    };
    within('asphalt', 0.93, 0.97);
    within('brick', 0.9, 0.93);
    within('grass', 0.9, 0.98);
    within('water', 0.95, 0.97);
    within('glass-clear', 0.83, 0.845);
    within('steel-dark-painted', 0.85, 0.95);
    within('aluminium-anodised', 0.75, 0.85);
  });

  it('band behaviour: grass red edge, white vs cool-white, glass specular n = 1.52', () => {
    // from memory: REFERENCE-VALUES §10.3 — grass 0.05–0.10 visible, 0.4–0.5 NIR; broadband near pvlib fresh grass 0.26 (tol 0.03)
    const g = MATERIAL_PRESETS.grass!;
    expect(g.reflectanceNir).toBeGreaterThan(4 * g.reflectanceVisible);
    expect(Math.abs(bandWeightedReflectance(g.reflectanceVisible, g.reflectanceNir) - 0.26)).toBeLessThan(0.03);
    // common practice: a conventional white absorbs more NIR than a cool white, with similar visible reflectance
    const w = MATERIAL_PRESETS['paint-white']!;
    const cw = MATERIAL_PRESETS['paint-cool-white']!;
    expect(Math.abs(w.reflectanceVisible - cw.reflectanceVisible)).toBeLessThan(0.05);
    expect(1 - w.reflectanceNir).toBeGreaterThan(1 - cw.reflectanceNir + 0.15);
    expect(solarAbsorptance(w)).toBeGreaterThan(solarAbsorptance(cw));
    // source: REFERENCE-VALUES §10.1 (n = 1.52 for glass); exact
    expect(MATERIAL_PRESETS['glass-clear']!.refractiveIndex).toBe(1.52);
    expect(MATERIAL_PRESETS['glass-clear']!.specularFraction).toBe(1);
  });

  it('solar absorptance is band-weighted and counts transmission', () => {
    // source: derived from ASTM G173-03 band fractions (REFERENCE-VALUES §10.2): α = 1 − (0.4758·0.88 + 0.5242·0.85) = 0.13573; tol 1e-4
    expect(solarAbsorptance(MATERIAL_PRESETS['paint-cool-white']!)).toBeCloseTo(0.1357, 4);
    const glass = MATERIAL_PRESETS['glass-clear']!;
    const opaqueRest = 1 - bandWeightedReflectance(glass.reflectanceVisible, glass.reflectanceNir);
    expect(solarAbsorptance(glass)).toBeLessThan(opaqueRest - 0.5);
    // common practice: dark steel absorbs more than light concrete
    expect(solarAbsorptance(MATERIAL_PRESETS['steel-dark-painted']!)).toBeGreaterThan(solarAbsorptance(MATERIAL_PRESETS['concrete-light']!) + 0.2);
  });
});

describe('resolveMaterial', () => {
  it('resolves an id and applies overrides (TSDoc example)', () => {
    expect(resolveMaterial('concrete', 'defaultMaterial')).toBe(MATERIAL_PRESETS.concrete);
    const m = resolveMaterial({ preset: 'concrete', albedo: 0.6 }, 'materials.wall');
    expect(m.reflectanceNir).toBe(0.6);
    expect(m.reflectanceVisible).toBe(0.6);
    expect(m.sources.reflectanceNir).toMatch(/override/);
    expect(m.construction).toBe(MATERIAL_PRESETS.concrete!.construction);
    const e = resolveMaterial({ preset: 'brick', emissivity: 0.5, back: { kind: 'adiabatic' } }, 'x');
    expect(e.emissivity).toBe(0.5);
    expect(e.back.kind).toBe('adiabatic');
  });

  it('unknown preset: names the place and lists the ids', () => {
    let err: unknown;
    try {
      resolveMaterial('concreet', 'materials["south wall"]', 'project.json');
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    const msg = (err as Error).message;
    expect(msg).toContain('project.json');
    expect(msg).toContain('materials["south wall"]');
    expect(msg).toContain('concreet');
    for (const id of REQUIRED) expect(msg).toContain(id);
    expect(() => resolveMaterial({ preset: 'nope' }, 'm')).toThrow(/m\.preset.*asphalt/);
  });

  it('validates override ranges and layers', () => {
    expect(() => resolveMaterial({ preset: 'concrete', reflectanceVisible: 1.2 }, 'm')).toThrow(/m\.reflectanceVisible/);
    expect(() => resolveMaterial({ preset: 'concrete', emissivity: 0 }, 'm')).toThrow(/m\.emissivity/);
    expect(() => resolveMaterial({ preset: 'glass-clear', reflectanceNir: 0.6 }, 'm')).toThrow(/transmittanceNir/);
    expect(() =>
      resolveMaterial({ preset: 'concrete', construction: [{ name: 'x', thicknessM: -1, conductivityWmK: 1, densityKgM3: 1, specificHeatJkgK: 1 }] }, 'm'),
    ).toThrow(/m\.construction\[0\]\.thicknessM/);
    expect(() => resolveMaterial({ preset: 'concrete', colour: 'red' }, 'm')).toThrow(/m\.colour/);
    expect(() => resolveMaterial({ reflectanceVisible: 0.2 }, 'm')).toThrow(/missing/);
    expect(() => resolveMaterial(42, 'm')).toThrow(InputError);
  });
});
