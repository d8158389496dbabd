/**
 * Material presets: two-band solar reflectance and transmittance, thermal emissivity, specular
 * behaviour, the layered construction behind the surface and its back boundary, with a source note
 * per property.
 *
 * Values are typical figures for screening, not measurements of a product. Most are from memory
 * within the ranges of REFERENCE-VALUES §6.3 (emissivities) and §10.3 (albedos), which are
 * themselves marked from memory (Oke 1987 tables, ASHRAE Fundamentals ch. 4 and 26, EN 673,
 * ISO 10456, pvlib's secondary albedo list). The split of each albedo between the visible and the
 * near-infrared band is an assumption guided by the spectral behaviour of the material class
 * (vegetation's red edge, titanium-white paint's NIR absorption, "cool" NIR-reflective pigments);
 * no sourced band values were found. Override any property per project.
 *
 * References:
 * [1] T. R. Oke, Boundary Layer Climates, 2nd ed. London: Methuen, 1987, Tables 1.1 and 12.x
 *     (albedo and emissivity of natural and urban materials) — ranges from memory.
 * [2] ASHRAE Handbook — Fundamentals, Atlanta: ASHRAE, 2017, ch. 4 (emissivities) and ch. 26
 *     (material thermal properties) — from memory.
 * [3] EN 673:2011, Glass in building — Determination of thermal transmittance (U value) —
 *     Calculation method (normal emissivity 0.89 → hemispherical 0.837 for uncoated soda-lime glass).
 * [4] ISO 10456:2007, Building materials and products — Hygrothermal properties — Tabulated design
 *     values (k, ρ, c of concrete, brick, timber, steel, aluminium, soil) — from memory.
 * [5] ISO 6946:2017, Annex C: interior surface resistance R_si = 0.13 m²·K/W (horizontal heat flow);
 *     a well-ventilated air layer's outer leaf is treated with a surface resistance like R_si on
 *     its back — from memory.
 * [6] R. Levinson, P. Berdahl, H. Akbari, "Solar spectral optical properties of pigments," Sol.
 *     Energy Mater. Sol. Cells, vol. 89, pp. 319–349, 2005, doi:10.1016/j.solmat.2004.11.012
 *     ("cool" coatings: high NIR reflectance) — qualitative, from memory.
 */
import type { ConstructionLayer } from './conduction.ts';
import { InputError } from './errors.ts';
import { bandWeightedReflectance } from './solarSpectrum.ts';

export type { ConstructionLayer } from './conduction.ts';

/** What lies behind the construction's innermost layer. */
export type MaterialBack =
  /** Indoor air at a fixed temperature through an interior surface resistance. */
  | { readonly kind: 'indoor-air'; readonly tempC: number; readonly surfaceResistanceM2KW: number }
  /** Outdoor air (a ventilated cavity at the outdoor air temperature) through a surface resistance. */
  | { readonly kind: 'outdoor-air'; readonly surfaceResistanceM2KW: number }
  /** Ground held at a fixed temperature at the bottom of the construction (its depth). */
  | { readonly kind: 'ground'; readonly tempC: number }
  /** No heat through the back face. */
  | { readonly kind: 'adiabatic' };

/** The solar, thermal and constructional properties of one surface material. */
export interface Material {
  /** Preset id, or the id of the preset the overrides started from ('custom' if none). */
  readonly id: string;
  readonly name: string;
  /** Reflectance in the visible band (280–700 nm, UV included) at near-normal incidence [-]. */
  readonly reflectanceVisible: number;
  /** Reflectance in the near-infrared band (> 700 nm) [-]. */
  readonly reflectanceNir: number;
  /** Solar transmittance in the visible band (glazing; 0 for opaque) [-]. */
  readonly transmittanceVisible: number;
  /** Solar transmittance in the near-infrared band [-]. */
  readonly transmittanceNir: number;
  /** Hemispherical thermal emissivity of the exposed face (= longwave absorptance) [-]. */
  readonly emissivity: number;
  /** Fraction of the reflected solar that leaves specularly (mirror-like) [-]. */
  readonly specularFraction: number;
  /** Real refractive index for Fresnel reflectance of specular dielectrics (glass, water). */
  readonly refractiveIndex: number | undefined;
  /** Layers, outermost first. */
  readonly construction: readonly ConstructionLayer[];
  readonly back: MaterialBack;
  /** Where each property's value comes from: a citation, 'common practice' or 'from memory'. */
  readonly sources: Readonly<Record<string, string>>;
}

