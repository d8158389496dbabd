import { describe, expect, it } from 'vitest';
import {
  ASTM_G173_AM15G_BAND_FRACTIONS,
  SOLAR_NIR_BAND_FRACTION,
  SOLAR_VISIBLE_BAND_FRACTION,
  bandWeightedReflectance,
} from '../../src/physics/solarSpectrum.ts';

describe('two-band solar split (ASTM G173-03 AM1.5 global)', () => {
  it('band fractions match the tabulated integrals', () => {
    // source: ASTM G173-03 via REFERENCE-VALUES §10.2 (UV 4.61 %, VIS 42.97 %, NIR 52.42 %); tol 0.2 pp as given there
    expect(ASTM_G173_AM15G_BAND_FRACTIONS.ultraviolet).toBeCloseTo(0.0461, 3);
    expect(ASTM_G173_AM15G_BAND_FRACTIONS.visible400to700).toBeCloseTo(0.4297, 3);
    expect(SOLAR_NIR_BAND_FRACTION).toBeCloseTo(0.5242, 3);
    expect(Math.abs(SOLAR_VISIBLE_BAND_FRACTION - (0.0461 + 0.4297))).toBeLessThan(0.002);
  });

  it('the two band weights sum to 1 so equal band values are preserved', () => {
    // source: ASTM G173-03 via REFERENCE-VALUES §10.2: 4.61 + 42.97 + 52.42 = 100.00 %; tol 1e-4
    expect(Math.abs(SOLAR_VISIBLE_BAND_FRACTION + SOLAR_NIR_BAND_FRACTION - 1)).toBeLessThan(1e-4);
    for (const r of [0, 0.12, 0.5, 1]) expect(bandWeightedReflectance(r, r)).toBeCloseTo(r, 4);
  });

  it('weights NIR more than visible (TSDoc example: grass)', () => {
    // source: derived from the REFERENCE-VALUES §10.2 fractions: 0.4758·0.07 + 0.5242·0.45 = 0.26920; tol 1e-4
    expect(bandWeightedReflectance(0.07, 0.45)).toBeCloseTo(0.2692, 4);
    expect(bandWeightedReflectance(0, 1)).toBeGreaterThan(bandWeightedReflectance(1, 0));
  });
});
