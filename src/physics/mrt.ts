/**
 * Mean radiant temperature (MRT) of a person: the six-directional integral method, the projected
 * area factor of a person for the direct solar beam, MRT from a globe thermometer (ISO 7726), and
 * the ASHRAE 55 solar-gain (ERF) method used as the published check of the projected-area table.
 *
 * Six directions are always ordered [up, down, east, south, west, north]: element i is the flux
 * density [W/m²] received by a small plane facing that direction (index 0 faces the sky and
 * receives the downwelling flux; index 1 faces the ground).
 *
 * References (bibliographic details of [1], [2] and the DOIs of [3] and [5] are from memory):
 * [1] P. Höppe, "A new procedure to determine the mean radiant temperature outdoors," Wetter und
 *     Leben, vol. 44, pp. 147–151, 1992.
 * [2] VDI 3787 Part 2, "Environmental meteorology — Methods for the human biometeorological
 *     evaluation of climate and air quality for urban and regional planning at regional level —
 *     Part I: Climate," Verein Deutscher Ingenieure, 2008.
 * [3] S. Thorsson, F. Lindberg, I. Eliasson and B. Holmer, "Different methods for estimating the
 *     mean radiant temperature in an outdoor urban setting," Int. J. Climatol., vol. 27, no. 14,
 *     pp. 1983–1993, 2007, doi:10.1002/joc.1537.
 * [4] ISO 7726:1998, "Ergonomics of the thermal environment — Instruments for measuring physical
 *     quantities," International Organization for Standardization, 1998.
 * [5] ANSI/ASHRAE Standard 55-2017, "Thermal environmental conditions for human occupancy,"
 *     Normative Appendix C (solar gain to occupants); E. Arens, T. Hoyt, X. Zhou, L. Huang,
 *     H. Zhang and S. Schiavon, "Modeling the comfort effects of short-wave solar radiation indoors,"
 *     Build. Environ., vol. 88, pp. 3–9, 2015, doi:10.1016/j.buildenv.2014.09.004.
 */
import { InputError, requireInRange } from './errors.ts';
import { KELVIN_AT_0C, STEFAN_BOLTZMANN_ROUNDED_W_M2K4, STEFAN_BOLTZMANN_W_M2K4, DEG } from './constants.ts';

/** Body shape for the six-directional weights. */
export type MrtPosture = 'standing' | 'seated' | 'sphere';
/** Postures of the ASHRAE 55 projected-area tables. */
export type BodyPosture = 'standing' | 'seated';

/** Angular weights of the six directions: one for up and for down, one for each lateral direction. */
export interface SixDirectionWeights {
  readonly upDown: number;
  readonly lateral: number;
}

/**
 * Weights Wᵢ of the six-directional method, summing to 1 (2·upDown + 4·lateral = 1).
 * - standing: 0.06 up/down, 0.22 lateral — Höppe 1992, VDI 3787-2, Thorsson et al. 2007 [1–3];
 * - sphere: 1/6 each [3];
 * - seated: 0.18/1.40 ≈ 0.1286 up/down, 0.26/1.40 ≈ 0.1857 lateral — derived by us from the ISO 7726
 *   projected-area factors for a seated person (up/down 0.18, right/left 0.22, front/back 0.30),
 *   averaging right/left with front/back for an unknown orientation and dividing by the sum over all
 *   six directions (2·(0.18 + 0.22 + 0.30) = 1.40). The same recipe turns ISO's standing factors
 *   (0.08, 0.23, 0.35) into 0.0606 / 0.2197, i.e. the 0.06 / 0.22 of [1–3]. The ISO factors were read
 *   from a secondary reproduction of the ISO 7726 table, not from the standard itself.
 */
export const SIX_DIRECTION_WEIGHTS: Readonly<Record<MrtPosture, SixDirectionWeights>> = {
  standing: { upDown: 0.06, lateral: 0.22 },
  seated: { upDown: 0.18 / 1.4, lateral: 0.26 / 1.4 },
  sphere: { upDown: 1 / 6, lateral: 1 / 6 },
};