// ---------------------------------------------------------------------------------------------
// Layer library (ISO 10456 / ASHRAE ch. 26 typical values, from memory)

function layer(name: string, thicknessM: number, conductivityWmK: number, densityKgM3: number, specificHeatJkgK: number): ConstructionLayer {
  return { name, thicknessM, conductivityWmK, densityKgM3, specificHeatJkgK };
}

const LAYER_SOURCE = 'from memory: typical design values of the ISO 10456 / ASHRAE Fundamentals ch. 26 kind [4][2]';
/** Interior surface resistance, horizontal heat flow (ISO 6946, from memory) [m²·K/W]. */
const R_SI = 0.13;
/** Indoor air temperature behind façades (common practice for a conditioned summer interior) [°C]. */
const INDOOR_TEMP_C = 24;
/**
 * Deep-ground temperature at about 1 m (common practice: close to the annual mean air temperature;
 * set it per site with a `back` override).
 */
const GROUND_TEMP_C = 15;

const indoor: MaterialBack = { kind: 'indoor-air', tempC: INDOOR_TEMP_C, surfaceResistanceM2KW: R_SI };
const ventilated: MaterialBack = { kind: 'outdoor-air', surfaceResistanceM2KW: R_SI };
const ground: MaterialBack = { kind: 'ground', tempC: GROUND_TEMP_C };

const soil = (t: number) => layer('soil (moist)', t, 1.2, 1800, 1200);
const base = (t: number) => layer('crushed-stone base', t, 1.4, 2000, 900);
const concreteLayer = (t: number) => layer('dense concrete', t, 1.7, 2300, 900);
const glassLayer = (t: number) => layer('soda-lime glass', t, 1.0, 2500, 840);

const BACK_SOURCES = {
  indoor: `common practice: conditioned interior at ${INDOOR_TEMP_C} °C behind R_si = ${R_SI} m²·K/W (ISO 6946 [5], from memory)`,
  ventilated: `from memory: ventilated cavity at outdoor air temperature, back resistance ${R_SI} m²·K/W (ISO 6946 ventilated-layer rule [5])`,
  ground: `common practice: ground held at ${GROUND_TEMP_C} °C at the bottom of the construction (≈ annual mean air temperature; override per site)`,
} as const;

interface PresetSpec {
  name: string;
  rv: number;
  rn: number;
  tv?: number;
  tn?: number;
  eps: number;
  spec?: number;
  n?: number;
  construction: ConstructionLayer[];
  back: MaterialBack;
  sources: Record<string, string>;
}

function preset(id: string, p: PresetSpec): Material {
  const backSource =
    p.back.kind === 'indoor-air' ? BACK_SOURCES.indoor : p.back.kind === 'outdoor-air' ? BACK_SOURCES.ventilated : p.back.kind === 'ground' ? BACK_SOURCES.ground : 'assumption: adiabatic back';
  return Object.freeze({
    id,
    name: p.name,
    reflectanceVisible: p.rv,
    reflectanceNir: p.rn,
    transmittanceVisible: p.tv ?? 0,
    transmittanceNir: p.tn ?? 0,
    emissivity: p.eps,
    specularFraction: p.spec ?? 0,
    refractiveIndex: p.n,
    construction: Object.freeze(p.construction.map((l) => Object.freeze(l))),
    back: Object.freeze(p.back),
    sources: Object.freeze({
      transmittanceVisible: p.tv === undefined ? 'opaque' : 'from memory',
      transmittanceNir: p.tn === undefined ? 'opaque' : 'from memory',
      specularFraction: p.spec === undefined ? 'common practice: matte, diffuse reflection' : 'from memory',
      refractiveIndex: p.n === undefined ? 'not specular dielectric' : 'from memory',
      construction: LAYER_SOURCE,
      back: backSource,
      ...p.sources,
    }),
  });
}

