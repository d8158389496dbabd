/**
 * Surface energy balance of one exterior surface patch, coupled to transient conduction through its
 * construction.
 *
 * Balance at the outer surface (per unit area, longwave absorptance = emissivity):
 *
 *   S_abs + ε·L_in − ε·σ·T_s⁴ − h_c·(T_s − T_air) − q_cond = 0,
 *
 * with q_cond the heat flux into the construction. In the transient mode q_cond comes from the
 * backward-Euler conduction step of conduction.ts, which reduces to q_cond = A·T_s − B for the
 * step (every other node eliminated); the scalar equation is solved by Newton's method (it is
 * concave and decreasing in T_s, so Newton converges monotonically after at most one overshoot),
 * then the profile is back-substituted. Inputs are held constant through the step; where the outer
 * layer is a thin metal sheet the step is split into sub-steps (see `conductionSubsteps`). The
 * energy terms returned are averages over the step and balance to round-off:
 *   absorbedShortwave + absorbedLongwave = emitted + convected + conductedBack + stored.
 *
 * References:
 * [1] J. A. Duffie, W. A. Beckman, Solar Engineering of Thermal Processes, 4th ed. Hoboken: Wiley,
 *     2013, ch. 3 (radiation and convection exchange of a surface), doi:10.1002/9781118671603.
 * [2] S. V. Patankar, Numerical Heat Transfer and Fluid Flow, 1980 (implicit conduction), see
 *     conduction.ts.
 * [3] ASHRAE Handbook — Fundamentals, ch. 18 (sol-air temperature: the linearised form of this
 *     balance with a combined coefficient h_o), see solAir.ts.
 */
import { KELVIN_AT_0C, STEFAN_BOLTZMANN_W_M2K4 } from './constants.ts';
import {
  conductionSubsteps,
  createConductionState,
  finishConductionStep,
  prepareConductionStep,
  setSteadyProfile,
  type ConductionGridOptions,
  type ConductionState,
  type ConstructionLayer,
} from './conduction.ts';
import { exteriorConvectionCoeffWm2K, type ConvectionModel } from './convection.ts';
import { InputError, requireInRange } from './errors.ts';
import type { MaterialBack } from './materials.ts';

/** What the balance needs of a material (a `Material` satisfies it). */
export interface SurfaceThermalProperties {
  readonly emissivity: number;
  readonly construction: readonly ConstructionLayer[];
  readonly back: MaterialBack;
}

/** Options of `createSurfaceState` and `steadySurfaceTempC`. */
export interface SurfaceBalanceOptions {
  /** Exterior convection correlation (default 'mcadams1954'); ignored if a fixed coefficient is given. */
  convectionModel?: ConvectionModel;
  /** Fixed convective coefficient [W/(m²·K)] instead of a wind correlation. */
  convectionCoeffWm2K?: number;
  /** Overrides the back temperature of 'indoor-air' and 'ground' backs [°C]. */
  backTempC?: number;
  /** Initial temperature of the whole construction [°C] (default: back temperature, or 20 °C). */
  initialTempC?: number;
  /** Conduction grid options (spacing, Fourier target, cells per layer). */
  grid?: Omit<ConductionGridOptions, 'back'>;
  /** Cap on sub-steps per step (default 120). */
  maxSubsteps?: number;
}

/** One step's inputs (reuse one object in loops). */
export interface SurfaceStepInputs {
  /** Solar radiation absorbed by the surface [W/m²]. */
  absorbedShortwaveWm2: number;
  /** Longwave irradiance arriving at the surface (sky, ground, other surfaces) [W/m²]. */
  longwaveInWm2: number;
  /** Air temperature next to the surface [°C]. */
  airTempC: number;
  /** Local wind speed next to the surface [m/s]. */
  windMs: number;
}

