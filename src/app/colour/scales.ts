/**
 * Colour scales for result layers: value → sRGB through a perceptually uniform map (tables.ts),
 * and a categorical palette for material assignments. Pure functions, no three.js.
 */
import { CIVIDIS_RGB, MAGMA_RGB, VIRIDIS_RGB } from './tables.ts';

export type ScaleId = 'viridis' | 'magma' | 'cividis';

export const SCALE_IDS: readonly ScaleId[] = ['viridis', 'magma', 'cividis'];

const TABLES: Record<ScaleId, readonly number[]> = { viridis: VIRIDIS_RGB, magma: MAGMA_RGB, cividis: CIVIDIS_RGB };

/**
 * The colour at fraction `t` of a scale (0 = low end, 1 = high end), linear between the 256
 * table entries; `t` outside [0, 1] is clamped, NaN gives the low end.
 * @param target receives r, g, b in [0, 1] (sRGB) at `offset`
 */
export function sampleScale(scale: ScaleId, t: number, target: Float32Array | number[], offset = 0): void {
  const table = TABLES[scale];
  const n = table.length / 3;
  const tt = Number.isFinite(t) ? Math.min(1, Math.max(0, t)) : 0;
  const x = tt * (n - 1);
  const i = Math.min(n - 2, Math.floor(x));
  const f = x - i;
  for (let k = 0; k < 3; k++) {
    const a = table[i * 3 + k]!;
    const b = table[(i + 1) * 3 + k]!;
    target[offset + k] = a + (b - a) * f;
  }
}

/** The fraction of a value within [min, max] (clamped; a zero-width range gives 0.5). */
export function valueFraction(value: number, min: number, max: number): number {
  if (!(max > min)) return 0.5;
  return Math.min(1, Math.max(0, (value - min) / (max - min)));
}

/** CSS colour string of a scale at fraction t, e.g. "rgb(68 1 84)". */
export function scaleCss(scale: ScaleId, t: number): string {
  const c = [0, 0, 0];
  sampleScale(scale, t, c);
  return `rgb(${Math.round(c[0]! * 255)} ${Math.round(c[1]! * 255)} ${Math.round(c[2]! * 255)})`;
}

/** A CSS linear-gradient (left = low) of a scale, for the legend bar. */
export function scaleGradientCss(scale: ScaleId, stops = 16): string {
  const parts: string[] = [];
  for (let i = 0; i <= stops; i++) parts.push(`${scaleCss(scale, i / stops)} ${((i / stops) * 100).toFixed(1)}%`);
  return `linear-gradient(to right, ${parts.join(', ')})`;
}

/**
 * Categorical colours for material assignments: the eight-colour palette of Okabe & Ito, "Color
 * Universal Design" (2008), distinguishable under the common colour-vision deficiencies; repeats
 * with a lighter tint after eight.
 */
const CATEGORY_RGB: readonly [number, number, number][] = [
  [0.9, 0.624, 0],
  [0.337, 0.706, 0.914],
  [0, 0.62, 0.451],
  [0.941, 0.894, 0.259],
  [0, 0.447, 0.698],
  [0.835, 0.369, 0],
  [0.8, 0.475, 0.655],
  [0.6, 0.6, 0.6],
];

/** Colour number `i` of the categorical palette, r, g, b in [0, 1]. */
export function categoryColour(i: number): [number, number, number] {
  const n = CATEGORY_RGB.length;
  const k = ((i % n) + n) % n;
  const base = CATEGORY_RGB[k]!;
  const round = Math.floor(Math.abs(i) / n);
  if (round === 0) return [base[0], base[1], base[2]];
  const mix = Math.min(0.6, 0.3 * round);
  return [base[0] + (1 - base[0]) * mix, base[1] + (1 - base[1]) * mix, base[2] + (1 - base[2]) * mix];
}

export function rgbCss(c: readonly [number, number, number]): string {
  return `rgb(${Math.round(c[0] * 255)} ${Math.round(c[1] * 255)} ${Math.round(c[2] * 255)})`;
}