/** Shortwave absorptance of the clothed body (Thorsson et al. 2007; VDI 3787-2 standard value). */
export const BODY_ABSORPTANCE_SHORTWAVE = 0.7;
/** Longwave emissivity of the body (Thorsson et al. 2007; VDI 3787-2 standard value). */
export const BODY_EMISSIVITY_LONGWAVE = 0.97;

function weightsFor(posture: MrtPosture): SixDirectionWeights {
  const w = SIX_DIRECTION_WEIGHTS[posture];
  if (w === undefined) {
    throw new InputError({ problem: 'unknown posture', place: 'posture', value: posture, expected: "'standing', 'seated' or 'sphere'" });
  }
  return w;
}

// ---------------------------------------------------------------------------------------------
// Six-directional integral method
// ---------------------------------------------------------------------------------------------

/** Direct solar beam on the body: normal irradiance and the projected area factor fp. */
export interface DirectBeamOnBody {
  /** Beam irradiance on a plane normal to the sun [W/m²] (0 when the point is shaded). */
  normalIrradianceWm2: number;
  /** Projected area factor fp [-] of the body for the sun's direction (see `projectedAreaFactor`). */
  projectedAreaFactor: number;
}

/** Inputs of `mrtSixDirectionalC` and `meanRadiantFluxDensityWm2`. */
export interface SixDirectionalInputs {
  /** Diffuse and reflected shortwave received from [up, down, east, south, west, north] [W/m²]. */
  shortwaveWm2: ArrayLike<number>;
  /** Longwave received from [up, down, east, south, west, north] [W/m²]. */
  longwaveWm2: ArrayLike<number>;
  posture: MrtPosture;
  /** The direct beam, added as α·fp·I on top of the six shortwave fluxes. Omit when shaded or at night. */
  directBeam?: DirectBeamOnBody;
  /** Shortwave absorptance of the body α [-]; default 0.7. */
  absorptanceShortwave?: number;
  /** Longwave emissivity of the body ε [-]; default 0.97. */
  emissivityLongwave?: number;
  /** σ [W m⁻² K⁻⁴]; default CODATA 2018 (`STEFAN_BOLTZMANN_W_M2K4`). */
  stefanBoltzmannWm2K4?: number;
}

/** S_str on fluxes at offsets, no checks (shared by the checked and the packed entry points). */
function fluxDensity(
  sw: ArrayLike<number>,
  swOff: number,
  lw: ArrayLike<number>,
  lwOff: number,
  w: SixDirectionWeights,
  beamNormalWm2: number,
  fp: number,
  alpha: number,
  eps: number,
): number {
  const swSum =
    w.upDown * ((sw[swOff] as number) + (sw[swOff + 1] as number)) +
    w.lateral * ((sw[swOff + 2] as number) + (sw[swOff + 3] as number) + (sw[swOff + 4] as number) + (sw[swOff + 5] as number));
  const lwSum =
    w.upDown * ((lw[lwOff] as number) + (lw[lwOff + 1] as number)) +
    w.lateral * ((lw[lwOff + 2] as number) + (lw[lwOff + 3] as number) + (lw[lwOff + 4] as number) + (lw[lwOff + 5] as number));
  return alpha * (swSum + fp * beamNormalWm2) + eps * lwSum;
}

function checkSix(values: ArrayLike<number>, place: string): void {
  if (values.length !== 6) {
    throw new InputError({ problem: 'wrong number of directions', place, value: values.length, expected: '6 fluxes [up, down, east, south, west, north] in W/m²' });
  }
  for (let i = 0; i < 6; i++) requireInRange(values[i] as number, 0, Infinity, `${place}[${i}]`, 'W/m²');
}

