import { describe, it, expect } from 'vitest';
import { windLogLawMs, windAtHeightFrom10mMs, wind10mFromHeightMs, windPowerLawMs } from '../../src/physics/wind.ts';
import { InputError } from '../../src/physics/errors.ts';

describe('log law', () => {
  it('thermofeel scale_windspeed: 7.0 m/s at 10 m → 5.369069989882623 at 2 m', () => {
    // source: ecmwf/thermofeel tests/test_scalars.py test_scale_windspeed (REFERENCE-VALUES §2.4); tolerance 1e-12
    expect(Math.abs(windAtHeightFrom10mMs(7.0, 2.0) - 5.369069989882623)).toBeLessThan(1e-12);
  });

  it('pythermalcomfort scale_wind_speed_log cases (rtol 1e-2)', () => {
    // source: pythermalcomfort tests for scale_wind_speed_log (REFERENCE-VALUES §13), rtol 1e-2 as published
    const rows: [number, number, number, number][] = [
      [6.52, 2, 0.01, 5.0],
      [7.69, 2, 0.1, 5.0],
      [5.0, 90, 0.1, 7.39],
    ];
    for (const [v10, z, z0, want] of rows) expect(Math.abs(windLogLawMs(v10, 10, z, z0) / want - 1)).toBeLessThan(1e-2);
  });

  it('factors 10 m → 1.1 m and 1.5 m, and the inverse', () => {
    // source: REFERENCE-VALUES §2.4 [derived] (0.68046, 1.46958 at 1.1 m; 0.72536 at 1.5 m); tolerance 5e-6
    expect(Math.abs(windAtHeightFrom10mMs(1, 1.1) - 0.68046)).toBeLessThan(5e-6);
    expect(Math.abs(wind10mFromHeightMs(1, 1.1) - 1.46958)).toBeLessThan(5e-6);
    expect(Math.abs(windAtHeightFrom10mMs(1, 1.5) - 0.72536)).toBeLessThan(5e-6);
    // source: common practice (inverse round trip); 1e-12
    for (const z of [0.6, 1.1, 2, 25]) expect(Math.abs(wind10mFromHeightMs(windAtHeightFrom10mMs(3.3, z), z) - 3.3)).toBeLessThan(1e-12);
  });

  it('displacement height shifts the profile', () => {
    // source: common practice (log law with zero-plane displacement: v(z) ∝ ln((z − d)/z0)); 1e-12
    expect(windLogLawMs(4, 20, 12, 0.5, 2)).toBeCloseTo((4 * Math.log(10 / 0.5)) / Math.log(18 / 0.5), 12);
  });

  it('refuses heights at or below d + z0 and bad roughness', () => {
    // source: common practice (ln undefined below z0)
    expect(() => windAtHeightFrom10mMs(3, 0.005)).toThrow(InputError);
    expect(() => windAtHeightFrom10mMs(3, 0.005)).toThrow(/heightM.*0.01/);
    expect(() => windLogLawMs(3, 10, 2, 0)).toThrow(/roughnessLengthM/);
    expect(() => windLogLawMs(3, 10, 1, 0.1, 1)).toThrow(/heightM/);
    expect(() => windAtHeightFrom10mMs(-1, 2)).toThrow(/windRefMs/);
  });
});

describe('power law', () => {
  it('factors 10 m → 1.1 m for α = 1/7, 0.22, 0.33', () => {
    // source: REFERENCE-VALUES §13 [derived] (0.7296, 0.6153, 0.4827); tolerance 5e-5
    expect(Math.abs(windPowerLawMs(1, 10, 1.1) - 0.7296)).toBeLessThan(5e-5);
    expect(Math.abs(windPowerLawMs(1, 10, 1.1, 0.22) - 0.6153)).toBeLessThan(5e-5);
    expect(Math.abs(windPowerLawMs(1, 10, 1.1, 0.33) - 0.4827)).toBeLessThan(5e-5);
  });

  it('is its own inverse and refuses bad heights', () => {
    // source: common practice; 1e-12
    expect(Math.abs(windPowerLawMs(windPowerLawMs(5, 10, 1.1, 0.22), 1.1, 10, 0.22) - 5)).toBeLessThan(1e-12);
    expect(() => windPowerLawMs(5, 10, 0)).toThrow(/heightM/);
    expect(() => windPowerLawMs(5, 10, 2, 1.5)).toThrow(/exponent/);
  });
});