/** One step's results: end-of-step surface temperature and step-averaged energy terms [W/m²]. */
export interface SurfaceStepResult {
  surfaceTempC: number;
  /** ε·σ·T_s⁴ [W/m²]. */
  emittedLongwaveWm2: number;
  /** ε·σ·T_s⁴ + (1 − ε)·L_in: all longwave leaving the surface [W/m²]. */
  leavingLongwaveWm2: number;
  absorbedShortwaveWm2: number;
  /** ε·L_in [W/m²]. */
  absorbedLongwaveWm2: number;
  /** h_c·(T_s − T_air) [W/m²], positive from surface to air. */
  convectedWm2: number;
  /** Heat flux into the construction through the outer surface [W/m²]. */
  intoConstructionWm2: number;
  /** Heat flux leaving the back of the construction [W/m²]. */
  conductedWm2: number;
  /** Rate of change of heat stored in the construction [W/m²]. */
  storedWm2: number;
  convectionCoeffWm2K: number;
  substeps: number;
  newtonIterations: number;
}

const BACK_AIR = 0;
const BACK_FIXED_TEMP = 1;
const BACK_NONE = 2;

/** State of one surface patch between steps. */
export interface SurfaceState {
  readonly conduction: ConductionState;
  readonly emissivity: number;
  readonly convectionModel: ConvectionModel;
  /** NaN when the wind correlation is used. */
  readonly fixedConvectionWm2K: number;
  /** 0: back temperature follows the air; 1: fixed `backTempC`; 2: adiabatic. */
  readonly backTempMode: number;
  readonly backTempC: number;
  readonly maxSubsteps: number;
  /** Current surface temperature [°C]. */
  readonly surfaceTempC: number;
}

interface MutableSurfaceState extends Omit<SurfaceState, 'surfaceTempC'> {
  surfaceTempC: number;
  // What `resolveSurfaceStep` needs of the last step taken by `stepSurface`: the profile and
  // surface temperature at its start (the profile is kept only when it was sub-stepped; with one
  // sub-step the conduction state's own `tempOldC` holds it), its sub-step count, convective
  // coefficient, back temperature, length and inputs of air temperature and wind.
  readonly stepStartTempC: Float64Array;
  stepStartSurfaceTempC: number;
  lastSubsteps: number;
  lastConvectionWm2K: number;
  lastBackTempC: number;
  lastDtS: number;
  lastAirTempC: number;
  lastWindMs: number;
}

function toConductionBack(back: MaterialBack): ConductionGridOptions['back'] {
  switch (back.kind) {
    case 'indoor-air':
    case 'outdoor-air':
      return { kind: 'resistance', resistanceM2KW: back.surfaceResistanceM2KW };
    case 'ground':
      return { kind: 'fixed-temperature' };
    case 'adiabatic':
      return { kind: 'adiabatic' };
  }
}

function backMode(back: MaterialBack, override: number | undefined): { mode: number; tempC: number } {
  switch (back.kind) {
    case 'indoor-air':
      return { mode: BACK_FIXED_TEMP, tempC: override ?? back.tempC };
    case 'ground':
      return { mode: BACK_FIXED_TEMP, tempC: override ?? back.tempC };
    case 'outdoor-air':
      return { mode: BACK_AIR, tempC: NaN };
    case 'adiabatic':
      return { mode: BACK_NONE, tempC: NaN };
  }
}

function checkProps(props: SurfaceThermalProperties): void {
  requireInRange(props.emissivity, 0, 1, 'emissivity');
  if (props.emissivity === 0) {
    throw new InputError({ problem: 'emissivity must be above 0', place: 'emissivity', value: 0, expected: 'a value in (0, 1]' });
  }
}

/**
 * Creates the transient state of one surface patch (conduction grid, coefficients, back boundary).
 *
 * @param props Emissivity [-], construction (outermost first) and back boundary (e.g. a Material)
 * @param opts Convection model or fixed coefficient [W/(m²·K)], back temperature [°C], initial
 *   temperature [°C], grid options
 * @returns A state for `stepSurface`
 *
 * @example
 * const s = createSurfaceState(MATERIAL_PRESETS['concrete']!, { initialTempC: 20 });
 */