function checkedFluxDensity(inputs: SixDirectionalInputs): number {
  checkSix(inputs.shortwaveWm2, 'shortwaveWm2');
  checkSix(inputs.longwaveWm2, 'longwaveWm2');
  const w = weightsFor(inputs.posture);
  const alpha = inputs.absorptanceShortwave ?? BODY_ABSORPTANCE_SHORTWAVE;
  const eps = inputs.emissivityLongwave ?? BODY_EMISSIVITY_LONGWAVE;
  requireInRange(alpha, 0, 1, 'absorptanceShortwave');
  requireInRange(eps, 0, 1, 'emissivityLongwave', '', { exclusive: false });
  if (eps === 0) throw new InputError({ problem: 'zero emissivity', place: 'emissivityLongwave', value: eps, expected: 'a value in (0, 1]' });
  let beam = 0;
  let fp = 0;
  if (inputs.directBeam !== undefined) {
    beam = inputs.directBeam.normalIrradianceWm2;
    fp = inputs.directBeam.projectedAreaFactor;
    requireInRange(beam, 0, Infinity, 'directBeam.normalIrradianceWm2', 'W/m²');
    requireInRange(fp, 0, 1, 'directBeam.projectedAreaFactor');
  }
  return fluxDensity(inputs.shortwaveWm2, 0, inputs.longwaveWm2, 0, w, beam, fp, alpha, eps);
}

/**
 * Mean radiant flux density S_str absorbed by the body, six-directional method.
 *
 * S_str = α·(Σᵢ Wᵢ·Kᵢ + fp·I_beam) + ε·Σᵢ Wᵢ·Lᵢ, i over [up, down, east, south, west, north].
 *
 * @param inputs Six shortwave and six longwave fluxes [W/m²], posture, optional direct beam [W/m²]
 *   with its fp [-], α [-] (0.7), ε [-] (0.97).
 * @returns S_str [W/m²].
 * @throws InputError for a wrong number of fluxes, negative fluxes, α or ε outside [0, 1].
 * @see [1] Höppe 1992; [2] VDI 3787-2; [3] Thorsson et al. 2007.
 * @example meanRadiantFluxDensityWm2({ shortwaveWm2: [900, 150, 300, 50, 80, 80],
 *   longwaveWm2: [350, 480, 450, 450, 450, 450], posture: 'standing' }) // → 555.066 (W/m²)
 */
export function meanRadiantFluxDensityWm2(inputs: SixDirectionalInputs): number {
  return checkedFluxDensity(inputs);
}

/**
 * MRT by the six-directional integral method (Höppe 1992; VDI 3787-2; Thorsson et al. 2007).
 *
 * S_str = α·(Σᵢ Wᵢ·Kᵢ + fp·I_beam) + ε·Σᵢ Wᵢ·Lᵢ;  Tmrt = (S_str / (ε·σ))^¼ − 273.15.
 * Weights Wᵢ from `SIX_DIRECTION_WEIGHTS` (standing 0.06 up/down, 0.22 lateral; sphere 1/6;
 * seated derived, see there). With the beam in, fp must refer to the same posture.
 *
 * @param inputs See `SixDirectionalInputs`: fluxes [W/m²], posture, directBeam
 *   {normalIrradianceWm2 [W/m²], projectedAreaFactor [-]}, absorptanceShortwave [-] = 0.7,
 *   emissivityLongwave [-] = 0.97, stefanBoltzmannWm2K4 [W m⁻² K⁻⁴] = CODATA 2018.
 * @returns Mean radiant temperature [°C].
 * @throws InputError for malformed or negative fluxes, α/ε/fp outside [0, 1], or S_str ≤ 0.
 * @see [1] Höppe 1992; [2] VDI 3787-2; [3] Thorsson et al. 2007.
 * @example mrtSixDirectionalC({ shortwaveWm2: [900, 150, 300, 50, 80, 80],
 *   longwaveWm2: [350, 480, 450, 450, 450, 450], posture: 'standing',
 *   stefanBoltzmannWm2K4: 5.67e-8 }) // → 43.80 (°C)
 */
