import { describe, expect, it } from 'vitest';
import {
  conductionHeatContentJm2,
  conductionSubsteps,
  createConductionState,
  setSteadyProfile,
  stepConductionWithFlux,
  stepConductionWithSurfaceTemp,
  type ConstructionLayer,
} from '../../src/physics/conduction.ts';
import { InputError } from '../../src/physics/errors.ts';

const concrete = (t: number): ConstructionLayer => ({ name: 'concrete', thicknessM: t, conductivityWmK: 1.7, densityKgM3: 2300, specificHeatJkgK: 900 });
const wool = (t: number): ConstructionLayer => ({ name: 'wool', thicknessM: t, conductivityWmK: 0.035, densityKgM3: 30, specificHeatJkgK: 1030 });
const steel: ConstructionLayer = { name: 'steel', thicknessM: 0.0007, conductivityWmK: 50, densityKgM3: 7850, specificHeatJkgK: 450 };

describe('conduction grid', () => {
  it('builds nodes from the spacing / Fourier rule (TSDoc example)', () => {
    // common practice: Δx = min(0.05, √(α·3600/2)) = 38.4 mm for concrete → 6 cells, 7 nodes; exact
    const s = createConductionState([concrete(0.2)], 20);
    expect(s.nodeCount).toBe(7);
    expect(s.depthM[6]).toBeCloseTo(0.2, 12);
    // common practice: capacity sums to ρ·c·L; tol 1e-9 relative
    const cSum = s.capacityJm2K.reduce((a, b) => a + b, 0);
    expect(cSum / (2300 * 900 * 0.2)).toBeCloseTo(1, 9);
    // a thin sheet is one cell
    expect(createConductionState([steel], 20).nodeCount).toBe(2);
  });

  it('rejects non-positive layer values, naming the place', () => {
    expect(() => createConductionState([{ ...concrete(0.2), conductivityWmK: 0 }], 20)).toThrow(/construction\[0\]\.conductivityWmK/);
    expect(() => createConductionState([], 20)).toThrow(InputError);
  });
});

describe('steady state through a layered slab', () => {
  it('equals the series-resistance closed form', () => {
    // source: series thermal resistance (Fourier's law), q = ΔT / (Σ L/k + R_si); tol 1e-6 relative
    const layers = [concrete(0.15), wool(0.08), concrete(0.1)];
    const rsi = 0.13;
    const s = createConductionState(layers, 20, { back: { kind: 'resistance', resistanceM2KW: rsi } });
    let q = 0;
    for (let i = 0; i < 4000; i++) q = stepConductionWithSurfaceTemp(s, 40, 3600, 20);
    const rTot = 0.15 / 1.7 + 0.08 / 0.035 + 0.1 / 1.7 + rsi;
    const qExact = 20 / rTot;
    expect(Math.abs(q - qExact) / qExact).toBeLessThan(1e-6);
    expect(Math.abs(s.lastBackFluxWm2 - qExact) / qExact).toBeLessThan(1e-6);
    // interface temperatures fall in proportion to resistance
    const tAfterFirst = 40 - qExact * (0.15 / 1.7);
    expect(Math.abs(s.tempC[s.layerFirstNode[1]!]! - tAfterFirst)).toBeLessThan(1e-5);
    // setSteadyProfile gives the same profile directly
    const s2 = createConductionState(layers, 0, { back: { kind: 'resistance', resistanceM2KW: rsi } });
    setSteadyProfile(s2, 40, 20);
    for (let j = 0; j < s.nodeCount; j++) expect(Math.abs(s2.tempC[j]! - s.tempC[j]!)).toBeLessThan(1e-5);
  });

  it('fixed back temperature (ground at depth)', () => {
    // source: series resistance, q = ΔT/(L/k); tol 1e-6 relative
    const s = createConductionState([concrete(0.3)], 10, { back: { kind: 'fixed-temperature' } });
    let q = 0;
    for (let i = 0; i < 3000; i++) q = stepConductionWithSurfaceTemp(s, 30, 3600, 10);
    expect(Math.abs(q - (20 * 1.7) / 0.3) / ((20 * 1.7) / 0.3)).toBeLessThan(1e-6);
  });
});

