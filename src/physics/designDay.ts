/**
 * Hourly air temperature of a design day from its minimum and maximum.
 *
 * The daily range is distributed by the ASHRAE "fraction of daily temperature range" profile:
 * t(h) = t_max − f(h)·(t_max − t_min), with f = 0 at 14–15 h (the afternoon maximum) and f = 1 at
 * 5 h (the dawn minimum).
 *
 * References:
 * [1] ASHRAE Handbook — Fundamentals (SI), ch. 14 "Climatic design information", Table 6
 *     "Fraction of daily temperature range", 2009 (also 2013, 2017). The 24 fractions below are
 *     from memory of that table (not checked against the printed handbook in this project).
 */

/** f(h) for hour h = 1..24 of local standard time (index 0 is hour 1). From memory of [1]. */
export const ASHRAE_DAILY_RANGE_FRACTIONS = [
  0.88, 0.92, 0.95, 0.98, 1.0, 0.98, 0.91, 0.74, 0.55, 0.38, 0.23, 0.13,
  0.05, 0.0, 0.0, 0.06, 0.14, 0.24, 0.39, 0.5, 0.59, 0.68, 0.75, 0.82,
] as const;

/**
 * Air temperature [°C] at a fractional local-standard hour of a design day.
 * @param hourOfDay Local standard time [h], 0 ≤ h < 24 (fractions interpolate linearly; the table's hour 24 is midnight).
 * @param minTempC Daily minimum [°C].
 * @param maxTempC Daily maximum [°C].
 * @example designDayAirTempC(15, 18, 30) // → 30 (f = 0 at 15 h)
 */
export function designDayAirTempC(hourOfDay: number, minTempC: number, maxTempC: number): number {
  const f = dailyRangeFraction(hourOfDay);
  return maxTempC - f * (maxTempC - minTempC);
}

/** The fraction of daily range at a fractional hour, interpolated between tabulated hours (hour 0 ≡ hour 24). */
export function dailyRangeFraction(hourOfDay: number): number {
  const h = ((hourOfDay % 24) + 24) % 24;
  const lo = Math.floor(h);
  const w = h - lo;
  const at = (hr: number) => ASHRAE_DAILY_RANGE_FRACTIONS[(((hr - 1) % 24) + 24) % 24]!;
  return (1 - w) * at(lo === 0 ? 24 : lo) + w * at(lo + 1);
}