export function mrtSixDirectionalC(inputs: SixDirectionalInputs): number {
  const s = checkedFluxDensity(inputs);
  const eps = inputs.emissivityLongwave ?? BODY_EMISSIVITY_LONGWAVE;
  const sigma = inputs.stefanBoltzmannWm2K4 ?? STEFAN_BOLTZMANN_W_M2K4;
  requireInRange(sigma, 0, Infinity, 'stefanBoltzmannWm2K4', 'W m⁻² K⁻⁴', { exclusive: true });
  return mrtFromFluxDensity(s, eps, sigma);
}

function mrtFromFluxDensity(s: number, eps: number, sigma: number): number {
  if (!(s > 0)) {
    throw new InputError({ problem: 'absorbed radiation is not positive', place: 'six-directional fluxes', value: s, expected: 'a positive mean radiant flux density in W/m²' });
  }
  return Math.sqrt(Math.sqrt(s / (eps * sigma))) - KELVIN_AT_0C;
}

/**
 * MRT by the six-directional method on fluxes packed in typed arrays — the no-allocation variant
 * for hot loops (same equation as `mrtSixDirectionalC`).
 *
 * Reads six shortwave values from shortwaveWm2[shortwaveOffset … +5] and six longwave values from
 * longwaveWm2[longwaveOffset … +5], both ordered [up, down, east, south, west, north]. Inputs are
 * not range-checked (the caller produced them); only a non-positive S_str is refused.
 *
 * @param shortwaveWm2 Diffuse + reflected shortwave fluxes [W/m²].
 * @param shortwaveOffset Index of the "up" value in shortwaveWm2.
 * @param longwaveWm2 Longwave fluxes [W/m²].
 * @param longwaveOffset Index of the "up" value in longwaveWm2.
 * @param posture 'standing' | 'seated' | 'sphere'.
 * @param beamNormalIrradianceWm2 Direct beam normal irradiance at the point [W/m²] (0 if shaded).
 * @param projectedAreaFactor fp [-] for the sun direction and posture.
 * @param absorptanceShortwave α [-], default 0.7.
 * @param emissivityLongwave ε [-], default 0.97.
 * @param stefanBoltzmannWm2K4 σ [W m⁻² K⁻⁴], default CODATA 2018.
 * @returns Mean radiant temperature [°C].
 * @throws InputError when S_str ≤ 0 or NaN.
 * @see [1] Höppe 1992; [2] VDI 3787-2; [3] Thorsson et al. 2007.
 * @example mrtSixDirectionalPackedC(sw, 6 * k, lw, 6 * k, 'standing', 800, 0.27) // sensor k
 */
export function mrtSixDirectionalPackedC(
  shortwaveWm2: Float64Array,
  shortwaveOffset: number,
  longwaveWm2: Float64Array,
  longwaveOffset: number,
  posture: MrtPosture,
  beamNormalIrradianceWm2 = 0,
  projectedAreaFactor = 0,
  absorptanceShortwave = BODY_ABSORPTANCE_SHORTWAVE,
  emissivityLongwave = BODY_EMISSIVITY_LONGWAVE,
  stefanBoltzmannWm2K4 = STEFAN_BOLTZMANN_W_M2K4,
): number {
  const s = fluxDensity(
    shortwaveWm2,
    shortwaveOffset,
    longwaveWm2,
    longwaveOffset,
    weightsFor(posture),
    beamNormalIrradianceWm2,
    projectedAreaFactor,
    absorptanceShortwave,
    emissivityLongwave,
  );
  return mrtFromFluxDensity(s, emissivityLongwave, stefanBoltzmannWm2K4);
}

// ---------------------------------------------------------------------------------------------
// Projected area factor (ASHRAE 55 / SolarCal table)
// ---------------------------------------------------------------------------------------------

/** Solar altitudes [°] of the fp table columns. */
export const FP_ALTITUDES_DEG = [0, 15, 30, 45, 60, 75, 90] as const;
/** Relative azimuths [°] (sun azimuth relative to the person's front, "SHARP") of the fp table rows. */
export const FP_RELATIVE_AZIMUTHS_DEG = [0, 15, 30, 45, 60, 75, 90, 105, 120, 135, 150, 165, 180] as const;

