import { describe, it, expect } from 'vitest';
import {
  CROWN_PRESETS, crownExtinctionPerM, dayOfYearFromMonthDay, dayOfYearLocal, leafFraction, parseMonthDay,
  seasonalCrownTransmittance, shiftSeasonHalfYear, type CrownSeason,
} from '../../src/physics/vegetation.ts';

const season: CrownSeason = { summerTransmittance: 0.3, winterTransmittance: 0.68, leafOnDayOfYear: 121, leafOffDayOfYear: 305, transitionDays: 0 };

describe('calendar helpers', () => {
  it('day of year (non-leap)', () => {
    // source: common practice (Gregorian calendar: Jan 31 + Feb 28 days before 1 March)
    expect(dayOfYearFromMonthDay(3, 1)).toBe(60);
    expect(dayOfYearFromMonthDay(12, 31)).toBe(365);
    expect(dayOfYearFromMonthDay(2, 29)).toBe(59);
    expect(parseMonthDay('05-01')).toBe(121);
    expect(parseMonthDay('5-1')).toBeUndefined();
    expect(parseMonthDay('02-30')).toBeUndefined();
    expect(() => dayOfYearFromMonthDay(13, 1)).toThrow(/month/);
  });
  it('local day of year from an instant and an offset', () => {
    expect(dayOfYearLocal(Date.UTC(2026, 6, 21, 12), 120)).toBe(202);
    expect(dayOfYearLocal(Date.UTC(2026, 6, 21, 23), 120)).toBe(203); // already 22 July locally
    expect(dayOfYearLocal(Date.UTC(2028, 2, 1, 12), 0)).toBe(60); // leap year: 1 March is still 60
  });
});

describe('seasonal crown transmittance', () => {
  it('switches on the dates without a transition', () => {
    expect(seasonalCrownTransmittance(season, 120)).toBe(0.68);
    expect(seasonalCrownTransmittance(season, 121)).toBe(0.3);
    expect(seasonalCrownTransmittance(season, 304)).toBe(0.3);
    expect(seasonalCrownTransmittance(season, 305)).toBe(0.68);
  });
  it('ramps linearly in leaf area (log τ) over the transition', () => {
    const s = { ...season, transitionDays: 20 };
    expect(leafFraction(s, 121)).toBeCloseTo(0.5, 12);
    expect(leafFraction(s, 111)).toBeCloseTo(0, 12);
    expect(leafFraction(s, 131)).toBeCloseTo(1, 12);
    expect(leafFraction(s, 310)).toBeCloseTo(0.25, 12);
    // source: Beer–Lambert with leaf area linear in time → τ at the midpoint = √(τ_s τ_w)
    expect(seasonalCrownTransmittance(s, 121)).toBeCloseTo(Math.sqrt(0.3 * 0.68), 12);
  });
  it('wraps over the new year (southern-hemisphere dates)', () => {
    const south = shiftSeasonHalfYear(season);
    expect(south.leafOnDayOfYear).toBe(303);
    expect(south.leafOffDayOfYear).toBe(122);
    expect(seasonalCrownTransmittance(south, 15)).toBe(0.3);
    expect(seasonalCrownTransmittance(south, 200)).toBe(0.68);
  });
  it('extinction: k = −ln τ / H', () => {
    expect(crownExtinctionPerM(Math.exp(-1), 2)).toBeCloseTo(0.5, 14);
    expect(Math.exp(-crownExtinctionPerM(0.3, 7) * 7)).toBeCloseTo(0.3, 14);
    expect(() => crownExtinctionPerM(0, 2)).toThrow(/transmittance/);
  });
});

describe('crown presets sit in the published ranges', () => {
  it('open deciduous: Heisler 1986', () => {
    // source: Heisler 1986 (REFERENCE-VALUES §12): in leaf 0.25–0.35, leafless 0.66–0.70
    const p = CROWN_PRESETS['deciduous-open'];
    expect(p.summerTransmittance).toBeGreaterThanOrEqual(0.25);
    expect(p.summerTransmittance).toBeLessThanOrEqual(0.35);
    expect(p.winterTransmittance).toBeGreaterThanOrEqual(0.66);
    expect(p.winterTransmittance).toBeLessThanOrEqual(0.7);
  });
  it('dense deciduous: Konarska et al. 2014 and Wilkinson 1992', () => {
    // source: Konarska et al. 2014 (8.8–27.5 % in full foliage); Wilkinson 1992 winter 0.47–0.54 (REFERENCE-VALUES §12)
    const p = CROWN_PRESETS['deciduous-dense'];
    expect(p.summerTransmittance).toBeGreaterThanOrEqual(0.088);
    expect(p.summerTransmittance).toBeLessThanOrEqual(0.275);
    expect(p.winterTransmittance).toBeGreaterThanOrEqual(0.47);
    expect(p.winterTransmittance).toBeLessThanOrEqual(0.54);
  });
  it('evergreen: Wilkinson 1992, Scots pine 0.27 / 0.30', () => {
    // source: Wilkinson 1992 via Tregenza & Sharples (REFERENCE-VALUES §12); tolerance 0.005
    expect(CROWN_PRESETS.evergreen.summerTransmittance).toBeCloseTo(0.27, 2);
    expect(CROWN_PRESETS.evergreen.winterTransmittance).toBeCloseTo(0.3, 2);
    for (const p of Object.values(CROWN_PRESETS)) expect(p.summerTransmittance).toBeLessThanOrEqual(p.winterTransmittance);
  });
});