export function createSurfaceState(props: SurfaceThermalProperties, opts: SurfaceBalanceOptions = {}): SurfaceState {
  checkProps(props);
  if (opts.convectionCoeffWm2K !== undefined) requireInRange(opts.convectionCoeffWm2K, 0, 500, 'convectionCoeffWm2K', 'W/(m²·K)');
  if (opts.backTempC !== undefined) requireInRange(opts.backTempC, -50, 80, 'backTempC', '°C');
  const bm = backMode(props.back, opts.backTempC);
  const init = opts.initialTempC ?? (Number.isFinite(bm.tempC) ? bm.tempC : 20);
  requireInRange(init, -60, 100, 'initialTempC', '°C');
  const back = toConductionBack(props.back);
  const conduction = createConductionState(props.construction, init, back === undefined ? { ...opts.grid } : { ...opts.grid, back });
  if (bm.mode === BACK_FIXED_TEMP && props.back.kind === 'ground') conduction.tempC[conduction.nodeCount - 1] = bm.tempC;
  const state: MutableSurfaceState = {
    conduction,
    emissivity: props.emissivity,
    convectionModel: opts.convectionModel ?? 'mcadams1954',
    fixedConvectionWm2K: opts.convectionCoeffWm2K ?? NaN,
    backTempMode: bm.mode,
    backTempC: bm.tempC,
    maxSubsteps: opts.maxSubsteps ?? 120,
    surfaceTempC: init,
    stepStartTempC: new Float64Array(conduction.nodeCount),
    stepStartSurfaceTempC: init,
    lastSubsteps: 0,
    lastConvectionWm2K: 0,
    lastBackTempC: 0,
    lastDtS: 0,
    lastAirTempC: NaN,
    lastWindMs: NaN,
  };
  return state;
}

/** A zeroed result object to pass as `out`. */
export function createSurfaceResult(): SurfaceStepResult {
  return {
    surfaceTempC: NaN,
    emittedLongwaveWm2: 0,
    leavingLongwaveWm2: 0,
    absorbedShortwaveWm2: 0,
    absorbedLongwaveWm2: 0,
    convectedWm2: 0,
    intoConstructionWm2: 0,
    conductedWm2: 0,
    storedWm2: 0,
    convectionCoeffWm2K: 0,
    substeps: 0,
    newtonIterations: 0,
  };
}

const NEWTON_TOL_K = 1e-9;
const NEWTON_MAX = 60;

// Range checks run every step, so requireInRange (which allocates its options object) is only
// called to build the error once a comparison has failed (NaN fails every comparison).
function checkInputs(inputs: SurfaceStepInputs): void {
  const sw = inputs.absorbedShortwaveWm2;
  const lw = inputs.longwaveInWm2;
  const ta = inputs.airTempC;
  const v = inputs.windMs;
  if (!(sw >= 0 && sw <= 2000)) requireInRange(sw, 0, 2000, 'absorbedShortwaveWm2', 'W/m²');
  if (!(lw >= 0 && lw <= 1000)) requireInRange(lw, 0, 1000, 'longwaveInWm2', 'W/m²');
  if (!(ta >= -60 && ta <= 70)) requireInRange(ta, -60, 70, 'airTempC', '°C');
  if (!(v >= 0 && v <= 40)) requireInRange(v, 0, 40, 'windMs', 'm/s');
}

function convectionCoeff(state: SurfaceState, windMs: number): number {
  return Number.isNaN(state.fixedConvectionWm2K) ? exteriorConvectionCoeffWm2K(state.convectionModel, windMs) : state.fixedConvectionWm2K;
}

/**
 * Solves f(T) = gain − εσT⁴ − (h + A)·T + (h·T_air + B) = 0 for T [°C] by Newton's method, where
 * `gain` = S_abs + ε·L_in. Returns the iteration count through `_iters`.
 */
