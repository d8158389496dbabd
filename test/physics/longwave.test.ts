import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/physics/errors.ts';
import {
  dewPointMagnusC,
  emittedLongwaveWm2,
  skyEmissivityBerdahlMartin1984,
  skyEmissivitySwinbank1963,
  skyLongwaveWm2,
} from '../../src/physics/longwave.ts';

describe('emitted longwave (Stefan–Boltzmann)', () => {
  it('black body at 300 K', () => {
    // source: Stefan–Boltzmann law with CODATA 2018 σ: 5.670374419e-8 · 300⁴ = 459.30 W/m²; tol 0.01
    expect(emittedLongwaveWm2(1, 300 - 273.15)).toBeCloseTo(459.3, 1);
  });

  it('σT⁴ table', () => {
    // source: REFERENCE-VALUES §6.1 [derived, CODATA σ]: 0 °C 315.658, 20 °C 418.766, 30 °C 478.897, 50 °C 618.341; tol 1e-3
    const table: [number, number][] = [[0, 315.658], [20, 418.766], [30, 478.897], [50, 618.341]];
    for (const [t, m] of table) expect(Math.abs(emittedLongwaveWm2(1, t) - m)).toBeLessThan(1e-3);
    // common practice: grey body scales linearly with ε; tol 1e-9 relative
    expect(emittedLongwaveWm2(0.9, 20) / emittedLongwaveWm2(1, 20)).toBeCloseTo(0.9, 9);
  });
});

describe('clear-sky emissivity', () => {
  it('Berdahl & Martin 1984 worked case (T_dp 10 °C)', () => {
    // source: REFERENCE-VALUES §6.2 worked case: ε = 0.7743 (no time/pressure correction); tol 1e-4
    expect(Math.abs(skyEmissivityBerdahlMartin1984(10) - 0.7743)).toBeLessThan(1e-4);
  });

  it('Berdahl & Martin 1984 corrections', () => {
    // source: REFERENCE-VALUES §6.2: +0.013·cos(2πt/24), +0.00012·(P − 1000); tol 1e-9
    const base = skyEmissivityBerdahlMartin1984(10);
    expect(skyEmissivityBerdahlMartin1984(10, 0) - base).toBeCloseTo(0.013, 9);
    expect(skyEmissivityBerdahlMartin1984(10, 12) - base).toBeCloseTo(-0.013, 9);
    expect(skyEmissivityBerdahlMartin1984(10, 6) - base).toBeCloseTo(0, 9);
    expect(skyEmissivityBerdahlMartin1984(10, undefined, 900) - base).toBeCloseTo(-0.012, 9);
  });

  it('Swinbank 1963 worked case (T_a 20 °C)', () => {
    // source: REFERENCE-VALUES §6.2 worked case: ε = 0.8048, L↓ = 337.0 W/m²; tol 1e-4 in ε, 0.1 W/m²
    expect(Math.abs(skyEmissivitySwinbank1963(293.15) - 0.8048)).toBeLessThan(1e-4);
    expect(Math.abs(skyLongwaveWm2({ airTempC: 20 }, 'swinbank-1963') - 337.0)).toBeLessThan(0.1);
  });

  it('sky longwave: formula, then measured value when given', () => {
    // source: REFERENCE-VALUES §6.2 worked case: Berdahl–Martin L↓ = 324.3 W/m²; tol 0.1
    expect(Math.abs(skyLongwaveWm2({ airTempC: 20, dewPointC: 10 }) - 324.3)).toBeLessThan(0.1);
    // common practice: a weather file's measured horizontal infrared takes precedence; exact
    expect(skyLongwaveWm2({ airTempC: 20, dewPointC: 10, measuredHorizontalIrWm2: 350 })).toBe(350);
    expect(skyLongwaveWm2({ airTempC: 20, dewPointC: 10, measuredHorizontalIrWm2: NaN })).toBeCloseTo(324.3, 0);
    expect(skyLongwaveWm2({ airTempC: 20, dewPointC: 10, measuredHorizontalIrWm2: null })).toBeCloseTo(324.3, 0);
    expect(() => skyLongwaveWm2({ airTempC: 20 })).toThrow(/dewPointC/);
    expect(() => skyLongwaveWm2({ airTempC: 20, dewPointC: 10 }, 'bogus' as 'swinbank-1963')).toThrow(InputError);
  });
});

describe('dew point (Magnus, Alduchov & Eskridge 1996)', () => {
  it('recovers the §6.2 worked case', () => {
    // source: REFERENCE-VALUES §6.2: e(10 °C) = 12.260 hPa by 6.1094·exp(17.625 T/(T + 243.04)); RH = e/e_s(20 °C); tol 0.01 K
    const es = (t: number) => 6.1094 * Math.exp((17.625 * t) / (t + 243.04));
    expect(Math.abs(es(10) - 12.26)).toBeLessThan(0.001);
    const rh = (100 * 12.26) / es(20);
    expect(Math.abs(dewPointMagnusC(20, rh) - 10)).toBeLessThan(0.01);
    // common practice: at saturation the dew point equals the air temperature; tol 1e-9
    expect(dewPointMagnusC(25, 100)).toBeCloseTo(25, 9);
    expect(() => dewPointMagnusC(20, 0)).toThrow(InputError);
  });
});