const BAND_SPLIT = 'band split assumed (no sourced band values)';

const concreteWall = () => [concreteLayer(0.2)];

/** The preset library, keyed by id. */
export const MATERIAL_PRESETS: Readonly<Record<string, Material>> = Object.freeze({
  asphalt: preset('asphalt', {
    name: 'Asphalt paving (aged)',
    rv: 0.08,
    rn: 0.12,
    eps: 0.95,
    construction: [layer('asphalt', 0.05, 0.75, 2300, 920), base(0.25), soil(0.7)],
    back: ground,
    sources: {
      reflectanceVisible: `from memory: albedo 0.05–0.20 (Oke 1987 [1]); pvlib 0.12; ${BAND_SPLIT}`,
      reflectanceNir: `from memory: see reflectanceVisible; ${BAND_SPLIT}`,
      emissivity: 'from memory: 0.95 (0.93–0.97), REFERENCE-VALUES §6.3',
    },
  }),
  concrete: preset('concrete', {
    name: 'Concrete, weathered grey (200 mm wall)',
    rv: 0.3,
    rn: 0.32,
    eps: 0.9,
    construction: concreteWall(),
    back: indoor,
    sources: {
      reflectanceVisible: `from memory: albedo 0.10–0.35 (Oke 1987 [1]); pvlib 0.30; ${BAND_SPLIT}`,
      reflectanceNir: `from memory; ${BAND_SPLIT}`,
      emissivity: 'from memory: 0.88–0.94, REFERENCE-VALUES §6.3',
    },
  }),
  'concrete-light': preset('concrete-light', {
    name: 'Concrete, light / new (200 mm wall)',
    rv: 0.45,
    rn: 0.4,
    eps: 0.9,
    construction: concreteWall(),
    back: indoor,
    sources: {
      reflectanceVisible: `from memory: upper part of the 0.10–0.35+ concrete range (new light concrete); ${BAND_SPLIT}`,
      reflectanceNir: `from memory; ${BAND_SPLIT}`,
      emissivity: 'from memory: 0.88–0.94, REFERENCE-VALUES §6.3',
    },
  }),
  'concrete-dark': preset('concrete-dark', {
    name: 'Concrete, dark / pigmented (200 mm wall)',
    rv: 0.15,
    rn: 0.2,
    eps: 0.92,
    construction: concreteWall(),
    back: indoor,
    sources: {
      reflectanceVisible: `from memory: lower part of the concrete range; ${BAND_SPLIT}`,
      reflectanceNir: `from memory; ${BAND_SPLIT}`,
      emissivity: 'from memory: 0.88–0.94, REFERENCE-VALUES §6.3',
    },
  }),
  brick: preset('brick', {
    name: 'Red brick cavity wall (brick, insulation, block)',
    rv: 0.22,
    rn: 0.4,
    eps: 0.91,
    construction: [
      layer('clay brick', 0.105, 0.77, 1700, 800),
      layer('mineral wool', 0.1, 0.035, 30, 1030),
      layer('concrete block', 0.1, 1.13, 2000, 1000),
    ],
    back: indoor,
    sources: {
      reflectanceVisible: `from memory: albedo 0.20–0.40 (Oke 1987 [1]); red absorbs blue/green; ${BAND_SPLIT}`,
      reflectanceNir: `from memory; ${BAND_SPLIT}`,
      emissivity: 'from memory: 0.90–0.93, REFERENCE-VALUES §6.3',
    },
  }),
  grass: preset('grass', {
    name: 'Grass on moist soil (no evapotranspiration modelled)',
    rv: 0.07,
    rn: 0.45,
    eps: 0.97,
    construction: [layer('topsoil with roots (moist)', 0.1, 0.9, 1500, 1500), soil(0.9)],
    back: ground,
    sources: {
      reflectanceVisible: 'from memory: green leaves reflect 0.05–0.10 in the visible (REFERENCE-VALUES §10.3, red edge)',
      reflectanceNir: 'from memory: 0.4–0.5 in the NIR (REFERENCE-VALUES §10.3); broadband 0.27 vs pvlib fresh grass 0.26',
      emissivity: 'from memory: 0.97–0.98, REFERENCE-VALUES §6.3',
    },
  }),
  water: preset('water', {
    name: 'Water, shallow pool (well mixed)',
    rv: 0.06,
    rn: 0.05,
    eps: 0.96,
    spec: 0.9,
    n: 1.33,
    construction: [layer('water (mixed; effective conductivity)', 0.5, 10, 1000, 4186), soil(0.5)],
    back: ground,
    sources: {
      reflectanceVisible: 'from memory: sea/pool albedo ≈ 0.06 (pvlib sea 0.06) at moderate sun; Fresnel rises at grazing sun',
      reflectanceNir: 'from memory',
      emissivity: 'from memory: 0.95–0.97, REFERENCE-VALUES §6.3',
      specularFraction: 'common practice: a calm water surface reflects mostly specularly',
      refractiveIndex: 'from memory: 1.33 (visible)',
      construction: 'assumption: mixing represented by an effective conductivity of 10 W/(m·K) (still water 0.6); ρ, c of water',
    },
  }),
  'glass-clear': preset('glass-clear', {
    name: 'Clear double glazing (6 / 16 air / 6 mm)',
    rv: 0.14,
    rn: 0.12,
    tv: 0.78,
    tn: 0.58,
    eps: 0.84,
    spec: 1,
    n: 1.52,
    construction: [glassLayer(0.006), layer('air gap, 16 mm (R ≈ 0.17 m²K/W as effective k)', 0.016, 0.094, 1.2, 1005), glassLayer(0.006)],
    back: indoor,
    sources: {
      reflectanceVisible: 'from memory: clear double glazing, normal incidence (4 uncoated faces)',
      reflectanceNir: 'from memory',
      transmittanceVisible: 'from memory: clear double glazing τ_v ≈ 0.78–0.81',
      transmittanceNir: 'from memory: iron oxide absorbs part of the NIR',
      emissivity: 'EN 673 [3]: hemispherical 0.837 for uncoated soda-lime glass (REFERENCE-VALUES §6.3)',
      specularFraction: 'common practice: float glass is a specular reflector',
      refractiveIndex: 'REFERENCE-VALUES §10.1: n = 1.52',
      construction: 'from memory: glass k 1.0 W/(m·K), ρ 2500, c 840; air gap as an effective conductivity',
    },
  }),
  'glass-low-e': preset('glass-low-e', {
    name: 'Solar-control low-e double glazing (coating on face 2, argon)',
    rv: 0.12,
    rn: 0.3,
    tv: 0.7,
    tn: 0.25,
    eps: 0.84,
    spec: 1,
    n: 1.52,
    construction: [glassLayer(0.006), layer('argon gap with low-e coating (R ≈ 0.73 m²K/W as effective k)', 0.016, 0.022, 1.7, 520), glassLayer(0.006)],
    back: indoor,
    sources: {
      reflectanceVisible: 'from memory: solar-control low-e double glazing',
      reflectanceNir: 'from memory: spectrally selective coating reflects NIR',
      transmittanceVisible: 'from memory',
      transmittanceNir: 'from memory',
      emissivity: 'EN 673 [3]: the outer face (face 1) is uncoated glass, 0.837; the low-e coating faces the cavity',
      specularFraction: 'common practice: float glass is a specular reflector',
      refractiveIndex: 'REFERENCE-VALUES §10.1: n = 1.52',
      construction: 'from memory: gap resistance chosen so the unit U ≈ 1.1 W/(m²·K)',
    },
  }),
  'steel-dark-painted': preset('steel-dark-painted', {
    name: 'Dark painted steel cladding sheet (0.7 mm), ventilated behind',
    rv: 0.08,
    rn: 0.1,
    eps: 0.9,
    spec: 0.05,
    construction: [layer('steel sheet', 0.0007, 50, 7850, 450)],
    back: ventilated,
    sources: {
      reflectanceVisible: `from memory: dark (carbon-black pigmented) paint; ${BAND_SPLIT}`,
      reflectanceNir: `from memory; ${BAND_SPLIT}`,
      emissivity: 'from memory: painted metal 0.85–0.95, REFERENCE-VALUES §6.3',
      specularFraction: 'from memory: semi-gloss paint, small specular part',
    },
  }),
  'steel-weathered': preset('steel-weathered', {
    name: 'Weathering (rusted) steel plate (3 mm), ventilated behind',
    rv: 0.1,
    rn: 0.2,
    eps: 0.85,
    construction: [layer('weathering steel plate', 0.003, 50, 7850, 450)],
    back: ventilated,
    sources: {
      reflectanceVisible: `from memory: pvlib dirty steel 0.08; rust is redder in the NIR; ${BAND_SPLIT}`,
      reflectanceNir: `from memory; ${BAND_SPLIT}`,
      emissivity: 'from memory: oxidised steel ≈ 0.8, REFERENCE-VALUES §6.3',
    },
  }),
  'aluminium-anodised': preset('aluminium-anodised', {
    name: 'Natural anodised aluminium panel (3 mm), ventilated behind',
    rv: 0.7,
    rn: 0.65,
    eps: 0.8,
    spec: 0.5,
    construction: [layer('aluminium sheet', 0.003, 160, 2700, 900)],
    back: ventilated,
    sources: {
      reflectanceVisible: 'from memory: below polished aluminium (pvlib 0.85)',
      reflectanceNir: 'from memory',
      emissivity: 'from memory: anodised aluminium ≈ 0.8, REFERENCE-VALUES §6.3',
      specularFraction: 'from memory: satin anodised finish, partly specular',
      refractiveIndex: 'metal: no real refractive index; specular part uses the band reflectance',
    },
  }),
  'paint-white': preset('paint-white', {
    name: 'Conventional white paint on rendered block wall',
    rv: 0.85,
    rn: 0.6,
    eps: 0.9,
    construction: [layer('render', 0.02, 1.0, 1800, 1000), layer('concrete block', 0.15, 1.13, 2000, 1000)],
    back: indoor,
    sources: {
      reflectanceVisible: 'from memory: white paint 0.50–0.90 (Oke 1987 [1]); TiO₂ whites are bright in the visible',
      reflectanceNir: 'from memory: conventional whites absorb more NIR than cool whites [6]',
      emissivity: 'from memory: non-metallic paint 0.85–0.95, REFERENCE-VALUES §6.3',
    },
  }),
  'paint-cool-white': preset('paint-cool-white', {
    name: 'Cool (NIR-reflective) white coating on rendered block wall',
    rv: 0.88,
    rn: 0.85,
    eps: 0.9,
    construction: [layer('render', 0.02, 1.0, 1800, 1000), layer('concrete block', 0.15, 1.13, 2000, 1000)],
    back: indoor,
    sources: {
      reflectanceVisible: 'from memory: cool-roof white coatings, solar reflectance ≈ 0.85–0.90 [6]',
      reflectanceNir: 'from memory: high NIR reflectance is what makes a coating "cool" [6]',
      emissivity: 'from memory: non-metallic paint 0.85–0.95, REFERENCE-VALUES §6.3',
    },
  }),
  timber: preset('timber', {
    name: 'Timber cladding boards (20 mm), ventilated behind',
    rv: 0.3,
    rn: 0.45,
    eps: 0.9,
    construction: [layer('softwood', 0.02, 0.13, 500, 1600)],
    back: ventilated,
    sources: {
      reflectanceVisible: `from memory: untreated/light-stained wood; ${BAND_SPLIT}`,
      reflectanceNir: `from memory: wood is brighter in the NIR; ${BAND_SPLIT}`,
      emissivity: 'from memory: wood ≈ 0.90',
    },
  }),
  'stone-paving': preset('stone-paving', {
    name: 'Stone paving slabs on sand bed',
    rv: 0.3,
    rn: 0.35,
    eps: 0.92,
    construction: [layer('granite / sandstone slab', 0.05, 2.8, 2600, 800), layer('sand bed (dry)', 0.03, 0.33, 1600, 800), base(0.2), soil(0.72)],
    back: ground,
    sources: {
      reflectanceVisible: `from memory: light-grey stone; ${BAND_SPLIT}`,
      reflectanceNir: `from memory; ${BAND_SPLIT}`,
      emissivity: 'from memory: stone 0.90–0.95',
    },
  }),
  'turf-artificial': preset('turf-artificial', {
    name: 'Artificial turf (polyethylene with rubber infill) on shock pad',
    rv: 0.07,
    rn: 0.2,
    eps: 0.93,
    construction: [layer('turf with rubber infill', 0.04, 0.2, 600, 1500), layer('shock pad', 0.02, 0.06, 150, 1500), base(0.2), soil(0.74)],
    back: ground,
    sources: {
      reflectanceVisible: `from memory: green pigmented plastic, no vegetation red edge; ${BAND_SPLIT}`,
      reflectanceNir: `from memory; ${BAND_SPLIT}`,
      emissivity: 'from memory: plastics ≈ 0.90–0.95',
    },
  }),
  gravel: preset('gravel', {
    name: 'Loose gravel on soil',
    rv: 0.25,
    rn: 0.3,
    eps: 0.92,
    construction: [layer('gravel (with air voids)', 0.1, 0.7, 1600, 800), soil(0.9)],
    back: ground,
    sources: {
      reflectanceVisible: `from memory: grey gravel; ${BAND_SPLIT}`,
      reflectanceNir: `from memory; ${BAND_SPLIT}`,
      emissivity: 'from memory: stone 0.90–0.95',
    },
  }),
});

