/**
 * Stage 4: hour by hour, the shortwave on every patch (beam, Perez sky, reflected in two bands),
 * the surface energy balance with transient conduction and longwave exchange between patches, and
 * at every sensor the six directional shortwave and longwave fluxes → MRT → UTCI.
 *
 * Shortwave on patch i (W/m², per band β ∈ {visible, near-infrared}, fraction f_β of the solar
 * spectrum after ASTM G173):
 *   E_β,i = f_β·[(DNI + E_cs)·max(0, n·s)·V_i + Σ_b L_b·P_i,b]
 *         + Σ_j F_ij·ρ_β,j·E_β,j + F_i,g·ρ_β,g·f_β·GHI          (Jacobi, REFLECTION_PASSES bounces)
 * with V_i the sun visibility, L_b the Perez (1990) radiance of sky band b and P_i,b the patch's
 * visible projected solid angle of that band, E_cs the circumsolar point source (skyRadiance.ts),
 * F the cosine-weighted view fractions (surfaceViews), "g" the far ground beyond the apron.
 * The reflection here is the diffuse (Lambertian) part, ρ·(1 − specularFraction); the specular
 * part reaches the sensors as directional beams traced by the glare stage (glare.ts), passed in as
 * `specularBeamTermWm2` (Σ fp·E per sensor and step) and added to the direct-beam term of the MRT,
 * so it is not counted twice. Specular reflection onto other patches is not modelled.
 *
 * Longwave arriving at patch i: L_in = F_i,sky·L↓ + Σ_j F_ij·J_j + F_i,g·J_g + F_i,other·σT_air⁴,
 * J the longwave leaving each patch (εσT⁴ + (1 − ε)·L_in), the sky taken as isotropic with the
 * downwelling flux L↓ of the step. Within a step the patches are solved again with updated J until
 * no surface temperature changes by more than CONVERGENCE_K (at most MAX_PASSES passes).
 *
 * Speed (the loops are small module-level functions so the engine optimises each on its own): the
 * view fractions are premultiplied by the reflectances once; a step with no shortwave skips the
 * bounces; the second longwave pass sums every row, later passes add only the change of the
 * patches re-solved in the pass before (through the transposed view lists); a re-solve reuses the
 * first solve's eliminated conduction system (resolveSurfaceStep); results are gathered per block
 * of steps and written patch-major once per block.
 */
import type { PreparedModel } from './model.ts';
import type { Steps } from './steps.ts';
import type { GeometryData } from './geometryPass.ts';
import { skySubdivision } from '../../physics/skySubdivision.ts';
import { fillSkyRadiance, type SkyRadianceResult } from '../../physics/skyRadiance.ts';
import { SOLAR_VISIBLE_BAND_FRACTION, SOLAR_NIR_BAND_FRACTION } from '../../physics/solarSpectrum.ts';
import { createSurfaceState, createSurfaceResult, stepSurface, resolveSurfaceStep, type SurfaceState, type SurfaceStepInputs, type SurfaceStepResult } from '../../physics/surfaceEnergyBalance.ts';
import { windAtHeightFrom10mMs } from '../../physics/wind.ts';
import { mrtSixDirectionalPackedC, projectedAreaFactor } from '../../physics/mrt.ts';
import { utciClampedC, utciStressCategory, type UtciCategoryId, type UtciClampedResult } from '../../physics/utci.ts';
import { STEFAN_BOLTZMANN_W_M2K4, KELVIN_AT_0C } from '../../physics/constants.ts';
import { SKY_LEVEL } from './geometryPass.ts';

export const REFLECTION_PASSES = 2;
export const CONVERGENCE_K = 0.1;
export const MAX_PASSES = 6;
/** Repetitions of the first day before the recorded run, so conduction starts from a periodic state. */
export const SPIN_UP_DAYS = 2;
export const MAX_SUBSTEPS = 4;
/** A lower bound of a surface's conductance to its surroundings (convection + linearised radiation) [W/(m²·K)]. */
const SURFACE_CONDUCTANCE_FLOOR_WM2K = 8;

