/**
 * Sky diffuse irradiance on a tilted plane: the isotropic (Liu–Jordan) model and the Perez 1990
 * anisotropic model (isotropic background + circumsolar point source + horizon band), with a
 * dispatcher by model name.
 *
 * Angles follow the project: tilt from horizontal (0 = facing up, 90 = vertical façade), azimuths
 * clockwise from north (0 N, 90 E, 180 S, 270 W), solar zenith from the vertical.
 *
 * References:
 * [1] R. Perez, P. Ineichen, R. Seals, J. Michalsky and R. Stewart, "Modeling daylight
 *     availability and irradiance components from direct and global irradiance," Solar Energy,
 *     vol. 44, no. 5, pp. 271–289, 1990, doi:10.1016/0038-092X(90)90055-H.
 * [2] R. Perez, R. Seals, P. Ineichen, R. Stewart and D. Menicucci, "A new simplified version of
 *     the Perez diffuse irradiance model for tilted surfaces," Solar Energy, vol. 39, no. 3,
 *     pp. 221–231, 1987, doi:10.1016/S0038-092X(87)80031-2.
 * [3] B. Y. H. Liu and R. C. Jordan, "The long-term average performance of flat-plate solar-energy
 *     collectors," Solar Energy, vol. 7, no. 2, pp. 53–74, 1963, doi:10.1016/0038-092X(63)90006-9
 *     (citation from memory).
 * [4] W. F. Holmgren, C. W. Hansen and M. A. Mikofski, "pvlib python: a python package for modeling
 *     solar energy systems," J. Open Source Softw., vol. 3, no. 29, p. 884, 2018,
 *     doi:10.21105/joss.00884 — `irradiance.perez`, whose formulation (κ, bins, clipping) is
 *     followed here so its published test cases apply.
 */
import { cosIncidenceFromAngles } from './irradiance.ts';
import { InputError, requireInRange } from './errors.ts';

const D2R = Math.PI / 180;

/** Names of the sky diffuse models the dispatcher accepts. */
export type SkyDiffuseModel = 'perez1990' | 'isotropic';

/**
 * Perez 1990 "allsitescomposite1990" coefficients, one row per sky-clearness (ε) bin, bin 1
 * (overcast) to bin 8 (clear). `epsilonLowerBound` is the bin's lower ε bound; the last bin is
 * open-ended, and ε below 1.065 falls in bin 1.
 * F1 = f11 + f12·Δ + f13·Z and F2 = f21 + f22·Δ + f23·Z with Z the solar zenith [rad].
 * Source: Perez et al. 1990 [1] as tabulated in pvlib `_get_perez_coefficients` [4].
 */
export const PEREZ_1990_ALL_SITES_COMPOSITE = [
  { epsilonLowerBound: 1.0, f11: -0.008, f12: 0.588, f13: -0.062, f21: -0.06, f22: 0.072, f23: -0.022 },
  { epsilonLowerBound: 1.065, f11: 0.13, f12: 0.683, f13: -0.151, f21: -0.019, f22: 0.066, f23: -0.029 },
  { epsilonLowerBound: 1.23, f11: 0.33, f12: 0.487, f13: -0.221, f21: 0.055, f22: -0.064, f23: -0.026 },
  { epsilonLowerBound: 1.5, f11: 0.568, f12: 0.187, f13: -0.295, f21: 0.109, f22: -0.152, f23: -0.014 },
  { epsilonLowerBound: 1.95, f11: 0.873, f12: -0.392, f13: -0.362, f21: 0.226, f22: -0.462, f23: 0.001 },
  { epsilonLowerBound: 2.8, f11: 1.132, f12: -1.237, f13: -0.412, f21: 0.288, f22: -0.823, f23: 0.056 },
  { epsilonLowerBound: 4.5, f11: 1.06, f12: -1.6, f13: -0.359, f21: 0.264, f22: -1.127, f23: 0.131 },
  { epsilonLowerBound: 6.2, f11: 0.678, f12: -0.327, f13: -0.25, f21: 0.156, f22: -1.377, f23: 0.251 },
] as const;