describe('energy conservation', () => {
  it('heat in = stored + out over many steps (resistance back)', () => {
    // common practice: a conservative finite-volume scheme; Σ q_in·dt = ΔE + Σ q_back·dt to 1e-6 relative
    const s = createConductionState([steel, wool(0.05), concrete(0.12)], 15, { back: { kind: 'resistance', resistanceM2KW: 0.13 } });
    const e0 = conductionHeatContentJm2(s);
    let inJ = 0;
    let outJ = 0;
    let storedJ = 0;
    for (let i = 0; i < 500; i++) {
      const dt = 300 + 17 * (i % 7);
      const q = 400 * Math.sin(i / 9) + 50;
      stepConductionWithFlux(s, q, dt, 22 + 3 * Math.cos(i / 5));
      inJ += s.lastIntoSurfaceWm2 * dt;
      outJ += s.lastBackFluxWm2 * dt;
      storedJ += s.lastStoredWm2 * dt;
      expect(Math.abs(s.lastIntoSurfaceWm2 - q)).toBeLessThan(1e-9 * Math.max(1, Math.abs(q)));
    }
    const dE = conductionHeatContentJm2(s) - e0;
    expect(Math.abs(inJ - dE - outJ) / Math.abs(inJ)).toBeLessThan(1e-6);
    expect(Math.abs(storedJ - dE) / Math.abs(dE)).toBeLessThan(1e-6);
  });

  it('adiabatic slab stores everything', () => {
    // common practice: with an adiabatic back ΔE = ∫q dt; tol 1e-9 relative
    const s = createConductionState([concrete(0.2)], 20, { back: { kind: 'adiabatic' } });
    const e0 = conductionHeatContentJm2(s);
    for (let i = 0; i < 24; i++) stepConductionWithFlux(s, 100, 3600, 0);
    expect((conductionHeatContentJm2(s) - e0) / (100 * 24 * 3600)).toBeCloseTo(1, 9);
    // and the mean temperature rises by Q/(ρcL)
    const mean = (100 * 24 * 3600) / (2300 * 900 * 0.2);
    expect(s.tempC.reduce((a, b) => a + b, 0) / s.nodeCount).toBeGreaterThan(20 + 0.5 * mean);
  });
});

describe('periodic surface temperature (semi-infinite solid)', () => {
  it('amplitude decays as exp(−x/δ) and lags by x/δ radians', () => {
    // source: Carslaw & Jaeger 1959 §2.6: T(x,t) = A·exp(−x/δ)·cos(ωt − x/δ), δ = √(2α/ω); tol 3 % amplitude, 0.25 h lag
    const alpha = 1.7 / (2300 * 900);
    const period = 86400;
    const omega = (2 * Math.PI) / period;
    const delta = Math.sqrt((2 * alpha) / omega);
    const s = createConductionState([concrete(1.2)], 20, { back: { kind: 'adiabatic' }, cellsPerLayer: [240] });
    const dt = 300;
    const probeDepth = 0.1;
    let j = 0;
    while (s.depthM[j]! < probeDepth - 1e-9) j++;
    const steps = (6 * period) / dt;
    let maxT = -Infinity;
    let minT = Infinity;
    let tMax = 0;
    for (let i = 1; i <= steps; i++) {
      const t = i * dt;
      stepConductionWithSurfaceTemp(s, 20 + 10 * Math.cos(omega * t), dt, 0);
      if (i > steps - period / dt) {
        const v = s.tempC[j]!;
        if (v > maxT) {
          maxT = v;
          tMax = t % period;
        }
        if (v < minT) minT = v;
      }
    }
    const amp = (maxT - minT) / 2;
    const ampExact = 10 * Math.exp(-probeDepth / delta);
    expect(Math.abs(amp - ampExact) / ampExact).toBeLessThan(0.03);
    const lagExactH = (probeDepth / delta / omega) / 3600;
    expect(Math.abs(tMax / 3600 - lagExactH)).toBeLessThan(0.25);
  });
});

describe('sub-stepping', () => {
  it('asks for sub-steps only for a thin metal outer layer', () => {
    // common practice: lumped sheet τ = ρcL/(h + 1/R) = 2473/(16 + 7.69) ≈ 104 s → ⌈3600/104⌉ = 35; concrete needs none
    const sheet = createConductionState([steel], 20, { back: { kind: 'resistance', resistanceM2KW: 0.13 } });
    const n = conductionSubsteps(sheet, 3600, 16);
    const tau = (7850 * 450 * 0.0007) / (16 + 1 / 0.13);
    expect(n).toBe(Math.ceil(3600 / tau));
    expect(conductionSubsteps(sheet, 60, 16)).toBe(1);
    expect(conductionSubsteps(createConductionState([concrete(0.2)], 20), 3600, 16)).toBe(1);
    // common practice: a 6 mm glass pane (Bi ≈ 0.15) over a gap and R_si: τ = ρcL/(h + 1/(R_gap + R_pane + R_si)) ≈ 13 min
    const glass = { name: 'glass', thicknessM: 0.006, conductivityWmK: 1, densityKgM3: 2500, specificHeatJkgK: 840 };
    const gap = { name: 'gap', thicknessM: 0.016, conductivityWmK: 0.094, densityKgM3: 1.2, specificHeatJkgK: 1005 };
    const dgu = createConductionState([glass, gap, glass], 20, { back: { kind: 'resistance', resistanceM2KW: 0.13 } });
    const tauGlass = (2500 * 840 * 0.006) / (16 + 1 / (0.016 / 0.094 + 0.006 + 0.13));
    expect(conductionSubsteps(dgu, 3600, 16)).toBe(Math.ceil(3600 / tauGlass));
  });
});
