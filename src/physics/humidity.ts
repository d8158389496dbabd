/**
 * Humidity: saturation vapour pressure over water (Hardy 1998, ITS-90), vapour pressure from
 * relative humidity, relative humidity from dew point, dew point from vapour pressure.
 *
 * The saturation formula is the one in the UTCI reference code (function es of UTCI_a002.f90,
 * Bröde et al. 2012), so UTCI computed from relative humidity matches the operational procedure.
 * Note the term g₇·ln(T_K): it is the natural log of the absolute temperature, not ln(1 + T_K).
 *
 * References:
 * [1] B. Hardy, "ITS-90 formulations for vapor pressure, frostpoint temperature, dewpoint
 *     temperature, and enhancement factors in the range –100 to +100 °C," in Proc. 3rd Int. Symp.
 *     on Humidity & Moisture, Teddington, UK, 1998.
 * [2] P. Bröde et al., "Deriving the operational procedure for the Universal Thermal Climate Index
 *     (UTCI)," Int. J. Biometeorol., vol. 56, no. 3, pp. 481–494, 2012,
 *     doi:10.1007/s00484-011-0454-1.
 */
import { InputError, requireInRange } from './errors.ts';
import { KELVIN_AT_0C } from './constants.ts';

/**
 * Hardy (1998) ITS-90 coefficients g₀…g₇ for ln(es/Pa) over water, as in the UTCI reference code
 * (values copied from shared/reference/utci/utci-polynomial.json, "saturation_vapour_pressure").
 * ln(es) = Σ_{i=0..6} gᵢ·T^(i−2) + g₇·ln(T), T in kelvin.
 */
export const HARDY_1998_WATER_G = [
  -2.8365744e3, -6.028076559e3, 1.954263612e1, -2.737830188e-2, 1.6261698e-5, 7.0229056e-10,
  -1.8680009e-13, 2.7150305,
] as const;

/** Temperature range [°C] over which Hardy states the ITS-90 formulation (−100 … +100 °C). */
export const HARDY_1998_RANGE_C = { min: -100, max: 100 } as const;

const [G0, G1, G2, G3, G4, G5, G6, G7] = HARDY_1998_WATER_G;
/** Shared empty options for requireInRange, so a hot call allocates nothing. */
const NO_OPTS = {} as const;

/** The formula itself, no range check (shared by the public function and the Newton inverse). */
function hardyLnEsPa(tK: number): number {
  // Horner in tK for g2 + g3·T + g4·T² + g5·T³ + g6·T⁴, plus the T⁻² and T⁻¹ terms.
  const poly = G2 + tK * (G3 + tK * (G4 + tK * (G5 + tK * G6)));
  return G0 / (tK * tK) + G1 / tK + poly + G7 * Math.log(tK);
}

/** d ln(es)/dT [1/K], for the Newton inverse. */
function hardyDLnEsDT(tK: number): number {
  const dpoly = G3 + tK * (2 * G4 + tK * (3 * G5 + tK * 4 * G6));
  return (-2 * G0) / (tK * tK * tK) - G1 / (tK * tK) + dpoly + G7 / tK;
}

/**
 * Saturation vapour pressure over plane liquid water, Hardy (1998) ITS-90 formulation.
 *
 * es = exp( Σ_{i=0..6} gᵢ·T^(i−2) + g₇·ln T ) [Pa], T = t + 273.15 K; returned in hPa.
 * Over water also below 0 °C (supercooled), as the UTCI procedure uses it.
 *
 * @param airTempC Temperature [°C], within −100 … +100 °C (Hardy's stated range).
 * @returns Saturation vapour pressure [hPa].
 * @throws InputError outside −100 … +100 °C or when not finite.
 * @see [1] Hardy 1998; [2] Bröde et al. 2012 (function es of UTCI_a002.f90).
 * @example saturationVapourPressureHardyHpa(25) // → 31.699201897293 (hPa)
 */
