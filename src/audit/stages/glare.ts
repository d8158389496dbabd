/**
 * Glare stage: the sun reflected by mirror-like surfaces (glazing, polished or anodised metal, gloss
 * finishes, water) onto the zone sensors, the project's viewpoints and the ground apron, step by
 * step. It runs after the geometry pass (it needs the patches' sun visibility) and before the time
 * stepping, which adds the reflected beams to the sensors' MRT (`sensorBeamTermWm2`); the results
 * fields are filled after the time stepping.
 *
 * Per step with the sun up and per mirror patch p lit by the sun (geometry pass `patchSun`):
 * - reflected direction r = 2(n·s)n − s (fresnel.ts `reflectDirection`);
 * - reflectance ρ(θi) by the patch's specular model (fresnel.ts): glazing = a stack of panes of its
 *   refractive index, one pane per glass layer of its construction (incoherent, per polarisation,
 *   unpolarised mean; Duffie & Beckman sec. 5.1); an opaque dielectric (water) = one Fresnel
 *   interface; no refractive index (metal, paint) = Schlick's approximation from its solar-weighted
 *   band reflectance;
 * - which receivers see the sun's mirror image in p, and what part of the 9.3 mrad disc
 *   (trace/queries/specularPaths.ts: line of sight to the image, point-in-patch test, 16 disc
 *   samples, one occlusion ray);
 * - beam irradiance arriving at a receiver from p, normal to the beam [W/m²]:
 *   E_p = DNI · ρ_p(θi) · specularFraction_p · discFraction_p, summed over the patches.
 *
 * Glare at a receiver (a person's eye at the sensor or viewpoint): the images are grouped into
 * retinal spots (images whose lines of sight lie within one solar diameter of each other overlap
 * on the retina: the coplanar cells of one pane, or facets near a focus), each spot with corneal
 * irradiance E_c = Σ E_p and subtended angle ω = ω☉·√(min(1, Σ discFraction)). Its retinal
 * irradiance follows the geometric optics of the eye used by Ho, Ghanbari & Diver (2011):
 *   E_r = E_c · d_p² / (f² · ω²) · τ,
 * and its category by comparing E_r with two thresholds that fall with ω (`afterImageThresholdWcm2`,
 * `retinalBurnThresholdWcm2`). A spot counts only if it lies in the person's field of view: within
 * `fieldDeg` of a horizontal line of sight in any direction (zone sensors: a person on a terrace
 * turns around; 30° by default), or within `fieldDeg` of a viewpoint's view direction.
 * THE EYE PARAMETERS AND BOTH THRESHOLDS ARE FROM MEMORY (REFERENCE-VALUES §11: structure known,
 * numbers unverified); check them against the paper before relying on a category boundary.
 *
 * Concentration: a receiver (zone sensor or ground apron cell) where two or more patches together
 * deliver more than the step's DNI (a focusing façade) is flagged with its peak, time and the
 * surfaces involved.
 *
 * References:
 * [1] C. K. Ho, C. M. Ghanbari and R. B. Diver, "Methodology to assess potential glint and glare
 *     hazards from concentrating solar power plants: analytical models and experimental
 *     validation," J. Sol. Energy Eng., vol. 133, no. 3, 031021, 2011, doi:10.1115/1.4004349
 *     (retinal irradiance vs subtended angle; thresholds here from memory).
 * [2] J. A. Duffie and W. A. Beckman, Solar Engineering of Thermal Processes, 4th ed., Wiley, 2013,
 *     sec. 5.1 (reflection by N covers).
 * [3] M. Born and E. Wolf, Principles of Optics, 7th ed., 1999, sec. 1.5.3 (Fresnel formulae).
 * [4] C. Schlick, Computer Graphics Forum 13(3), 1994, doi:10.1111/1467-8659.1330233.
 */
import type { PreparedModel } from './model.ts';
import type { Steps } from './steps.ts';
import type { GeometryData } from './geometryPass.ts';
import type { ViewpointSpec } from '../project.ts';
import { GROUND_SURFACE_NAME } from './model.ts';
import { specularReflectanceCos, SUN_ANGULAR_DIAMETER_RAD, type SpecularModel } from '../../physics/fresnel.ts';
import { SOLAR_VISIBLE_BAND_FRACTION, SOLAR_NIR_BAND_FRACTION } from '../../physics/solarSpectrum.ts';
import { projectedAreaFactor } from '../../physics/mrt.ts';
import type { Material } from '../../physics/materials.ts';
import { makeSpecularHits, solarDiscSamples, specularSurfacesFromPatches, traceSpecularPaths } from '../../trace/queries/specularPaths.ts';

