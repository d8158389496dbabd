/**
 * Transient one-dimensional heat conduction through a layered construction by finite differences
 * (finite volumes on a vertex-centred grid), advanced implicitly with backward Euler.
 *
 * Grid: node 0 is the outer surface, node N the back face; every layer interface is a node, and a
 * layer of thickness L split into n cells has nodes L/n apart. Each node carries the heat capacity
 * of the half-cells on either side, C_j = Σ ρ·c·Δx/2 [J/(m²·K)], and neighbours are joined by the
 * conductance G_j = k/Δx [W/(m²·K)] of the cell between them. Backward Euler,
 *
 *   C_j·(T_j' − T_j)/Δt = G_{j−1}·(T_{j−1}' − T_j') + G_j·(T_{j+1}' − T_j') (+ boundary terms),
 *
 * is unconditionally stable and L-stable (no oscillation for stiff modes), so a one-hour step is
 * safe even for a 1 mm steel sheet; Crank–Nicolson was not used because it rings on exactly those
 * stiff modes. The tridiagonal system is solved by the Thomas algorithm, eliminating from the back
 * face towards the surface, which leaves one linear relation between the surface temperature and
 * the net heat flux into the surface, A·T_0' = B + q_in. A surface energy balance (nonlinear in
 * T_0) can then be solved as a scalar equation and the rest of the profile back-substituted
 * (`prepareConductionStep` → solve → `finishConductionStep`). No allocation per step.
 *
 * Back boundary: through a resistance to a given temperature (indoor air, ventilated cavity),
 * a fixed temperature at the back node (ground at depth), or adiabatic.
 *
 * Time accuracy (why sub-stepping exists): backward Euler lags a lumped mass with time constant
 * τ by a factor 1/(1 + Δt/τ) per step instead of e^(−Δt/τ). Where the outer layer is a thin,
 * conductive sheet (Biot number h·L/k < 0.2: metal cladding, a glass pane), the sheet behaves as a single
 * mass with τ of a few minutes; `conductionSubsteps` then asks for ⌈Δt/τ⌉ sub-steps so each
 * sub-step is no longer than τ. Massive layers (concrete) are resolved in space and need none.
 *
 * References:
 * [1] S. V. Patankar, Numerical Heat Transfer and Fluid Flow. Washington: Hemisphere, 1980,
 *     ch. 3–4 (finite-volume discretisation, fully implicit scheme, TDMA), doi:10.1201/9781482234213.
 * [2] H. S. Carslaw, J. C. Jaeger, Conduction of Heat in Solids, 2nd ed. Oxford: Clarendon Press,
 *     1959, §2.6 (periodic surface temperature of a semi-infinite solid).
 */
import { InputError } from './errors.ts';

/** One layer of a construction, outermost first. */
export interface ConstructionLayer {
  readonly name: string;
  readonly thicknessM: number;
  readonly conductivityWmK: number;
  readonly densityKgM3: number;
  readonly specificHeatJkgK: number;
}

/** How the back face of the construction exchanges heat. */
export type ConductionBack =
  /** Through a resistance [m²·K/W] to a back temperature given per step (air behind). */
  | { readonly kind: 'resistance'; readonly resistanceM2KW: number }
  /** The back node is held at the back temperature given per step (ground at depth). */
  | { readonly kind: 'fixed-temperature' }
  /** No heat crosses the back face. */
  | { readonly kind: 'adiabatic' };

/** Options of `createConductionState`. */
export interface ConductionGridOptions {
  /** Largest node spacing in any layer [m] (default 0.05). */
  maxSpacingM?: number;
  /**
   * Target Fourier number α·Δt_ref/Δx² at the reference step (default 2): the spacing is not made
   * finer than √(α·Δt_ref/Fo), since a backward-Euler step cannot resolve more than that.
   */
  fourierTarget?: number;
  /** Reference time step the grid is designed for [s] (default 3600). */
  referenceStepS?: number;
  /** Cap on cells per layer (default 12). */
  maxCellsPerLayer?: number;
  /** Explicit cell counts per layer (overrides the rules above). */
  cellsPerLayer?: readonly number[];
  /** Back boundary (default adiabatic). */
  back?: ConductionBack;
}

const BACK_RESISTANCE = 0;
const BACK_FIXED = 1;
const BACK_ADIABATIC = 2;

