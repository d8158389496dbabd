/**
 * The audit's results (DESIGN §4, contract version 1), columnar: every per-time array has one
 * entry per entry of `times`. Written to `results.json` atomically; `surfaces.csv`, `sensors.csv`
 * (long form) and `summary.json` are derived from it.
 */
import type { UtciCategoryId } from '../physics/utci.ts';

export interface SensorResult {
  /** Sensor point [m], engine coordinates (x east, y north, z up). */
  position: [number, number, number];
  /** Cosine-weighted fraction of the upper hemisphere of a horizontal plane that sees sky (Oke's ψ_s). */
  skyViewFactor: number;
  /** Sun above the horizon and the ray to the sun's centre unobstructed. */
  sunlit: boolean[];
  /** Mean radiant temperature [°C] per step. */
  mrtC: number[];
  /** UTCI [°C] per step (inputs clamped to the polynomial's validity where needed; see `utciClamped`). */
  utciC: number[];
  /** UTCI stress category id per step (see summary.categories for labels and bounds). */
  category: UtciCategoryId[];
}

export interface ZoneResult {
  name: string;
  posture: 'standing' | 'seated';
  sensorHeightM: number;
  sensors: SensorResult[];
  /** Sensors of the zone that fell inside solid geometry and were dropped. */
  droppedSensors: number;
}

export interface SurfaceResult {
  /** Patch id: `<surface name>-<n>`. */
  id: string;
  /** The surface (node/mesh) the patch belongs to. */
  surface: string;
  /** The preset id assigned (or "custom" for an override without a preset). */
  material: string;
  centroid: [number, number, number];
  normal: [number, number, number];
  areaM2: number;
  /** Incident shortwave (beam + sky + reflected) on the patch as oriented [W/m²] per step. */
  incidentShortwaveWm2: number[];
  /** Exterior surface temperature [°C] per step. */
  surfaceTempC: number[];
  /** Emitted longwave εσT⁴ [W/m²] per step. */
  longwaveEmissionWm2: number[];
}

export interface StepWeather {
  airTempC: number[];
  relativeHumidityPct: number[];
  /** Wind at 10 m [m/s]. */
  windMs: number[];
  dniWm2: number[];
  dhiWm2: number[];
  ghiWm2: number[];
  /** Downwelling longwave on a horizontal plane [W/m²]. */
  skyLongwaveWm2: number[];
}

export interface Results {
  sunfacet: 1;
  project: string;
  /** How a time stamp relates to its step: the instant the sun and weather were evaluated at. */
  timeConvention: string;
  times: string[];
  sun: { altitudeDeg: number; azimuthDeg: number }[];
  weather: StepWeather;
  zones: ZoneResult[];
  surfaces: SurfaceResult[];
  /** Everything the audit adjusted, clamped or dropped, in plain words. */
  warnings: string[];
  /** Run information: software version, sample counts, seed, model file hash, timings. */
  run: Record<string, unknown>;
}