export interface TimeStepOutput {
  /** P × T, row-major by patch. */
  incidentShortwaveWm2: Float32Array;
  surfaceTempC: Float32Array;
  longwaveEmissionWm2: Float32Array;
  /** N × T, row-major by sensor. */
  sensorSunlit: Uint8Array;
  mrtC: Float32Array;
  utciC: Float32Array;
  category: UtciCategoryId[][];
  /** Bookkeeping and convergence figures for the run record. */
  stats: {
    maxEnergyResidualPct: number;
    passesMax: number;
    passesMean: number;
    unconvergedSteps: number;
    utciClampedSensorSteps: number;
    utciClampedInputs: Record<string, number>;
    spinUpSteps: number;
    /** Patch solves after the first longwave pass (selective re-solving). */
    resolvedPatchSteps: number;
  };
}

function windAt(v10: number, heightM: number): number {
  return windAtHeightFrom10mMs(Math.max(v10, 0.1), Math.max(heightM, 0.5));
}

/** Steps gathered before writing the P × T outputs (patch-major) in one sweep. */
const OUTPUT_BLOCK_STEPS = 64;

/** Beam, circumsolar and sky-band shortwave on patches [i0, i1) [W/m²]; returns whether any is non-zero. */
function directShortwave(
  i0: number, i1: number, normals: Float64Array | Float32Array, patchSun: Uint8Array, tauSun: Float32Array | undefined, S: number, sunIdx: number,
  sx: number, sy: number, sz: number, beamNormal: number, bandRadiance: Float64Array, B: number, skyBand: Float32Array, eDirect: Float64Array,
): boolean {
  let any = false;
  for (let i = i0; i < i1; i++) {
    let e = 0;
    if (sunIdx >= 0 && patchSun[i * S + sunIdx] === 1) {
      // Fabric sheets and crowns pass part of the beam (transmittance 1 when there are none).
      const tau = tauSun !== undefined ? tauSun[i * S + sunIdx]! : 1;
      const c = normals[3 * i]! * sx + normals[3 * i + 1]! * sy + normals[3 * i + 2]! * sz;
      if (c > 0) e += beamNormal * c * tau;
    }
    const o = i * B;
    for (let b = 0; b < B; b++) e += bandRadiance[b]! * skyBand[o + b]!;
    eDirect[i] = e;
    if (e !== 0) any = true;
  }
  return any;
}

/**
 * One Jacobi bounce of the diffuse reflection on rows [i0, i1), both bands interleaved:
 * dst[2i+β] = f_β·E_direct,i + F_i,g·g_β + Σ_j (F_ij·ρ_β,j)·src[2j+β].
 */
function reflectionBounce(
  i0: number, i1: number, rowStart: Uint32Array, patchIndex: Uint32Array, fRho: Float64Array, groundFraction: Float32Array,
  gV: number, gN: number, fv: number, fn: number, eDirect: Float64Array, src: Float64Array, dst: Float64Array,
): void {
  for (let i = i0; i < i1; i++) {
    const gf = groundFraction[i]!;
    let rv = gf * gV, rn = gf * gN;
    for (let e = rowStart[i]!, end = rowStart[i + 1]!; e < end; e++) {
      const j2 = 2 * patchIndex[e]!;
      rv += fRho[2 * e]! * src[j2]!;
      rn += fRho[2 * e + 1]! * src[j2 + 1]!;
    }
    const ed = eDirect[i]!;
    dst[2 * i] = fv * ed + rv;
    dst[2 * i + 1] = fn * ed + rn;
  }
}

/** Longwave arriving at rows [i0, i1): base_i + Σ_j F_ij·J_j [W/m²]. */
function longwaveRowSums(i0: number, i1: number, rowStart: Uint32Array, patchIndex: Uint32Array, fraction: Float32Array, base: Float64Array, j: Float64Array, lOut: Float64Array): void {
  for (let i = i0; i < i1; i++) {
    let l = base[i]!;
    for (let e = rowStart[i]!, end = rowStart[i + 1]!; e < end; e++) l += fraction[e]! * j[patchIndex[e]!]!;
    lOut[i] = l;
  }
}