/** State of a 1-D conduction model: geometry, properties, temperatures and solver scratch. */
export interface ConductionState {
  readonly nodeCount: number;
  /** Node temperatures [°C], node 0 = outer surface. */
  readonly tempC: Float64Array;
  /** Node depths below the outer surface [m]. */
  readonly depthM: Float64Array;
  /** Node heat capacities per unit area [J/(m²·K)]. */
  readonly capacityJm2K: Float64Array;
  /** Conductance between node j and j+1 [W/(m²·K)] (length nodeCount − 1). */
  readonly conductanceWm2K: Float64Array;
  /** Index of the node on the outer face of each layer (plus one entry for the back face). */
  readonly layerFirstNode: Uint32Array;
  /** 0 resistance, 1 fixed temperature, 2 adiabatic. */
  readonly backKind: number;
  /** Conductance from the back node to the back temperature [W/(m²·K)] (0 if not 'resistance'). */
  readonly backConductanceWm2K: number;
  /** Σ L/k over the layers [m²·K/W]. */
  readonly constructionResistanceM2KW: number;
  /** Total thickness [m]. */
  readonly thicknessM: number;
  /**
   * Lumped time-constant capacity of the outer layer [J/(m²·K)] when that layer is thin and
   * conductive enough to act as one mass (0 otherwise); used by `conductionSubsteps`.
   */
  readonly lumpedOuterCapacityJm2K: number;
  /** Conductance from the outer layer through the rest of the construction to the back temperature [W/(m²·K)]. */
  readonly lumpedOuterBackConductanceWm2K: number;
  // --- solver scratch and the results of the last step (mutable) ---
  readonly p: Float64Array;
  readonly s: Float64Array;
  readonly tempOldC: Float64Array;
  /**
   * The time-step-only half of the elimination, kept for the last step length (the matrix of a
   * backward-Euler step depends on Δt but not on the temperatures): 1/a_j per node and the
   * surface coefficient A, valid while `eliminatedDtS` equals the step length.
   */
  readonly inverseDiagonal: Float64Array;
  eliminatedDtS: number;
  eliminatedSurfaceA: number;
  /** Surface relation A·T_0' = B + q_in of the prepared step. */
  surfaceA: number;
  surfaceB: number;
  preparedDtS: number;
  preparedBackTempC: number;
  /** Heat flux into the construction through the outer surface over the last step [W/m²]. */
  lastIntoSurfaceWm2: number;
  /** Heat flux out of the back face over the last step [W/m²]. */
  lastBackFluxWm2: number;
  /** Rate of change of stored heat over the last step [W/m²]. */
  lastStoredWm2: number;
}

function requirePositiveLayerValue(value: number, place: string, what: string): void {
  if (!(Number.isFinite(value) && value > 0)) {
    throw new InputError({ problem: `${what} must be a positive number`, place, value, expected: 'a finite number > 0' });
  }
}

/**
 * Builds the conduction grid for a construction and sets every node to `initialTempC`.
 *
 * Cells per layer: n = clamp(⌈L/Δx⌉, 1, maxCellsPerLayer), Δx = min(maxSpacingM, √(α·Δt_ref/Fo)).
 *
 * @param construction Layers, outermost first (thickness [m], k [W/(m·K)], ρ [kg/m³], c [J/(kg·K)])
 * @param initialTempC Initial temperature of every node [°C]
 * @param opts Grid options and back boundary
 * @returns A fresh state (typed arrays; reuse it step after step)
 *
 * References: [1] ch. 4.
 *
 * @example
 * createConductionState([{ name: 'concrete', thicknessM: 0.2, conductivityWmK: 1.7, densityKgM3: 2300, specificHeatJkgK: 900 }], 20).nodeCount // 7
 */