let _iters = 0;
function solveSurfaceTempC(gainWm2: number, eps: number, h: number, airTempC: number, a: number, b: number, guessC: number): number {
  const es = eps * STEFAN_BOLTZMANN_W_M2K4;
  const k = h + a;
  const c = gainWm2 + h * (airTempC + KELVIN_AT_0C) + b + a * KELVIN_AT_0C; // all in kelvin
  let t = guessC + KELVIN_AT_0C;
  if (!(t > 150)) t = airTempC + KELVIN_AT_0C;
  for (let i = 1; i <= NEWTON_MAX; i++) {
    const t3 = t * t * t;
    const f = c - es * t3 * t - k * t;
    const df = -4 * es * t3 - k;
    const dt = f / df;
    t -= dt;
    if (Math.abs(dt) < NEWTON_TOL_K) {
      _iters = i;
      return t - KELVIN_AT_0C;
    }
  }
  throw new Error(`surface energy balance: Newton iteration did not converge (last T = ${t - KELVIN_AT_0C} °C)`);
}

/**
 * Advances one surface patch by one time step: solves the surface balance coupled to implicit
 * conduction, sub-stepping thin metal sheets, and writes the end-of-step surface temperature and
 * the step-averaged energy terms into `out`. Allocates nothing.
 *
 * @param state Surface state (modified)
 * @param inputs Absorbed shortwave [W/m²], incoming longwave [W/m²], air temperature [°C], local wind [m/s]
 * @param dtS Time step [s], > 0
 * @param out Result object to fill (see `createSurfaceResult`)
 * @returns `out`
 *
 * @example
 * stepSurface(state, { absorbedShortwaveWm2: 600, longwaveInWm2: 380, airTempC: 30, windMs: 1 }, 3600, out).surfaceTempC
 */
export function stepSurface(state: SurfaceState, inputs: SurfaceStepInputs, dtS: number, out: SurfaceStepResult): SurfaceStepResult {
  checkInputs(inputs);
  if (!(Number.isFinite(dtS) && dtS > 0)) {
    throw new InputError({ problem: 'time step must be positive', place: 'dtS', value: dtS, expected: 'a number of seconds > 0' });
  }
  const st = state as MutableSurfaceState;
  const cs = st.conduction;
  const eps = st.emissivity;
  const h = convectionCoeff(st, inputs.windMs);
  const backTempC = st.backTempMode === BACK_AIR ? inputs.airTempC : st.backTempMode === BACK_FIXED_TEMP ? st.backTempC : 0;
  const t0K = st.surfaceTempC + KELVIN_AT_0C;
  const hr = 4 * eps * STEFAN_BOLTZMANN_W_M2K4 * t0K * t0K * t0K;
  const nSub = conductionSubsteps(cs, dtS, h + hr, st.maxSubsteps);
  st.stepStartSurfaceTempC = st.surfaceTempC;
  if (nSub > 1) st.stepStartTempC.set(cs.tempC);
  st.lastSubsteps = nSub;
  st.lastConvectionWm2K = h;
  st.lastBackTempC = backTempC;
  st.lastDtS = dtS;
  st.lastAirTempC = inputs.airTempC;
  st.lastWindMs = inputs.windMs;
  return advance(st, inputs, h, backTempC, nSub, dtS, false, out);
}

/**
 * Takes the step last taken by `stepSurface` on this state again, from the same start, with other
 * absorbed shortwave and incoming longwave: the result is the one `stepSurface` would give from
 * that start (same sub-steps, same Newton root to 1e-9 K). For the iteration of a step's
 * longwave exchange between surfaces. With one sub-step the eliminated conduction system of the
 * first solve is reused (only the scalar balance and the back-substitution are redone); if air
 * temperature, wind or step length differ from the first solve, the start is restored and the
 * step taken afresh. Allocates nothing.
 *
 * @param state Surface state last advanced by `stepSurface` (modified)
 * @param inputs Absorbed shortwave [W/m²], incoming longwave [W/m²], air temperature [°C], local wind [m/s]
 * @param dtS Time step [s], > 0
 * @param out Result object to fill
 * @returns `out`
 *
 * @example
 * stepSurface(state, inputs, 3600, out); inputs.longwaveInWm2 += 5; resolveSurfaceStep(state, inputs, 3600, out)
 */
