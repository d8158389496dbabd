import { describe, it, expect } from 'vitest';
import { autoRange, niceStep, niceTicks, tickDecimals } from '../../src/app/colour/legend.ts';
import { formatQuantity, fromSI, toSI, unitLabel } from '../../src/app/colour/units.ts';
import { effectiveRange, sensorRangeKey } from '../../src/app/ui/ranges.ts';
import { timeLeftS } from '../../src/app/ui/progress.ts';

describe('legend ticks and ranges', () => {
  it('picks 1-2-2.5-5 steps', () => {
    expect(niceStep(10, 5)).toBe(2);
    expect(niceStep(37, 5)).toBe(10);
    expect(niceStep(1.2, 5)).toBe(0.25);
    expect(niceStep(800, 5)).toBe(200);
  });

  it('puts ticks on multiples of the step inside the range, without float noise', () => {
    expect(niceTicks(14.3, 52.8, 5)).toEqual([20, 30, 40, 50]);
    expect(niceTicks(0, 1, 5)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
    expect(niceTicks(-3, 3, 4)).toEqual([-2, 0, 2]);
    expect(niceTicks(5, 5)).toEqual([]);
    expect(tickDecimals(0.25)).toBe(2);
    expect(tickDecimals(10)).toBe(0);
  });

  it('finds the finite range of data and widens a flat one', () => {
    expect(autoRange([3, NaN, -1, 7, Infinity])).toEqual({ min: -1, max: 7 });
    expect(autoRange([4, 4])).toEqual({ min: 3.5, max: 4.5 });
    expect(autoRange([NaN])).toBeNull();
  });

  it('uses the fixed range only when it is valid', () => {
    const auto = { min: 10, max: 40 };
    expect(effectiveRange('fixed', { min: 0, max: 50 }, auto)).toEqual({ min: 0, max: 50 });
    expect(effectiveRange('fixed', { min: 50, max: 0 }, auto)).toEqual(auto);
    expect(effectiveRange('auto', { min: 0, max: 50 }, auto)).toEqual(auto);
    expect(effectiveRange('auto', undefined, null)).toEqual({ min: 0, max: 1 });
    expect(sensorRangeKey('categoryHours', 'strong-heat')).toBe('categoryHours:strong-heat');
    expect(sensorRangeKey('mrt', 'strong-heat')).toBe('mrt');
  });
});

describe('display units', () => {
  it('converts temperatures, lengths, speeds and irradiance to IP and back', () => {
    // source: NIST SP 811 (2008), Appendix B: °F = 1.8·°C + 32; 1 ft = 0.3048 m exactly;
    // 1 mph = 0.44704 m/s exactly; 1 Btu_IT/(h·ft²) = 3.154591 W/m². Tolerance 1e-6 relative.
    expect(fromSI('temperature', 100, 'IP')).toBeCloseTo(212, 9);
    expect(fromSI('temperature', -40, 'IP')).toBeCloseTo(-40, 9);
    expect(fromSI('temperatureDifference', 10, 'IP')).toBeCloseTo(18, 9);
    expect(fromSI('length', 0.3048, 'IP')).toBeCloseTo(1, 9);
    expect(fromSI('speed', 0.44704, 'IP')).toBeCloseTo(1, 9);
    expect(fromSI('irradiance', 3.154591, 'IP')).toBeCloseTo(1, 6);
    for (const q of ['temperature', 'temperatureDifference', 'length', 'speed', 'irradiance'] as const) {
      expect(toSI(q, fromSI(q, 37.3, 'IP'), 'IP')).toBeCloseTo(37.3, 9);
      expect(fromSI(q, 37.3, 'SI')).toBe(37.3);
    }
  });

  it('labels and formats', () => {
    expect(unitLabel('temperature', 'IP')).toBe('°F');
    expect(unitLabel('irradiance', 'SI')).toBe('W/m²');
    expect(formatQuantity('temperature', 20, 'IP')).toBe('68.0 °F');
    expect(formatQuantity('irradiance', 812.4, 'SI')).toBe('812 W/m²');
    expect(formatQuantity('temperature', NaN, 'SI')).toBe('–');
  });
});

describe('time left of a stage', () => {
  it('extrapolates the stage rate, and says nothing too early', () => {
    expect(timeLeftS({ status: 'running', done: 25, total: 100, stageStartedMs: 0 }, 5000)).toBe(15);
    expect(timeLeftS({ status: 'running', done: 1, total: 100, stageStartedMs: 0 }, 100)).toBeNull();
    expect(timeLeftS({ status: 'done', done: 25, total: 100, stageStartedMs: 0 }, 5000)).toBeNull();
  });
});
