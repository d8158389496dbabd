import { describe, it, expect } from 'vitest';
import {
  mrtSixDirectionalC,
  mrtSixDirectionalPackedC,
  meanRadiantFluxDensityWm2,
  projectedAreaFactor,
  mrtFromGlobeIso7726C,
  solarGainAshrae55,
  SIX_DIRECTION_WEIGHTS,
  FP_TABLE,
  type MrtPosture,
  type BodyPosture,
} from '../../src/physics/mrt.ts';
import { STEFAN_BOLTZMANN_ROUNDED_W_M2K4, STEFAN_BOLTZMANN_W_M2K4 } from '../../src/physics/constants.ts';
import { InputError } from '../../src/physics/errors.ts';

const POSTURES: MrtPosture[] = ['standing', 'seated', 'sphere'];
// REFERENCE-VALUES §3.1 derived case: [up, down, east, south, west, north]
const K = [900, 150, 300, 50, 80, 80];
const L = [350, 480, 450, 450, 450, 450];

describe('six-directional weights', () => {
  it('sum to one for every posture', () => {
    // source: Thorsson et al. 2007 / VDI 3787-2 (weights sum to 1: 4·0.22 + 2·0.06 = 1); tolerance 1e-12
    for (const p of POSTURES) {
      const w = SIX_DIRECTION_WEIGHTS[p];
      expect(Math.abs(2 * w.upDown + 4 * w.lateral - 1)).toBeLessThan(1e-12);
    }
    expect(SIX_DIRECTION_WEIGHTS.standing).toEqual({ upDown: 0.06, lateral: 0.22 }); // source: Thorsson et al. 2007 (REFERENCE-VALUES §3.1)
  });

  it('the seated derivation applied to ISO 7726 standing factors gives the published standing weights', () => {
    // source: ISO 7726:1998 projected area factors (standing 0.08/0.23/0.35), secondary reproduction;
    // Thorsson et al. 2007 standing 0.06/0.22 — the recipe must reproduce them to 0.005
    const upDown = 0.08 / (2 * (0.08 + 0.23 + 0.35));
    const lateral = (0.23 + 0.35) / 2 / (2 * (0.08 + 0.23 + 0.35));
    expect(Math.abs(upDown - 0.06)).toBeLessThan(0.005);
    expect(Math.abs(lateral - 0.22)).toBeLessThan(0.005);
    // source: ISO 7726:1998 seated factors 0.18/0.22/0.30 (secondary reproduction), same recipe; 1e-12
    expect(Math.abs(SIX_DIRECTION_WEIGHTS.seated.upDown - 0.18 / 1.4)).toBeLessThan(1e-12);
    expect(Math.abs(SIX_DIRECTION_WEIGHTS.seated.lateral - 0.26 / 1.4)).toBeLessThan(1e-12);
  });
});

