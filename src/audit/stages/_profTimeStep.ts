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
 */
import type { PreparedModel } from './model.ts';
import type { Steps } from './steps.ts';
import type { GeometryData } from './geometryPass.ts';
import { skySubdivision } from '../../physics/skySubdivision.ts';
import { fillSkyRadiance, type SkyRadianceResult } from '../../physics/skyRadiance.ts';
import { SOLAR_VISIBLE_BAND_FRACTION, SOLAR_NIR_BAND_FRACTION } from '../../physics/solarSpectrum.ts';
import { createSurfaceState, createSurfaceResult, stepSurface, type SurfaceState, type SurfaceStepInputs } from '../../physics/surfaceEnergyBalance.ts';
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

/**
 * @param specularBeamTermWm2 Optional N × T (row-major by sensor): the reflected-sun beams at each
 *   sensor as Σ fp(posture, beam altitude) · E [W/m²] (glare.ts `sensorBeamTermWm2`).
 */
export const PT = { sky: 0, direct: 0, refl: 0, snap: 0, lwsum: 0, solve: 0, record: 0, sensors: 0, mrt: 0, solves: 0 };
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
  const heightM = new Float64Array(P), windFactor = new Float64Array(P);
  for (let i = 0; i < P; i++) {
    const m = mats[model.patchMaterial[i]!]!;
    // Diffuse part only; the specular part is the glare stage's beam (no double counting).
    rhoV[i] = m.reflectanceVisible * (1 - m.specularFraction);
    rhoN[i] = m.reflectanceNir * (1 - m.specularFraction);
    absV[i] = 1 - m.reflectanceVisible - m.transmittanceVisible;
    absN[i] = 1 - m.reflectanceNir - m.transmittanceNir;
    eps[i] = m.emissivity;
    heightM[i] = model.patches.centroids[3 * i + 2]! - model.groundZ;
    // The log law is linear in the 10 m wind: precompute the height factor once per patch.
    windFactor[i] = windAt(1, heightM[i]!);
  }
  const gm = mats[model.groundMaterial]!;
  const gAbs = 1 - (fv * gm.reflectanceVisible + fn * gm.reflectanceNir);
  // States: the recorded run starts from the spun-up state.
  const states: SurfaceState[] = new Array(P);
  const firstAir = steps.airTempC[0]!;
  // Forcing is constant within a step, so a thin sheet (time constant of minutes) reaches its
  // end-of-step temperature to within (1 + Δt/(nτ))^−n of the start deviation with n backward-Euler
  // sub-steps: 4 are ample (≈ 1e-4 for τ = 2 min, Δt = 1 h).
  for (let i = 0; i < P; i++) states[i] = createSurfaceState(mats[model.patchMaterial[i]!]!, { initialTempC: firstAir, maxSubsteps: MAX_SUBSTEPS });
  const farGround = createSurfaceState(gm, { initialTempC: firstAir });
  // Snapshot buffers for re-solving a step.
  const snapOffset = new Uint32Array(P + 1);
  for (let i = 0; i < P; i++) snapOffset[i + 1] = snapOffset[i]! + states[i]!.conduction.nodeCount;
  const snap = new Float64Array(snapOffset[P]!);
  const snapSurface = new Float64Array(P);

  const pv = geo.patchViews, sv = geo.sensorViews;
  const eDirect = new Float64Array(P);
  let eV = new Float64Array(P), eN = new Float64Array(P);
  let eV2 = new Float64Array(P), eN2 = new Float64Array(P);
  const jLw = new Float64Array(P), jNext = new Float64Array(P), jOld = new Float64Array(P), lIn = new Float64Array(P), tNew = new Float64Array(P);
  const emitted = new Float64Array(P), residualPct = new Float64Array(P);
  for (let i = 0; i < P; i++) {
    const tK = firstAir + KELVIN_AT_0C;
    jLw[i] = STEFAN_BOLTZMANN_W_M2K4 * tK ** 4;
    jNext[i] = jLw[i]!;
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
  const stepsPerDay = Math.max(1, Math.min(T, Math.round(24 / steps.stepHours)));
  const schedule: number[] = [];
  for (let c = 0; c < SPIN_UP_DAYS; c++) for (let i = 0; i < stepsPerDay; i++) schedule.push(i);
  out.stats.spinUpSteps = schedule.length;
  for (let i = 0; i < T; i++) schedule.push(i);
  let passesSum = 0;
  const sK = new Float64Array(6 * N), sL = new Float64Array(6 * N);
  const clamp: UtciClampedResult = { utciC: 0, clamped: false, clampedInputs: [] };

  for (let q = 0; q < schedule.length; q++) {
    const t = schedule[q]!;
    const record = q >= out.stats.spinUpSteps;
    const sunIdx = geo.sunIndexOfStep[t]!;
    const dni = steps.dniWm2[t]!, dhi = steps.dhiWm2[t]!, ghi = steps.ghiWm2[t]!, ta = steps.airTempC[t]!, v10 = steps.wind10mMs[t]!;
    const lSky = steps.skyLongwaveWm2[t]!;
    const sx = steps.sunDir[3 * t]!, sy = steps.sunDir[3 * t + 1]!, sz = steps.sunDir[3 * t + 2]!;
    let _t = performance.now(); const _lap = (k: keyof typeof PT) => { const n = performance.now(); PT[k] += n - _t; _t = n; };
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
    _lap('sky');
    const beamNormal = sunIdx >= 0 ? dni + csResult.circumsolarNormalWm2 : 0;
    // Direct (beam + circumsolar + sky) on each patch.
    for (let i = 0; i < P; i++) {
      let e = 0;
      if (sunIdx >= 0 && geo.patchSun[i * S + sunIdx] === 1) {
        // Fabric sheets and crowns pass part of the beam (transmittance 1 when there are none).
        const tau = geo.patchSunTransmittance ? geo.patchSunTransmittance[i * S + sunIdx]! : 1;
        const c = model.patches.normals[3 * i]! * sx + model.patches.normals[3 * i + 1]! * sy + model.patches.normals[3 * i + 2]! * sz;
        if (c > 0) e += beamNormal * c * tau;
      }
      const o = i * B;
      for (let b = 0; b < B; b++) e += bandRadiance[b]! * geo.patchSkyBand[o + b]!;
      eDirect[i] = e;
      eV[i] = fv * e;
      eN[i] = fn * e;
    }
    _lap('direct');
    // Diffuse inter-reflection (Jacobi bounces), far ground unshaded.
    const gV = gm.reflectanceVisible * fv * ghi, gN = gm.reflectanceNir * fn * ghi;
    for (let pass = 0; pass < REFLECTION_PASSES; pass++) {
      for (let i = 0; i < P; i++) {
        let rv = pv.groundFraction[i]! * gV, rn = pv.groundFraction[i]! * gN;
        for (let e = pv.rowStart[i]!, end = pv.rowStart[i + 1]!; e < end; e++) {
          const j = pv.patchIndex[e]!, f = pv.fraction[e]!;
          rv += f * rhoV[j]! * eV[j]!;
          rn += f * rhoN[j]! * eN[j]!;
        }
        eV2[i] = fv * eDirect[i]! + rv;
        eN2[i] = fn * eDirect[i]! + rn;
      }
      const tv = eV; eV = eV2; eV2 = tv;
      const tn = eN; eN = eN2; eN2 = tn;
    }
    _lap('refl');
    // Surface energy balance, iterated on the longwave exchange.
    for (let i = 0; i < P; i++) {
      const st = states[i]!;
      const temps = st.conduction.tempC;
      for (let n = 0, o = snapOffset[i]!; n < temps.length; n++) snap[o + n] = temps[n]!;
      snapSurface[i] = st.surfaceTempC;
    }
    const airLw = STEFAN_BOLTZMANN_W_M2K4 * (ta + KELVIN_AT_0C) ** 4;
    // Predict this step's leaving longwave by extrapolating the last two steps, so the first pass
    // starts close and the later passes re-solve few patches.
    for (let i = 0; i < P; i++) {
      const now = jLw[i]!;
      jLw[i] = Math.max(0, 2 * now - jOld[i]!);
      jOld[i] = now;
    }
    _lap('snap');
    let passes = 0;
    let converged = P === 0;
    while (passes < MAX_PASSES && !converged) {
      passes++;
      let maxChange = 0;
      let resolved = 0;
      for (let i = 0; i < P; i++) {
        let l = pv.skyFraction[i]! * lSky + pv.groundFraction[i]! * jFar + pv.otherFraction[i]! * airLw;
        for (let e = pv.rowStart[i]!, end = pv.rowStart[i + 1]!; e < end; e++) l += pv.fraction[e]! * jLw[pv.patchIndex[e]!]!;
        // After the first pass, re-solve only the patches whose incoming longwave moved enough to
        // shift their temperature by more than a fraction of the tolerance (ε·ΔL over a lower bound
        // of the surface conductance).
        _lap('lwsum');
        if (passes > 1 && (eps[i]! * Math.abs(l - lIn[i]!)) / SURFACE_CONDUCTANCE_FLOOR_WM2K < 0.5 * CONVERGENCE_K) continue;
        lIn[i] = l;
        const st = states[i]!;
        if (passes > 1) {
          const temps = st.conduction.tempC;
          for (let n = 0, o = snapOffset[i]!; n < temps.length; n++) temps[n] = snap[o + n]!;
          (st as { surfaceTempC: number }).surfaceTempC = snapSurface[i]!;
        }
        inputs.absorbedShortwaveWm2 = absV[i]! * eV[i]! + absN[i]! * eN[i]!;
        inputs.longwaveInWm2 = l;
        inputs.airTempC = ta;
        inputs.windMs = Math.max(v10, 0.1) * windFactor[i]!;
        stepSurface(st, inputs, dtS, res); PT.solves++;
        resolved++;
        if (passes > 1) out.stats.resolvedPatchSteps++;
        if (passes > 1) maxChange = Math.max(maxChange, Math.abs(res.surfaceTempC - tNew[i]!));
        tNew[i] = res.surfaceTempC;
        jNext[i] = res.leavingLongwaveWm2;
        emitted[i] = res.emittedLongwaveWm2;
        const gain = res.absorbedShortwaveWm2 + res.absorbedLongwaveWm2;
        const resid = gain - res.emittedLongwaveWm2 - res.convectedWm2 - res.conductedWm2 - res.storedWm2;
        residualPct[i] = (100 * Math.abs(resid)) / Math.max(gain, res.emittedLongwaveWm2, 1);
        _lap('solve');
      }
      jLw.set(jNext);
      converged = passes > 1 && (resolved === 0 || maxChange < CONVERGENCE_K);
    }
    _lap('lwsum');
    if (record) {
      for (let i = 0; i < P; i++) {
        const k = i * T + t;
        out.incidentShortwaveWm2[k] = eV[i]! + eN[i]!;
        out.surfaceTempC[k] = tNew[i]!;
        out.longwaveEmissionWm2[k] = emitted[i]!;
        if (residualPct[i]! > out.stats.maxEnergyResidualPct) out.stats.maxEnergyResidualPct = residualPct[i]!;
      }
    }
    _lap('record');
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
        k += f * (rhoV[j]! * eV[j]! + rhoN[j]! * eN[j]!);
        l += f * jLw[j]!;
      }
      const o = r * B;
      for (let b = 0; b < B; b++) k += bandRadiance[b]! * geo.sensorSkyBand[o + b]!;
      sK[r] = k;
      sL[r] = l;
    }
    _lap('sensors');
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
    _lap('mrt');
  }
  out.stats.passesMean = passesSum / Math.max(1, schedule.length);
  return out;
}
