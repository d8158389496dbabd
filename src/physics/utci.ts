/**
 * UTCI (Universal Thermal Climate Index) by Bröde's operational polynomial, its validity range and
 * its ten-category thermal-stress assessment scale.
 *
 * Three entry points, by how they treat inputs outside the polynomial's validity range:
 * - `utciPolynomialC` evaluates the raw polynomial, no checks (for test data and research use);
 * - `utciC` REFUSES out-of-range inputs with an InputError naming the quantity and the range;
 * - `utciClampedC` CLAMPS each input to its range, evaluates, and says which inputs it clamped
 *   (the audit uses this, so one bad hour does not stop a year's run but is flagged).
 *
 * Wind: UTCI takes the wind speed 10 m above ground (the polynomial was fitted that way). Do not
 * pass a person-height wind here; `wind.ts` converts between heights for surface convection only.
 *
 * References:
 * [1] P. Bröde, D. Fiala, K. Błażejczyk, I. Holmér, G. Jendritzky, B. Kampmann, B. Tinz and
 *     G. Havenith, "Deriving the operational procedure for the Universal Thermal Climate Index
 *     (UTCI)," Int. J. Biometeorol., vol. 56, no. 3, pp. 481–494, 2012,
 *     doi:10.1007/s00484-011-0454-1.
 * [2] K. Błażejczyk, G. Jendritzky, P. Bröde, D. Fiala, G. Havenith, Y. Epstein, A. Psikuta and
 *     B. Kampmann, "An introduction to the Universal Thermal Climate Index (UTCI)," Geographia
 *     Polonica, vol. 86, no. 1, pp. 5–10, 2013.
 */
import { InputError, requireInRange } from './errors.ts';
import { UTCI_POLYNOMIAL_TERMS, UTCI_TERM_COUNT, UTCI_TERM_STRIDE } from './utciCoefficients.ts';
import { saturationVapourPressureHardyHpa } from './humidity.ts';

// ---------------------------------------------------------------------------------------------
// Validity range
// ---------------------------------------------------------------------------------------------

/**
 * Validity range of the polynomial, bounds INCLUSIVE: −50 ≤ Ta ≤ 50 °C, −30 ≤ Tmrt − Ta ≤ 70 K,
 * 0.5 ≤ v10 ≤ 17 m/s, 0 ≤ RH ≤ 100 %. Source: UTCI_a002.f90 header (Tmrt "30 degC below and 70
 * degC above air temperature"; wind "between 0.5 and 17 m/s"), with the inclusive Ta bounds as
 * recorded in shared/reference/utci/utci-categories.json. The paper also names a humidity limit of
 * about 5 kPa vapour pressure; neither the reference code nor this function enforces it.
 */
export const UTCI_VALID_RANGE = {
  airTempC: { min: -50, max: 50, unit: '°C' },
  deltaMrtK: { min: -30, max: 70, unit: 'K' },
  wind10mMs: { min: 0.5, max: 17, unit: 'm/s' },
  relativeHumidityPct: { min: 0, max: 100, unit: '%' },
} as const;

const RANGE_OPTS = { source: 'validity range of the UTCI polynomial, Bröde et al. 2012' } as const;

// ---------------------------------------------------------------------------------------------
// The polynomial
// ---------------------------------------------------------------------------------------------

// The 210 coefficients are reordered once, at load, into the traversal order of a nested Horner
// scheme (Pa outermost, then ΔTmrt, va, Ta), so a call is 210 multiply-adds reading one array in
// sequence: no allocation, no power tables, and better rounding than summing monomials.
const MAX_DEGREE = 6;
const HORNER = buildHornerCoefficients();

function buildHornerCoefficients(): Float64Array {
  // Dense lookup c[i][j][k][l] (exponents of Ta, va, ΔTmrt, Pa), base 7.
  const dense = new Float64Array(7 ** 4);
  const seen = new Uint8Array(7 ** 4);
  for (let t = 0; t < UTCI_TERM_COUNT; t++) {
    const o = t * UTCI_TERM_STRIDE;
    const key = denseKey(
      UTCI_POLYNOMIAL_TERMS[o + 1] ?? -1,
      UTCI_POLYNOMIAL_TERMS[o + 2] ?? -1,
      UTCI_POLYNOMIAL_TERMS[o + 3] ?? -1,
      UTCI_POLYNOMIAL_TERMS[o + 4] ?? -1,
    );
    if (seen[key] === 1) throw new Error(`UTCI coefficient table: duplicate exponents at term ${t}`);
    seen[key] = 1;
    dense[key] = UTCI_POLYNOMIAL_TERMS[o] ?? Number.NaN;
  }
  const out = new Float64Array(UTCI_TERM_COUNT);
  let n = 0;
  for (let l = MAX_DEGREE; l >= 0; l--) {
    for (let k = MAX_DEGREE - l; k >= 0; k--) {
      for (let j = MAX_DEGREE - l - k; j >= 0; j--) {
        for (let i = MAX_DEGREE - l - k - j; i >= 0; i--) {
          const key = denseKey(i, j, k, l);
          if (seen[key] !== 1) throw new Error(`UTCI coefficient table: no term Ta^${i} va^${j} dTmrt^${k} Pa^${l}`);
          out[n++] = dense[key] as number;
        }
      }
    }
  }
  return out;
}