/**
 * Projected area factor fp [-] of a person, rows = relative azimuth 0…180° step 15, columns =
 * solar altitude 0…90° step 15. ASHRAE 55-2017 Normative Appendix C / SolarCal (Arens et al. 2015)
 * [5], as tabulated in github.com/CenterForTheBuiltEnvironment/pythermalcomfort
 * pythermalcomfort/models/solar_gain.py @10ff976acd8a9be6e7d2b6d782211252dd96f2e9 (rows 0°, 90°
 * and 180° also in shared/reference/REFERENCE-VALUES.md §3.2).
 */
export const FP_TABLE: Readonly<Record<BodyPosture, readonly (readonly number[])[]>> = {
  standing: [
    [0.35, 0.35, 0.314, 0.258, 0.206, 0.144, 0.082],
    [0.342, 0.342, 0.31, 0.252, 0.2, 0.14, 0.082],
    [0.33, 0.33, 0.3, 0.244, 0.19, 0.132, 0.082],
    [0.31, 0.31, 0.275, 0.228, 0.175, 0.124, 0.082],
    [0.283, 0.283, 0.251, 0.208, 0.16, 0.114, 0.082],
    [0.252, 0.252, 0.228, 0.188, 0.15, 0.108, 0.082],
    [0.23, 0.23, 0.214, 0.18, 0.148, 0.108, 0.082],
    [0.242, 0.242, 0.222, 0.18, 0.153, 0.112, 0.082],
    [0.274, 0.274, 0.245, 0.203, 0.165, 0.116, 0.082],
    [0.304, 0.304, 0.27, 0.22, 0.174, 0.121, 0.082],
    [0.328, 0.328, 0.29, 0.234, 0.183, 0.125, 0.082],
    [0.344, 0.344, 0.304, 0.244, 0.19, 0.128, 0.082],
    [0.347, 0.347, 0.308, 0.246, 0.191, 0.128, 0.082],
  ],
  seated: [
    [0.29, 0.324, 0.305, 0.303, 0.262, 0.224, 0.177],
    [0.292, 0.328, 0.294, 0.288, 0.268, 0.227, 0.177],
    [0.288, 0.332, 0.298, 0.29, 0.264, 0.222, 0.177],
    [0.274, 0.326, 0.294, 0.289, 0.252, 0.214, 0.177],
    [0.254, 0.308, 0.28, 0.276, 0.241, 0.202, 0.177],
    [0.23, 0.282, 0.262, 0.26, 0.233, 0.193, 0.177],
    [0.216, 0.26, 0.248, 0.244, 0.22, 0.186, 0.177],
    [0.234, 0.258, 0.236, 0.227, 0.208, 0.18, 0.177],
    [0.262, 0.26, 0.224, 0.208, 0.196, 0.176, 0.177],
    [0.28, 0.26, 0.21, 0.192, 0.184, 0.17, 0.177],
    [0.298, 0.256, 0.194, 0.174, 0.168, 0.168, 0.177],
    [0.306, 0.25, 0.18, 0.156, 0.156, 0.166, 0.177],
    [0.3, 0.24, 0.168, 0.152, 0.152, 0.164, 0.177],
  ],
};

/** Projected area factor of a sphere: πr² / 4πr², the same from every direction (geometry). */
export const FP_SPHERE = 0.25;

const FP_STEP_DEG = 15;

/**
 * Per posture, fp averaged over relative azimuth (one value per altitude column). fp is
 * piecewise linear in relative azimuth between table rows, so its mean over 0…360° (= over 0…180°
 * by symmetry) is exactly the trapezoid rule on the 13 rows.
 */
const FP_AZIMUTH_MEAN: Readonly<Record<BodyPosture, Float64Array>> = {
  standing: azimuthMean(FP_TABLE.standing),
  seated: azimuthMean(FP_TABLE.seated),
};

function azimuthMean(table: readonly (readonly number[])[]): Float64Array {
  const out = new Float64Array(FP_ALTITUDES_DEG.length);
  const last = table.length - 1;
  for (let a = 0; a < out.length; a++) {
    let s = 0;
    for (let r = 0; r <= last; r++) s += ((table[r] as readonly number[])[a] as number) * (r === 0 || r === last ? 0.5 : 1);
    out[a] = s / last;
  }
  return out;
}

