/**
 * Clear-sky irradiance: beam normal (DNI), diffuse horizontal (DHI) and global horizontal (GHI)
 * under a cloudless sky, by two published models, plus a dispatcher and a generic monthly Linke
 * turbidity profile so a project needs no site tables.
 *
 *  - 'ineichen-perez': Ineichen & Perez (2002) with the Linke turbidity, in pvlib's formulation.
 *  - 'ashrae-tau': ASHRAE Handbook of Fundamentals (2009+, ch. 14) with the site's monthly beam
 *    and diffuse pseudo-optical depths τb, τd from the handbook's climatic design tables.
 */
import { DEG } from './constants.ts';
import { InputError, requireInRange } from './errors.ts';
import { pressureFromElevationPa, absoluteAirMass, relativeAirMassKastenYoung1989 } from './atmosphere.ts';
import { extraterrestrialNormalAshraeWm2, extraterrestrialNormalSpencer1971Wm2 } from './solarPosition.ts';

/** Clear-sky irradiance components. */
export interface ClearSkyIrradiance {
  /** Direct normal irradiance [W/m²]. */
  dniWm2: number;
  /** Diffuse horizontal irradiance [W/m²]. */
  dhiWm2: number;
  /** Global horizontal irradiance [W/m²] = DNI·cos z + DHI. */
  ghiWm2: number;
}

function newIrradiance(): ClearSkyIrradiance {
  return { dniWm2: 0, dhiWm2: 0, ghiWm2: 0 };
}

function setZero(target: ClearSkyIrradiance): ClearSkyIrradiance {
  target.dniWm2 = 0;
  target.dhiWm2 = 0;
  target.ghiWm2 = 0;
  return target;
}

/**
 * Ineichen–Perez clear-sky model (pvlib `clearsky.ineichen` formulation, without the optional
 * "Perez enhancement" factor).
 *
 * fh1 = exp(−h/8000), fh2 = exp(−h/1250), cg1 = 5.09e−5 h + 0.868, cg2 = 3.92e−5 h + 0.0387;
 * GHI = cg1 · E0 · cos z · exp(−cg2 · AM · (fh1 + fh2 (TL − 1)));
 * DNI = min(b · E0 · exp(−0.09 · AM · (TL − 1)), GHI · [1 − (0.1 − 0.2 e^−TL)/(0.1 + 0.882/fh1)] / cos z),
 * b = 0.664 + 0.163/fh1; DHI = GHI − DNI · cos z. All zero when z ≥ 90°.
 *
 * @param apparentZenithDeg Apparent solar zenith z [°], 0..180.
 * @param airMassAbsolute Absolute (pressure-corrected) air mass AM [-] (ignored when z ≥ 90°).
 * @param linkeTurbidity Linke turbidity factor TL at air mass 2 [-], 1..10.
 * @param elevationM Site elevation h [m], −1000..11000.
 * @param extraterrestrialNormalWm2 Extraterrestrial normal irradiance E0 [W/m²].
 * @param target Optional object to write into (no allocation when given).
 * @returns DNI, DHI, GHI [W/m²].
 * @throws InputError for inputs out of range.
 *
 * References:
 * [1] P. Ineichen and R. Perez, "A new airmass independent formulation for the Linke turbidity
 *     coefficient," Solar Energy, vol. 73, no. 3, pp. 151–157, 2002,
 *     doi:10.1016/S0038-092X(02)00045-2.
 * [2] R. Perez et al., "A new operational model for satellite-derived irradiances: description
 *     and validation," Solar Energy, vol. 73, no. 5, pp. 307–317, 2002,
 *     doi:10.1016/S0038-092X(02)00122-6.
 * [3] W. F. Holmgren, C. W. Hansen and M. A. Mikofski, "pvlib python: a python package for
 *     modeling solar energy systems," J. Open Source Softw., vol. 3, no. 29, p. 884, 2018,
 *     doi:10.21105/joss.00884 (clearsky.ineichen).
 *
 * @example
 * ineichenPerez2002(10, 1, 3, 0, 1364); // → { ghiWm2: 1038.159219, dniWm2: 942.208186, dhiWm2: 110.265293 }
 */
