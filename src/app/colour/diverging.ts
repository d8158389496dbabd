/**
 * The diverging scale for differences (option − reference): Moreland's cool-warm map
 * (coolWarmTable.ts), centred on zero — blue = cooler, neutral grey = no change, red = hotter.
 * The range is always symmetric, ±halfRange, so the middle colour means exactly zero.
 */
import { COOL_WARM_RGB } from './coolWarmTable.ts';
import { MISSING_RGB } from './layers.ts';
import { niceStep } from './legend.ts';

/** The colour at fraction t of the cool-warm map (0 = coolest end, 0.5 = zero, 1 = hottest); clamped, NaN → middle. */
export function sampleCoolWarm(t: number, target: Float32Array | number[], offset = 0): void {
  const n = COOL_WARM_RGB.length / 3;
  const tt = Number.isFinite(t) ? Math.min(1, Math.max(0, t)) : 0.5;
  const x = tt * (n - 1);
  const i = Math.min(n - 2, Math.floor(x));
  const f = x - i;
  for (let k = 0; k < 3; k++) {
    const a = COOL_WARM_RGB[i * 3 + k]!, b = COOL_WARM_RGB[(i + 1) * 3 + k]!;
    target[offset + k] = a + (b - a) * f;
  }
}

/**
 * Half-width of a symmetric range covering every finite value, rounded up to a nice step
 * (so the legend reads ±2 K rather than ±1.87 K); at least `minHalf` so "no change" stays grey.
 */
export function symmetricHalfRange(values: ArrayLike<number>, minHalf = 0.5): number {
  let m = 0;
  for (let i = 0; i < values.length; i++) {
    const v = Math.abs(values[i]!);
    if (Number.isFinite(v) && v > m) m = v;
  }
  if (m <= minHalf) return minHalf;
  const step = niceStep(m, 4);
  return Math.ceil(m / step - 1e-9) * step;
}

/** r, g, b per value (3 per value) on the cool-warm map over [−halfRange, +halfRange]; NaN → the missing grey. */
export function colourDifferences(values: ArrayLike<number>, halfRange: number, target?: Float32Array): Float32Array {
  const out = target ?? new Float32Array(values.length * 3);
  const h = halfRange > 0 ? halfRange : 1;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (Number.isFinite(v)) sampleCoolWarm(0.5 + v / (2 * h), out, i * 3);
    else {
      out[i * 3] = MISSING_RGB[0];
      out[i * 3 + 1] = MISSING_RGB[1];
      out[i * 3 + 2] = MISSING_RGB[2];
    }
  }
  return out;
}

/** CSS gradient (left = coolest) of the cool-warm map, for the legend bar. */
export function coolWarmGradientCss(stops = 16): string {
  const c = [0, 0, 0];
  const parts: string[] = [];
  for (let i = 0; i <= stops; i++) {
    sampleCoolWarm(i / stops, c);
    parts.push(`rgb(${Math.round(c[0]! * 255)} ${Math.round(c[1]! * 255)} ${Math.round(c[2]! * 255)}) ${((i / stops) * 100).toFixed(1)}%`);
  }
  return `linear-gradient(to right, ${parts.join(', ')})`;
}
