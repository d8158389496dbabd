/**
 * Seasonal solar transmittance of tree crowns, and the Beer–Lambert extinction coefficient a
 * tracer uses to attenuate a ray by its path length through a crown.
 *
 * Model: a crown is a homogeneous turbid volume. A ray crossing it along a chord of length L [m]
 * keeps the fraction τ = exp(−k·L) of its beam (Beer–Lambert). With a spherical leaf-angle
 * distribution the projection function G = 0.5 does not depend on the ray direction [1], so one
 * extinction coefficient k [1/m] per crown and date serves every direction; the crown's shape
 * supplies the direction dependence through L.
 *
 * Convention (the one the presets' numbers are tied to): a crown's stated transmittance τ is the
 * beam fraction passed along the VERTICAL chord through the crown's centre, whose length is the
 * crown height H. Hence k = −ln(τ) / H. A ray through the crown's full height passes τ exactly; a
 * shorter chord passes more, a longer (low-sun, through a wide crown) passes less.
 *
 * Season: the crown is in leaf from the leaf-on date to the leaf-off date (month-day, any year;
 * the interval may wrap over the new year for southern sites). With a transition of T days the leaf
 * area ramps linearly over the T days centred on each date; transmittance is interpolated in
 * ln τ (i.e. linear in leaf area, Beer–Lambert): ln τ = (1 − f)·ln τ_winter + f·ln τ_summer, f the
 * leaf fraction in [0, 1]. T = 0 switches on the date.
 *
 * Longwave: crowns are taken to emit at air temperature (common practice); this module gives the
 * shortwave transmittance only.
 *
 * References:
 * [1] G. S. Campbell and J. M. Norman, An Introduction to Environmental Biophysics, 2nd ed.
 *     New York: Springer, 1998, ch. 15 (Beer's law for canopies, K_b = 0.5/cos z for a spherical
 *     leaf-angle distribution) — from memory (REFERENCE-VALUES §12).
 * [2] G. M. Heisler, "Measurements of solar radiation on vertical surfaces in the shade of
 *     individual trees," in The Forest–Atmosphere Interaction, Springer, 1985/86 — abstract
 *     (REFERENCE-VALUES §12): τ ≈ 0.25–0.35 in leaf, 0.66–0.70 leafless.
 * [3] S. Wilkinson, PhD thesis, University of Sheffield, 1992, via P. Tregenza and S. Sharples,
 *     daylight algorithms, algorithm 1.44 — fraction of sky seen through mature crowns,
 *     summer/winter (oak 0.17/0.50, lime 0.11/0.54, Scots pine 0.27/0.30).
 * [4] J. Konarska, F. Lindberg, A. Larsson, S. Thorsson, B. Holmer, "Transmissivity of solar
 *     radiation through crowns of single urban trees — application for outdoor thermal comfort
 *     modelling," Int. J. Biometeorol., vol. 58, pp. 783–795, 2014 (as quoted by Zielonko-Jung &
 *     Janiak 2019, Sustainability 11:7019) — 8.8–27.5 % in full foliage.
 */
import { InputError } from './errors.ts';

/** A crown's seasonal transmittance description. Days of year are 1..365 on a non-leap calendar. */
export interface CrownSeason {
  /** Beam transmittance in full leaf along the vertical chord through the centre [-]. */
  summerTransmittance: number;
  /** Beam transmittance when leafless (branches only) [-]. */
  winterTransmittance: number;
  /** Day of year (1..365, non-leap) by which the crown is in leaf (centre of the leaf-out ramp). */
  leafOnDayOfYear: number;
  /** Day of year (1..365, non-leap) at which leaf fall is half done (centre of the leaf-fall ramp). */
  leafOffDayOfYear: number;
  /** Length of each ramp [days]; 0 switches on the date. */
  transitionDays: number;
}

/** Preset crown kinds. */
export type CrownPresetId = 'deciduous-dense' | 'deciduous-open' | 'evergreen';

export interface CrownPreset {
  readonly summerTransmittance: number;
  readonly winterTransmittance: number;
  /** "MM-DD", northern-hemisphere temperate default. */
  readonly leafOnDate: string;
  readonly leafOffDate: string;
  readonly transitionDays: number;
  readonly source: string;
}