/** Folds any relative azimuth [°] onto 0…180° (the table is symmetric left/right). */
function foldRelativeAzimuthDeg(deg: number): number {
  const a = ((deg % 360) + 360) % 360;
  return a > 180 ? 360 - a : a;
}

/**
 * Projected area factor fp of a person (or a sphere) for the direct solar beam.
 *
 * Bilinear interpolation in the ASHRAE 55 / SolarCal table `FP_TABLE` (altitude 0…90° and
 * relative azimuth 0…180° in 15° steps). relativeAzimuthDeg is the sun's azimuth minus the
 * direction the person faces (any value; folded to 0…180° by left/right symmetry). When it is
 * omitted (a person of unknown orientation) the result is fp averaged uniformly over all relative
 * azimuths — exact for the piecewise-linear table: the trapezoid rule over its 13 rows, then linear
 * in altitude. For 'sphere', fp = 0.25 from every direction.
 *
 * @param posture 'standing' | 'seated' | 'sphere'.
 * @param solarAltitudeDeg Solar altitude [°], 0…90.
 * @param relativeAzimuthDeg Sun azimuth relative to the person's front [°]; omit for the orientation average.
 * @returns fp [-].
 * @throws InputError for an altitude outside 0…90° or an unknown posture.
 * @see [5] ASHRAE 55-2017 Appendix C; Arens et al. 2015.
 * @example projectedAreaFactor('standing', 30, 0) // → 0.314
 */
export function projectedAreaFactor(posture: MrtPosture, solarAltitudeDeg: number, relativeAzimuthDeg?: number): number {
  requireInRange(solarAltitudeDeg, 0, 90, 'solarAltitudeDeg (projected area factor)', '°');
  if (posture === 'sphere') return FP_SPHERE;
  const table = FP_TABLE[posture];
  if (table === undefined) {
    throw new InputError({ problem: 'unknown posture', place: 'posture', value: posture, expected: "'standing', 'seated' or 'sphere'" });
  }
  const altPos = solarAltitudeDeg / FP_STEP_DEG;
  const ai = Math.min(Math.floor(altPos), FP_ALTITUDES_DEG.length - 2);
  const at = altPos - ai;
  if (relativeAzimuthDeg === undefined) {
    const m = FP_AZIMUTH_MEAN[posture];
    return (m[ai] as number) * (1 - at) + (m[ai + 1] as number) * at;
  }
  requireInRange(relativeAzimuthDeg, -Infinity, Infinity, 'relativeAzimuthDeg', '°');
  const azPos = foldRelativeAzimuthDeg(relativeAzimuthDeg) / FP_STEP_DEG;
  const zi = Math.min(Math.floor(azPos), FP_RELATIVE_AZIMUTHS_DEG.length - 2);
  const zt = azPos - zi;
  const r0 = table[zi] as readonly number[];
  const r1 = table[zi + 1] as readonly number[];
  const f00 = r0[ai] as number;
  const f01 = r0[ai + 1] as number;
  const f10 = r1[ai] as number;
  const f11 = r1[ai + 1] as number;
  return (f00 * (1 - at) + f01 * at) * (1 - zt) + (f10 * (1 - at) + f11 * at) * zt;
}

// ---------------------------------------------------------------------------------------------
// ASHRAE 55 solar gain (ERF)
// ---------------------------------------------------------------------------------------------

/** Fraction of the body surface exchanging radiation with the surroundings, f_eff [-] (ASHRAE 55; Fanger 1970). */
export const EFFECTIVE_RADIATION_AREA_FRACTION: Readonly<Record<BodyPosture, number>> = { standing: 0.725, seated: 0.696 };
/** Radiative heat-transfer coefficient of the body used by ASHRAE 55 Appendix C, h_r [W/(m²·K)]. */
export const ASHRAE55_RADIATIVE_COEFFICIENT_WM2K = 6;
/** Longwave absorptance of the body used by ASHRAE 55 Appendix C [-]. */
export const ASHRAE55_ABSORPTANCE_LONGWAVE = 0.95;