describe('mrtSixDirectionalC', () => {
  it('a uniform enclosure at T gives MRT = T for every posture', () => {
    // source: common practice (definition of MRT: uniform black enclosure); REFERENCE-VALUES §3.1 (300 K → 26.85 °C); 1e-9 K
    for (const p of POSTURES) {
      for (const tK of [250, 300, 330]) {
        const l = STEFAN_BOLTZMANN_W_M2K4 * tK ** 4;
        const mrt = mrtSixDirectionalC({ shortwaveWm2: [0, 0, 0, 0, 0, 0], longwaveWm2: [l, l, l, l, l, l], posture: p });
        expect(Math.abs(mrt - (tK - 273.15)), `${p} ${tK}`).toBeLessThan(1e-9);
      }
    }
  });

  it('derived case: S_str 555.07 / 43.80 °C standing, 607.18 / 51.00 °C sphere (σ = 5.67e-8)', () => {
    // source: REFERENCE-VALUES §3.1 [derived], computed there with σ = 5.67e-8; tolerance 0.01 °C (0.005 W/m² on S_str)
    const sigma = STEFAN_BOLTZMANN_ROUNDED_W_M2K4;
    expect(Math.abs(meanRadiantFluxDensityWm2({ shortwaveWm2: K, longwaveWm2: L, posture: 'standing' }) - 555.07)).toBeLessThan(0.005);
    expect(Math.abs(meanRadiantFluxDensityWm2({ shortwaveWm2: K, longwaveWm2: L, posture: 'sphere' }) - 607.18)).toBeLessThan(0.005);
    const st = mrtSixDirectionalC({ shortwaveWm2: K, longwaveWm2: L, posture: 'standing', stefanBoltzmannWm2K4: sigma });
    const sp = mrtSixDirectionalC({ shortwaveWm2: K, longwaveWm2: L, posture: 'sphere', stefanBoltzmannWm2K4: sigma });
    expect(Math.abs(st - 43.8)).toBeLessThan(0.01);
    expect(Math.abs(sp - 51.0)).toBeLessThan(0.01);
    // default σ (CODATA 2018) is 0.0066 % larger: MRT drops by ≈ 0.005 K here
    const stCodata = mrtSixDirectionalC({ shortwaveWm2: K, longwaveWm2: L, posture: 'standing' });
    expect(st - stCodata).toBeGreaterThan(0.003);
    expect(st - stCodata).toBeLessThan(0.008);
  });

  it('the direct beam adds α·fp·I to S_str', () => {
    // source: Thorsson et al. 2007 / VDI 3787-2 (S_str = α Σ K F + α fp I + ε Σ L F), α = 0.7; tolerance 1e-9 W/m²
    const base = meanRadiantFluxDensityWm2({ shortwaveWm2: K, longwaveWm2: L, posture: 'standing' });
    const withBeam = meanRadiantFluxDensityWm2({
      shortwaveWm2: K, longwaveWm2: L, posture: 'standing', directBeam: { normalIrradianceWm2: 800, projectedAreaFactor: 0.3 },
    });
    expect(Math.abs(withBeam - base - 0.7 * 0.3 * 800)).toBeLessThan(1e-9);
  });

  it('packed typed-array variant equals the object variant at an offset', () => {
    // source: common practice (two entry points of one equation); tolerance 1e-12 K
    const sw = new Float64Array(18);
    const lw = new Float64Array(24);
    sw.set(K, 12);
    lw.set(L, 6);
    for (const p of POSTURES) {
      const a = mrtSixDirectionalC({ shortwaveWm2: K, longwaveWm2: L, posture: p, directBeam: { normalIrradianceWm2: 700, projectedAreaFactor: 0.25 } });
      const b = mrtSixDirectionalPackedC(sw, 12, lw, 6, p, 700, 0.25);
      expect(Math.abs(a - b)).toBeLessThan(1e-12);
    }
    expect(() => mrtSixDirectionalPackedC(new Float64Array(6), 0, new Float64Array(6), 0, 'standing')).toThrow(InputError);
  });

  it('refuses malformed input', () => {
    // source: common practice (input validation)
    expect(() => mrtSixDirectionalC({ shortwaveWm2: [1, 2, 3], longwaveWm2: L, posture: 'standing' })).toThrow(/shortwaveWm2.*6 fluxes/);
    expect(() => mrtSixDirectionalC({ shortwaveWm2: K, longwaveWm2: [350, -1, 450, 450, 450, 450], posture: 'standing' })).toThrow(/longwaveWm2\[1\]/);
    expect(() => mrtSixDirectionalC({ shortwaveWm2: K, longwaveWm2: L, posture: 'lying' as MrtPosture })).toThrow(/posture/);
    expect(() => mrtSixDirectionalC({ shortwaveWm2: K, longwaveWm2: L, posture: 'standing', absorptanceShortwave: 1.2 })).toThrow(/absorptanceShortwave/);
  });
});