// ---------------------------------------------------------------------------------------------
// The criterion (after Ho, Ghanbari & Diver 2011) — numbers FROM MEMORY, see the module notes.

/** Pupil diameter in daylight, d_p [m] (from memory: Ho et al. 2011 use ≈ 2 mm). */
export const PUPIL_DIAMETER_M = 0.002;
/** Focal length of the eye, f [m] (from memory: ≈ 17 mm). */
export const EYE_FOCAL_LENGTH_M = 0.017;
/** Transmittance of the ocular media, τ [-] (from memory: ≈ 0.5). */
export const OCULAR_TRANSMITTANCE = 0.5;
/** Retinal-burn threshold coefficient: E_r,burn = k / ω [W/cm², ω in rad] (from memory: k ≈ 0.118, REFERENCE-VALUES §11). */
export const RETINAL_BURN_COEFFICIENT = 0.118;
/**
 * After-image threshold coefficient: E_r,flash = k / ω² [W/cm², ω in rad] (from memory, coefficient
 * and exponent both unverified; the published curve falls more steeply with ω than the burn line).
 * With k = 3.59e-5 the threshold is 0.42 W/cm² at ω = 9.3 mrad, against ≈ 8 W/cm² for the sun
 * itself, so a single uncoated surface at normal incidence (4 %) stays just below it and a pane
 * (8 %) lies above.
 */
export const AFTER_IMAGE_COEFFICIENT = 3.59e-5;
/** Default half-width of the field of view around the line of sight [°] (our screening choice). */
export const DEFAULT_GLARE_FIELD_DEG = 30;
/** Height of the ground receivers above the apron cells [m] (concentration only). */
export const GROUND_RECEIVER_HEIGHT_M = 0.02;
/** Surface name of the outer, coarser ground cells (model.ts GROUND_OUTER_SURFACE_NAME). */
const GROUND_OUTER_NAME = 'ground-outer';
/** Disc samples per side (16 directions over the sun's disc). */
export const GLARE_DISC_SAMPLE_SIDE = 4;

/** Our glare categories, mildest first; the index is the stored code. */
export const GLARE_CATEGORIES = [
  { id: 'none', label: 'no reflected sun in view', description: 'no mirror image of the sun within the field of view' },
  { id: 'dim', label: 'reflection in view, below the after-image level', description: 'a reflected sun is in view with retinal irradiance below the after-image threshold' },
  { id: 'after-image', label: 'after-image possible', description: 'retinal irradiance at or above the after-image threshold: temporary spots in the vision' },
  { id: 'retinal-risk', label: 'risk to the retina', description: 'retinal irradiance at or above the retinal-burn threshold' },
] as const;
export type GlareCategoryId = (typeof GLARE_CATEGORIES)[number]['id'];
/** Categories counted as glare hours: after-image possible or worse. */
export const GLARE_HOURS_FROM: GlareCategoryId = 'after-image';

/** A one-line statement of the criterion, for results and the report. */
export const GLARE_CRITERION =
  'retinal irradiance E_r = E_c·d_p²/(f²·ω²)·τ against the after-image (3.59e-5/ω² W/cm²) and retinal-burn (0.118/ω W/cm²) thresholds, after Ho, Ghanbari & Diver 2011 (J. Sol. Energy Eng. 133:031021); eye parameters d_p 2 mm, f 17 mm, τ 0.5 and both thresholds from memory, unverified';

export const GLARE_CAUTION =
  'Screening only: glare that can affect drivers or pilots needs a study by a licensed professional under the local rules.';

/**
 * Retinal irradiance from a source seen by the eye (geometric optics of the eye, as in Ho et al. 2011).
 *
 * E_r = E_c · d_p² / (f² · ω²) · τ: the power through the pupil (E_c·π d_p²/4) spread over the
 * source's retinal image (π (f ω)²/4), times the ocular transmittance.
 *
 * @param cornealIrradianceWm2 Irradiance at the eye normal to the line of sight, E_c [W/m²].
 * @param subtendedAngleRad Angular diameter of the source, ω [rad], > 0.
 * @returns Retinal irradiance [W/cm²].
 * @example retinalIrradianceWcm2(1000, 0.0093) // → ≈ 8.0 W/cm² (the sun itself; REFERENCE-VALUES §11)
 */