/** Inputs of `solarGainAshrae55`. */
export interface SolarGainAshrae55Inputs {
  /** Solar altitude [°], 0…90. */
  solarAltitudeDeg: number;
  /** Sun azimuth relative to the person's front [°] ("SHARP"); any value, folded to 0…180. */
  relativeAzimuthDeg: number;
  /** Direct-beam (normal) solar irradiance I_dir [W/m²]. */
  directIrradianceWm2: number;
  /** Total solar transmittance of the glazing T_sol [-] (1 outdoors). */
  solarTransmittance: number;
  /** Sky-vault view fraction f_svv [-]. */
  skyVaultViewFraction: number;
  /** Fraction of the body surface exposed to the sun f_bes [-]. */
  bodyExposedFraction: number;
  posture: BodyPosture;
  /** Shortwave absorptance of the body α_SW [-]; default 0.7. */
  absorptanceShortwave?: number;
  /** Floor reflectance R_floor [-]; default 0.6. */
  floorReflectance?: number;
}

/**
 * Solar gain to a person by the ASHRAE 55 Appendix C (SolarCal) effective-radiant-field method.
 *
 * I_diff = 0.2·I_dir;  E_diff = f_eff·f_svv·0.5·T_sol·I_diff;  E_dir = f_eff·fp·T_sol·f_bes·I_dir;
 * E_refl = f_eff·f_svv·0.5·T_sol·(I_dir·sin β + I_diff)·R_floor;
 * ERF = (E_diff + E_dir + E_refl)·α_SW/α_LW (α_LW = 0.95);  ΔMRT = ERF/(h_r·f_eff), h_r = 6 W/(m²·K).
 * fp from `projectedAreaFactor`.
 *
 * @param inputs See `SolarGainAshrae55Inputs` (angles [°], irradiance [W/m²], fractions [-]).
 * @returns { erfWm2: effective radiant field [W/m²], deltaMrtK: MRT increase [K] }.
 * @throws InputError for inputs outside their ranges (fractions 0…1, altitude 0…90°, I_dir ≥ 0).
 * @see [5] ASHRAE 55-2017 Appendix C; Arens et al. 2015.
 * @example solarGainAshrae55({ solarAltitudeDeg: 45, relativeAzimuthDeg: 0, directIrradianceWm2: 700,
 *   solarTransmittance: 0.8, skyVaultViewFraction: 0.2, bodyExposedFraction: 0.5, posture: 'seated' })
 *   // → { erfWm2: 64.9, deltaMrtK: 15.5 } (rounded)
 */
export function solarGainAshrae55(inputs: SolarGainAshrae55Inputs): { erfWm2: number; deltaMrtK: number } {
  const { solarAltitudeDeg, relativeAzimuthDeg, directIrradianceWm2, solarTransmittance, skyVaultViewFraction, bodyExposedFraction, posture } = inputs;
  const alphaSw = inputs.absorptanceShortwave ?? BODY_ABSORPTANCE_SHORTWAVE;
  const rFloor = inputs.floorReflectance ?? 0.6;
  requireInRange(directIrradianceWm2, 0, Infinity, 'directIrradianceWm2', 'W/m²');
  requireInRange(solarTransmittance, 0, 1, 'solarTransmittance');
  requireInRange(skyVaultViewFraction, 0, 1, 'skyVaultViewFraction');
  requireInRange(bodyExposedFraction, 0, 1, 'bodyExposedFraction');
  requireInRange(alphaSw, 0, 1, 'absorptanceShortwave');
  requireInRange(rFloor, 0, 1, 'floorReflectance');
  const fEff = EFFECTIVE_RADIATION_AREA_FRACTION[posture];
  if (fEff === undefined) {
    throw new InputError({ problem: 'unknown posture', place: 'posture', value: posture, expected: "'standing' or 'seated'" });
  }
  const fp = projectedAreaFactor(posture, solarAltitudeDeg, relativeAzimuthDeg);
  const iDiff = 0.2 * directIrradianceWm2;
  const eDiff = fEff * skyVaultViewFraction * 0.5 * solarTransmittance * iDiff;
  const eDirect = fEff * fp * solarTransmittance * bodyExposedFraction * directIrradianceWm2;
  const eRefl =
    fEff * skyVaultViewFraction * 0.5 * solarTransmittance * (directIrradianceWm2 * Math.sin(solarAltitudeDeg * DEG) + iDiff) * rFloor;
  const erfWm2 = ((eDiff + eDirect + eRefl) * alphaSw) / ASHRAE55_ABSORPTANCE_LONGWAVE;
  return { erfWm2, deltaMrtK: erfWm2 / (ASHRAE55_RADIATIVE_COEFFICIENT_WM2K * fEff) };
}

