/**
 * Legend helpers: value ranges (automatic from the data, or fixed by the user) and "nice" tick
 * values (1, 2, 2.5, 5 × 10ⁿ steps) in the displayed unit.
 */

export interface ValueRange {
  min: number;
  max: number;
}

/**
 * Finite min and max of the values (all steps, or one column), or null if none is finite.
 * A flat range is widened by ±0.5 so a legend can still be drawn.
 */
export function autoRange(values: Iterable<number>): ValueRange | null {
  let min = Infinity;
  let max = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (min > max) return null;
  if (min === max) return { min: min - 0.5, max: max + 0.5 };
  return { min, max };
}

/** The step from {1, 2, 2.5, 5} × 10ⁿ that gives about `target` intervals over [min, max]. */
export function niceStep(span: number, target = 5): number {
  if (!(span > 0) || !Number.isFinite(span)) return 1;
  const raw = span / Math.max(1, target);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const norm = raw / mag;
  const pick = norm <= 1 ? 1 : norm <= 2 ? 2 : norm <= 2.5 ? 2.5 : norm <= 5 ? 5 : 10;
  return pick * mag;
}

/** Tick values: multiples of a nice step inside [min, max] (inclusive within rounding). */
export function niceTicks(min: number, max: number, target = 5): number[] {
  if (!Number.isFinite(min) || !Number.isFinite(max) || max <= min) return [];
  const step = niceStep(max - min, target);
  const eps = step * 1e-9;
  const first = Math.ceil((min - eps) / step) * step;
  const ticks: number[] = [];
  for (let v = first; v <= max + eps; v += step) {
    // Strip floating noise (0.30000000000000004 → 0.3).
    ticks.push(Number(v.toPrecision(12)));
    if (ticks.length > 50) break;
  }
  return ticks;
}

/** Decimals needed to print ticks of this step without losing digits (0.25 → 2). */
export function tickDecimals(step: number): number {
  if (!(step > 0)) return 0;
  for (let d = 0; d < 6; d++) {
    if (Math.abs(Math.round(step * 10 ** d) - step * 10 ** d) < 1e-6) return d;
  }
  return 6;
}