export function ineichenPerez2002(
  apparentZenithDeg: number,
  airMassAbsolute: number,
  linkeTurbidity: number,
  elevationM: number,
  extraterrestrialNormalWm2: number,
  target: ClearSkyIrradiance = newIrradiance(),
): ClearSkyIrradiance {
  requireInRange(apparentZenithDeg, 0, 180, 'apparentZenithDeg', '°');
  requireInRange(linkeTurbidity, 1, 10, 'linkeTurbidity', '', { source: 'Linke turbidity at air mass 2' });
  requireInRange(elevationM, -1000, 11000, 'elevationM', 'm');
  requireInRange(extraterrestrialNormalWm2, 1000, 1500, 'extraterrestrialNormalWm2', 'W/m²');
  const cosZ = Math.cos(apparentZenithDeg * DEG);
  if (apparentZenithDeg >= 90 || cosZ <= 0) return setZero(target);
  requireInRange(airMassAbsolute, 0, 100, 'airMassAbsolute', '', { exclusive: true });

  const tl = linkeTurbidity;
  const h = elevationM;
  const fh1 = Math.exp(-h / 8000);
  const fh2 = Math.exp(-h / 1250);
  const cg1 = 5.09e-5 * h + 0.868;
  const cg2 = 3.92e-5 * h + 0.0387;
  const ghi = cg1 * extraterrestrialNormalWm2 * cosZ * Math.exp(-cg2 * airMassAbsolute * (fh1 + fh2 * (tl - 1)));
  const b = 0.664 + 0.163 / fh1;
  const bnci = b * extraterrestrialNormalWm2 * Math.exp(-0.09 * airMassAbsolute * (tl - 1));
  // "empirical correction" (Solar Energy 73, pp. 157 and 312): keeps DHI ≥ a fraction of GHI.
  const bnci2 = (ghi * Math.max(0, 1 - (0.1 - 0.2 * Math.exp(-tl)) / (0.1 + 0.882 / fh1))) / cosZ;
  const dni = Math.min(bnci, bnci2);
  target.ghiWm2 = ghi;
  target.dniWm2 = dni;
  target.dhiWm2 = ghi - dni * cosZ;
  return target;
}

/**
 * Beam air-mass exponent of the ASHRAE clear-sky model.
 *
 * ab = 1.454 − 0.406 τb − 0.268 τd + 0.021 τb τd.
 *
 * @param tauBeam Beam pseudo-optical depth τb [-].
 * @param tauDiffuse Diffuse pseudo-optical depth τd [-].
 * @returns ab [-].
 *
 * References: see {@link ashraeClearSky2009}.
 *
 * @example
 * ashraeBeamAirMassExponent(0.556, 1.779); // → 0.77226
 */
export function ashraeBeamAirMassExponent(tauBeam: number, tauDiffuse: number): number {
  return 1.454 - 0.406 * tauBeam - 0.268 * tauDiffuse + 0.021 * tauBeam * tauDiffuse;
}

/**
 * Diffuse air-mass exponent of the ASHRAE clear-sky model.
 *
 * ad = 0.507 + 0.205 τb − 0.080 τd − 0.190 τb τd.
 *
 * @param tauBeam Beam pseudo-optical depth τb [-].
 * @param tauDiffuse Diffuse pseudo-optical depth τd [-].
 * @returns ad [-].
 *
 * References: see {@link ashraeClearSky2009}.
 *
 * @example
 * ashraeDiffuseAirMassExponent(0.556, 1.779); // → 0.29073
 */
export function ashraeDiffuseAirMassExponent(tauBeam: number, tauDiffuse: number): number {
  return 0.507 + 0.205 * tauBeam - 0.08 * tauDiffuse - 0.19 * tauBeam * tauDiffuse;
}

/**
 * ASHRAE clear-sky model (Handbook of Fundamentals 2009 and later, ch. 14).
 *
 * Eb = E0 · exp(−τb · m^ab), Ed = E0 · exp(−τd · m^ad), with m the Kasten–Young (1989) relative
 * air mass at solar altitude β and ab, ad from {@link ashraeBeamAirMassExponent} and
 * {@link ashraeDiffuseAirMassExponent}. DNI = Eb, DHI = Ed, GHI = Eb sin β + Ed; all zero for β ≤ 0.
 *
 * @param solarAltitudeDeg Solar altitude β [°], −90..90.
 * @param tauBeam Beam pseudo-optical depth τb [-], in (0, 2) (sanity bounds, wider than the handbook's tables).
 * @param tauDiffuse Diffuse pseudo-optical depth τd [-], in (0, 5) (sanity bounds, wider than the handbook's tables).
 * @param extraterrestrialNormalWm2 E0 [W/m²]; the model was fitted with the ASHRAE form and
 *   1367 W/m² ({@link extraterrestrialNormalAshraeWm2}).
 * @param target Optional object to write into.
 * @returns DNI, DHI, GHI [W/m²].
 * @throws InputError for inputs out of range.
 *
 * References:
 * [1] ASHRAE, "Climatic design information," in ASHRAE Handbook—Fundamentals (SI), ch. 14.
 *     Atlanta, GA, USA: ASHRAE, 2009 (same model in 2013 and 2017).
 * [2] C. A. Gueymard and D. Thevenard, "Revising ASHRAE climatic data for design and standards —
 *     Part 2: Clear-sky solar radiation model," ASHRAE Trans., vol. 119, no. 2, 2013.
 * [3] F. Kasten and A. T. Young, "Revised optical air mass tables and approximation formula,"
 *     Appl. Opt., vol. 28, no. 22, pp. 4735–4738, 1989, doi:10.1364/AO.28.004735.
 *
 * @example
 * ashraeClearSky2009(60, 0.556, 1.779, 1323.1); // → { dniWm2: 711.02, dhiWm2: 207.08, ... }
 */