function denseKey(i: number, j: number, k: number, l: number): number {
  if (!(i >= 0 && j >= 0 && k >= 0 && l >= 0 && i + j + k + l <= MAX_DEGREE)) {
    throw new Error(`UTCI coefficient table: bad exponents ${i},${j},${k},${l}`);
  }
  return ((i * 7 + j) * 7 + k) * 7 + l;
}

/**
 * The raw operational UTCI polynomial (Bröde et al. 2012), no range check.
 *
 * UTCI = Ta + Σₖ cₖ · Ta^iₖ · va^jₖ · ΔTmrt^kₖ · Pa^lₖ over the 210 terms of `utciCoefficients.ts`,
 * evaluated as a nested Horner scheme (mathematically the same sum).
 * Outside the validity range (see `UTCI_VALID_RANGE`) the value is an extrapolation; the paper's
 * own test data evaluates it up to 30 m/s.
 *
 * @param airTempC Air temperature Ta [°C].
 * @param wind10mMs Wind speed 10 m above ground va [m/s].
 * @param deltaMrtK Mean radiant temperature minus air temperature, Tmrt − Ta [K].
 * @param vapourPressureKpa Water-vapour pressure Pa [kPa].
 * @returns UTCI [°C].
 * @see [1] Bröde et al. 2012, function UTCI_approx of UTCI_a002.f90.
 * @example utciPolynomialC(25, 1, 1, 1.5) // → 24.7336 (°C)
 */
export function utciPolynomialC(airTempC: number, wind10mMs: number, deltaMrtK: number, vapourPressureKpa: number): number {
  const h = HORNER;
  let idx = 0;
  let sPa = 0;
  for (let l = MAX_DEGREE; l >= 0; l--) {
    let sDt = 0;
    for (let k = MAX_DEGREE - l; k >= 0; k--) {
      let sVa = 0;
      for (let j = MAX_DEGREE - l - k; j >= 0; j--) {
        let sTa = 0;
        for (let i = MAX_DEGREE - l - k - j; i >= 0; i--) sTa = sTa * airTempC + (h[idx++] as number);
        sVa = sVa * wind10mMs + sTa;
      }
      sDt = sDt * deltaMrtK + sVa;
    }
    sPa = sPa * vapourPressureKpa + sDt;
  }
  return airTempC + sPa;
}

// ---------------------------------------------------------------------------------------------
// Public functions with range handling
// ---------------------------------------------------------------------------------------------

/** Inputs of `utciC` and `utciClampedC`. */
export interface UtciInputs {
  /** Air temperature [°C]. */
  airTempC: number;
  /** Mean radiant temperature [°C]. */
  mrtC: number;
  /** Wind speed 10 m above ground [m/s] — not the wind at the person. */
  wind10mMs: number;
  /** Relative humidity [%], over water. */
  relativeHumidityPct: number;
}

/**
 * Vapour pressure [kPa] the polynomial takes, from Ta and RH: Pa = es(Ta)·RH/100/10 with es after
 * Hardy (1998), as in UTCI_a002.f90.
 */
function vapourPressureKpaFor(airTempC: number, relativeHumidityPct: number): number {
  return (saturationVapourPressureHardyHpa(airTempC) * relativeHumidityPct) / 1000;
}

/**
 * UTCI from air temperature, MRT, 10 m wind and relative humidity; REFUSES inputs outside the
 * validity range (use `utciClampedC` to clamp instead).
 *
 * Pa = es(Ta)·RH/1000 [kPa] with es by Hardy (1998) [hPa]; UTCI = utciPolynomialC(Ta, v10, Tmrt − Ta, Pa).
 * Valid (bounds inclusive): −50 ≤ Ta ≤ 50 °C, −30 ≤ Tmrt − Ta ≤ 70 K, 0.5 ≤ v10 ≤ 17 m/s,
 * 0 ≤ RH ≤ 100 %.
 *
 * @param inputs.airTempC Air temperature [°C].
 * @param inputs.mrtC Mean radiant temperature [°C].
 * @param inputs.wind10mMs Wind speed 10 m above ground [m/s].
 * @param inputs.relativeHumidityPct Relative humidity [%].
 * @returns UTCI [°C].
 * @throws InputError naming the quantity and its range when an input is outside it or not finite.
 * @see [1] Bröde et al. 2012.
 * @example utciC({ airTempC: 25, mrtC: 25, wind10mMs: 1, relativeHumidityPct: 50 }) // → 24.61 (°C)
 */