export function createConductionState(
  construction: readonly ConstructionLayer[],
  initialTempC: number,
  opts: ConductionGridOptions = {},
): ConductionState {
  if (construction.length === 0) {
    throw new InputError({ problem: 'construction has no layers', place: 'construction', expected: 'at least one layer' });
  }
  if (!Number.isFinite(initialTempC)) {
    throw new InputError({ problem: 'not a finite number', place: 'initialTempC', value: initialTempC });
  }
  const maxSpacingM = opts.maxSpacingM ?? 0.05;
  const fo = opts.fourierTarget ?? 2;
  const dtRef = opts.referenceStepS ?? 3600;
  const maxCells = opts.maxCellsPerLayer ?? 12;
  const back = opts.back ?? { kind: 'adiabatic' as const };
  const cells: number[] = [];
  let resistance = 0;
  let thickness = 0;
  construction.forEach((layer, i) => {
    const place = `construction[${i}]`;
    requirePositiveLayerValue(layer.thicknessM, `${place}.thicknessM`, 'layer thickness');
    requirePositiveLayerValue(layer.conductivityWmK, `${place}.conductivityWmK`, 'conductivity');
    requirePositiveLayerValue(layer.densityKgM3, `${place}.densityKgM3`, 'density');
    requirePositiveLayerValue(layer.specificHeatJkgK, `${place}.specificHeatJkgK`, 'specific heat');
    let n: number;
    const given = opts.cellsPerLayer?.[i];
    if (given !== undefined) {
      if (!Number.isInteger(given) || given < 1) {
        throw new InputError({ problem: 'cell count must be a positive integer', place: `cellsPerLayer[${i}]`, value: given });
      }
      n = given;
    } else {
      const alpha = layer.conductivityWmK / (layer.densityKgM3 * layer.specificHeatJkgK);
      const dx = Math.min(maxSpacingM, Math.sqrt((alpha * dtRef) / fo));
      n = Math.min(maxCells, Math.max(1, Math.ceil(layer.thicknessM / dx - 1e-9)));
    }
    cells.push(n);
    resistance += layer.thicknessM / layer.conductivityWmK;
    thickness += layer.thicknessM;
  });
  const nodeCount = cells.reduce((a, b) => a + b, 0) + 1;
  const capacity = new Float64Array(nodeCount);
  const conductance = new Float64Array(nodeCount - 1);
  const depth = new Float64Array(nodeCount);
  const layerFirstNode = new Uint32Array(construction.length + 1);
  let node = 0;
  let z = 0;
  construction.forEach((layer, i) => {
    const n = cells[i]!;
    const dx = layer.thicknessM / n;
    const halfC = 0.5 * layer.densityKgM3 * layer.specificHeatJkgK * dx;
    const g = layer.conductivityWmK / dx;
    layerFirstNode[i] = node;
    for (let c = 0; c < n; c++) {
      depth[node] = z;
      capacity[node] = capacity[node]! + halfC;
      capacity[node + 1] = capacity[node + 1]! + halfC;
      conductance[node] = g;
      node++;
      z += dx;
    }
  });
  layerFirstNode[construction.length] = node;
  depth[node] = thickness;

  let backKind: number;
  let backG = 0;
  if (back.kind === 'resistance') {
    if (!(Number.isFinite(back.resistanceM2KW) && back.resistanceM2KW > 0)) {
      throw new InputError({ problem: 'back resistance must be positive', place: 'back.resistanceM2KW', value: back.resistanceM2KW, expected: 'a number > 0 m²·K/W (use fixed-temperature for none)' });
    }
    backKind = BACK_RESISTANCE;
    backG = 1 / back.resistanceM2KW;
  } else if (back.kind === 'fixed-temperature') {
    backKind = BACK_FIXED;
  } else {
    backKind = BACK_ADIABATIC;
  }

  // A thin outer layer with Biot number h·L/k < 0.2 (h ≈ 25 W/(m²·K), a typical exterior
  // convective + radiative coefficient) behaves nearly as one lumped mass. The classic lumped
  // criterion is Bi < 0.1 (common practice); 0.2 also catches glass panes (Bi ≈ 0.15), whose
  // lumped time constant (~10 min) is likewise shorter than an hour.
  const outer = construction[0]!;
  const biot = (25 * outer.thicknessM) / outer.conductivityWmK;
  const lumped = biot < 0.2 ? outer.densityKgM3 * outer.specificHeatJkgK * outer.thicknessM : 0;
  // Conductance from the outer layer to the back temperature, through the rest of the
  // construction (its capacity ignored): only used to estimate the lumped time constant.
  const rRest = resistance - outer.thicknessM / outer.conductivityWmK;
  const lumpedBackG = back.kind === 'adiabatic' ? 0 : 1 / (rRest + (back.kind === 'resistance' ? back.resistanceM2KW : 0));

  const tempC = new Float64Array(nodeCount).fill(initialTempC);
  return {
    nodeCount,
    tempC,
    depthM: depth,
    capacityJm2K: capacity,
    conductanceWm2K: conductance,
    layerFirstNode,
    backKind,
    backConductanceWm2K: backG,
    constructionResistanceM2KW: resistance,
    thicknessM: thickness,
    lumpedOuterCapacityJm2K: lumped,
    lumpedOuterBackConductanceWm2K: Number.isFinite(lumpedBackG) ? lumpedBackG : 0,
    p: new Float64Array(nodeCount),
    s: new Float64Array(nodeCount),
    tempOldC: new Float64Array(nodeCount),
    inverseDiagonal: new Float64Array(nodeCount),
    eliminatedDtS: NaN,
    eliminatedSurfaceA: 0,
    surfaceA: 0,
    surfaceB: 0,
    preparedDtS: 0,
    preparedBackTempC: 0,
    lastIntoSurfaceWm2: 0,
    lastBackFluxWm2: 0,
    lastStoredWm2: 0,
  };
}