export function ashraeClearSky2009(
  solarAltitudeDeg: number,
  tauBeam: number,
  tauDiffuse: number,
  extraterrestrialNormalWm2: number,
  target: ClearSkyIrradiance = newIrradiance(),
): ClearSkyIrradiance {
  requireInRange(solarAltitudeDeg, -90, 90, 'solarAltitudeDeg', '°');
  requireInRange(tauBeam, 0, 2, 'tauBeam', '', { exclusive: true, source: 'ASHRAE beam pseudo-optical depth' });
  requireInRange(tauDiffuse, 0, 5, 'tauDiffuse', '', { exclusive: true, source: 'ASHRAE diffuse pseudo-optical depth' });
  requireInRange(extraterrestrialNormalWm2, 1000, 1500, 'extraterrestrialNormalWm2', 'W/m²');
  if (solarAltitudeDeg <= 0) return setZero(target);
  const m = relativeAirMassKastenYoung1989(90 - solarAltitudeDeg);
  const ab = ashraeBeamAirMassExponent(tauBeam, tauDiffuse);
  const ad = ashraeDiffuseAirMassExponent(tauBeam, tauDiffuse);
  const eb = extraterrestrialNormalWm2 * Math.exp(-tauBeam * Math.pow(m, ab));
  const ed = extraterrestrialNormalWm2 * Math.exp(-tauDiffuse * Math.pow(m, ad));
  target.dniWm2 = eb;
  target.dhiWm2 = ed;
  target.ghiWm2 = eb * Math.sin(solarAltitudeDeg * DEG) + ed;
  return target;
}

/**
 * Generic monthly Linke turbidity (at air mass 2) for a northern mid-latitude site, January
 * first: clean winter air about 2.6, hazy humid summer about 3.8.
 *
 * `from memory` / common practice: the shape and size follow typical rural-to-suburban values of
 * the monthly Linke turbidity climatologies for Europe and North America (e.g. the SoDa maps of
 * Remund et al. 2003); it is NOT a site table. Industrial or desert sites and cities run higher
 * (4–6), mountains lower. Replace it with the site's values when known.
 */
export const GENERIC_MIDLATITUDE_LINKE_TURBIDITY = [
  2.6, 2.8, 3.1, 3.4, 3.6, 3.7, 3.8, 3.7, 3.4, 3.0, 2.7, 2.6,
] as const;

/**
 * Default Linke turbidity for a month, from a generic mid-latitude profile (overridable).
 *
 * South of the equator the profile is shifted by six months (January takes July's value).
 *
 * @param month Calendar month [-], integer 1..12.
 * @param latitudeDeg Site latitude [°], −90..90; default 45 (only its sign is used).
 * @param profile Twelve monthly values, January first, each in 1..10; default
 *   {@link GENERIC_MIDLATITUDE_LINKE_TURBIDITY}.
 * @returns Linke turbidity TL [-].
 * @throws InputError for a month, latitude or profile out of range.
 *
 * References:
 * [1] J. Remund, L. Wald, M. Lefèvre, T. Ranchin and J. Page, "Worldwide Linke turbidity
 *     information," in Proc. ISES Solar World Congress, Göteborg, Sweden, 2003 (for the order of
 *     magnitude only; the profile is from memory, not read from it).
 *
 * @example
 * defaultLinkeTurbidity(7); // → 3.8
 * defaultLinkeTurbidity(1, -33.9); // → 3.8 (southern summer)
 */
export function defaultLinkeTurbidity(
  month: number,
  latitudeDeg = 45,
  profile: readonly number[] = GENERIC_MIDLATITUDE_LINKE_TURBIDITY,
): number {
  if (!Number.isInteger(month) || month < 1 || month > 12) {
    throw new InputError({ problem: 'not a calendar month', place: 'month', value: month, expected: 'an integer 1..12' });
  }
  requireInRange(latitudeDeg, -90, 90, 'latitudeDeg', '°');
  if (profile.length !== 12) {
    throw new InputError({
      problem: 'wrong number of monthly values',
      place: 'profile',
      value: profile.length,
      expected: '12 values, January first',
    });
  }
  const index = latitudeDeg < 0 ? (month + 5) % 12 : month - 1;
  const tl = profile[index]!;
  requireInRange(tl, 1, 10, `profile[${index}]`, '', { source: 'Linke turbidity' });
  return tl;
}