/** κ in the sky-clearness formula, for the zenith in radians [1]. */
export const PEREZ_KAPPA = 1.041;

/** cos 85°: the floor of the circumsolar denominator b = max(cos 85°, cos z) [1], [2]. */
const COS_85 = Math.cos(85 * D2R);

/** The sky state the Perez model needs (no receiving surface). */
export interface PerezSkyInputs {
  /** Diffuse horizontal irradiance [W/m²]. */
  readonly dhiWm2: number;
  /** Direct normal irradiance [W/m²]. */
  readonly dniWm2: number;
  /** Extraterrestrial normal irradiance E0 [W/m²]. */
  readonly dniExtraWm2: number;
  /** Solar zenith angle [°]. */
  readonly solarZenithDeg: number;
  /** Solar azimuth, clockwise from north [°]. */
  readonly solarAzimuthDeg: number;
  /** Relative (not pressure-corrected) optical air mass [-]; ignored when the sun is down. */
  readonly relativeAirMass: number;
}

/** The sky state plus the receiving plane. */
export interface PerezTiltInputs extends PerezSkyInputs {
  /** Surface tilt from horizontal [°]: 0 faces up, 90 is vertical. */
  readonly surfaceTiltDeg: number;
  /** Azimuth the surface faces, clockwise from north [°]. */
  readonly surfaceAzimuthDeg: number;
}

/** The Perez sky's brightness parameters. */
export interface PerezSkyParameters {
  /** Sky clearness ε [-]. */
  epsilon: number;
  /** Sky brightness Δ [-]. */
  delta: number;
  /** Circumsolar brightening coefficient F1 [-] (≥ 0). */
  f1: number;
  /** Horizon brightening coefficient F2 [-] (may be negative). */
  f2: number;
}

/** Perez 1990 tilted-plane result: the three parts, the total and the sky parameters. */
export interface PerezComponents extends PerezSkyParameters {
  /** DHI·(1 − F1)·(1 + cos S)/2 [W/m²]. */
  isotropicWm2: number;
  /** DHI·F1·a/b [W/m²]. */
  circumsolarWm2: number;
  /** DHI·F2·sin S [W/m²]; negative when the horizon is darker than the background. */
  horizonWm2: number;
  /** max(0, sum of the three) [W/m²]. */
  totalWm2: number;
}

/**
 * Isotropic sky diffuse irradiance on a tilted plane (Liu–Jordan): the plane sees the fraction
 * (1 + cos S)/2 of a sky of uniform radiance.
 *
 * Equation: D_T = DHI·(1 + cos S)/2.
 *
 * References: [3] (see the module header).
 *
 * @param surfaceTiltDeg Surface tilt from horizontal [°], in [0, 180].
 * @param dhiWm2 Diffuse horizontal irradiance [W/m²], ≥ 0.
 * @returns Sky diffuse irradiance on the plane [W/m²].
 * @example isotropicSkyDiffuseWm2(40, 100) // 88.30222215594891
 */
export function isotropicSkyDiffuseWm2(surfaceTiltDeg: number, dhiWm2: number): number {
  requireInRange(surfaceTiltDeg, 0, 180, 'surfaceTiltDeg', '°');
  requireInRange(dhiWm2, 0, 2000, 'dhiWm2', 'W/m²');
  return (dhiWm2 * (1 + Math.cos(surfaceTiltDeg * D2R))) / 2;
}