/** Ids of all presets, sorted. */
export function materialPresetIds(): string[] {
  return Object.keys(MATERIAL_PRESETS).sort();
}

/**
 * Broadband solar absorptance of an opaque or glazed material, band-weighted with the AM1.5
 * fractions: α = 1 − ρ_solar − τ_solar (ASTM G173-03 band weights, see solarSpectrum.ts).
 *
 * @param m Material
 * @returns Solar absorptance [-]
 *
 * @example
 * solarAbsorptance(MATERIAL_PRESETS['paint-cool-white']!) // ≈ 0.1357
 */
export function solarAbsorptance(m: Material): number {
  return 1 - bandWeightedReflectance(m.reflectanceVisible, m.reflectanceNir) - bandWeightedReflectance(m.transmittanceVisible, m.transmittanceNir);
}

/** Property overrides accepted in a project's material entry. */
export interface MaterialOverrides {
  preset?: string;
  name?: string;
  /** Sets both band reflectances at once (a broadband albedo). */
  albedo?: number;
  reflectanceVisible?: number;
  reflectanceNir?: number;
  transmittanceVisible?: number;
  transmittanceNir?: number;
  emissivity?: number;
  specularFraction?: number;
  refractiveIndex?: number;
  construction?: readonly ConstructionLayer[];
  back?: MaterialBack;
}