export function resolveSurfaceStep(state: SurfaceState, inputs: SurfaceStepInputs, dtS: number, out: SurfaceStepResult): SurfaceStepResult {
  const st = state as MutableSurfaceState;
  const cs = st.conduction;
  if (st.lastSubsteps === 0 || dtS !== st.lastDtS || inputs.airTempC !== st.lastAirTempC || inputs.windMs !== st.lastWindMs) {
    if (st.lastSubsteps > 1) cs.tempC.set(st.stepStartTempC);
    else if (st.lastSubsteps === 1) cs.tempC.set(cs.tempOldC);
    if (st.lastSubsteps > 0) st.surfaceTempC = st.stepStartSurfaceTempC;
    return stepSurface(state, inputs, dtS, out);
  }
  checkInputs(inputs);
  const nSub = st.lastSubsteps;
  if (nSub > 1) {
    cs.tempC.set(st.stepStartTempC);
    st.surfaceTempC = st.stepStartSurfaceTempC;
  }
  return advance(st, inputs, st.lastConvectionWm2K, st.lastBackTempC, nSub, dtS, nSub === 1, out);
}

/** The sub-step loop of `stepSurface`; `prepared`: one sub-step whose conduction system is already eliminated. */
function advance(st: MutableSurfaceState, inputs: SurfaceStepInputs, h: number, backTempC: number, nSub: number, dtS: number, prepared: boolean, out: SurfaceStepResult): SurfaceStepResult {
  const cs = st.conduction;
  const eps = st.emissivity;
  const dtSub = dtS / nSub;
  const absLw = eps * inputs.longwaveInWm2;
  const gain = inputs.absorbedShortwaveWm2 + absLw;
  let sumEmit = 0;
  let sumConv = 0;
  let sumIn = 0;
  let sumBack = 0;
  let sumStored = 0;
  let iters = 0;
  // With a prepared system the last solution is the closer guess; the root is the same.
  let t = prepared ? st.surfaceTempC : st.stepStartSurfaceTempC;
  for (let k = 0; k < nSub; k++) {
    if (!prepared) prepareConductionStep(cs, dtSub, backTempC);
    t = solveSurfaceTempC(gain, eps, h, inputs.airTempC, cs.surfaceA, cs.surfaceB, t);
    iters += _iters;
    finishConductionStep(cs, t);
    const tK = t + KELVIN_AT_0C;
    sumEmit += eps * STEFAN_BOLTZMANN_W_M2K4 * tK * tK * tK * tK;
    sumConv += h * (t - inputs.airTempC);
    sumIn += cs.lastIntoSurfaceWm2;
    sumBack += cs.lastBackFluxWm2;
    sumStored += cs.lastStoredWm2;
  }
  st.surfaceTempC = t;
  const tK = t + KELVIN_AT_0C;
  const emitEnd = eps * STEFAN_BOLTZMANN_W_M2K4 * tK * tK * tK * tK;
  out.surfaceTempC = t;
  out.emittedLongwaveWm2 = nSub === 1 ? emitEnd : sumEmit / nSub;
  out.leavingLongwaveWm2 = emitEnd + (1 - eps) * inputs.longwaveInWm2;
  out.absorbedShortwaveWm2 = inputs.absorbedShortwaveWm2;
  out.absorbedLongwaveWm2 = absLw;
  out.convectedWm2 = sumConv / nSub;
  out.intoConstructionWm2 = sumIn / nSub;
  out.conductedWm2 = sumBack / nSub;
  out.storedWm2 = sumStored / nSub;
  out.convectionCoeffWm2K = h;
  out.substeps = nSub;
  out.newtonIterations = iters;
  return out;
}

