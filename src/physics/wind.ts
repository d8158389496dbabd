/**
 * Wind speed profile: converting a wind speed between heights by the neutral logarithmic law or a
 * power law.
 *
 * IMPORTANT — UTCI takes the wind 10 m above ground. The audit passes the 10 m wind (from the
 * weather file or the project) to `utciC` / `utciClampedC` unchanged and uses the wind converted to
 * a local height here only for surface convection (façade patches, ground). Converting the wind to
 * body height and then feeding it to UTCI would count the height reduction twice.
 *
 * Any profile law is a screening assumption near buildings: pedestrian-level wind in street canyons
 * and courtyards departs strongly from it.
 *
 * References:
 * [1] P. Bröde et al., "Deriving the operational procedure for the Universal Thermal Climate Index
 *     (UTCI)," Int. J. Biometeorol., vol. 56, no. 3, pp. 481–494, 2012,
 *     doi:10.1007/s00484-011-0454-1 (log law with z0 = 0.01 m between 10 m and body height).
 * [2] T. R. Oke, Boundary Layer Climates, 2nd ed. London: Methuen, 1987 (neutral logarithmic wind
 *     profile) — from memory for the edition details.
 * [3] ASHRAE Handbook — Fundamentals, ch. 24 "Airflow around buildings" (power-law profile).
 */
import { requireInRange } from './errors.ts';

/** Roughness length used with UTCI for converting the 10 m wind [m] (Bröde et al. 2012). */
export const UTCI_ROUGHNESS_LENGTH_M = 0.01;
/** Height of the standard meteorological wind measurement [m]. */
export const METEOROLOGICAL_WIND_HEIGHT_M = 10;
/** The classic 1/7 power-law exponent for open country (common practice). */
export const POWER_LAW_OPEN_COUNTRY_EXPONENT = 1 / 7;

/**
 * Wind speed at one height from the speed at another, neutral logarithmic profile.
 *
 * v(z) = v_ref · ln((z − d)/z0) / ln((z_ref − d)/z0).
 *
 * @param windRefMs Wind speed at the reference height [m/s], ≥ 0.
 * @param refHeightM Reference height z_ref [m], above d + z0.
 * @param heightM Target height z [m], above d + z0.
 * @param roughnessLengthM Aerodynamic roughness length z0 [m], > 0; default 0.01 (the UTCI convention).
 * @param displacementHeightM Zero-plane displacement d [m], ≥ 0; default 0.
 * @returns Wind speed at heightM [m/s].
 * @throws InputError for negative speeds, z0 ≤ 0, d < 0, or a height not above d + z0.
 * @see [1] Bröde et al. 2012; [2] Oke 1987.
 * @example windLogLawMs(7.0, 10, 2.0) // → 5.369069989882623 (m/s)
 */
export function windLogLawMs(
  windRefMs: number,
  refHeightM: number,
  heightM: number,
  roughnessLengthM = UTCI_ROUGHNESS_LENGTH_M,
  displacementHeightM = 0,
): number {
  requireInRange(windRefMs, 0, Infinity, 'windRefMs', 'm/s');
  requireInRange(roughnessLengthM, 0, Infinity, 'roughnessLengthM', 'm', { exclusive: true });
  requireInRange(displacementHeightM, 0, Infinity, 'displacementHeightM', 'm');
  const floorM = displacementHeightM + roughnessLengthM;
  requireInRange(refHeightM, floorM, Infinity, 'refHeightM (log wind profile: above displacement + roughness length)', 'm', { exclusive: true });
  requireInRange(heightM, floorM, Infinity, 'heightM (log wind profile: above displacement + roughness length)', 'm', { exclusive: true });
  return (
    (windRefMs * Math.log((heightM - displacementHeightM) / roughnessLengthM)) /
    Math.log((refHeightM - displacementHeightM) / roughnessLengthM)
  );
}

/**
 * Wind at a local height from the 10 m wind, log law (default z0 = 0.01 m as used with UTCI).
 * For surface convection only — UTCI itself takes the 10 m wind (see the file header).
 *
 * v(z) = v10 · ln(z/z0) / ln(10/z0).
 *
 * @param wind10mMs Wind speed 10 m above ground [m/s].
 * @param heightM Target height [m], > z0.
 * @param roughnessLengthM z0 [m], default 0.01.
 * @returns Wind speed at heightM [m/s].
 * @throws InputError as `windLogLawMs`.
 * @see [1] Bröde et al. 2012.
 * @example windAtHeightFrom10mMs(1, 1.1) // → 0.68046 (m/s)
 */
export function windAtHeightFrom10mMs(wind10mMs: number, heightM: number, roughnessLengthM = UTCI_ROUGHNESS_LENGTH_M): number {
  return windLogLawMs(wind10mMs, METEOROLOGICAL_WIND_HEIGHT_M, heightM, roughnessLengthM);
}

/**
 * The 10 m wind from a wind measured at a local height, log law (the inverse of
 * `windAtHeightFrom10mMs`), e.g. to feed a 1.1 m anemometer reading to UTCI.
 *
 * v10 = v(z) · ln(10/z0) / ln(z/z0).
 *
 * @param windMs Wind speed at heightM [m/s].
 * @param heightM Measurement height [m], > z0.
 * @param roughnessLengthM z0 [m], default 0.01.
 * @returns Wind speed 10 m above ground [m/s].
 * @throws InputError as `windLogLawMs`.
 * @see [1] Bröde et al. 2012.
 * @example wind10mFromHeightMs(1, 1.1) // → 1.46958 (m/s)
 */
export function wind10mFromHeightMs(windMs: number, heightM: number, roughnessLengthM = UTCI_ROUGHNESS_LENGTH_M): number {
  return windLogLawMs(windMs, heightM, METEOROLOGICAL_WIND_HEIGHT_M, roughnessLengthM);
}

/**
 * Wind speed at one height from another, power law.
 *
 * v(z) = v_ref · (z / z_ref)^α.
 *
 * @param windRefMs Wind speed at the reference height [m/s], ≥ 0.
 * @param refHeightM Reference height [m], > 0.
 * @param heightM Target height [m], > 0.
 * @param exponent α [-], default 1/7 (open country; ASHRAE Fundamentals ch. 24 tabulates 0.10…0.33
 *   by terrain).
 * @returns Wind speed at heightM [m/s].
 * @throws InputError for negative speed, non-positive heights, or α outside 0…1.
 * @see [3] ASHRAE Handbook — Fundamentals, ch. 24.
 * @example windPowerLawMs(1, 10, 1.1) // → 0.7296 (m/s)
 */
export function windPowerLawMs(windRefMs: number, refHeightM: number, heightM: number, exponent = POWER_LAW_OPEN_COUNTRY_EXPONENT): number {
  requireInRange(windRefMs, 0, Infinity, 'windRefMs', 'm/s');
  requireInRange(refHeightM, 0, Infinity, 'refHeightM', 'm', { exclusive: true });
  requireInRange(heightM, 0, Infinity, 'heightM', 'm', { exclusive: true });
  requireInRange(exponent, 0, 1, 'exponent (power-law wind profile)');
  return windRefMs * Math.pow(heightM / refHeightM, exponent);
}