describe('projectedAreaFactor (ASHRAE 55 / SolarCal table)', () => {
  it('reproduces the table rows of REFERENCE-VALUES §3.2 at the nodes', () => {
    // source: REFERENCE-VALUES §3.2 (pythermalcomfort solar_gain.py fp tables, ASHRAE 55); exact at nodes (1e-12)
    const rows: [BodyPosture, number, number[]][] = [
      ['standing', 0, [0.35, 0.35, 0.314, 0.258, 0.206, 0.144, 0.082]],
      ['standing', 90, [0.23, 0.23, 0.214, 0.18, 0.148, 0.108, 0.082]],
      ['standing', 180, [0.347, 0.347, 0.308, 0.246, 0.191, 0.128, 0.082]],
      ['seated', 0, [0.29, 0.324, 0.305, 0.303, 0.262, 0.224, 0.177]],
      ['seated', 90, [0.216, 0.26, 0.248, 0.244, 0.22, 0.186, 0.177]],
      ['seated', 180, [0.3, 0.24, 0.168, 0.152, 0.152, 0.164, 0.177]],
    ];
    for (const [p, sharp, vals] of rows) {
      vals.forEach((v, i) => expect(Math.abs(projectedAreaFactor(p, 15 * i, sharp) - v)).toBeLessThan(1e-12));
    }
  });

  it('interpolates bilinearly, folds the azimuth symmetrically', () => {
    // source: REFERENCE-VALUES §3.2 (bilinear interpolation); values from the table; tolerance 1e-12
    const t = FP_TABLE.standing;
    const mid = (((t[2]?.[1] ?? 0) + (t[2]?.[2] ?? 0) + (t[3]?.[1] ?? 0) + (t[3]?.[2] ?? 0)) / 4);
    expect(Math.abs(projectedAreaFactor('standing', 22.5, 37.5) - mid)).toBeLessThan(1e-12);
    expect(projectedAreaFactor('seated', 40, -70)).toBeCloseTo(projectedAreaFactor('seated', 40, 70), 14);
    expect(projectedAreaFactor('seated', 40, 290)).toBeCloseTo(projectedAreaFactor('seated', 40, 70), 14);
    // source: REFERENCE-VALUES §3.2: at altitude 90° fp is 0.082 standing / 0.177 seated for every azimuth
    for (let a = 0; a <= 360; a += 20) {
      expect(projectedAreaFactor('standing', 90, a)).toBeCloseTo(0.082, 12);
      expect(projectedAreaFactor('seated', 90, a)).toBeCloseTo(0.177, 12);
    }
  });

  it('unknown orientation = mean over relative azimuth; sphere = 0.25', () => {
    // source: common practice (uniform average over orientation), checked by brute-force sampling; 1e-6
    for (const p of ['standing', 'seated'] as const) {
      for (const alt of [0, 10, 37, 60, 88]) {
        let s = 0;
        const n = 36000;
        for (let i = 0; i < n; i++) s += projectedAreaFactor(p, alt, ((i + 0.5) * 360) / n);
        expect(Math.abs(projectedAreaFactor(p, alt) - s / n), `${p} ${alt}`).toBeLessThan(1e-6);
      }
    }
    // source: geometry (sphere shadow πr² over surface 4πr²)
    expect(projectedAreaFactor('sphere', 33, 10)).toBe(0.25);
  });

  it('refuses altitudes outside 0…90°', () => {
    // source: common practice (table domain)
    expect(() => projectedAreaFactor('standing', -1, 0)).toThrow(/solarAltitudeDeg.*\[0, 90\]/);
    expect(() => projectedAreaFactor('standing', 91)).toThrow(InputError);
  });
});

describe('solarGainAshrae55 — the 27 ASHRAE 55 rows', () => {
  // source: ts_solar_gain.json @324e852 (ASHRAE 55 2017), via REFERENCE-VALUES §3.4; published tolerance 0.1
  // alt, SHARP, I_dir, T_sol, f_svv, f_bes, α_SW, posture, ERF, ΔMRT
  const rows: [number, number, number, number, number, number, number, BodyPosture, number, number][] = [
    [45, 0, 700, 0.8, 0.2, 0.5, 0.7, 'seated', 64.9, 15.5],
    [0, 120, 800, 0.5, 0.5, 0.5, 0.7, 'seated', 43.3, 10.4],
    [60, 120, 800, 0.5, 0.5, 0.5, 0.7, 'seated', 63.2, 15.1],
    [90, 120, 800, 0.5, 0.5, 0.5, 0.7, 'seated', 65.3, 15.6],
    [30, 0, 800, 0.5, 0.5, 0.5, 0.7, 'seated', 63.1, 15.1],
    [30, 30, 800, 0.5, 0.5, 0.5, 0.7, 'seated', 62.4, 14.9],
    [30, 60, 800, 0.5, 0.5, 0.5, 0.7, 'seated', 60.5, 14.5],
    [30, 90, 800, 0.5, 0.5, 0.5, 0.7, 'seated', 57.2, 13.7],
    [30, 120, 800, 0.5, 0.5, 0.5, 0.7, 'seated', 54.8, 13.1],
    [30, 150, 800, 0.5, 0.5, 0.5, 0.7, 'seated', 51.7, 12.4],
    [30, 180, 800, 0.5, 0.5, 0.5, 0.7, 'seated', 49.0, 11.7],
    [30, 120, 800, 0.5, 0.5, 0.5, 0.7, 'standing', 59.3, 13.6],
    [30, 120, 400, 0.5, 0.5, 0.5, 0.7, 'seated', 27.4, 6.6],
    [30, 120, 600, 0.5, 0.5, 0.5, 0.7, 'seated', 41.1, 9.8],
    [30, 120, 1000, 0.5, 0.5, 0.5, 0.7, 'seated', 68.5, 16.4],
    [30, 120, 800, 0.1, 0.5, 0.5, 0.7, 'seated', 11.0, 2.6],
    [30, 120, 800, 0.3, 0.5, 0.5, 0.7, 'seated', 32.9, 7.9],
    [30, 120, 800, 0.7, 0.5, 0.5, 0.7, 'seated', 76.7, 18.4],
    [30, 120, 800, 0.5, 0.1, 0.5, 0.7, 'seated', 29.3, 7.0],
    [30, 120, 800, 0.5, 0.3, 0.5, 0.7, 'seated', 42.1, 10.1],
    [30, 120, 800, 0.5, 0.7, 0.5, 0.7, 'seated', 67.5, 16.2],
    [30, 120, 800, 0.5, 0.5, 0.1, 0.7, 'seated', 36.4, 8.7],
    [30, 120, 800, 0.5, 0.5, 0.3, 0.7, 'seated', 45.6, 10.9],
    [30, 120, 800, 0.5, 0.5, 0.7, 0.7, 'seated', 64.0, 15.3],
    [30, 120, 800, 0.5, 0.5, 0.5, 0.3, 'seated', 23.5, 5.6],
    [30, 120, 800, 0.5, 0.5, 0.5, 0.5, 'seated', 39.1, 9.4],
    [30, 120, 800, 0.5, 0.5, 0.5, 0.9, 'seated', 70.4, 16.9],
  ];
  it('has 27 rows and matches ERF and ΔMRT within 0.1', () => {
    expect(rows.length).toBe(27);
    for (const [alt, sharp, iDir, tSol, fSvv, fBes, aSw, posture, erf, dMrt] of rows) {
      const r = solarGainAshrae55({
        solarAltitudeDeg: alt, relativeAzimuthDeg: sharp, directIrradianceWm2: iDir, solarTransmittance: tSol,
        skyVaultViewFraction: fSvv, bodyExposedFraction: fBes, absorptanceShortwave: aSw, posture,
      });
      const tag = `${alt}/${sharp}/${iDir}/${tSol}/${fSvv}/${fBes}/${aSw}/${posture}`;
      expect(Math.abs(r.erfWm2 - erf), tag).toBeLessThanOrEqual(0.1 + 1e-9);
      expect(Math.abs(r.deltaMrtK - dMrt), tag).toBeLessThanOrEqual(0.1 + 1e-9);
    }
  });
  it('refuses fractions outside 0…1', () => {
    // source: common practice (fractions)
    expect(() => solarGainAshrae55({ solarAltitudeDeg: 30, relativeAzimuthDeg: 0, directIrradianceWm2: 800, solarTransmittance: 1.5, skyVaultViewFraction: 0.5, bodyExposedFraction: 0.5, posture: 'seated' })).toThrow(/solarTransmittance/);
  });
});