const OVERRIDE_KEYS = [
  'preset',
  'name',
  'albedo',
  'reflectanceVisible',
  'reflectanceNir',
  'transmittanceVisible',
  'transmittanceNir',
  'emissivity',
  'specularFraction',
  'refractiveIndex',
  'construction',
  'back',
] as const;

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function unknownPreset(id: unknown, place: string, file: string | undefined): InputError {
  return new InputError({
    problem: 'unknown material preset',
    ...(file === undefined ? {} : { file }),
    place,
    value: id,
    expected: `one of: ${materialPresetIds().join(', ')}`,
  });
}

function num(v: unknown, place: string, lo: number, hi: number, loOpen: boolean, file: string | undefined): number {
  const ok = typeof v === 'number' && Number.isFinite(v) && (loOpen ? v > lo : v >= lo) && v <= hi;
  if (!ok) {
    throw new InputError({
      problem: typeof v === 'number' ? 'outside the valid range' : 'not a number',
      ...(file === undefined ? {} : { file }),
      place,
      value: v,
      expected: `a number in ${loOpen ? '(' : '['}${lo}, ${hi}]`,
    });
  }
  return v;
}

function positive(v: unknown, place: string, file: string | undefined): number {
  if (!(typeof v === 'number' && Number.isFinite(v) && v > 0)) {
    throw new InputError({ problem: 'must be a positive number', ...(file === undefined ? {} : { file }), place, value: v, expected: 'a finite number > 0' });
  }
  return v;
}