/** The clear-sky models available to {@link clearSkyIrradiance}. */
export type ClearSkyModel = 'ineichen-perez' | 'ashrae-tau';

/** Inputs of {@link clearSkyIrradiance}; each model reads the ones it needs. */
export interface ClearSkyInputs {
  /** Apparent (refraction-corrected) solar zenith [°]. */
  apparentZenithDeg: number;
  /** Day of year [-], 1..367, for the extraterrestrial irradiance. */
  dayOfYear: number;
  /** Site elevation [m]; default 0. Used by 'ineichen-perez' (air mass and fh1/fh2). */
  elevationM?: number;
  /** Linke turbidity [-]; required by 'ineichen-perez' (see {@link defaultLinkeTurbidity}). */
  linkeTurbidity?: number;
  /** Beam pseudo-optical depth τb [-]; required by 'ashrae-tau'. */
  tauBeam?: number;
  /** Diffuse pseudo-optical depth τd [-]; required by 'ashrae-tau'. */
  tauDiffuse?: number;
  /**
   * Extraterrestrial normal irradiance override [W/m²]. Default: Spencer (1971) with
   * SOLAR_CONSTANT_WM2 for 'ineichen-perez'; the ASHRAE form with 1367 W/m² for 'ashrae-tau'.
   */
  extraterrestrialNormalWm2?: number;
}

/**
 * Clear-sky DNI, DHI and GHI by the named model (dispatcher); zeros below the horizon.
 *
 * 'ineichen-perez' takes the relative air mass from Kasten & Young (1989) at the apparent zenith
 * and makes it absolute with the standard-atmosphere pressure at the site elevation (as pvlib's
 * `Location.get_clearsky` does). 'ashrae-tau' uses solar altitude β = 90° − apparent zenith.
 *
 * @param model 'ineichen-perez' or 'ashrae-tau'.
 * @param inputs Sun, date and atmosphere; see {@link ClearSkyInputs}.
 * @param target Optional object to write into.
 * @returns DNI, DHI, GHI [W/m²].
 * @throws InputError for an unknown model, a missing model parameter, or inputs out of range.
 *
 * References: see {@link ineichenPerez2002} and {@link ashraeClearSky2009}.
 *
 * @example
 * clearSkyIrradiance('ashrae-tau', { apparentZenithDeg: 30, dayOfYear: 172, tauBeam: 0.556, tauDiffuse: 1.779 });
 * // → { dniWm2: ≈711.0, dhiWm2: ≈207.1, ghiWm2: ≈822.9 }
 */
export function clearSkyIrradiance(
  model: ClearSkyModel,
  inputs: ClearSkyInputs,
  target: ClearSkyIrradiance = newIrradiance(),
): ClearSkyIrradiance {
  const z = inputs.apparentZenithDeg;
  requireInRange(z, 0, 180, 'inputs.apparentZenithDeg', '°');
  switch (model) {
    case 'ineichen-perez': {
      const tl = inputs.linkeTurbidity;
      if (tl === undefined) {
        throw new InputError({
          problem: 'missing',
          place: 'inputs.linkeTurbidity',
          expected: "a Linke turbidity for the 'ineichen-perez' model (e.g. defaultLinkeTurbidity(month, latitudeDeg))",
        });
      }
      const elevationM = inputs.elevationM ?? 0;
      const e0 = inputs.extraterrestrialNormalWm2 ?? extraterrestrialNormalSpencer1971Wm2(inputs.dayOfYear);
      if (z >= 90) {
        // Still validate the model parameters, so a night-time call reports bad input too.
        return ineichenPerez2002(z, NaN, tl, elevationM, e0, target);
      }
      const am = absoluteAirMass(relativeAirMassKastenYoung1989(z), pressureFromElevationPa(elevationM));
      return ineichenPerez2002(z, am, tl, elevationM, e0, target);
    }
    case 'ashrae-tau': {
      const tb = inputs.tauBeam;
      const td = inputs.tauDiffuse;
      if (tb === undefined || td === undefined) {
        throw new InputError({
          problem: 'missing',
          place: tb === undefined ? 'inputs.tauBeam' : 'inputs.tauDiffuse',
          expected: "the site's monthly τb and τd (ASHRAE Handbook of Fundamentals climatic design tables)",
        });
      }
      const e0 = inputs.extraterrestrialNormalWm2 ?? extraterrestrialNormalAshraeWm2(inputs.dayOfYear);
      return ashraeClearSky2009(90 - z, tb, td, e0, target);
    }
    default:
      throw new InputError({
        problem: 'unknown clear-sky model',
        place: 'model',
        value: model,
        expected: "'ineichen-perez' or 'ashrae-tau'",
      });
  }
}