export function utciC(inputs: UtciInputs): number {
  const { airTempC, mrtC, wind10mMs, relativeHumidityPct } = inputs;
  const r = UTCI_VALID_RANGE;
  requireInRange(airTempC, r.airTempC.min, r.airTempC.max, 'airTempC (air temperature)', r.airTempC.unit, RANGE_OPTS);
  requireInRange(mrtC, -Infinity, Infinity, 'mrtC (mean radiant temperature)', '°C');
  requireInRange(mrtC - airTempC, r.deltaMrtK.min, r.deltaMrtK.max, 'mrtC − airTempC (mean radiant minus air temperature)', r.deltaMrtK.unit, RANGE_OPTS);
  requireInRange(wind10mMs, r.wind10mMs.min, r.wind10mMs.max, 'wind10mMs (wind speed 10 m above ground)', r.wind10mMs.unit, RANGE_OPTS);
  requireInRange(relativeHumidityPct, r.relativeHumidityPct.min, r.relativeHumidityPct.max, 'relativeHumidityPct (relative humidity)', r.relativeHumidityPct.unit);
  return utciPolynomialC(airTempC, wind10mMs, mrtC - airTempC, vapourPressureKpaFor(airTempC, relativeHumidityPct));
}

/** Result of `utciClampedC`. */
export interface UtciClampedResult {
  /** UTCI [°C] at the clamped inputs. */
  utciC: number;
  /** True when any input was moved onto its range. */
  clamped: boolean;
  /** Which inputs were clamped: any of 'airTempC', 'deltaMrtK', 'wind10mMs', 'relativeHumidityPct'. */
  clampedInputs: string[];
}

function clampInto(value: number, lo: number, hi: number): number {
  return value < lo ? lo : value > hi ? hi : value;
}

/**
 * UTCI with each input CLAMPED to the validity range, flagging what was clamped (use `utciC` to
 * refuse instead). For the audit's per-sensor, per-hour loop: pass a reused `target` and nothing is
 * allocated.
 *
 * Clamping rule: Ta is clamped to [−50, 50] °C; the radiant excess ΔTmrt = Tmrt − Ta is taken from
 * the inputs as given and clamped to [−30, 70] K on its own; v10 to [0.5, 17] m/s; RH to [0, 100] %;
 * then Pa = es(Ta_clamped)·RH_clamped/1000 and UTCI = utciPolynomialC(Ta, v10, ΔTmrt, Pa) on the
 * clamped values. A value on a bound is not "clamped". Non-finite inputs are refused (InputError):
 * a missing value cannot be clamped.
 *
 * @param inputs Air temperature [°C], MRT [°C], 10 m wind [m/s], relative humidity [%].
 * @param target Optional result object to fill (its `clampedInputs` array is emptied and reused).
 * @returns `{ utciC [°C], clamped, clampedInputs }`.
 * @throws InputError when an input is NaN or infinite.
 * @see [1] Bröde et al. 2012.
 * @example utciClampedC({ airTempC: 25, mrtC: 25, wind10mMs: 0.2, relativeHumidityPct: 50 })
 *   // → { utciC: 24.854 (as at v10 = 0.5), clamped: true, clampedInputs: ['wind10mMs'] }
 */
export function utciClampedC(inputs: UtciInputs, target?: UtciClampedResult): UtciClampedResult {
  const { airTempC, mrtC, wind10mMs, relativeHumidityPct } = inputs;
  // Finite checks first (cheap, nothing allocated unless one fails).
  if (!Number.isFinite(airTempC)) requireInRange(airTempC, -Infinity, Infinity, 'airTempC (air temperature)', '°C');
  if (!Number.isFinite(mrtC)) requireInRange(mrtC, -Infinity, Infinity, 'mrtC (mean radiant temperature)', '°C');
  if (!Number.isFinite(wind10mMs)) requireInRange(wind10mMs, -Infinity, Infinity, 'wind10mMs (wind speed 10 m above ground)', 'm/s');
  if (!Number.isFinite(relativeHumidityPct)) requireInRange(relativeHumidityPct, -Infinity, Infinity, 'relativeHumidityPct (relative humidity)', '%');
  const out = target ?? { utciC: Number.NaN, clamped: false, clampedInputs: [] };
  out.clampedInputs.length = 0;
  const r = UTCI_VALID_RANGE;

  const ta = clampInto(airTempC, r.airTempC.min, r.airTempC.max);
  if (ta !== airTempC) out.clampedInputs.push('airTempC');
  const dt = clampInto(mrtC - airTempC, r.deltaMrtK.min, r.deltaMrtK.max);
  if (dt !== mrtC - airTempC) out.clampedInputs.push('deltaMrtK');
  const va = clampInto(wind10mMs, r.wind10mMs.min, r.wind10mMs.max);
  if (va !== wind10mMs) out.clampedInputs.push('wind10mMs');
  const rh = clampInto(relativeHumidityPct, r.relativeHumidityPct.min, r.relativeHumidityPct.max);
  if (rh !== relativeHumidityPct) out.clampedInputs.push('relativeHumidityPct');

  out.utciC = utciPolynomialC(ta, va, dt, vapourPressureKpaFor(ta, rh));
  out.clamped = out.clampedInputs.length > 0;
  return out;
}