/**
 * Sets the steady-state temperature profile between a surface temperature and the back
 * temperature (linear in thermal resistance; uniform at `surfaceTempC` if adiabatic).
 *
 * @param state Conduction state (modified)
 * @param surfaceTempC Outer-surface temperature [°C]
 * @param backTempC Back temperature [°C] (air behind, or the fixed back-node temperature)
 *
 * @example
 * setSteadyProfile(state, 40, 20) // node temperatures fall linearly in resistance from 40 towards 20
 */
export function setSteadyProfile(state: ConductionState, surfaceTempC: number, backTempC: number): void {
  const t = state.tempC;
  if (state.backKind === BACK_ADIABATIC) {
    t.fill(surfaceTempC);
    return;
  }
  const rBack = state.backKind === BACK_RESISTANCE ? 1 / state.backConductanceWm2K : 0;
  const rTot = state.constructionResistanceM2KW + rBack;
  const q = (surfaceTempC - backTempC) / rTot;
  t[0] = surfaceTempC;
  for (let j = 1; j < state.nodeCount; j++) t[j] = t[j - 1]! - q / state.conductanceWm2K[j - 1]!;
}

/**
 * First half of an implicit step: assembles the backward-Euler system for a step of `dtS` and
 * eliminates every node but the surface, leaving A·T_0' = B + q_in in `state.surfaceA/B`, where q_in
 * [W/m²] is the net heat flux into the outer surface over the step. Call `finishConductionStep`
 * with the chosen surface temperature next.
 *
 * @param state Conduction state (scratch modified)
 * @param dtS Time step [s], > 0
 * @param backTempC Back temperature for this step [°C] (ignored when adiabatic)
 *
 * References: [1] §4.2 (TDMA).
 *
 * @example
 * prepareConductionStep(state, 3600, 24); const t0 = (state.surfaceB + 100) / state.surfaceA;
 */
export function prepareConductionStep(state: ConductionState, dtS: number, backTempC: number): void {
  const n = state.nodeCount - 1; // index of the back node
  const C = state.capacityJm2K;
  const G = state.conductanceWm2K;
  const T = state.tempC;
  const p = state.p;
  const s = state.s;
  const ia = state.inverseDiagonal;
  const inv = 1 / dtS;
  state.tempOldC.set(T);
  if (state.eliminatedDtS !== dtS) {
    // The matrix half of the Thomas elimination (s_j, 1/a_j, A) depends on Δt only.
    if (state.backKind === BACK_FIXED) {
      s[n] = 0;
      ia[n] = 0;
    } else {
      const a = C[n]! * inv + G[n - 1]! + state.backConductanceWm2K; // 0 when adiabatic
      ia[n] = 1 / a;
      s[n] = G[n - 1]! / a;
    }
    for (let j = n - 1; j >= 1; j--) {
      const a = C[j]! * inv + G[j - 1]! + G[j]! - G[j]! * s[j + 1]!;
      ia[j] = 1 / a;
      s[j] = G[j - 1]! / a;
    }
    state.eliminatedSurfaceA = C[0]! * inv + G[0]! - G[0]! * s[1]!;
    state.eliminatedDtS = dtS;
  }
  // back node
  if (state.backKind === BACK_FIXED) p[n] = backTempC;
  else p[n] = (C[n]! * inv * T[n]! + state.backConductanceWm2K * backTempC) * ia[n]!;
  for (let j = n - 1; j >= 1; j--) p[j] = (C[j]! * inv * T[j]! + G[j]! * p[j + 1]!) * ia[j]!;
  state.surfaceA = state.eliminatedSurfaceA;
  state.surfaceB = C[0]! * inv * T[0]! + G[0]! * p[1]!;
  state.preparedDtS = dtS;
  state.preparedBackTempC = backTempC;
}

/**
 * Second half of an implicit step: given the new surface temperature, back-substitutes the profile
 * and records the step's fluxes (into the surface, out of the back, stored), which balance exactly:
 * q_in = stored + q_back.
 *
 * @param state Conduction state prepared by `prepareConductionStep` (modified)
 * @param surfaceTempC New outer-surface temperature T_0' [°C]
 * @returns Net heat flux into the construction through the surface over the step [W/m²]
 *
 * @example
 * finishConductionStep(state, 35.2) // W/m² conducted into the wall
 */