function parseConstruction(v: unknown, place: string, file: string | undefined): ConstructionLayer[] {
  if (!Array.isArray(v) || v.length === 0) {
    throw new InputError({ problem: 'construction must be a non-empty array of layers', ...(file === undefined ? {} : { file }), place, value: v, expected: 'layers { name, thicknessM, conductivityWmK, densityKgM3, specificHeatJkgK }, outermost first' });
  }
  return v.map((l: unknown, i) => {
    const lp = `${place}[${i}]`;
    if (!isRecord(l)) throw new InputError({ problem: 'layer must be an object', ...(file === undefined ? {} : { file }), place: lp, value: l });
    return {
      name: typeof l.name === 'string' ? l.name : `layer ${i + 1}`,
      thicknessM: positive(l.thicknessM, `${lp}.thicknessM`, file),
      conductivityWmK: positive(l.conductivityWmK, `${lp}.conductivityWmK`, file),
      densityKgM3: positive(l.densityKgM3, `${lp}.densityKgM3`, file),
      specificHeatJkgK: positive(l.specificHeatJkgK, `${lp}.specificHeatJkgK`, file),
    };
  });
}

function parseBack(v: unknown, place: string, file: string | undefined): MaterialBack {
  const kinds = "'indoor-air' { tempC, surfaceResistanceM2KW }, 'outdoor-air' { surfaceResistanceM2KW }, 'ground' { tempC } or 'adiabatic'";
  if (!isRecord(v)) throw new InputError({ problem: 'back must be an object', ...(file === undefined ? {} : { file }), place, value: v, expected: kinds });
  switch (v.kind) {
    case 'indoor-air':
      return { kind: 'indoor-air', tempC: num(v.tempC, `${place}.tempC`, -30, 60, false, file), surfaceResistanceM2KW: positive(v.surfaceResistanceM2KW, `${place}.surfaceResistanceM2KW`, file) };
    case 'outdoor-air':
      return { kind: 'outdoor-air', surfaceResistanceM2KW: positive(v.surfaceResistanceM2KW, `${place}.surfaceResistanceM2KW`, file) };
    case 'ground':
      return { kind: 'ground', tempC: num(v.tempC, `${place}.tempC`, -30, 60, false, file) };
    case 'adiabatic':
      return { kind: 'adiabatic' };
    default:
      throw new InputError({ problem: 'unknown back boundary kind', ...(file === undefined ? {} : { file }), place: `${place}.kind`, value: v.kind, expected: kinds });
  }
}