/** Adds F_ij·ΔJ_j of the listed changed patches j to the longwave arriving at every row i (transposed lists). */
function longwavePushChanges(count: number, changed: Uint32Array, dJ: Float64Array, colStart: Uint32Array, colRow: Uint32Array, colFraction: Float32Array, lCur: Float64Array): void {
  for (let c = 0; c < count; c++) {
    const j = changed[c]!;
    const d = dJ[j]!;
    for (let e = colStart[j]!, end = colStart[j + 1]!; e < end; e++) lCur[colRow[e]!] = lCur[colRow[e]!]! + colFraction[e]! * d;
  }
}

/** Per-run arrays of the patch loop (one set per run; `solvePatches` reads and writes them). */
interface PatchWork {
  states: SurfaceState[];
  eps: Float64Array;
  absV: Float64Array;
  absN: Float64Array;
  windFactor: Float64Array;
  /** Interleaved visible/NIR irradiance of the final bounce [W/m²]. */
  eVN: Float64Array;
  lCur: Float64Array;
  lIn: Float64Array;
  tNew: Float64Array;
  jLw: Float64Array;
  dJ: Float64Array;
  emitted: Float64Array;
  residualPct: Float64Array;
  changed: Uint32Array;
  changedCount: number;
  inputs: SurfaceStepInputs;
  res: SurfaceStepResult;
}

/**
 * Solves (first pass) or re-solves the patches [i0, i1) against the longwave in `lCur`; on later
 * passes only those whose incoming longwave moved enough to shift their temperature by more than
 * half the tolerance (ε·ΔL over a lower bound of the surface conductance). Updates J, records ΔJ
 * and the changed list; returns the largest temperature change of a re-solve [K] and adds the
 * number of re-solves to `w.changedCount`.
 */
function solvePatches(w: PatchWork, i0: number, i1: number, first: boolean, ta: number, wind10: number, dtS: number): number {
  const { states, eps, absV, absN, windFactor, eVN, lCur, lIn, tNew, jLw, dJ, emitted, residualPct, changed, inputs, res } = w;
  let maxChange = 0;
  let n = w.changedCount;
  const v = Math.max(wind10, 0.1);
  inputs.airTempC = ta;
  for (let i = i0; i < i1; i++) {
    const l = lCur[i]!;
    if (!first && (eps[i]! * Math.abs(l - lIn[i]!)) / SURFACE_CONDUCTANCE_FLOOR_WM2K < 0.5 * CONVERGENCE_K) continue;
    lIn[i] = l;
    const st = states[i]!;
    inputs.absorbedShortwaveWm2 = absV[i]! * eVN[2 * i]! + absN[i]! * eVN[2 * i + 1]!;
    inputs.longwaveInWm2 = l;
    inputs.windMs = v * windFactor[i]!;
    if (first) stepSurface(st, inputs, dtS, res);
    else resolveSurfaceStep(st, inputs, dtS, res);
    if (!first) {
      const d = Math.abs(res.surfaceTempC - tNew[i]!);
      if (d > maxChange) maxChange = d;
    }
    tNew[i] = res.surfaceTempC;
    dJ[i] = res.leavingLongwaveWm2 - jLw[i]!;
    jLw[i] = res.leavingLongwaveWm2;
    changed[n++] = i;
    emitted[i] = res.emittedLongwaveWm2;
    const gain = res.absorbedShortwaveWm2 + res.absorbedLongwaveWm2;
    const resid = gain - res.emittedLongwaveWm2 - res.convectedWm2 - res.conductedWm2 - res.storedWm2;
    residualPct[i] = (100 * Math.abs(resid)) / Math.max(gain, res.emittedLongwaveWm2, 1);
  }
  w.changedCount = n;
  return maxChange;
}