/** Validates the sky part of the Perez inputs (throws InputError naming the field). */
export function validatePerezSkyInputs(inputs: PerezSkyInputs): void {
  requireInRange(inputs.dhiWm2, 0, 2000, 'dhiWm2', 'W/m²');
  requireInRange(inputs.dniWm2, 0, 2000, 'dniWm2', 'W/m²');
  requireInRange(inputs.dniExtraWm2, 1000, 1500, 'dniExtraWm2', 'W/m²');
  requireInRange(inputs.solarZenithDeg, 0, 180, 'solarZenithDeg', '°');
  requireInRange(inputs.solarAzimuthDeg, -360, 720, 'solarAzimuthDeg', '°');
  if (inputs.solarZenithDeg < 90 && inputs.dhiWm2 > 0) {
    requireInRange(inputs.relativeAirMass, 0, 1000, 'relativeAirMass', '', { exclusive: true });
  }
}

/**
 * Perez 1990 sky parameters ε, Δ, F1, F2 for a sky state, written into `target`.
 *
 * Equations (pvlib formulation [4] of [1]):
 *   ε = [(DHI + DNI)/DHI + κ Z³] / (1 + κ Z³), κ = 1.041, Z = zenith [rad];
 *   Δ = DHI·AM/E0 (AM relative air mass);
 *   F1 = max(0, f11 + f12 Δ + f13 Z), F2 = f21 + f22 Δ + f23 Z, with the coefficients of the ε bin.
 * With the sun at or below the horizon (Z ≥ 90°) or DHI = 0 the sky is taken as isotropic
 * (F1 = F2 = 0; ε = 1, Δ = 0): our choice, since the air mass is undefined there (pvlib returns 0
 * diffuse when its air mass is NaN).
 *
 * @param inputs The sky state (see {@link PerezSkyInputs}; no validation here, see
 *   {@link validatePerezSkyInputs}).
 * @param target Object to fill (reused to avoid allocation).
 * @returns `target`.
 * @example perez1990SkyParameters(southFacadeSky, {epsilon:0,delta:0,f1:0,f2:0}).f1 // 0.47227
 */
export function perez1990SkyParameters<T extends PerezSkyParameters>(inputs: PerezSkyInputs, target: T): T {
  const dhi = inputs.dhiWm2;
  if (inputs.solarZenithDeg >= 90 || !(dhi > 0)) {
    target.epsilon = 1;
    target.delta = 0;
    target.f1 = 0;
    target.f2 = 0;
    return target;
  }
  const z = inputs.solarZenithDeg * D2R;
  const kz3 = PEREZ_KAPPA * z * z * z;
  const epsilon = ((dhi + inputs.dniWm2) / dhi + kz3) / (1 + kz3);
  const delta = (dhi * inputs.relativeAirMass) / inputs.dniExtraWm2;
  const table = PEREZ_1990_ALL_SITES_COMPOSITE;
  let bin = 0;
  for (let i = table.length - 1; i > 0; i--) {
    if (epsilon >= table[i]!.epsilonLowerBound) {
      bin = i;
      break;
    }
  }
  const c = table[bin]!;
  target.epsilon = epsilon;
  target.delta = delta;
  target.f1 = Math.max(0, c.f11 + c.f12 * delta + c.f13 * z);
  target.f2 = c.f21 + c.f22 * delta + c.f23 * z;
  return target;
}

/** The circumsolar denominator b = max(cos 85°, cos z) [-]. */
export function perezCircumsolarDenominator(solarZenithDeg: number): number {
  return Math.max(COS_85, Math.cos(solarZenithDeg * D2R));
}

/**
 * Perez 1990 anisotropic sky diffuse irradiance on a tilted plane, by part.
 *
 * Equation [1], [2] (pvlib formulation [4]):
 *   D_T = DHI·[(1 − F1)(1 + cos S)/2 + F1·a/b + F2·sin S], clipped at ≥ 0,
 *   a = max(0, cos θ), b = max(cos 85°, cos z); ε, Δ, F1, F2 as in {@link perez1990SkyParameters}.
 * The parts are reported unclipped (the horizon part may be negative); like pvlib, all parts are
 * set to 0 when the clipped total is 0.
 *
 * @param inputs Sky state and plane: tilt [°], surface azimuth [°], DHI [W/m²], DNI [W/m²],
 *   E0 [W/m²], solar zenith [°], solar azimuth [°], relative air mass [-].
 * @param target Optional object to fill instead of allocating one.
 * @returns The parts and total [W/m²] and ε, Δ, F1, F2 [-].
 * @example perez1990Components({ surfaceTiltDeg: 40, surfaceAzimuthDeg: 180, dhiWm2: 118.45831879,
 *   dniWm2: 939.95469881, dniExtraWm2: 1321.1655834833093, solarZenithDeg: 10.56413562,
 *   solarAzimuthDeg: 144.76567754, relativeAirMass: 1.01688136 }).totalWm2 // 109.084332
 */