describe('mrtFromGlobeIso7726C', () => {
  it('published and derived cases (REFERENCE-VALUES §3.3, 0.05 °C)', () => {
    // source: pythermalcomfort utilities.mean_radiant_tmp docstring, ISO standard (53.2/30/0.3/D 0.1 → 74.8, 1 decimal): 0.05 + rounding
    expect(Math.abs(mrtFromGlobeIso7726C(53.2, 30, 0.3, 0.1) - 74.8)).toBeLessThanOrEqual(0.05);
    // source: REFERENCE-VALUES §3.3 [derived] values, tolerance 0.05 °C as stated there
    const rows: [number, number, number, number, number][] = [
      [53.2, 30, 0.3, 0.1, 74.771],
      [55, 30, 0.3, 0.1, 77.755],
      [55, 30, 0.1, 0.1, 71.925],
      [55, 30, 0.3, 0.15, 74.62],
      [40, 30, 0.5, 0.15, 52.63],
      [35, 30, 1.0, 0.15, 45.16],
      [30, 25, 0.1, 0.15, 32.78],
    ];
    for (const [tg, ta, v, d, want] of rows) expect(Math.abs(mrtFromGlobeIso7726C(tg, ta, v, d) - want), `${tg}/${ta}/${v}/${d}`).toBeLessThan(0.05);
    // source: REFERENCE-VALUES §3.3 (tg = ta → Tmrt = ta); 1e-9
    expect(Math.abs(mrtFromGlobeIso7726C(27, 27, 2))).toBeGreaterThan(0);
    expect(Math.abs(mrtFromGlobeIso7726C(27, 27, 2) - 27)).toBeLessThan(1e-9);
  });

  it('the standard globe uses ISO 7726’s 2.5·10⁸·v^0.6 coefficient', () => {
    // source: REFERENCE-VALUES §3.3 [derived] 6.3/(0.95·5.67e-8·0.15^0.4) ≈ 2.50e8 (ISO 7726 "2.5·10⁸", from memory); 0.05 °C
    const tg = 45, ta = 30, v = 0.8;
    const iso = Math.pow((tg + 273.15) ** 4 + 2.5e8 * v ** 0.6 * (tg - ta), 0.25) - 273.15;
    expect(Math.abs(mrtFromGlobeIso7726C(tg, ta, v) - iso)).toBeLessThan(0.05);
  });

  it('refuses negative air speed or non-positive diameter', () => {
    // source: common practice (input validation)
    expect(() => mrtFromGlobeIso7726C(40, 30, -0.1)).toThrow(/airSpeedMs/);
    expect(() => mrtFromGlobeIso7726C(40, 30, 0.2, 0)).toThrow(/diameterM/);
  });
});