// ---------------------------------------------------------------------------------------------
// Assessment scale
// ---------------------------------------------------------------------------------------------

/** Our ids for the ten categories of the UTCI assessment scale. */
export type UtciCategoryId =
  | 'extreme-heat'
  | 'very-strong-heat'
  | 'strong-heat'
  | 'moderate-heat'
  | 'no-stress'
  | 'slight-cold'
  | 'moderate-cold'
  | 'strong-cold'
  | 'very-strong-cold'
  | 'extreme-cold';

/** One band of the UTCI assessment scale: lowerC < UTCI ≤ upperC. */
export interface UtciCategory {
  readonly id: UtciCategoryId;
  /** The category's name on the published UTCI assessment scale. */
  readonly label: string;
  /** Lower bound [°C], exclusive (−Infinity for the coldest band). */
  readonly lowerC: number;
  /** Upper bound [°C], inclusive (+Infinity for the hottest band). */
  readonly upperC: number;
}

/**
 * The ten UTCI thermal-stress categories, hottest first, with the published thresholds (Bröde et
 * al. 2012; Błażejczyk et al. 2013) and names, read from shared/reference/utci/utci-categories.json.
 *
 * Boundary rule (ours; the published scale only gives ranges such as "+26 to +32"): each band is
 * (lowerC, upperC], so a value exactly on a threshold belongs to the colder band — 26.0 is
 * 'no-stress', 46.0 is 'very-strong-heat', −40.0 is 'extreme-cold'. This is the convention
 * recorded in utci-categories.json. The rule applies to the value passed in, unrounded; to match a
 * value displayed to 0.1 °C, pass the rounded value.
 */
export const UTCI_CATEGORIES: readonly UtciCategory[] = [
  { id: 'extreme-heat', label: 'extreme heat stress', lowerC: 46, upperC: Infinity },
  { id: 'very-strong-heat', label: 'very strong heat stress', lowerC: 38, upperC: 46 },
  { id: 'strong-heat', label: 'strong heat stress', lowerC: 32, upperC: 38 },
  { id: 'moderate-heat', label: 'moderate heat stress', lowerC: 26, upperC: 32 },
  { id: 'no-stress', label: 'no thermal stress', lowerC: 9, upperC: 26 },
  { id: 'slight-cold', label: 'slight cold stress', lowerC: 0, upperC: 9 },
  { id: 'moderate-cold', label: 'moderate cold stress', lowerC: -13, upperC: 0 },
  { id: 'strong-cold', label: 'strong cold stress', lowerC: -27, upperC: -13 },
  { id: 'very-strong-cold', label: 'very strong cold stress', lowerC: -40, upperC: -27 },
  { id: 'extreme-cold', label: 'extreme cold stress', lowerC: -Infinity, upperC: -40 },
] as const;

/**
 * The UTCI assessment-scale category of a UTCI value, by the (lower, upper] rule of
 * `UTCI_CATEGORIES`.
 *
 * @param utciC UTCI [°C].
 * @returns The category id (look up the label in `UTCI_CATEGORIES`).
 * @throws InputError when utciC is not a finite number.
 * @see [1] Bröde et al. 2012; [2] Błażejczyk et al. 2013.
 * @example utciStressCategory(26) // → 'no-stress'; utciStressCategory(26.01) // → 'moderate-heat'
 */
export function utciStressCategory(utciC: number): UtciCategoryId {
  if (!Number.isFinite(utciC)) {
    throw new InputError({ problem: 'not a finite number', place: 'utciC', value: utciC, expected: 'a UTCI value in °C' });
  }
  // Hottest first: the first band whose lower bound is below the value.
  for (let i = 0; i < UTCI_CATEGORIES.length; i++) {
    const c = UTCI_CATEGORIES[i] as UtciCategory;
    if (utciC > c.lowerC) return c.id;
  }
  return 'extreme-cold';
}