/**
 * Crown presets, northern temperate dates. Transmittances from REFERENCE-VALUES §12; the dates
 * and transition length are from memory (temperate Europe: leaf-out late April to mid May, leaf fall
 * late October to November).
 */
export const CROWN_PRESETS: Readonly<Record<CrownPresetId, CrownPreset>> = Object.freeze({
  /** A dense broadleaf crown (lime, oak, horse chestnut, Lombardy poplar). */
  'deciduous-dense': Object.freeze({
    summerTransmittance: 0.12,
    winterTransmittance: 0.5,
    leafOnDate: '05-01',
    leafOffDate: '11-01',
    transitionDays: 0,
    source:
      'summer 0.12: inside Konarska et al. 2014 (8.8–27.5 % in full foliage), near Wilkinson 1992 lime 0.11 / poplar 0.13; ' +
      'winter 0.50: Wilkinson 1992 via Tregenza & Sharples (oak 0.50, poplar 0.50; sky fraction, used as beam τ); dates from memory',
  }),
  /** An open broadleaf crown (birch, honey locust, young street trees). */
  'deciduous-open': Object.freeze({
    summerTransmittance: 0.3,
    winterTransmittance: 0.68,
    leafOnDate: '05-01',
    leafOffDate: '11-01',
    transitionDays: 0,
    source: 'Heisler 1986: in leaf 0.25–0.35 (mid 0.30), leafless 0.66–0.70 (mid 0.68); dates from memory',
  }),
  /** An evergreen conifer crown (Scots pine). */
  evergreen: Object.freeze({
    summerTransmittance: 0.27,
    winterTransmittance: 0.3,
    leafOnDate: '05-01',
    leafOffDate: '11-01',
    transitionDays: 0,
    source: 'Wilkinson 1992 via Tregenza & Sharples: Scots pine 0.27 summer / 0.30 winter (sky fraction, used as beam τ)',
  }),
});

export function crownPresetIds(): CrownPresetId[] {
  return Object.keys(CROWN_PRESETS) as CrownPresetId[];
}

/** Cumulative days before each month, non-leap year. */
const DAYS_BEFORE_MONTH = [0, 31, 59, 90, 120, 151, 181, 212, 243, 273, 304, 334] as const;
const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31] as const;
const YEAR_DAYS = 365;

/**
 * Day of year on a non-leap calendar.
 * @param month 1..12
 * @param day 1..31 (29 February maps to 28 February)
 * @returns 1..365
 * @example dayOfYearFromMonthDay(3, 1) // 60
 */
export function dayOfYearFromMonthDay(month: number, day: number): number {
  if (!Number.isInteger(month) || month < 1 || month > 12) {
    throw new InputError({ problem: 'bad month', place: 'month', expected: 'an integer in [1, 12]', value: month });
  }
  const dim = month === 2 ? 29 : DAYS_IN_MONTH[month - 1]!;
  if (!Number.isInteger(day) || day < 1 || day > dim) {
    throw new InputError({ problem: 'bad day of month', place: 'day', expected: `an integer in [1, ${dim}]`, value: day });
  }
  return DAYS_BEFORE_MONTH[month - 1]! + Math.min(day, DAYS_IN_MONTH[month - 1]!);
}

/**
 * Parses "MM-DD" to a day of year (non-leap), or returns undefined when the text is not a date.
 * @example parseMonthDay('05-01') // 121
 */
export function parseMonthDay(text: string): number | undefined {
  const m = /^(\d{2})-(\d{2})$/.exec(text);
  if (!m) return undefined;
  const month = Number(m[1]), day = Number(m[2]);
  if (month < 1 || month > 12) return undefined;
  const dim = month === 2 ? 29 : DAYS_IN_MONTH[month - 1]!;
  if (day < 1 || day > dim) return undefined;
  return DAYS_BEFORE_MONTH[month - 1]! + Math.min(day, DAYS_IN_MONTH[month - 1]!);
}