// ---------------------------------------------------------------------------------------------
// Globe thermometer (ISO 7726)
// ---------------------------------------------------------------------------------------------

/**
 * MRT from a globe thermometer, ISO 7726:1998 (forced or natural convection, whichever is larger).
 *
 * h_cg = max(6.3·v^0.6 / D^0.4, 1.4·(|tg − ta| / D)^0.25) [W/(m²·K)];
 * Tmrt = [ (tg + 273.15)⁴ + h_cg·(tg − ta) / (ε_g·σ) ]^¼ − 273.15, with σ = 5.67×10⁻⁸ (the value
 * behind ISO 7726's "2.5·10⁸" for the standard 0.15 m globe and behind the published checks).
 *
 * @param globeTempC Globe temperature tg [°C].
 * @param airTempC Air temperature ta [°C].
 * @param airSpeedMs Air speed at the globe v [m/s], ≥ 0.
 * @param diameterM Globe diameter D [m], default 0.15 (the standard globe).
 * @param emissivity Globe emissivity ε_g [-], default 0.95.
 * @returns Mean radiant temperature [°C].
 * @throws InputError for v < 0, D ≤ 0, ε outside (0, 1], or readings giving a negative T⁴.
 * @see [4] ISO 7726:1998.
 * @example mrtFromGlobeIso7726C(53.2, 30, 0.3, 0.1) // → 74.77 (°C)
 */
export function mrtFromGlobeIso7726C(globeTempC: number, airTempC: number, airSpeedMs: number, diameterM = 0.15, emissivity = 0.95): number {
  requireInRange(globeTempC, -KELVIN_AT_0C, Infinity, 'globeTempC', '°C');
  requireInRange(airTempC, -KELVIN_AT_0C, Infinity, 'airTempC', '°C');
  requireInRange(airSpeedMs, 0, Infinity, 'airSpeedMs', 'm/s');
  requireInRange(diameterM, 0, Infinity, 'diameterM', 'm', { exclusive: true });
  requireInRange(emissivity, 0, 1, 'emissivity');
  if (emissivity === 0) throw new InputError({ problem: 'zero emissivity', place: 'emissivity', value: emissivity, expected: 'a value in (0, 1]' });
  const dT = globeTempC - airTempC;
  const hForced = (6.3 * Math.pow(airSpeedMs, 0.6)) / Math.pow(diameterM, 0.4);
  const hNatural = 1.4 * Math.pow(Math.abs(dT) / diameterM, 0.25);
  const h = Math.max(hForced, hNatural);
  const tgK = globeTempC + KELVIN_AT_0C;
  const t4 = tgK * tgK * tgK * tgK + (h * dT) / (emissivity * STEFAN_BOLTZMANN_ROUNDED_W_M2K4);
  if (!(t4 > 0)) {
    throw new InputError({ problem: 'globe and air temperatures imply no radiant temperature', place: 'globeTempC', value: globeTempC, expected: `a globe reading consistent with air at ${airTempC} °C` });
  }
  return Math.sqrt(Math.sqrt(t4)) - KELVIN_AT_0C;
}
