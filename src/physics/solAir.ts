/**
 * ASHRAE sol-air temperature: the outdoor air temperature that, with no sun and no longwave
 * deficit, would give the same heat flux into an exterior surface as the actual combination of
 * air temperature, absorbed sun and longwave exchange.
 *
 * References:
 * [1] ASHRAE, ASHRAE Handbook — Fundamentals, ch. 18 "Nonresidential cooling and heating load
 *     calculations," Atlanta: ASHRAE, 2009/2013/2017 (sol-air temperature, eq. for t_e).
 *
 * The SI coefficients are from memory, consistent with the Handbook's IP values
 * (REFERENCE-VALUES §7): h_o = 17 W/(m²·K) (3.0 Btu/h·ft²·°F); α/h_o = 0.026 (light) and 0.052
 * (dark) m²·K/W; ΔR ≈ 63 W/m² for horizontal surfaces (20 Btu/h·ft²) and 0 for vertical ones.
 */
import { requireInRange } from './errors.ts';

/** ASHRAE sol-air coefficients in SI (from memory, REFERENCE-VALUES §7). */
export const ASHRAE_SOL_AIR = {
  /** combined exterior coefficient (convection + longwave) [W/(m²·K)] */
  outsideCoeffWm2K: 17,
  /** longwave deficit ΔR of a horizontal surface facing the sky [W/m²] */
  deltaRHorizontalWm2: 63,
  /** longwave deficit of a vertical surface [W/m²] (sky deficit offset by warm ground) */
  deltaRVerticalWm2: 0,
  /** α/h_o for a light-coloured surface [m²·K/W] */
  absorptanceOverCoeffLightM2KW: 0.026,
  /** α/h_o for a dark-coloured surface [m²·K/W] */
  absorptanceOverCoeffDarkM2KW: 0.052,
} as const;

/**
 * Sol-air temperature (ASHRAE Fundamentals ch. 18).
 *
 * t_e = t_o + α·E_t/h_o − ε·ΔR/h_o
 *
 * @param airTempC Outdoor air temperature t_o [°C]
 * @param absorptance Solar absorptance α of the surface [-], in [0, 1]
 * @param irradianceWm2 Total solar irradiance on the surface E_t [W/m²], ≥ 0
 * @param emissivity Hemispherical emissivity ε [-], in [0, 1] (default 1, as ASHRAE tabulates ε·ΔR)
 * @param deltaRWm2 Longwave deficit ΔR [W/m²]: 63 horizontal, 0 vertical (default 0)
 * @param outsideCoeffWm2K Combined exterior coefficient h_o [W/(m²·K)] (default 17)
 * @returns Sol-air temperature t_e [°C]
 *
 * References: [1].
 *
 * @example
 * solAirTempC(30, 0.052 * 17, 800) // 71.6 (dark vertical surface)
 */
export function solAirTempC(
  airTempC: number,
  absorptance: number,
  irradianceWm2: number,
  emissivity = 1,
  deltaRWm2: number = ASHRAE_SOL_AIR.deltaRVerticalWm2,
  outsideCoeffWm2K: number = ASHRAE_SOL_AIR.outsideCoeffWm2K,
): number {
  requireInRange(airTempC, -60, 70, 'airTempC', '°C');
  requireInRange(absorptance, 0, 1, 'absorptance');
  requireInRange(irradianceWm2, 0, 2000, 'irradianceWm2', 'W/m²');
  requireInRange(emissivity, 0, 1, 'emissivity');
  requireInRange(deltaRWm2, 0, 200, 'deltaRWm2', 'W/m²');
  requireInRange(outsideCoeffWm2K, 0, 200, 'outsideCoeffWm2K', 'W/(m²·K)', { exclusive: true });
  return airTempC + (absorptance * irradianceWm2) / outsideCoeffWm2K - (emissivity * deltaRWm2) / outsideCoeffWm2K;
}