/**
 * Local calendar day of year (non-leap numbering: in a leap year 29 Feb counts as 28 Feb and later
 * days shift down by one, so month-day dates compare alike every year).
 * @param timeMs instant [ms since epoch, UTC]
 * @param offsetMinutes local offset from UTC [min] (e.g. +120 for +02:00)
 * @returns 1..365
 * @example dayOfYearLocal(Date.UTC(2026, 6, 21, 12), 120) // 202
 */
export function dayOfYearLocal(timeMs: number, offsetMinutes: number): number {
  const d = new Date(timeMs + offsetMinutes * 60000);
  return dayOfYearFromMonthDay(d.getUTCMonth() + 1, d.getUTCDate());
}

/**
 * Leaf fraction f in [0, 1] on a day of year: 1 in full leaf, 0 leafless (see file comment).
 * @param season the crown's season
 * @param dayOfYear 1..365 (fractions allowed)
 * @example leafFraction({ summerTransmittance: 0.3, winterTransmittance: 0.7, leafOnDayOfYear: 121, leafOffDayOfYear: 305, transitionDays: 20 }, 121) // 0.5
 */
export function leafFraction(season: CrownSeason, dayOfYear: number): number {
  const on = season.leafOnDayOfYear, off = season.leafOffDayOfYear, ramp = season.transitionDays;
  const inLeafDays = mod(off - on, YEAR_DAYS);
  const x = mod(dayOfYear - (on - ramp / 2), YEAR_DAYS);
  if (ramp > 0 && x < ramp) return x / ramp;
  if (x < inLeafDays) return 1;
  if (ramp > 0 && x < inLeafDays + ramp) return 1 - (x - inLeafDays) / ramp;
  return 0;
}

function mod(a: number, n: number): number {
  const r = a % n;
  return r < 0 ? r + n : r;
}

/**
 * Beam transmittance of a crown on a day (vertical chord through the centre).
 *
 * ln τ = (1 − f)·ln τ_winter + f·ln τ_summer, f = leafFraction(season, day).
 * @param season the crown's season
 * @param dayOfYear 1..365
 * @returns τ [-]
 * @example seasonalCrownTransmittance({ summerTransmittance: 0.3, winterTransmittance: 0.68, leafOnDayOfYear: 121, leafOffDayOfYear: 305, transitionDays: 0 }, 20) // 0.68
 */
export function seasonalCrownTransmittance(season: CrownSeason, dayOfYear: number): number {
  const f = leafFraction(season, dayOfYear);
  if (f >= 1) return season.summerTransmittance;
  if (f <= 0) return season.winterTransmittance;
  return Math.exp((1 - f) * Math.log(season.winterTransmittance) + f * Math.log(season.summerTransmittance));
}

/**
 * Beer–Lambert extinction coefficient that makes a chord of `verticalPathM` pass `transmittance`.
 *
 * k = −ln(τ) / H
 * @param transmittance τ along the vertical chord through the centre, in (0, 1] [-]
 * @param verticalPathM that chord's length, the crown height H [m]
 * @returns k [1/m]
 * @example crownExtinctionPerM(Math.exp(-1), 2) // 0.5
 */
export function crownExtinctionPerM(transmittance: number, verticalPathM: number): number {
  if (!(transmittance > 0 && transmittance <= 1)) {
    throw new InputError({ problem: 'transmittance outside (0, 1]', place: 'crownExtinctionPerM transmittance', expected: 'a number in (0, 1]', value: transmittance });
  }
  if (!(verticalPathM > 0) || !Number.isFinite(verticalPathM)) {
    throw new InputError({ problem: 'path not positive', place: 'crownExtinctionPerM verticalPathM', expected: 'a length > 0 [m]', value: verticalPathM });
  }
  return -Math.log(transmittance) / verticalPathM;
}

/**
 * The season moved by half a year (for a southern-hemisphere site given northern preset dates).
 * @example shiftSeasonHalfYear({ ...s, leafOnDayOfYear: 121, leafOffDayOfYear: 305 }) // leaf on 303, leaf off 122
 */
export function shiftSeasonHalfYear(season: CrownSeason): CrownSeason {
  const shift = (d: number) => ((d + 182 - 1) % YEAR_DAYS) + 1;
  return { ...season, leafOnDayOfYear: shift(season.leafOnDayOfYear), leafOffDayOfYear: shift(season.leafOffDayOfYear) };
}
