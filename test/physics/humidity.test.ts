import { describe, it, expect } from 'vitest';
import {
  saturationVapourPressureHardyHpa,
  vapourPressureFromRelativeHumidityHpa,
  relativeHumidityFromDewPointPct,
  dewPointFromVapourPressureC,
} from '../../src/physics/humidity.ts';
import { InputError } from '../../src/physics/errors.ts';

describe('saturationVapourPressureHardyHpa (Hardy 1998, ITS-90, over water)', () => {
  it('es(25 °C) = 31.699201897293 hPa', () => {
    // source: ecmwf/thermofeel tests/test_scalars.py test_saturation_vapour_pressure (REFERENCE-VALUES §2.4); tolerance 1e-9 hPa
    expect(Math.abs(saturationVapourPressureHardyHpa(25) - 31.699201897293)).toBeLessThan(1e-9);
  });

  it('check values at 0…40 °C', () => {
    // source: REFERENCE-VALUES §2.4 [lib-run] Hardy with ln(T_K), given to 4 decimals (3 for 40 °C); tolerance half a last digit
    const rows: [number, number, number][] = [
      [0, 6.1121, 5e-5],
      [10, 12.2814, 5e-5],
      [20, 23.3926, 5e-5],
      [30, 42.4705, 5e-5],
      [40, 73.853, 5e-4],
    ];
    for (const [t, want, tol] of rows) expect(Math.abs(saturationVapourPressureHardyHpa(t) - want), String(t)).toBeLessThan(tol);
  });

  it('refuses temperatures outside Hardy’s −100…+100 °C', () => {
    // source: Hardy 1998 title range (−100 to +100 °C)
    expect(() => saturationVapourPressureHardyHpa(101)).toThrow(InputError);
    expect(() => saturationVapourPressureHardyHpa(101)).toThrow(/airTempC.*\[-100, 100\] °C/);
    expect(() => saturationVapourPressureHardyHpa(Number.NaN)).toThrow(/not a finite number/);
  });

  it('rises monotonically and about 6–7 %/K near 20 °C (Clausius–Clapeyron)', () => {
    // source: common practice (Clausius–Clapeyron: d ln es/dT = L/(R_v T²) ≈ 2.5e6/(461.5·293.15²) ≈ 0.063 /K)
    const r = Math.log(saturationVapourPressureHardyHpa(20.5) / saturationVapourPressureHardyHpa(19.5));
    expect(Math.abs(r - 0.063)).toBeLessThan(0.002);
    for (let t = -99; t < 100; t += 7) {
      expect(saturationVapourPressureHardyHpa(t + 1)).toBeGreaterThan(saturationVapourPressureHardyHpa(t));
    }
  });
});

describe('vapour pressure, relative humidity and dew point', () => {
  it('vapour pressure from RH is es·RH/100', () => {
    // source: Bröde et al. 2012, UTCI_a002.f90 (ehPa = es(Ta)·RH/100); es(25) from thermofeel; 1e-9 hPa
    expect(Math.abs(vapourPressureFromRelativeHumidityHpa(25, 50) - 31.699201897293 / 2)).toBeLessThan(1e-9);
    expect(vapourPressureFromRelativeHumidityHpa(10, 0)).toBe(0);
    expect(() => vapourPressureFromRelativeHumidityHpa(20, 100.5)).toThrow(/relativeHumidityPct.*\[0, 100\] %/);
  });

  it('dew point inverts es to 1e-9 K across the range', () => {
    // source: Hardy 1998 (definition: es(Td) = e); tolerance 1e-9 K
    for (let t = -95; t <= 95; t += 5) {
      expect(Math.abs(dewPointFromVapourPressureC(saturationVapourPressureHardyHpa(t)) - t), String(t)).toBeLessThan(1e-9);
    }
    expect(Math.abs(dewPointFromVapourPressureC(31.699201897293) - 25)).toBeLessThan(1e-9);
  });

  it('dew point of 50 % RH at 25 °C is about 13.9 °C', () => {
    // source: from memory (psychrometric tables give Td ≈ 13.9 °C for 25 °C / 50 %); tolerance 0.1 K
    expect(Math.abs(dewPointFromVapourPressureC(vapourPressureFromRelativeHumidityHpa(25, 50)) - 13.9)).toBeLessThan(0.1);
  });

  it('RH from dew point: 100 % at Td = Ta, round trip through vapour pressure', () => {
    // source: Hardy 1998 (RH = es(Td)/es(Ta)); tolerance 1e-9 %
    expect(Math.abs(relativeHumidityFromDewPointPct(25, 25) - 100)).toBeLessThan(1e-9);
    for (const [ta, rh] of [[30, 40], [-10, 80], [5, 12]] as const) {
      const td = dewPointFromVapourPressureC(vapourPressureFromRelativeHumidityHpa(ta, rh));
      expect(Math.abs(relativeHumidityFromDewPointPct(ta, td) - rh)).toBeLessThan(1e-9);
    }
    expect(() => relativeHumidityFromDewPointPct(20, 21)).toThrow(/dewPointC.*dew point above the air temperature/);
  });

  it('dew point refuses non-positive vapour pressure', () => {
    // source: common practice (vapour pressure is positive)
    expect(() => dewPointFromVapourPressureC(0)).toThrow(InputError);
    expect(() => dewPointFromVapourPressureC(-1)).toThrow(/vapourPressureHpa/);
  });
});