/**
 * Resolves a project's material entry (a preset id, or an object of overrides with an optional
 * `preset` to start from) into a validated Material.
 *
 * Checks: reflectances and transmittances in [0, 1] and ρ + τ ≤ 1 per band, emissivity in (0, 1],
 * specular fraction in [0, 1], refractive index in [1, 4], layer values positive. Without a preset
 * every property must be given.
 *
 * @param spec Preset id, or `{ preset?, ...overrides }`
 * @param place Where the entry sits, for error messages (e.g. 'materials["south wall"]')
 * @param file The project file, for error messages (optional)
 * @returns The resolved material (its `sources` note which properties were overridden)
 * @throws InputError naming the place, the bad value and, for an unknown preset, listing the ids
 *
 * @example
 * resolveMaterial({ preset: 'concrete', albedo: 0.6 }, 'materials.wall').reflectanceNir // 0.6
 */
export function resolveMaterial(spec: unknown, place: string, file?: string): Material {
  if (typeof spec === 'string') {
    const m = Object.hasOwn(MATERIAL_PRESETS, spec) ? MATERIAL_PRESETS[spec] : undefined;
    if (m === undefined) throw unknownPreset(spec, place, file);
    return m;
  }
  if (!isRecord(spec)) {
    throw new InputError({ problem: 'material must be a preset id or an object of overrides', ...(file === undefined ? {} : { file }), place, value: spec, expected: `a preset id (${materialPresetIds().join(', ')}) or { preset?, ...overrides }` });
  }
  for (const key of Object.keys(spec)) {
    if (!(OVERRIDE_KEYS as readonly string[]).includes(key)) {
      throw new InputError({ problem: 'unknown material property', ...(file === undefined ? {} : { file }), place: `${place}.${key}`, expected: `one of ${OVERRIDE_KEYS.join(', ')}` });
    }
  }
  let base: Material | undefined;
  if (spec.preset !== undefined) {
    const id = spec.preset;
    base = typeof id === 'string' && Object.hasOwn(MATERIAL_PRESETS, id) ? MATERIAL_PRESETS[id] : undefined;
    if (base === undefined) throw unknownPreset(id, `${place}.preset`, file);
  }
  const need = (key: string): never => {
    throw new InputError({ problem: 'missing material property (no preset to inherit from)', ...(file === undefined ? {} : { file }), place: `${place}.${key}`, expected: `the property, or a "preset" (one of: ${materialPresetIds().join(', ')})` });
  };
  const sources: Record<string, string> = { ...(base?.sources ?? {}) };
  const has = (k: string) => spec[k] !== undefined;
  const unit = (k: string, fallback: number | undefined, lo = 0, loOpen = false): number => {
    if (has(k)) {
      sources[k] = 'project override';
      return num(spec[k], `${place}.${k}`, lo, 1, loOpen, file);
    }
    return fallback ?? need(k);
  };
  let albedo: number | undefined;
  if (has('albedo')) albedo = num(spec.albedo, `${place}.albedo`, 0, 1, false, file);
  const rv = has('reflectanceVisible') ? unit('reflectanceVisible', undefined) : (albedo ?? unit('reflectanceVisible', base?.reflectanceVisible));
  const rn = has('reflectanceNir') ? unit('reflectanceNir', undefined) : (albedo ?? unit('reflectanceNir', base?.reflectanceNir));
  if (albedo !== undefined) {
    if (!has('reflectanceVisible')) sources.reflectanceVisible = 'project override (albedo)';
    if (!has('reflectanceNir')) sources.reflectanceNir = 'project override (albedo)';
  }
  const tv = unit('transmittanceVisible', base?.transmittanceVisible ?? 0);
  const tn = unit('transmittanceNir', base?.transmittanceNir ?? 0);
  const eps = unit('emissivity', base?.emissivity, 0, true);
  const specular = unit('specularFraction', base?.specularFraction ?? 0);
  let n = base?.refractiveIndex;
  if (has('refractiveIndex')) {
    n = num(spec.refractiveIndex, `${place}.refractiveIndex`, 1, 4, false, file);
    sources.refractiveIndex = 'project override';
  }
  if (rv + tv > 1 + 1e-12) {
    throw new InputError({ problem: 'visible reflectance + transmittance exceeds 1', ...(file === undefined ? {} : { file }), place: `${place}.transmittanceVisible`, value: tv, expected: `at most ${1 - rv} with reflectanceVisible ${rv}` });
  }
  if (rn + tn > 1 + 1e-12) {
    throw new InputError({ problem: 'NIR reflectance + transmittance exceeds 1', ...(file === undefined ? {} : { file }), place: `${place}.transmittanceNir`, value: tn, expected: `at most ${1 - rn} with reflectanceNir ${rn}` });
  }
  let construction = base?.construction;
  if (has('construction')) {
    construction = parseConstruction(spec.construction, `${place}.construction`, file);
    sources.construction = 'project override';
  }
  let back = base?.back;
  if (has('back')) {
    back = parseBack(spec.back, `${place}.back`, file);
    sources.back = 'project override';
  }
  if (has('name') && typeof spec.name !== 'string') {
    throw new InputError({ problem: 'name must be a string', ...(file === undefined ? {} : { file }), place: `${place}.name`, value: spec.name });
  }
  return Object.freeze({
    id: base?.id ?? 'custom',
    name: typeof spec.name === 'string' ? spec.name : (base?.name ?? 'custom material'),
    reflectanceVisible: rv,
    reflectanceNir: rn,
    transmittanceVisible: tv,
    transmittanceNir: tn,
    emissivity: eps,
    specularFraction: specular,
    refractiveIndex: n,
    construction: construction ?? need('construction'),
    back: back ?? need('back'),
    sources: Object.freeze(sources),
  });
}
