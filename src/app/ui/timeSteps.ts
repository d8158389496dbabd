/** Splitting a period's steps into days and steps within a day, for the day + time-of-day sliders. Pure. */

/** Steps per day from the time stamps' spacing (24 for hourly; 1 when there is one step). */
export function stepsPerDayOf(times: readonly string[]): number {
  if (times.length < 2) return Math.max(1, times.length);
  const h = (Date.parse(times[1]!) - Date.parse(times[0]!)) / 3_600_000;
  if (!(h > 0) || !Number.isFinite(h)) return times.length;
  return Math.max(1, Math.round(24 / h));
}

export interface DaySplit {
  /** Steps per day. */
  perDay: number;
  /** Number of (possibly partial) days. */
  days: number;
}

/** How a period of `count` steps divides into days (one "day" holding everything for a period of up to 2 days). */
export function daySplit(times: readonly string[]): DaySplit {
  const perDay = stepsPerDayOf(times);
  const n = times.length;
  if (n <= perDay * 2) return { perDay: Math.max(1, n), days: 1 };
  return { perDay, days: Math.ceil(n / perDay) };
}

/** The step index of day `day` and step-of-day `k`, clamped to the period. */
export function stepIndexOf(split: DaySplit, day: number, k: number, count: number): number {
  return Math.max(0, Math.min(count - 1, day * split.perDay + k));
}
