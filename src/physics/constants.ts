/** Physical constants used across the physics core. */

/**
 * Stefan–Boltzmann constant [W m⁻² K⁻⁴]. CODATA 2018 value, exact given the 2019 SI
 * (σ = 5.670374419×10⁻⁸). Comfort reference cases generated with 5.67×10⁻⁸ are compared with
 * `STEFAN_BOLTZMANN_ROUNDED_W_M2K4` where the source used it.
 */
export const STEFAN_BOLTZMANN_W_M2K4 = 5.670374419e-8;
/** The rounded σ many comfort codes (UTCI, ISO 7726, ASHRAE 55 examples) were computed with. */
export const STEFAN_BOLTZMANN_ROUNDED_W_M2K4 = 5.67e-8;
/** 0 °C in kelvin. */
export const KELVIN_AT_0C = 273.15;
/**
 * Solar constant [W/m²]. 1361 W/m² after Kopp & Lean 2011 (GRL 38, L01706,
 * doi:10.1029/2010GL045777) — from memory for the attribution; the ASHRAE clear-sky model was
 * fitted with 1367 W/m² (WMO 1981) and uses `SOLAR_CONSTANT_ASHRAE_WM2`.
 */
export const SOLAR_CONSTANT_WM2 = 1361;
/** Solar constant used by the ASHRAE Handbook of Fundamentals clear-sky model (2009+, ch. 14). */
export const SOLAR_CONSTANT_ASHRAE_WM2 = 1367;
export const DEG = Math.PI / 180;