export function finishConductionStep(state: ConductionState, surfaceTempC: number): number {
  const n = state.nodeCount - 1;
  const T = state.tempC;
  const p = state.p;
  const s = state.s;
  const C = state.capacityJm2K;
  const old = state.tempOldC;
  const dt = state.preparedDtS;
  T[0] = surfaceTempC;
  for (let j = 1; j <= n; j++) T[j] = p[j]! + s[j]! * T[j - 1]!;
  const qIn = state.surfaceA * surfaceTempC - state.surfaceB;
  const last = state.backKind === BACK_FIXED ? n - 1 : n;
  let stored = 0;
  for (let j = 0; j <= last; j++) stored += C[j]! * (T[j]! - old[j]!);
  stored /= dt;
  let qBack: number;
  if (state.backKind === BACK_FIXED) qBack = state.conductanceWm2K[n - 1]! * (T[n - 1]! - T[n]!);
  else if (state.backKind === BACK_RESISTANCE) qBack = state.backConductanceWm2K * (T[n]! - state.preparedBackTempC);
  else qBack = 0;
  state.lastIntoSurfaceWm2 = qIn;
  state.lastStoredWm2 = stored;
  state.lastBackFluxWm2 = qBack;
  return qIn;
}

/**
 * Advances the conduction one implicit step with a given net heat flux into the outer surface.
 *
 * @param state Conduction state (modified)
 * @param surfaceFluxInWm2 Net heat flux into the outer surface during the step [W/m²]
 * @param dtS Time step [s]
 * @param backTempC Back temperature [°C]
 * @returns New surface temperature [°C]
 *
 * @example
 * stepConductionWithFlux(state, 200, 600, 20)
 */
export function stepConductionWithFlux(state: ConductionState, surfaceFluxInWm2: number, dtS: number, backTempC: number): number {
  prepareConductionStep(state, dtS, backTempC);
  const t0 = (state.surfaceB + surfaceFluxInWm2) / state.surfaceA;
  finishConductionStep(state, t0);
  return t0;
}

/**
 * Advances the conduction one implicit step with the outer surface held at a given temperature.
 *
 * @param state Conduction state (modified)
 * @param surfaceTempC Outer-surface temperature at the end of the step [°C]
 * @param dtS Time step [s]
 * @param backTempC Back temperature [°C]
 * @returns Net heat flux into the construction through the surface [W/m²]
 *
 * @example
 * stepConductionWithSurfaceTemp(state, 40, 3600, 20)
 */
export function stepConductionWithSurfaceTemp(state: ConductionState, surfaceTempC: number, dtS: number, backTempC: number): number {
  prepareConductionStep(state, dtS, backTempC);
  return finishConductionStep(state, surfaceTempC);
}

/**
 * Number of sub-steps a step of `dtS` needs for time accuracy: ⌈Δt/τ⌉ when the outer layer acts
 * as a lumped mass (thin metal sheet or glass pane, Biot < 0.2) with τ = C_layer/(h_surface + U_behind) shorter
 * than Δt, else 1. Capped at `maxSubsteps`.
 *
 * @param state Conduction state
 * @param dtS Step [s]
 * @param surfaceCoeffWm2K Linearised surface coefficient h_c + h_r [W/(m²·K)]
 * @param maxSubsteps Cap (default 120)
 * @returns Sub-step count ≥ 1
 *
 * @example
 * conductionSubsteps(steelSheetState, 3600, 16) // 35 (0.7 mm steel, R_back 0.13: τ ≈ 104 s)
 */
export function conductionSubsteps(state: ConductionState, dtS: number, surfaceCoeffWm2K: number, maxSubsteps = 120): number {
  const c = state.lumpedOuterCapacityJm2K;
  if (c <= 0) return 1;
  const tau = c / (surfaceCoeffWm2K + state.lumpedOuterBackConductanceWm2K);
  if (!(tau < dtS)) return 1;
  return Math.min(maxSubsteps, Math.ceil(dtS / tau));
}

/**
 * Heat content of the construction relative to 0 °C [J/m²]: Σ C_j·T_j over the nodes whose
 * temperature is free (a fixed-temperature back node is excluded).
 *
 * @param state Conduction state
 * @returns Heat content [J/m²]
 *
 * @example
 * conductionHeatContentJm2(state)
 */
export function conductionHeatContentJm2(state: ConductionState): number {
  const last = state.backKind === BACK_FIXED ? state.nodeCount - 2 : state.nodeCount - 1;
  let e = 0;
  for (let j = 0; j <= last; j++) e += state.capacityJm2K[j]! * state.tempC[j]!;
  return e;
}