/** Time series inputs of `surfaceTimeSeries` (one entry per step). */
export interface SurfaceSeriesInputs {
  absorbedShortwaveWm2: ArrayLike<number>;
  longwaveInWm2: ArrayLike<number>;
  airTempC: ArrayLike<number>;
  windMs: ArrayLike<number>;
}

/** Time series results of `surfaceTimeSeries` [°C, W/m²]. */
export interface SurfaceSeriesResult {
  surfaceTempC: Float64Array;
  emittedLongwaveWm2: Float64Array;
  leavingLongwaveWm2: Float64Array;
  convectedWm2: Float64Array;
  intoConstructionWm2: Float64Array;
  conductedWm2: Float64Array;
  storedWm2: Float64Array;
}

/**
 * Runs the transient balance over a whole series (convenience wrapper over `stepSurface`).
 *
 * @param props Emissivity, construction and back boundary (e.g. a Material)
 * @param series Per-step absorbed shortwave [W/m²], incoming longwave [W/m²], air temperature [°C], local wind [m/s]
 * @param dtS Step length [s]
 * @param opts As `createSurfaceState`, plus `spinUpCycles`: run the whole series that many times
 *   first and discard the results (for a periodic design day; default 0); initial temperature
 *   defaults to the first air temperature
 * @returns Per-step results
 *
 * @example
 * surfaceTimeSeries(MATERIAL_PRESETS['brick']!, series, 3600, { spinUpCycles: 3 }).surfaceTempC
 */
export function surfaceTimeSeries(
  props: SurfaceThermalProperties,
  series: SurfaceSeriesInputs,
  dtS: number,
  opts: SurfaceBalanceOptions & { spinUpCycles?: number } = {},
): SurfaceSeriesResult {
  const n = series.absorbedShortwaveWm2.length;
  for (const key of ['longwaveInWm2', 'airTempC', 'windMs'] as const) {
    if (series[key].length !== n) {
      throw new InputError({ problem: 'series lengths differ', place: key, value: series[key].length, expected: `${n} entries, like absorbedShortwaveWm2` });
    }
  }
  const first = series.airTempC[0];
  const state = createSurfaceState(props, { ...opts, initialTempC: opts.initialTempC ?? first ?? 20 });
  const res: SurfaceSeriesResult = {
    surfaceTempC: new Float64Array(n),
    emittedLongwaveWm2: new Float64Array(n),
    leavingLongwaveWm2: new Float64Array(n),
    convectedWm2: new Float64Array(n),
    intoConstructionWm2: new Float64Array(n),
    conductedWm2: new Float64Array(n),
    storedWm2: new Float64Array(n),
  };
  const inp: SurfaceStepInputs = { absorbedShortwaveWm2: 0, longwaveInWm2: 0, airTempC: 0, windMs: 0 };
  const out = createSurfaceResult();
  const cycles = opts.spinUpCycles ?? 0;
  if (!(Number.isInteger(cycles) && cycles >= 0 && cycles <= 1000)) {
    throw new InputError({ problem: 'spin-up cycles must be a whole number', place: 'spinUpCycles', value: cycles, expected: 'an integer in [0, 1000]' });
  }
  for (let c = 0; c <= cycles; c++) {
    for (let i = 0; i < n; i++) {
      inp.absorbedShortwaveWm2 = series.absorbedShortwaveWm2[i]!;
      inp.longwaveInWm2 = series.longwaveInWm2[i]!;
      inp.airTempC = series.airTempC[i]!;
      inp.windMs = series.windMs[i]!;
      stepSurface(state, inp, dtS, out);
      if (c === cycles) {
        res.surfaceTempC[i] = out.surfaceTempC;
        res.emittedLongwaveWm2[i] = out.emittedLongwaveWm2;
        res.leavingLongwaveWm2[i] = out.leavingLongwaveWm2;
        res.convectedWm2[i] = out.convectedWm2;
        res.intoConstructionWm2[i] = out.intoConstructionWm2;
        res.conductedWm2[i] = out.conductedWm2;
        res.storedWm2[i] = out.storedWm2;
      }
    }
  }
  return res;
}