/** The transposed (column) lists of a row-sparse view matrix. */
function transposeViews(P: number, rowStart: Uint32Array, patchIndex: Uint32Array, fraction: Float32Array): { colStart: Uint32Array; colRow: Uint32Array; colFraction: Float32Array } {
  const nnz = rowStart[P]!;
  const colStart = new Uint32Array(P + 1);
  for (let e = 0; e < nnz; e++) colStart[patchIndex[e]! + 1]!++;
  for (let j = 0; j < P; j++) colStart[j + 1] = colStart[j + 1]! + colStart[j]!;
  const fill = colStart.slice(0, P);
  const colRow = new Uint32Array(nnz), colFraction = new Float32Array(nnz);
  for (let i = 0; i < P; i++) {
    for (let e = rowStart[i]!, end = rowStart[i + 1]!; e < end; e++) {
      const k = fill[patchIndex[e]!]!++;
      colRow[k] = i;
      colFraction[k] = fraction[e]!;
    }
  }
  return { colStart, colRow, colFraction };
}

/**
 * @param specularBeamTermWm2 Optional N × T (row-major by sensor): the reflected-sun beams at each
 *   sensor as Σ fp(posture, beam altitude) · E [W/m²] (glare.ts `sensorBeamTermWm2`).
 */
export function runTimeSteps(model: PreparedModel, steps: Steps, geo: GeometryData, onStep?: (done: number, total: number) => void, specularBeamTermWm2?: Float32Array): TimeStepOutput {
  const P = model.patches.count;
  const T = steps.count;
  const N = geo.sensorSun.length > 0 || geo.sensorSkyViewFactor.length > 0 ? geo.sensorSkyViewFactor.length : 0;
  const B = geo.bandCount;
  const S = geo.sunCount;
  const sky = skySubdivision(SKY_LEVEL);
  const radiance = new Float64Array(sky.count);
  const bandRadiance = new Float64Array(B);
  const csResult: SkyRadianceResult = { circumsolarNormalWm2: 0 };
  const fv = SOLAR_VISIBLE_BAND_FRACTION, fn = SOLAR_NIR_BAND_FRACTION;
  const mats = model.materials;
  // Per patch material properties, flattened.
  const rhoV = new Float64Array(P), rhoN = new Float64Array(P), absV = new Float64Array(P), absN = new Float64Array(P), eps = new Float64Array(P);
  const windFactor = new Float64Array(P);
  for (let i = 0; i < P; i++) {
    const m = mats[model.patchMaterial[i]!]!;
    // Diffuse part only; the specular part is the glare stage's beam (no double counting).
    rhoV[i] = m.reflectanceVisible * (1 - m.specularFraction);
    rhoN[i] = m.reflectanceNir * (1 - m.specularFraction);
    absV[i] = 1 - m.reflectanceVisible - m.transmittanceVisible;
    absN[i] = 1 - m.reflectanceNir - m.transmittanceNir;
    eps[i] = m.emissivity;
    // The log law is linear in the 10 m wind: precompute the height factor once per patch.
    windFactor[i] = windAt(1, model.patches.centroids[3 * i + 2]! - model.groundZ);
  }
  const gm = mats[model.groundMaterial]!;
  const gAbs = 1 - (fv * gm.reflectanceVisible + fn * gm.reflectanceNir);
  const firstAir = steps.airTempC[0]!;
  // Forcing is constant within a step, so a thin sheet (time constant of minutes) reaches its
  // end-of-step temperature to within (1 + Δt/(nτ))^−n of the start deviation with n backward-Euler
  // sub-steps: 4 are ample (≈ 1e-4 for τ = 2 min, Δt = 1 h).
  const states: SurfaceState[] = new Array(P);
  for (let i = 0; i < P; i++) states[i] = createSurfaceState(mats[model.patchMaterial[i]!]!, { initialTempC: firstAir, maxSubsteps: MAX_SUBSTEPS });
  const farGround = createSurfaceState(gm, { initialTempC: firstAir });

  const pv = geo.patchViews, sv = geo.sensorViews;
  const nnz = pv.rowStart[P] ?? 0;
  // View fractions premultiplied by the diffuse reflectance of the patch seen, bands interleaved.
  const fRho = new Float64Array(2 * nnz);
  for (let e = 0; e < nnz; e++) {
    const j = pv.patchIndex[e]!, f = pv.fraction[e]!;
    fRho[2 * e] = f * rhoV[j]!;
    fRho[2 * e + 1] = f * rhoN[j]!;
  }
  const { colStart, colRow, colFraction } = transposeViews(P, pv.rowStart, pv.patchIndex, pv.fraction);
  const eDirect = new Float64Array(P);
  let eVN = new Float64Array(2 * P), eVN2 = new Float64Array(2 * P);
  const jOld = new Float64Array(P), lBase = new Float64Array(P);
  const work: PatchWork = {
    states, eps, absV, absN, windFactor, eVN,
    lCur: new Float64Array(P), lIn: new Float64Array(P), tNew: new Float64Array(P), jLw: new Float64Array(P), dJ: new Float64Array(P),
    emitted: new Float64Array(P), residualPct: new Float64Array(P), changed: new Uint32Array(P), changedCount: 0,
    inputs: { absorbedShortwaveWm2: 0, longwaveInWm2: 0, airTempC: 0, windMs: 0 }, res: createSurfaceResult(),
  };
  const { jLw, tNew, lCur, emitted, residualPct } = work;
  for (let i = 0; i < P; i++) {
    const tK = firstAir + KELVIN_AT_0C;
    jLw[i] = STEFAN_BOLTZMANN_W_M2K4 * tK ** 4;
    jOld[i] = jLw[i]!;
    tNew[i] = firstAir;
  }
  let jFar = STEFAN_BOLTZMANN_W_M2K4 * (firstAir + KELVIN_AT_0C) ** 4;
  const inputs: SurfaceStepInputs = { absorbedShortwaveWm2: 0, longwaveInWm2: 0, airTempC: 0, windMs: 0 };
  const res = createSurfaceResult();
  const dtS = steps.stepHours * 3600;

  const out: TimeStepOutput = {
    incidentShortwaveWm2: new Float32Array(P * T),
    surfaceTempC: new Float32Array(P * T),
    longwaveEmissionWm2: new Float32Array(P * T),
    sensorSunlit: new Uint8Array(N * T),
    mrtC: new Float32Array(N * T),
    utciC: new Float32Array(N * T),
    category: Array.from({ length: N }, () => new Array<UtciCategoryId>(T)),
    stats: { maxEnergyResidualPct: 0, passesMax: 0, passesMean: 0, unconvergedSteps: 0, utciClampedSensorSteps: 0, utciClampedInputs: {}, spinUpSteps: 0, resolvedPatchSteps: 0 },
  };
  // Recorded steps are gathered step-major per block, then written patch-major.
  const blockSteps = Math.max(1, Math.min(OUTPUT_BLOCK_STEPS, T));
  const blockInc = new Float32Array(P * blockSteps), blockTemp = new Float32Array(P * blockSteps), blockEmit = new Float32Array(P * blockSteps);
  let blockFirstStep = 0, blockCount = 0;
  const flushBlock = () => {
    for (let i = 0; i < P; i++) {
      const o = i * T + blockFirstStep;
      for (let b = 0; b < blockCount; b++) {
        out.incidentShortwaveWm2[o + b] = blockInc[b * P + i]!;
        out.surfaceTempC[o + b] = blockTemp[b * P + i]!;
        out.longwaveEmissionWm2[o + b] = blockEmit[b * P + i]!;
      }
    }
    blockCount = 0;
  };
  const stepsPerDay = Math.max(1, Math.min(T, Math.round(24 / steps.stepHours)));
  const schedule: number[] = [];
  for (let c = 0; c < SPIN_UP_DAYS; c++) for (let i = 0; i < stepsPerDay; i++) schedule.push(i);
  out.stats.spinUpSteps = schedule.length;
  for (let i = 0; i < T; i++) schedule.push(i);
  let passesSum = 0;
  const sK = new Float64Array(6 * N), sL = new Float64Array(6 * N);
  const clamp: UtciClampedResult = { utciC: 0, clamped: false, clampedInputs: [] };
  const normals = model.patches.normals;
  // Far ground unshaded: its reflected shortwave per band per W/m² of GHI.
  const gRefV = gm.reflectanceVisible * fv, gRefN = gm.reflectanceNir * fn;

  for (let q = 0; q < schedule.length; q++) {
    const t = schedule[q]!;
    const record = q >= out.stats.spinUpSteps;
    const sunIdx = geo.sunIndexOfStep[t]!;
    const dni = steps.dniWm2[t]!, dhi = steps.dhiWm2[t]!, ghi = steps.ghiWm2[t]!, ta = steps.airTempC[t]!, v10 = steps.wind10mMs[t]!;
    const lSky = steps.skyLongwaveWm2[t]!;
    const sx = steps.sunDir[3 * t]!, sy = steps.sunDir[3 * t + 1]!, sz = steps.sunDir[3 * t + 2]!;
    // Sky radiance per band (uniform within a band for the Perez patch form).
    if (dhi > 0 && steps.sunAltitudeDeg[t]! > 0) {
      fillSkyRadiance('perez1990', sky, {
        dhiWm2: dhi, dniWm2: dni, dniExtraWm2: steps.dniExtraWm2[t]!, solarZenithDeg: steps.sunZenithDeg[t]!,
        solarAzimuthDeg: steps.sunAzimuthDeg[t]!, relativeAirMass: steps.relativeAirMass[t]!,
      }, radiance, csResult);
    } else {
      radiance.fill(dhi > 0 ? dhi / Math.PI : 0);
      csResult.circumsolarNormalWm2 = 0;
    }
    for (let b = 0; b < B; b++) bandRadiance[b] = radiance[sky.bandStart[b]!]!;
    const beamNormal = sunIdx >= 0 ? dni + csResult.circumsolarNormalWm2 : 0;
    // Direct (beam + circumsolar + sky) on each patch, then the diffuse inter-reflection (Jacobi
    // bounces), far ground unshaded. With no shortwave at all (night) everything is zero.
    const anyDirect = directShortwave(0, P, normals, geo.patchSun, geo.patchSunTransmittance, S, sunIdx, sx, sy, sz, beamNormal, bandRadiance, B, geo.patchSkyBand, eDirect);
    const gV = gRefV * ghi, gN = gRefN * ghi;
    if (anyDirect || gV !== 0 || gN !== 0) {
      for (let i = 0; i < P; i++) {
        eVN[2 * i] = fv * eDirect[i]!;
        eVN[2 * i + 1] = fn * eDirect[i]!;
      }
      for (let pass = 0; pass < REFLECTION_PASSES; pass++) {
        reflectionBounce(0, P, pv.rowStart, pv.patchIndex, fRho, pv.groundFraction, gV, gN, fv, fn, eDirect, eVN, eVN2);
        const tmp = eVN; eVN = eVN2; eVN2 = tmp;
      }
    } else {
      eVN.fill(0);
    }
    work.eVN = eVN;
    const airLw = STEFAN_BOLTZMANN_W_M2K4 * (ta + KELVIN_AT_0C) ** 4;
    // Predict this step's leaving longwave by extrapolating the last two steps, so the first pass
    // starts close and the later passes re-solve few patches.
    for (let i = 0; i < P; i++) {
      const now = jLw[i]!;
      jLw[i] = Math.max(0, 2 * now - jOld[i]!);
      jOld[i] = now;
      lBase[i] = pv.skyFraction[i]! * lSky + pv.groundFraction[i]! * jFar + pv.otherFraction[i]! * airLw;
    }
    // Surface energy balance, iterated on the longwave exchange.
    let passes = 0;
    let converged = P === 0;
    while (passes < MAX_PASSES && !converged) {
      passes++;
      // Pass 1 and 2 sum every row; later passes add the change of the patches re-solved last.
      if (passes <= 2 || work.changedCount > P / 4) longwaveRowSums(0, P, pv.rowStart, pv.patchIndex, pv.fraction, lBase, jLw, lCur);
      else longwavePushChanges(work.changedCount, work.changed, work.dJ, colStart, colRow, colFraction, lCur);
      work.changedCount = 0;
      const maxChange = solvePatches(work, 0, P, passes === 1, ta, v10, dtS);
      const resolved = work.changedCount;
      if (passes > 1) out.stats.resolvedPatchSteps += resolved;
      converged = passes > 1 && (resolved === 0 || maxChange < CONVERGENCE_K);
    }
    if (record) {
      if (blockCount === 0) blockFirstStep = t;
      const o = blockCount * P;
      for (let i = 0; i < P; i++) {
        blockInc[o + i] = eVN[2 * i]! + eVN[2 * i + 1]!;
        blockTemp[o + i] = tNew[i]!;
        blockEmit[o + i] = emitted[i]!;
        if (residualPct[i]! > out.stats.maxEnergyResidualPct) out.stats.maxEnergyResidualPct = residualPct[i]!;
      }
      blockCount++;
      if (blockCount === blockSteps || t === T - 1) flushBlock();
    }
    if (!converged) out.stats.unconvergedSteps++;
    passesSum += passes;
    if (passes > out.stats.passesMax) out.stats.passesMax = passes;
    // Far ground: open, unshaded.
    inputs.absorbedShortwaveWm2 = gAbs * ghi;
    inputs.longwaveInWm2 = lSky;
    inputs.airTempC = ta;
    inputs.windMs = windAt(v10, 1);
    stepSurface(farGround, inputs, dtS, res);
    jFar = res.leavingLongwaveWm2;
    onStep?.(q + 1, schedule.length);
    if (!record) continue;

    // Sensors: six directional fluxes → MRT → UTCI.
    for (let r = 0; r < 6 * N; r++) {
      let k = sv.groundFraction[r]! * (gm.reflectanceVisible * fv + gm.reflectanceNir * fn) * ghi;
      let l = sv.skyFraction[r]! * lSky + sv.groundFraction[r]! * jFar + sv.otherFraction[r]! * airLw;
      for (let e = sv.rowStart[r]!, end = sv.rowStart[r + 1]!; e < end; e++) {
        const j = sv.patchIndex[e]!, f = sv.fraction[e]!;
        k += f * (rhoV[j]! * eVN[2 * j]! + rhoN[j]! * eVN[2 * j + 1]!);
        l += f * jLw[j]!;
      }
      const o = r * B;
      for (let b = 0; b < B; b++) k += bandRadiance[b]! * geo.sensorSkyBand[o + b]!;
      sK[r] = k;
      sL[r] = l;
    }
    let n0 = 0;
    for (const set of model.sensors) {
      const posture = set.zone.posture;
      const fp = sunIdx >= 0 ? projectedAreaFactor(posture, Math.min(90, steps.sunAltitudeDeg[t]!)) : 0;
      const count = set.positions.length / 3;
      for (let k = n0; k < n0 + count; k++) {
        const lit = sunIdx >= 0 && geo.sensorSun[k * S + sunIdx] === 1;
        // Direct beam fp·I plus the reflected-sun beams Σ fp·E, passed as one term with fp = 1.
        const tauSensor = lit && geo.sensorSunTransmittance ? geo.sensorSunTransmittance[k * S + sunIdx]! : 1;
        const beamTerm = (lit ? beamNormal * fp * tauSensor : 0) + (specularBeamTermWm2 === undefined ? 0 : specularBeamTermWm2[k * T + t]!);
        const mrt = mrtSixDirectionalPackedC(sK, 6 * k, sL, 6 * k, posture, beamTerm, 1);
        utciClampedC({ airTempC: ta, mrtC: mrt, wind10mMs: v10, relativeHumidityPct: steps.relativeHumidityPct[t]! }, clamp);
        if (clamp.clamped) {
          out.stats.utciClampedSensorSteps++;
          for (const c of clamp.clampedInputs) out.stats.utciClampedInputs[c] = (out.stats.utciClampedInputs[c] ?? 0) + 1;
        }
        const idx = k * T + t;
        out.sensorSunlit[idx] = lit ? 1 : 0;
        out.mrtC[idx] = mrt;
        out.utciC[idx] = clamp.utciC;
        out.category[k]![t] = utciStressCategory(clamp.utciC);
      }
      n0 += count;
    }
  }
  out.stats.passesMean = passesSum / Math.max(1, schedule.length);
  return out;
}