export function saturationVapourPressureHardyHpa(airTempC: number): number {
  requireInRange(airTempC, HARDY_1998_RANGE_C.min, HARDY_1998_RANGE_C.max, 'airTempC (saturation vapour pressure, Hardy 1998)', '°C', NO_OPTS);
  return Math.exp(hardyLnEsPa(airTempC + KELVIN_AT_0C)) * 0.01;
}

/**
 * Water-vapour pressure from relative humidity (relative to saturation over water).
 *
 * e = es(Ta) · RH / 100.
 *
 * @param airTempC Air temperature [°C].
 * @param relativeHumidityPct Relative humidity [%], 0 … 100.
 * @returns Vapour pressure [hPa].
 * @throws InputError for RH outside 0 … 100 % or Ta outside Hardy's range.
 * @see [2] Bröde et al. 2012 (ehPa = es(Ta)·RH/100 in UTCI_a002.f90).
 * @example vapourPressureFromRelativeHumidityHpa(25, 50) // → 15.8496 (hPa)
 */
export function vapourPressureFromRelativeHumidityHpa(airTempC: number, relativeHumidityPct: number): number {
  requireInRange(relativeHumidityPct, 0, 100, 'relativeHumidityPct', '%', NO_OPTS);
  return (saturationVapourPressureHardyHpa(airTempC) * relativeHumidityPct) / 100;
}

/**
 * Relative humidity from air temperature and dew point.
 *
 * RH = 100 · es(Td) / es(Ta). A dew point above the air temperature is refused (supersaturation).
 *
 * @param airTempC Air temperature [°C].
 * @param dewPointC Dew-point temperature [°C], ≤ airTempC.
 * @returns Relative humidity [%].
 * @throws InputError when the dew point exceeds the air temperature or either is out of range.
 * @see [1] Hardy 1998.
 * @example relativeHumidityFromDewPointPct(25, 25) // → 100
 */
export function relativeHumidityFromDewPointPct(airTempC: number, dewPointC: number): number {
  const es = saturationVapourPressureHardyHpa(airTempC);
  const e = saturationVapourPressureHardyHpa(dewPointC);
  if (dewPointC > airTempC) {
    throw new InputError({
      problem: 'dew point above the air temperature',
      place: 'dewPointC',
      value: dewPointC,
      expected: `a dew point ≤ the air temperature (${airTempC} °C)`,
    });
  }
  return (100 * e) / es;
}

/**
 * Dew point from vapour pressure: the temperature at which es(Td) = e, with es after Hardy (1998).
 *
 * Solved by Newton's method on ln es(T) − ln e (monotonic and smooth, converges in a few steps to
 * machine precision), so it is the exact inverse of `saturationVapourPressureHardyHpa` rather than
 * Hardy's separate fitted inverse.
 *
 * @param vapourPressureHpa Water-vapour pressure [hPa], > 0 and within es(−100 °C) … es(100 °C).
 * @returns Dew-point temperature [°C] (over water).
 * @throws InputError for e ≤ 0 or outside the range of the formulation.
 * @see [1] Hardy 1998.
 * @example dewPointFromVapourPressureC(31.699201897293) // → 25 (°C)
 */
export function dewPointFromVapourPressureC(vapourPressureHpa: number): number {
  const loHpa = Math.exp(hardyLnEsPa(HARDY_1998_RANGE_C.min + KELVIN_AT_0C)) * 0.01;
  const hiHpa = Math.exp(hardyLnEsPa(HARDY_1998_RANGE_C.max + KELVIN_AT_0C)) * 0.01;
  requireInRange(vapourPressureHpa, loHpa, hiHpa, 'vapourPressureHpa (dew point, Hardy 1998)', 'hPa');
  const target = Math.log(vapourPressureHpa * 100);
  // Start from the Magnus-type estimate, then Newton in ln es.
  const g = Math.log(vapourPressureHpa / 6.112);
  let tK = KELVIN_AT_0C + (243.12 * g) / (17.62 - g);
  for (let i = 0; i < 50; i++) {
    const step = (hardyLnEsPa(tK) - target) / hardyDLnEsDT(tK);
    tK -= step;
    if (Math.abs(step) < 1e-12) break;
  }
  return tK - KELVIN_AT_0C;
}