export function retinalIrradianceWcm2(cornealIrradianceWm2: number, subtendedAngleRad: number): number {
  const ecWcm2 = cornealIrradianceWm2 * 1e-4;
  return (ecWcm2 * PUPIL_DIAMETER_M * PUPIL_DIAMETER_M * OCULAR_TRANSMITTANCE) / (EYE_FOCAL_LENGTH_M * EYE_FOCAL_LENGTH_M * subtendedAngleRad * subtendedAngleRad);
}

/**
 * After-image threshold of retinal irradiance [W/cm²] at subtended angle ω (from memory, see
 * AFTER_IMAGE_COEFFICIENT). @param subtendedAngleRad ω [rad].
 * @example afterImageThresholdWcm2(0.0093) // → ≈ 0.415 W/cm²
 */
export function afterImageThresholdWcm2(subtendedAngleRad: number): number {
  return AFTER_IMAGE_COEFFICIENT / (subtendedAngleRad * subtendedAngleRad);
}

/**
 * Retinal-burn threshold of retinal irradiance [W/cm²] at subtended angle ω (from memory,
 * REFERENCE-VALUES §11). @param subtendedAngleRad ω [rad].
 * @example retinalBurnThresholdWcm2(0.0093) // → ≈ 12.7 W/cm²
 */
export function retinalBurnThresholdWcm2(subtendedAngleRad: number): number {
  return RETINAL_BURN_COEFFICIENT / subtendedAngleRad;
}

/**
 * Glare category code (index into GLARE_CATEGORIES) of one retinal spot in view.
 * @param cornealIrradianceWm2 E_c [W/m²] of the spot.
 * @param discFraction Part of the sun's image the spot covers (Σ of its images, capped at 1) [-].
 * @returns 1 dim, 2 after-image possible, 3 retinal risk (0 only for no irradiance).
 */
export function glareCategoryCode(cornealIrradianceWm2: number, discFraction: number): number {
  if (!(cornealIrradianceWm2 > 0) || !(discFraction > 0)) return 0;
  const omega = SUN_ANGULAR_DIAMETER_RAD * Math.sqrt(Math.min(1, discFraction));
  const er = retinalIrradianceWcm2(cornealIrradianceWm2, omega);
  if (er >= retinalBurnThresholdWcm2(omega)) return 3;
  if (er >= afterImageThresholdWcm2(omega)) return 2;
  return 1;
}

/**
 * The specular model of a material (see fresnel.ts): glazing with a refractive index and some
 * transmittance = a stack of panes (one per glass layer of its construction); an opaque dielectric
 * = one interface; otherwise Schlick from the solar-weighted band reflectance.
 */
export function specularModelOf(m: Material): SpecularModel {
  if (m.refractiveIndex !== undefined) {
    if (m.transmittanceVisible + m.transmittanceNir > 0) {
      const panes = Math.max(1, m.construction.filter((l) => /glass|glazing|pane/i.test(l.name)).length);
      return { kind: 'pane-stack', refractiveIndex: m.refractiveIndex, panes };
    }
    return { kind: 'fresnel-interface', refractiveIndex: m.refractiveIndex };
  }
  const r0 = (SOLAR_VISIBLE_BAND_FRACTION * m.reflectanceVisible + SOLAR_NIR_BAND_FRACTION * m.reflectanceNir) / (SOLAR_VISIBLE_BAND_FRACTION + SOLAR_NIR_BAND_FRACTION);
  return { kind: 'schlick', normalReflectance: Math.min(1, Math.max(0, r0)) };
}

/** Reflection paths to zone sensors and viewpoints, columnar, in step order. */
export interface ReflectionPathData {
  count: number;
  step: number[];
  /** Reflecting patch (index into patches / Results.surfaces). */
  patch: number[];
  /** Zone index, or −1 for a viewpoint. */
  zone: number[];
  /** Sensor index within its zone, or the viewpoint index. */
  receiver: number[];
  /** Where the image is seen on the patch [m]. */
  point: [number, number, number][];
  /** Beam irradiance arriving from this patch [W/m²]. */
  irradianceWm2: number[];
  /** Part of the sun's image seen in this patch [-]. */
  discFraction: number[];
  /** Angle of the line of sight to the image from the nearest view direction [°]. */
  offAxisDeg: number[];
}

