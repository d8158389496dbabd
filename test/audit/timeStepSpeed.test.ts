/**
 * The faster hour-by-hour stage (src/audit/stages/timeStep.ts) against a reference recorded from
 * the stage as it stood before its speed work, on the small invented canyon scene of
 * timeStepScene.ts (thin steel, glass and aluminium sheets, masonry, paving): surface
 * temperatures and MRT, the energy bookkeeping, convergence and repeatability; and the re-solve of
 * a surface step (resolveSurfaceStep) against a fresh step from the same start.
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { AuditState } from '../../src/audit/pipeline.ts';
import { runTimeSteps, type TimeStepOutput } from '../../src/audit/stages/timeStep.ts';
import { glareStage } from '../../src/audit/stages/glare.ts';
import { createSurfaceState, createSurfaceResult, stepSurface, resolveSurfaceStep } from '../../src/physics/surfaceEnergyBalance.ts';
import { MATERIAL_PRESETS } from '../../src/physics/materials.ts';
import { timeStepScene } from './timeStepScene.ts';

interface Reference {
  patches: number;
  steps: number;
  sensors: number;
  surfaceTempC: number[];
  mrtC: number[];
}

const reference = JSON.parse(readFileSync(fileURLToPath(new URL('../fixtures/audit/timeStepReference.json', import.meta.url)), 'utf8')) as Reference;

function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]! - b[i]!));
  return m;
}

describe('runTimeSteps on the canyon scene', () => {
  let state: AuditState;
  let out: TimeStepOutput;
  let beams: Float32Array;
  beforeAll(async () => {
    state = await timeStepScene();
    beams = glareStage(state.model, state.steps, state.geometry, []).sensorBeamTermWm2;
    out = runTimeSteps(state.model, state.steps, state.geometry, undefined, beams);
  }, 120_000);

  it('matches the recorded surface temperatures and MRT to 0.05 K', () => {
    // source: regression reference from the previous runTimeSteps (test/fixtures/audit/SOURCE.md),
    // stored to 0.001 K; tolerance 0.05 K (the accuracy the speed work had to keep).
    expect(state.model.patches.count).toBe(reference.patches);
    expect(state.steps.count).toBe(reference.steps);
    expect(out.surfaceTempC.length).toBe(reference.surfaceTempC.length);
    expect(out.mrtC.length).toBe(reference.mrtC.length);
    expect(maxAbsDiff(out.surfaceTempC, reference.surfaceTempC)).toBeLessThan(0.05);
    expect(maxAbsDiff(out.mrtC, reference.mrtC)).toBeLessThan(0.05);
    // The scene is not trivial: thin sheets in the sun run well above the air (max 30 °C).
    expect(Math.max(...out.surfaceTempC)).toBeGreaterThan(40);
  });

  it('keeps every patch step in energy balance and converges the longwave exchange', () => {
    // common practice: the surface balance S + εL = emitted + convected + conducted + stored
    // closes for every step; tolerance 1 % of the larger gain or loss.
    expect(out.stats.maxEnergyResidualPct).toBeLessThan(1);
    // Every step converged to CONVERGENCE_K within MAX_PASSES passes.
    expect(out.stats.unconvergedSteps).toBe(0);
    expect(out.stats.passesMean).toBeGreaterThanOrEqual(2);
  });

  it('gives the same numbers on a second run', () => {
    const again = runTimeSteps(state.model, state.steps, state.geometry, undefined, beams);
    expect(Array.from(again.surfaceTempC)).toEqual(Array.from(out.surfaceTempC));
    expect(Array.from(again.mrtC)).toEqual(Array.from(out.mrtC));
    expect(Array.from(again.utciC)).toEqual(Array.from(out.utciC));
  });
});

describe('resolveSurfaceStep', () => {
  const inputs = { absorbedShortwaveWm2: 600, longwaveInWm2: 380, airTempC: 30, windMs: 1 };
  const moved = { ...inputs, absorbedShortwaveWm2: 640, longwaveInWm2: 395 };
  for (const id of ['steel-dark-painted', 'concrete-light', 'stone-paving', 'glass-clear']) {
    it(`re-solving a ${id} step equals a fresh step from the same start`, () => {
      const mat = MATERIAL_PRESETS[id]!;
      const a = createSurfaceState(mat, { initialTempC: 22, maxSubsteps: 4 });
      const b = createSurfaceState(mat, { initialTempC: 22, maxSubsteps: 4 });
      const ra = createSurfaceResult(), rb = createSurfaceResult();
      for (let k = 0; k < 3; k++) {
        stepSurface(a, inputs, 3600, ra);
        resolveSurfaceStep(a, moved, 3600, ra);
        stepSurface(b, inputs, 3600, rb);
      }
      const c = createSurfaceState(mat, { initialTempC: 22, maxSubsteps: 4 });
      const rc = createSurfaceResult();
      for (let k = 0; k < 3; k++) stepSurface(c, moved, 3600, rc);
      // common practice: the same implicit step from the same start has the same root; Newton
      // stops at 1e-9 K, so the two agree to 1e-6 K and the fluxes to 1e-6 W/m².
      expect(Math.abs(ra.surfaceTempC - rc.surfaceTempC)).toBeLessThan(1e-6);
      expect(Math.abs(ra.storedWm2 - rc.storedWm2)).toBeLessThan(1e-6);
      expect(Math.abs(ra.conductedWm2 - rc.conductedWm2)).toBeLessThan(1e-6);
      expect(Math.abs(ra.emittedLongwaveWm2 - rc.emittedLongwaveWm2)).toBeLessThan(1e-6);
      for (let n = 0; n < a.conduction.nodeCount; n++) expect(Math.abs(a.conduction.tempC[n]! - c.conduction.tempC[n]!)).toBeLessThan(1e-6);
      // The moved inputs heat the surface (the re-solve did act).
      expect(ra.surfaceTempC).toBeGreaterThan(rb.surfaceTempC);
    });
  }
});
