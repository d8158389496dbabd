/**
 * The audit's results (DESIGN §4, contract version 1), columnar: every per-time array has one
 * entry per entry of `times`. Written to `results.json` atomically; `surfaces.csv`, `sensors.csv`
 * (long form) and `summary.json` are derived from it.
 */
import type { UtciCategoryId } from '../physics/utci.ts';
import type { GlareCategoryId } from './stages/glare.ts';

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
  /**
   * Reflected sun arriving at the sensor per step [W/m²]: the sum over the mirror patches that
   * reflect the sun to it of DNI · ρ(θi) · specularFraction · (part of the sun's image seen in the
   * patch), each normal to its own beam. It enters the MRT as directional beams (fp by the beam's
   * altitude). Present when the glare stage ran (absent in results written before it).
   */
  reflectedBeamWm2?: number[];
  /** Glare category id per step (`glare.categories`); counted within ±30° of the horizontal line of sight. */
  glare?: GlareCategoryId[];
  /** Number of mirror patches reflecting the sun to the sensor, per step (their positions: `reflectionPaths`). */
  reflectingPatches?: number[];
}

/** A project viewpoint with its glare count (project key `viewpoints`). */
export interface ViewpointResult {
  name: string;
  /** Eye position [m] (x east, y north, z up). */
  position: [number, number, number];
  /** Azimuth of the line of sight [°] clockwise from north; null = all around the horizon. */
  viewDirectionDeg: number | null;
  /** Half-width of the field of view around the line of sight [°]. */
  fieldDeg: number;
  /** As SensorResult.reflectedBeamWm2 [W/m²] per step. */
  reflectedBeamWm2: number[];
  /** Glare category id per step. */
  glare: GlareCategoryId[];
  reflectingPatches: number[];
}

/**
 * Reflection paths: one entry per (step, mirror patch, receiver) where the receiver sees the sun's
 * image in the patch with a clear line of sight; columnar, sorted by step. For the viewer's
 * "paths at a picked step": select the entries with `step[i] === t` and draw a line from
 * `point[i]` (on the patch) to the receiver's position (`zones[zone[i]].sensors[receiver[i]]`, or
 * `viewpoints[receiver[i]]` when zone[i] is −1); `surfaces[patch[i]]` is the reflecting patch.
 */
export interface ReflectionPaths {
  /** Index into `times`. */
  step: number[];
  /** Index into `surfaces`. */
  patch: number[];
  /** Index into `zones`, or −1 for a viewpoint. */
  zone: number[];
  /** Index into the zone's `sensors`, or into `viewpoints` when zone is −1. */
  receiver: number[];
  /** Where the sun's image is seen on the patch [m]. */
  point: [number, number, number][];
  /** Beam irradiance arriving along this path [W/m²]. */
  irradianceWm2: number[];
  /** Part of the sun's image seen in this patch [-] (0…1; 16 samples over the disc). */
  discFraction: number[];
  /** Angle between the line of sight to the image and the nearest view direction [°] (> field: not counted as glare). */
  offAxisDeg: number[];
}

/** A point where several mirror patches together deliver more than the step's DNI (a focusing façade). */
export interface ConcentrationResult {
  /** A zone sensor or a ground apron cell (receiver 0.02 m above its centroid). */
  kind: 'sensor' | 'ground';
  /** Zone name, or the ground patch id. */
  where: string;
  /** Sensor index within the zone; −1 for the ground. */
  sensor: number;
  position: [number, number, number];
  /** Peak reflected irradiance over the period [W/m²], and the DNI of that step [W/m²]. */
  peakWm2: number;
  dniWm2: number;
  /** Time of the peak (as in `times`) and its index into `times`. */
  time: string;
  step: number;
  /** Patches contributing at the peak. */
  patches: number;
  /** Contributing surfaces (node names) with their share [W/m²], largest first (at most 10; `patches` counts them all). */
  surfaces: { surface: string; irradianceWm2: number; patches: number }[];
}

/** How glare was judged (criterion, categories, field, caution). */
export interface GlareInfo {
  categories: { id: GlareCategoryId; label: string; description: string }[];
  /** The published criterion and its status (thresholds from memory). */
  criterion: string;
  /** Half-width of the zone sensors' field of view around the horizontal [°]. */
  zoneFieldDeg: number;
  /** Categories from this one up count as glare hours. */
  glareHoursFrom: GlareCategoryId;
  /** Mirror patches considered (specularFraction > 0). */
  mirrorPatches: number;
  caution: string;
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
  /** Glare: how it was judged (present when the glare stage ran). */
  glare?: GlareInfo;
  /** The project's viewpoints with their glare per step (empty without viewpoints). */
  viewpoints?: ViewpointResult[];
  /** The reflection paths to sensors and viewpoints, per step (see ReflectionPaths). */
  reflectionPaths?: ReflectionPaths;
  /** Points where reflections from several patches exceed the DNI, highest peak first (at most 200). */
  concentration?: ConcentrationResult[];
  /** Everything the audit adjusted, clamped or dropped, in plain words. */
  warnings: string[];
  /** Run information: software version, sample counts, seed, model file hash, timings. */
  run: Record<string, unknown>;
}