export interface ConcentrationSpot {
  kind: 'sensor' | 'ground';
  /** Zone name (sensors) or the ground patch id (ground). */
  where: string;
  /** Sensor index within the zone (−1 for ground). */
  sensor: number;
  position: [number, number, number];
  peakWm2: number;
  dniWm2: number;
  step: number;
  /** Number of patches contributing at the peak. */
  patches: number;
  /** The contributing surfaces (node names), with their share of the peak [W/m²], largest first (at most 10). */
  surfaces: { surface: string; irradianceWm2: number; patches: number }[];
}

export interface GlareData {
  /** Receivers: N zone sensors, then V viewpoints (ground cells are not stored per step). */
  sensorCount: number;
  viewpointCount: number;
  /** (N + V) × T, row-major by receiver: Σ beam irradiance [W/m²]. */
  reflectedWm2: Float32Array;
  /** (N + V) × T: glare category code (GLARE_CATEGORIES index). */
  glare: Uint8Array;
  /** (N + V) × T: number of patches reflecting the sun to the receiver. */
  reflectingPatches: Uint16Array;
  /** N × T: Σ fp(posture, |altitude of the beam|) · E_p [W/m²], the sensors' extra MRT beam term. */
  sensorBeamTermWm2: Float32Array;
  paths: ReflectionPathData;
  /** Flagged receivers, the highest peak first. */
  concentration: ConcentrationSpot[];
  /** Mirror patches considered (specularFraction > 0). */
  mirrorPatches: number;
  viewpoints: ViewpointSpec[];
  timingMs: number;
}

interface Receiver { kind: 0 | 1 | 2; zone: number; index: number; posture: 'standing' | 'seated' | null; viewAzDeg: number | null; fieldDeg: number }

/**
 * Runs the glare stage over all steps.
 * @param model Prepared model (patches, materials, BVH, sensors).
 * @param steps Time steps (sun, DNI).
 * @param geo Geometry pass (patch sun visibility).
 * @param viewpoints The project's viewpoints (may be empty).
 */