/** Options of `steadySurfaceTempC`. */
export interface SteadySurfaceOptions extends Omit<SurfaceBalanceOptions, 'initialTempC' | 'grid' | 'maxSubsteps'> {
  /**
   * Linearise the longwave exchange about this temperature [°C] (default: not linearised):
   * ε·σ·T⁴ ≈ ε·σ·T_m⁴ + h_r·(T − T_m), h_r = 4·ε·σ·T_m³ — the form behind a combined exterior
   * coefficient such as ASHRAE's h_o.
   */
  linearisedAboutTempC?: number;
}

/**
 * Steady-state surface temperature: the same balance with the conduction term replaced by the
 * steady flux through the construction, q = (T_s − T_back)/(Σ L/k + R_back) (0 if adiabatic).
 *
 * @param props Emissivity, construction and back boundary
 * @param inputs Absorbed shortwave [W/m²], incoming longwave [W/m²], air temperature [°C], local wind [m/s]
 * @param opts Convection model or fixed coefficient [W/(m²·K)], back temperature [°C], linearisation
 * @returns Surface temperature [°C]
 *
 * References: [1] ch. 3; [3].
 *
 * @example
 * steadySurfaceTempC(MATERIAL_PRESETS['steel-dark-painted']!, { absorbedShortwaveWm2: 740, longwaveInWm2: 400, airTempC: 30, windMs: 1 })
 */
export function steadySurfaceTempC(props: SurfaceThermalProperties, inputs: SurfaceStepInputs, opts: SteadySurfaceOptions = {}): number {
  checkProps(props);
  checkInputs(inputs);
  const eps = props.emissivity;
  let h: number;
  if (opts.convectionCoeffWm2K !== undefined) {
    requireInRange(opts.convectionCoeffWm2K, 0, 500, 'convectionCoeffWm2K', 'W/(m²·K)');
    h = opts.convectionCoeffWm2K;
  } else {
    h = exteriorConvectionCoeffWm2K(opts.convectionModel ?? 'mcadams1954', inputs.windMs);
  }
  let rConstr = 0;
  for (const l of props.construction) rConstr += l.thicknessM / l.conductivityWmK;
  const bm = backMode(props.back, opts.backTempC);
  let u = 0;
  let tb = 0;
  if (props.back.kind !== 'adiabatic') {
    const rBack = props.back.kind === 'ground' ? 0 : props.back.surfaceResistanceM2KW;
    u = 1 / (rConstr + rBack);
    tb = bm.mode === BACK_AIR ? inputs.airTempC : bm.tempC;
  }
  const gain = inputs.absorbedShortwaveWm2 + eps * inputs.longwaveInWm2;
  if (opts.linearisedAboutTempC !== undefined) {
    const tmK = opts.linearisedAboutTempC + KELVIN_AT_0C;
    const es = eps * STEFAN_BOLTZMANN_W_M2K4;
    const hr = 4 * es * tmK * tmK * tmK;
    // gain − (es·Tm⁴ + hr·(T − Tm)) − h·(T − Ta) − u·(T − Tb) = 0, temperatures in °C except Tm⁴
    return (gain - es * tmK * tmK * tmK * tmK + hr * opts.linearisedAboutTempC + h * inputs.airTempC + u * tb) / (hr + h + u);
  }
  // u·(T − Tb) = A·T − B with A = u, B = u·Tb
  return solveSurfaceTempC(gain, eps, h, inputs.airTempC, u, u * tb, inputs.airTempC);
}
