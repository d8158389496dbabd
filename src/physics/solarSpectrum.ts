/**
 * The two-band split of solar energy used for surface reflectance: "visible" (here 280–700 nm,
 * ultraviolet included, since façade materials reflect UV much as they reflect violet/blue) and
 * near-infrared (700–4000 nm), as fractions of the ASTM G173-03 AM1.5 global-tilt spectrum.
 *
 * References:
 * [1] ASTM G173-03, "Standard Tables for Reference Solar Spectral Irradiances: Direct Normal and
 *     Hemispherical on 37° Tilted Surface," ASTM International, 2003 (reapproved 2012),
 *     doi:10.1520/G0173-03R12. Band integrals by trapezoidal integration of the tabulated global
 *     spectrum (REFERENCE-VALUES §10.2): UV < 400 nm 4.61 %, VIS 400–700 nm 42.97 %,
 *     NIR > 700 nm 52.42 % of 1000.4 W/m².
 */

/** Fractions of AM1.5 global energy per band (ASTM G173-03, REFERENCE-VALUES §10.2). */
export const ASTM_G173_AM15G_BAND_FRACTIONS = {
  /** < 400 nm */
  ultraviolet: 0.0461,
  /** 400–700 nm */
  visible400to700: 0.4297,
  /** > 700 nm */
  nearInfrared: 0.5242,
  /** Total of the tabulated 280–4000 nm global spectrum [W/m²]. */
  totalWm2: 1000.4,
} as const;

/** Weight of the "visible" band (ultraviolet + 400–700 nm) in band-weighted solar quantities [-]. */
export const SOLAR_VISIBLE_BAND_FRACTION =
  ASTM_G173_AM15G_BAND_FRACTIONS.ultraviolet + ASTM_G173_AM15G_BAND_FRACTIONS.visible400to700;

/** Weight of the near-infrared band (> 700 nm) in band-weighted solar quantities [-]. */
export const SOLAR_NIR_BAND_FRACTION = ASTM_G173_AM15G_BAND_FRACTIONS.nearInfrared;

/**
 * Broadband solar reflectance (or transmittance) from the two band values, weighted by the
 * AM1.5 global energy in each band.
 *
 * ρ_solar = f_vis·ρ_vis + f_nir·ρ_nir, with f_vis = 0.4758 (UV + 400–700 nm) and f_nir = 0.5242.
 * The weights sum to 1.0000, so equal band values give the same broadband value.
 *
 * @param visible Reflectance in the visible band (UV included) [-], in [0, 1]
 * @param nir Reflectance in the near-infrared band [-], in [0, 1]
 * @returns Band-weighted solar reflectance [-]
 *
 * References: ASTM G173-03 [1] (see module header).
 *
 * @example
 * bandWeightedReflectance(0.07, 0.45) // ≈ 0.2692 (green grass: dark in the visible, bright in the NIR)
 */
export function bandWeightedReflectance(visible: number, nir: number): number {
  return SOLAR_VISIBLE_BAND_FRACTION * visible + SOLAR_NIR_BAND_FRACTION * nir;
}