export function glareStage(model: PreparedModel, steps: Steps, geo: GeometryData, viewpoints: readonly ViewpointSpec[] = []): GlareData {
  const t0 = performance.now();
  const T = steps.count;
  const p = model.patches;
  const S = geo.sunCount;
  // Mirrors: patches with a specular part.
  const mirrorList: number[] = [];
  for (let i = 0; i < p.count; i++) if (model.materials[model.patchMaterial[i]!]!.specularFraction > 0) mirrorList.push(i);
  const M = mirrorList.length;
  const surfaces = specularSurfacesFromPatches(p.scene.positions, p.scene.indices, p.triangleOffsets, p.centroids, p.normals, mirrorList);
  const models = mirrorList.map((i) => specularModelOf(model.materials[model.patchMaterial[i]!]!));
  const specFrac = Float64Array.from(mirrorList, (i) => model.materials[model.patchMaterial[i]!]!.specularFraction);

  // Receivers: sensors, viewpoints, ground apron cells.
  const recv: Receiver[] = [];
  const pts: number[] = [];
  model.sensors.forEach((set, z) => {
    const c = set.positions.length / 3;
    for (let k = 0; k < c; k++) {
      recv.push({ kind: 0, zone: z, index: k, posture: set.zone.posture, viewAzDeg: null, fieldDeg: DEFAULT_GLARE_FIELD_DEG });
      pts.push(set.positions[3 * k]!, set.positions[3 * k + 1]!, set.positions[3 * k + 2]!);
    }
  });
  const N = recv.length;
  viewpoints.forEach((v, i) => {
    recv.push({ kind: 1, zone: -1, index: i, posture: null, viewAzDeg: v.viewDirectionDeg ?? null, fieldDeg: v.fieldDeg });
    pts.push(v.position[0], v.position[1], v.position[2]);
  });
  const V = viewpoints.length;
  // Ground cells: the apron ('ground') and, where the model stage makes them, its coarser outer ring.
  const isGround = p.scene.surfaceNames.map((name) => name === GROUND_SURFACE_NAME || name === GROUND_OUTER_NAME);
  if (model.hasGroundPlane) {
    for (let i = 0; i < p.count; i++) {
      if (!isGround[p.surfaceIds[i]!]) continue;
      recv.push({ kind: 2, zone: -1, index: i, posture: null, viewAzDeg: null, fieldDeg: 0 });
      pts.push(p.centroids[3 * i]! + GROUND_RECEIVER_HEIGHT_M * p.normals[3 * i]!, p.centroids[3 * i + 1]! + GROUND_RECEIVER_HEIGHT_M * p.normals[3 * i + 1]!, p.centroids[3 * i + 2]! + GROUND_RECEIVER_HEIGHT_M * p.normals[3 * i + 2]!);
    }
  }
  const R = recv.length;
  const points = Float64Array.from(pts);
  const NV = N + V;
  const out: GlareData = {
    sensorCount: N, viewpointCount: V,
    reflectedWm2: new Float32Array(NV * T), glare: new Uint8Array(NV * T), reflectingPatches: new Uint16Array(NV * T),
    sensorBeamTermWm2: new Float32Array(N * T),
    paths: { count: 0, step: [], patch: [], zone: [], receiver: [], point: [], irradianceWm2: [], discFraction: [], offAxisDeg: [] },
    concentration: [], mirrorPatches: M, viewpoints: [...viewpoints], timingMs: 0,
  };
  if (M === 0 || R === 0) {
    out.timingMs = Math.round(performance.now() - t0);
    return out;
  }
  const disc = solarDiscSamples(GLARE_DISC_SAMPLE_SIDE);
  const hits = makeSpecularHits(256);
  const lit = new Uint8Array(M);
  const ground = model.hasGroundPlane ? { z: model.groundZ } : null;
  // Per step scratch, by receiver.
  const sum = new Float64Array(R);
  const cnt = new Uint16Array(R);
  const first = new Int32Array(R).fill(-1);
  const next = new Int32Array(256);
  let nextArr = next;
  const eHit = new Float64Array(256);
  let eArr = eHit;
  // Concentration peak per receiver (sensor or ground), over steps.
  const peak = new Float64Array(R);
  const peakStep = new Int32Array(R).fill(-1);
  const peakSurfaces: ({ surface: string; irradianceWm2: number; patches: number }[] | null)[] = new Array(R).fill(null);
  const peakPatches = new Uint16Array(R);
  const toDeg = 180 / Math.PI;
  const spotDir: number[] = [], spotE: number[] = [], spotF: number[] = [], spotOff: number[] = [];
  const sun = new Float64Array(3);

  for (let t = 0; t < T; t++) {
    const sunIdx = geo.sunIndexOfStep[t]!;
    const dni = steps.dniWm2[t]!;
    if (sunIdx < 0 || !(dni > 0)) continue;
    sun[0] = steps.sunDir[3 * t]!; sun[1] = steps.sunDir[3 * t + 1]!; sun[2] = steps.sunDir[3 * t + 2]!;
    for (let j = 0; j < M; j++) lit[j] = geo.patchSun[mirrorList[j]! * S + sunIdx]!;
    const H = traceSpecularPaths(model.bvh, { surfaces, points, sunDirection: sun, surfaceLit: lit, discSamples: disc, ground }, hits);
    if (H === 0) continue;
    if (nextArr.length < H) { nextArr = new Int32Array(2 * H); eArr = new Float64Array(2 * H); }
    // Irradiance per hit; link hits per receiver.
    for (let h = 0; h < H; h++) {
      const j = hits.surface[h]!;
      const cosI = surfaces.normals[3 * j]! * sun[0]! + surfaces.normals[3 * j + 1]! * sun[1]! + surfaces.normals[3 * j + 2]! * sun[2]!;
      const e = dni * specularReflectanceCos(models[j]!, cosI) * specFrac[j]! * hits.discFraction[h]!;
      eArr[h] = e;
      const r = hits.receiver[h]!;
      sum[r]! += e;
      cnt[r]! += 1;
      nextArr[h] = first[r]!;
      first[r] = h;
    }
    for (let h = 0; h < H; h++) {
      const r = hits.receiver[h]!;
      if (first[r]! < 0) continue; // done already
      const rc = recv[r]!;
      const total = sum[r]!;
      if (rc.kind !== 2) {
        const o = r * T + t;
        out.reflectedWm2[o] = total;
        out.reflectingPatches[o] = Math.min(65535, cnt[r]!);
        spotDir.length = 0; spotE.length = 0; spotF.length = 0; spotOff.length = 0;
        let beamTerm = 0;
        const px = points[3 * r]!, py = points[3 * r + 1]!, pz = points[3 * r + 2]!;
        for (let g = first[r]!; g >= 0; g = nextArr[g]!) {
          const d = hits.distanceM[g]!;
          const lx = (hits.point[3 * g]! - px) / d, ly = (hits.point[3 * g + 1]! - py) / d, lz = (hits.point[3 * g + 2]! - pz) / d;
          const elev = Math.asin(Math.max(-1, Math.min(1, lz)));
          let off: number;
          if (rc.viewAzDeg === null) off = Math.abs(elev) * toDeg;
          else {
            const az = (rc.viewAzDeg * Math.PI) / 180;
            off = Math.acos(Math.max(-1, Math.min(1, lx * Math.sin(az) + ly * Math.cos(az)))) * toDeg;
          }
          const e = eArr[g]!;
          if (rc.kind === 0) beamTerm += projectedAreaFactor(rc.posture!, Math.min(90, Math.abs(elev) * toDeg)) * e;
          const pi = mirrorList[hits.surface[g]!]!;
          const P = out.paths;
          P.count++;
          P.step.push(t); P.patch.push(pi); P.zone.push(rc.kind === 0 ? rc.zone : -1); P.receiver.push(rc.index);
          P.point.push([r3(hits.point[3 * g]!), r3(hits.point[3 * g + 1]!), r3(hits.point[3 * g + 2]!)]);
          P.irradianceWm2.push(r1(e)); P.discFraction.push(r3(hits.discFraction[g]!)); P.offAxisDeg.push(r1(off));
          if (off > rc.fieldDeg) continue;
          // Retinal spots: images within one solar diameter of each other overlap.
          let s = 0;
          for (; s < spotE.length; s++) {
            const c = spotDir[3 * s]! * lx + spotDir[3 * s + 1]! * ly + spotDir[3 * s + 2]! * lz;
            if (c >= Math.cos(SUN_ANGULAR_DIAMETER_RAD)) break;
          }
          if (s === spotE.length) { spotDir.push(lx, ly, lz); spotE.push(0); spotF.push(0); spotOff.push(off); }
          spotE[s]! += e;
          spotF[s]! += hits.discFraction[g]!;
        }
        let code = 0;
        for (let s = 0; s < spotE.length; s++) code = Math.max(code, glareCategoryCode(spotE[s]!, spotF[s]!));
        out.glare[o] = code;
        if (rc.kind === 0) out.sensorBeamTermWm2[r * T + t] = beamTerm;
      }
      // Concentration: several patches together above the DNI.
      if (rc.kind !== 1 && cnt[r]! >= 2 && total > dni && total > peak[r]!) {
        {
          peak[r] = total;
          peakStep[r] = t;
          peakPatches[r] = cnt[r]!;
          const bySurface = new Map<string, { surface: string; irradianceWm2: number; patches: number }>();
          for (let g = first[r]!; g >= 0; g = nextArr[g]!) {
            const name = p.scene.surfaceNames[p.surfaceIds[mirrorList[hits.surface[g]!]!]!]!;
            const b = bySurface.get(name) ?? { surface: name, irradianceWm2: 0, patches: 0 };
            b.irradianceWm2 += eArr[g]!;
            b.patches++;
            bySurface.set(name, b);
          }
          peakSurfaces[r] = [...bySurface.values()].map((b) => ({ ...b, irradianceWm2: r1(b.irradianceWm2) })).sort((a, b) => b.irradianceWm2 - a.irradianceWm2 || (a.surface < b.surface ? -1 : 1)).slice(0, 10);
        }
      }
      first[r] = -1;
      sum[r] = 0;
      cnt[r] = 0;
    }
  }
  for (let r = 0; r < R; r++) {
    if (peakStep[r]! < 0) continue;
    const rc = recv[r]!;
    out.concentration.push({
      kind: rc.kind === 0 ? 'sensor' : 'ground',
      where: rc.kind === 0 ? model.sensors[rc.zone]!.zone.name : p.ids[rc.index]!,
      sensor: rc.kind === 0 ? rc.index : -1,
      position: [r3(points[3 * r]!), r3(points[3 * r + 1]!), r3(points[3 * r + 2]!)],
      peakWm2: r1(peak[r]!),
      dniWm2: r1(steps.dniWm2[peakStep[r]!]!),
      step: peakStep[r]!,
      patches: peakPatches[r]!,
      surfaces: peakSurfaces[r]!,
    });
  }
  out.concentration.sort((a, b) => b.peakWm2 - a.peakWm2 || a.step - b.step);
  out.timingMs = Math.round(performance.now() - t0);
  return out;
}

const r1 = (x: number) => Math.round(x * 10) / 10;
const r3 = (x: number) => Math.round(x * 1000) / 1000;