export function perez1990Components(inputs: PerezTiltInputs, target?: PerezComponents): PerezComponents {
  validatePerezSkyInputs(inputs);
  requireInRange(inputs.surfaceTiltDeg, 0, 180, 'surfaceTiltDeg', '°');
  requireInRange(inputs.surfaceAzimuthDeg, -360, 720, 'surfaceAzimuthDeg', '°');
  const out: PerezComponents = target ?? {
    isotropicWm2: 0,
    circumsolarWm2: 0,
    horizonWm2: 0,
    totalWm2: 0,
    epsilon: 0,
    delta: 0,
    f1: 0,
    f2: 0,
  };
  perez1990SkyParameters(inputs, out);
  const dhi = inputs.dhiWm2;
  const s = inputs.surfaceTiltDeg * D2R;
  const a = Math.max(
    0,
    cosIncidenceFromAngles(inputs.surfaceTiltDeg, inputs.surfaceAzimuthDeg, inputs.solarZenithDeg, inputs.solarAzimuthDeg),
  );
  const b = perezCircumsolarDenominator(inputs.solarZenithDeg);
  const iso = dhi * 0.5 * (1 - out.f1) * (1 + Math.cos(s));
  const circ = (dhi * out.f1 * a) / b;
  const hor = dhi * out.f2 * Math.sin(s);
  const total = Math.max(0, iso + circ + hor);
  const zeroed = total === 0;
  out.isotropicWm2 = zeroed ? 0 : iso;
  out.circumsolarWm2 = zeroed ? 0 : circ;
  out.horizonWm2 = zeroed ? 0 : hor;
  out.totalWm2 = total;
  return out;
}

/** Module scratch for the dispatcher (no allocation per call). */
const _components: PerezComponents = {
  isotropicWm2: 0,
  circumsolarWm2: 0,
  horizonWm2: 0,
  totalWm2: 0,
  epsilon: 0,
  delta: 0,
  f1: 0,
  f2: 0,
};

/**
 * Sky diffuse irradiance on a tilted plane by the named model.
 *
 * 'perez1990' → {@link perez1990Components}.totalWm2; 'isotropic' → {@link isotropicSkyDiffuseWm2}
 * (uses only the tilt and DHI of `inputs`).
 *
 * References: [1]–[4] (see the module header).
 *
 * @param model 'perez1990' or 'isotropic'.
 * @param inputs Sky state and plane (angles [°], irradiances [W/m²], air mass [-]).
 * @returns Sky diffuse irradiance on the plane [W/m²].
 * @example skyDiffuseOnTiltWm2('isotropic', { ...southFacadeSky, surfaceTiltDeg: 90 }) // 0.5·DHI
 */
export function skyDiffuseOnTiltWm2(model: SkyDiffuseModel, inputs: PerezTiltInputs): number {
  switch (model) {
    case 'perez1990':
      return perez1990Components(inputs, _components).totalWm2;
    case 'isotropic':
      return isotropicSkyDiffuseWm2(inputs.surfaceTiltDeg, inputs.dhiWm2);
    default: {
      const never: never = model;
      throw new InputError({
        problem: 'unknown sky diffuse model',
        place: 'model',
        value: never,
        expected: "'perez1990' or 'isotropic'",
      });
    }
  }
}
