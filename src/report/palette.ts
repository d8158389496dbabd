/**
 * Colours of the report: the sensor and surface scales come from the perceptually uniform tables
 * in src/app/colour (viridis, magma, cividis; matplotlib's CC0 tables). The ten UTCI stress
 * categories get our own banding: the heat bands are steps along magma (lighter = milder), the
 * cold bands steps along viridis' blue end, and "no thermal stress" a pale neutral.
 */
import { sampleScale, scaleCss, type ScaleId } from '../app/colour/scales.ts';
import type { UtciCategoryId } from '../physics/utci.ts';

export { scaleCss, sampleScale };
export type { ScaleId };

const hex = (scale: ScaleId, t: number): string => {
  const c = [0, 0, 0];
  sampleScale(scale, t, c);
  return '#' + c.map((v) => Math.round(v * 255).toString(16).padStart(2, '0')).join('');
};

/** Band colour per UTCI category (CSS hex). */
export const CATEGORY_COLOURS: Record<UtciCategoryId, string> = {
  'extreme-heat': hex('magma', 0.3),
  'very-strong-heat': hex('magma', 0.5),
  'strong-heat': hex('magma', 0.68),
  'moderate-heat': hex('magma', 0.86),
  'no-stress': '#ece9e1',
  'slight-cold': hex('viridis', 0.62),
  'moderate-cold': hex('viridis', 0.48),
  'strong-cold': hex('viridis', 0.36),
  'very-strong-cold': hex('viridis', 0.24),
  'extreme-cold': hex('viridis', 0.1),
};

/** sRGB component [0, 1] → linear light (IEC 61966-2-1), for glTF COLOR_0, which is linear. */
export function srgbToLinear(c: number): number {
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}
