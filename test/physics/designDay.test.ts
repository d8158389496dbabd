import { describe, it, expect } from 'vitest';
import { designDayAirTempC, dailyRangeFraction, ASHRAE_DAILY_RANGE_FRACTIONS } from '../../src/physics/designDay.ts';

describe('design-day air temperature profile', () => {
  // source: ASHRAE Handbook — Fundamentals (SI) 2009, ch. 14, Table 6 (fractions from memory):
  // the maximum falls at 14–15 h (f = 0), the minimum at 5 h (f = 1).
  it('peaks at 14–15 h and bottoms out at 5 h', () => {
    expect(designDayAirTempC(15, 18, 30)).toBeCloseTo(30, 10);
    expect(designDayAirTempC(14, 18, 30)).toBeCloseTo(30, 10);
    expect(designDayAirTempC(5, 18, 30)).toBeCloseTo(18, 10);
    const temps = Array.from({ length: 24 }, (_, h) => designDayAirTempC(h, 18, 30));
    expect(Math.max(...temps)).toBeCloseTo(30, 10);
    expect(Math.min(...temps)).toBeCloseTo(18, 10);
  });
  it('has 24 fractions in [0, 1] and interpolates between hours', () => {
    expect(ASHRAE_DAILY_RANGE_FRACTIONS).toHaveLength(24);
    for (const f of ASHRAE_DAILY_RANGE_FRACTIONS) expect(f >= 0 && f <= 1).toBe(true);
    // from memory of the table: hour 12 → 0.13, hour 13 → 0.05; midway 0.09 (linear, common practice)
    expect(dailyRangeFraction(12.5)).toBeCloseTo(0.09, 10);
    // hour 0 is the table's hour 24 (0.82)
    expect(dailyRangeFraction(0)).toBeCloseTo(0.82, 10);
    expect(dailyRangeFraction(24)).toBeCloseTo(0.82, 10);
  });
});
