import { describe, it, expect } from 'vitest';
import { sampleScale, valueFraction, categoryColour, scaleCss, SCALE_IDS } from '../../src/app/colour/scales.ts';
import { CIVIDIS_RGB, MAGMA_RGB, VIRIDIS_RGB } from '../../src/app/colour/tables.ts';

const hex = (h: string) => [1, 3, 5].map((i) => parseInt(h.slice(i, i + 2), 16) / 255);
const sample = (s: (typeof SCALE_IDS)[number], t: number) => {
  const c = [0, 0, 0];
  sampleScale(s, t, c);
  return c;
};

describe('colour scales', () => {
  it('has 256 entries per table, all in [0, 1]', () => {
    for (const t of [VIRIDIS_RGB, MAGMA_RGB, CIVIDIS_RGB]) {
      expect(t.length).toBe(768);
      expect(t.every((v) => v >= 0 && v <= 1)).toBe(true);
    }
  });

  it('matches the published end and middle colours', () => {
    // from memory: matplotlib's documented hex values viridis #440154 / #21918c / #fde725,
    // magma #000004 / #fcfdbf, cividis #00224e / #fee838; tolerance 1.5/255 (8-bit rounding).
    const cases: [(typeof SCALE_IDS)[number], number, string][] = [
      ['viridis', 0, '#440154'],
      ['viridis', 128 / 255, '#21918c'],
      ['viridis', 1, '#fde725'],
      ['magma', 0, '#000004'],
      ['magma', 1, '#fcfdbf'],
      ['cividis', 0, '#00224e'],
      ['cividis', 1, '#fee838'],
    ];
    for (const [s, t, h] of cases) {
      const got = sample(s, t);
      const want = hex(h);
      for (let k = 0; k < 3; k++) expect(Math.abs(got[k]! - want[k]!)).toBeLessThan(1.5 / 255);
    }
  });

  it('gets lighter monotonically along each scale (perceptually ordered)', () => {
    // common practice: these scales are designed with monotonically increasing lightness.
    for (const s of SCALE_IDS) {
      let prev = -1;
      for (let i = 0; i <= 32; i++) {
        const [r, g, b] = sample(s, i / 32);
        const luma = 0.2126 * r! + 0.7152 * g! + 0.0722 * b!;
        expect(luma).toBeGreaterThan(prev - 1e-3);
        prev = luma;
      }
    }
  });

  it('interpolates between table entries and clamps outside [0, 1]', () => {
    const mid = sample('viridis', 0.5 / 255);
    for (let k = 0; k < 3; k++) expect(mid[k]).toBeCloseTo((VIRIDIS_RGB[k]! + VIRIDIS_RGB[3 + k]!) / 2, 6);
    expect(sample('magma', -3)).toEqual(sample('magma', 0));
    expect(sample('magma', 7)).toEqual(sample('magma', 1));
    expect(sample('magma', NaN)).toEqual(sample('magma', 0));
    expect(scaleCss('viridis', 0)).toBe('rgb(68 1 84)');
  });

  it('maps values to fractions of a range', () => {
    expect(valueFraction(25, 20, 30)).toBe(0.5);
    expect(valueFraction(10, 20, 30)).toBe(0);
    expect(valueFraction(99, 20, 30)).toBe(1);
    expect(valueFraction(5, 3, 3)).toBe(0.5);
  });

  it('gives distinct categorical colours for the first eight presets and lighter repeats after', () => {
    const first = Array.from({ length: 8 }, (_, i) => categoryColour(i).join(','));
    expect(new Set(first).size).toBe(8);
    const c0 = categoryColour(0), c8 = categoryColour(8);
    expect(c8[0] + c8[1] + c8[2]).toBeGreaterThan(c0[0] + c0[1] + c0[2]);
  });
});
