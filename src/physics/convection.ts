/**
 * Exterior convective heat-transfer coefficients of building surfaces as functions of the local
 * wind speed.
 *
 * Wind height: both correlations expect the air speed **next to the surface** (McAdams/Jürges: the
 * free-stream speed over a plate in a wind tunnel; ISO 6946: "wind speed adjacent to the surface").
 * A 10 m meteorological wind must be converted to the local height first (a wind-profile helper
 * does that; it is not part of this module).
 *
 * The coefficients are quoted from memory (REFERENCE-VALUES §8 marks them [mem]); the review by
 * Mirsadeghi et al. 2013 is the place to confirm them.
 *
 * References:
 * [1] W. H. McAdams, Heat Transmission, 3rd ed. New York: McGraw-Hill, 1954 (after W. Jürges,
 *     "Der Wärmeübergang an einer ebenen Wand," Beihefte zum Gesundheits-Ingenieur, 1924).
 * [2] ISO 6946:2017, "Building components and building elements — Thermal resistance and thermal
 *     transmittance — Calculation methods," Annex C.
 * [3] M. Mirsadeghi, D. Cóstola, B. Blocken, J. L. M. Hensen, "Review of external convective heat
 *     transfer coefficient models in building energy simulation programs," Appl. Therm. Eng.,
 *     vol. 56, pp. 134–151, 2013, doi:10.1016/j.applthermaleng.2013.03.003.
 */
import { InputError, requireInRange } from './errors.ts';

/** Coefficients of the exterior convection correlations (from memory, REFERENCE-VALUES §8). */
export const CONVECTION_COEFFICIENTS = {
  /** McAdams 1954 after Jürges 1924: h = a + b·v for v < vMax; h = c·v^d above (from memory). */
  mcadams1954: { a: 5.7, b: 3.8, vLinearMaxMs: 4.88, c: 7.2, d: 0.78, vMaxMs: 30.5 },
  /** ISO 6946:2017 Annex C: h_ce = a + b·v (from memory). */
  iso6946: { a: 4, b: 4 },
} as const;

/** Names of the exterior convection models the dispatcher accepts. */
export const CONVECTION_MODELS = ['mcadams1954', 'iso6946'] as const;
export type ConvectionModel = (typeof CONVECTION_MODELS)[number];

const WIND_MAX_MS = 40;
// Checks compare first and call requireInRange (which allocates its options object) only to
// build the error, so per-step calls allocate nothing.

/**
 * McAdams (1954) exterior convective coefficient, after Jürges (1924).
 *
 * h_c = 5.7 + 3.8·v for v < 4.88 m/s; h_c = 7.2·v^0.78 for 4.88 ≤ v ≤ 30.5 m/s (coefficients from
 * memory). Above 30.5 m/s the power law is extrapolated.
 *
 * @param windLocalMs Air speed next to the surface [m/s], ≥ 0
 * @returns Convective heat-transfer coefficient [W/(m²·K)]
 *
 * References: [1] in the module header.
 *
 * @example
 * convectionCoeffMcAdams1954Wm2K(3) // 17.1
 */
export function convectionCoeffMcAdams1954Wm2K(windLocalMs: number): number {
  if (!(windLocalMs >= 0 && windLocalMs <= WIND_MAX_MS)) requireInRange(windLocalMs, 0, WIND_MAX_MS, 'windLocalMs', 'm/s');
  const c = CONVECTION_COEFFICIENTS.mcadams1954;
  return windLocalMs < c.vLinearMaxMs ? c.a + c.b * windLocalMs : c.c * Math.pow(windLocalMs, c.d);
}

/**
 * ISO 6946 exterior convective coefficient.
 *
 * h_ce = 4 + 4·v (ISO 6946:2017 Annex C; coefficients from memory).
 *
 * @param windLocalMs Wind speed adjacent to the surface [m/s], ≥ 0
 * @returns Convective heat-transfer coefficient [W/(m²·K)]
 *
 * References: [2] in the module header.
 *
 * @example
 * convectionCoeffIso6946Wm2K(4) // 20
 */
export function convectionCoeffIso6946Wm2K(windLocalMs: number): number {
  if (!(windLocalMs >= 0 && windLocalMs <= WIND_MAX_MS)) requireInRange(windLocalMs, 0, WIND_MAX_MS, 'windLocalMs', 'm/s');
  const c = CONVECTION_COEFFICIENTS.iso6946;
  return c.a + c.b * windLocalMs;
}

/**
 * Exterior convective coefficient by model name.
 *
 * @param model 'mcadams1954' or 'iso6946'
 * @param windLocalMs Air speed next to the surface [m/s]
 * @returns Convective heat-transfer coefficient [W/(m²·K)]
 *
 * @example
 * exteriorConvectionCoeffWm2K('iso6946', 1) // 8
 */
export function exteriorConvectionCoeffWm2K(model: ConvectionModel, windLocalMs: number): number {
  switch (model) {
    case 'mcadams1954':
      return convectionCoeffMcAdams1954Wm2K(windLocalMs);
    case 'iso6946':
      return convectionCoeffIso6946Wm2K(windLocalMs);
    default:
      throw unknownModel(model as unknown);
  }
}

function unknownModel(model: unknown): InputError {
  return new InputError({
    problem: 'unknown convection model',
    place: 'model',
    value: model,
    expected: `one of ${CONVECTION_MODELS.join(', ')}`,
  });
}
