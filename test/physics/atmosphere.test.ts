import { describe, it, expect } from 'vitest';
import {
  relativeAirMassKastenYoung1989,
  pressureFromElevationPa,
  absoluteAirMass,
  atmosphericRefractionSpaDeg,
  STANDARD_SEA_LEVEL_PRESSURE_PA,
} from '../../src/physics/atmosphere.ts';
import { InputError } from '../../src/physics/errors.ts';

describe('relativeAirMassKastenYoung1989', () => {
  it('matches pvlib get_relative_airmass(model="kastenyoung1989") to 1e-5', () => {
    // source: REFERENCE-VALUES §4.7 [lib-run], pvlib atmosphere.get_relative_airmass, Kasten & Young 1989.
    const table: Array<[number, number]> = [
      [0, 0.99971], [30, 1.15399], [60, 1.99429], [70, 2.90315],
      [80, 5.58604], [85, 10.30579], [89, 26.31056],
    ];
    // The table is printed to 5 decimals, so the comparison is to half a unit in the last place.
    for (const [z, m] of table) expect(Math.abs(relativeAirMassKastenYoung1989(z) - m)).toBeLessThanOrEqual(5e-6 + 1e-12);
  });

  it('is NaN below the horizon and refuses a zenith outside [0, 180]', () => {
    // source: pvlib atmosphere.get_relative_airmass returns NaN for zenith > 90 (common practice).
    expect(relativeAirMassKastenYoung1989(90.5)).toBeNaN();
    expect(() => relativeAirMassKastenYoung1989(-1)).toThrow(InputError);
    expect(() => relativeAirMassKastenYoung1989(NaN)).toThrow(/zenithDeg/);
  });

  it('approaches sec z near the zenith (common practice: plane-parallel limit)', () => {
    // source: common practice — for small zenith angles m ≈ 1/cos z within 0.1 %.
    const z = 20;
    expect(relativeAirMassKastenYoung1989(z) * Math.cos((z * Math.PI) / 180)).toBeCloseTo(1, 3);
  });
});

describe('pressureFromElevationPa', () => {
  it('gives 101325 Pa at sea level', () => {
    // source: ISO 2533:1975 / U.S. Standard Atmosphere 1976, p0 = 101325 Pa (definition).
    expect(pressureFromElevationPa(0)).toBe(STANDARD_SEA_LEVEL_PRESSURE_PA);
  });

  it('matches the standard-atmosphere table at 1, 2, 5 and 11 km', () => {
    // source: from memory — U.S. Standard Atmosphere 1976 table: 89 875 Pa (1 km), 79 495 (2 km),
    // 54 019 (5 km), 22 632 (11 km). Tolerance 0.05 %.
    const table: Array<[number, number]> = [[1000, 89875], [2000, 79495], [5000, 54019], [11000, 22632]];
    for (const [h, p] of table) expect(Math.abs(pressureFromElevationPa(h) / p - 1)).toBeLessThan(5e-4);
  });

  it('agrees with pvlib alt2pres to 1e-4 relative', () => {
    // source: pvlib atmosphere.alt2pres: p = 100·((44331.514 − h)/11880.516)^(1/0.1902632)
    // (the same standard atmosphere, rearranged and rounded). Evaluated here as a formula.
    for (const h of [-400, 0, 500, 1830.14, 3000, 8000]) {
      const pv = 100 * Math.pow((44331.514 - h) / 11880.516, 1 / 0.1902632);
      expect(Math.abs(pressureFromElevationPa(h) / pv - 1)).toBeLessThan(1e-4);
    }
  });

  it('refuses elevations outside the troposphere layer', () => {
    expect(() => pressureFromElevationPa(12000)).toThrow(/elevationM/);
    expect(() => pressureFromElevationPa(Infinity)).toThrow(InputError);
  });
});

describe('absoluteAirMass', () => {
  it('scales the relative air mass by p / 101325', () => {
    // source: Kasten & Young 1989 (absolute air mass = relative × p/p0); values [derived].
    expect(absoluteAirMass(2, 101325)).toBe(2);
    expect(absoluteAirMass(2, 79495)).toBeCloseTo(1.569109, 6);
  });

  it('passes NaN through and refuses a bad pressure or a non-positive air mass', () => {
    expect(absoluteAirMass(NaN, 101325)).toBeNaN();
    expect(() => absoluteAirMass(0, 101325)).toThrow(/relativeAirMass/);
    expect(() => absoluteAirMass(1, 500)).toThrow(/pressurePa/);
  });
});

describe('atmosphericRefractionSpaDeg', () => {
  it('reproduces SPA Δe = 0.016332° for the Reda & Andreas example (e0 39.872046°, 820 hPa, 11 °C)', () => {
    // source: pvlib tests/test_spa.py `de` 0.016332 (Reda & Andreas 2004, eq. 42).
    expect(atmosphericRefractionSpaDeg(39.872046, 820, 11)).toBeCloseTo(0.016332, 6);
  });

  it('reproduces the pvlib pressure case: 900 hPa → apparent elevation 39.88997°', () => {
    // source: pvlib tests/test_solarposition.py test_get_solarposition_pressure (90000 Pa, 11 °C,
    // elevation 39.87205 printed to 5 decimals, so tolerance 1e-5°).
    expect(39.872046 + atmosphericRefractionSpaDeg(39.872046, 900, 11)).toBeCloseTo(39.88997, 5);
  });

  it('reproduces the solposx ~1° row: 0.35074° at e0 = 1.10773° (1013.25 hPa, 12 °C)', () => {
    // source: solposx expected_spa 2020-10-17T05:50Z 45N 10E: zenith 88.89226772 (geometric),
    // 88.54152518 (apparent).
    const e0 = 90 - 88.89226772;
    expect(atmosphericRefractionSpaDeg(e0, 1013.25, 12)).toBeCloseTo(88.89226772 - 88.54152518, 6);
  });

  it('is zero once the upper limb is below the refracted horizon (e0 < −0.83337°)', () => {
    // source: Reda & Andreas 2004, eq. 42 condition e0 ≥ −(0.26667 + 0.5667).
    expect(atmosphericRefractionSpaDeg(-0.84, 1013.25, 12)).toBe(0);
    expect(atmosphericRefractionSpaDeg(-0.83, 1013.25, 12)).toBeGreaterThan(0.5);
  });

  it('refuses out-of-range inputs', () => {
    expect(() => atmosphericRefractionSpaDeg(10, 0, 12)).toThrow(/pressureHpa/);
    expect(() => atmosphericRefractionSpaDeg(10, 1000, 200)).toThrow(/tempC/);
    expect(() => atmosphericRefractionSpaDeg(95, 1000, 10)).toThrow(/trueAltitudeDeg/);
  });
});
