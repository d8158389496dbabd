/**
 * Specular (mirror) reflectance of smooth surfaces as a function of the angle of incidence:
 * Fresnel reflectance of a dielectric interface (glass, water), the reflectance of a pane and of a
 * stack of panes by incoherent multiple reflection, and Schlick's angular approximation for
 * metals and coated finishes that have no real refractive index. Plus the sun's angular size, which
 * sets the size of the mirror image of the sun.
 *
 * Which model the audit uses for which material (src/audit/stages/glare.ts):
 * - a transmitting dielectric (glazing, refractiveIndex set, transmittance > 0): `paneStackReflectance`
 *   with one pane per glass layer of its construction (unpolarised, per polarisation first);
 * - an opaque dielectric (water, refractiveIndex set, no transmittance): `fresnelReflectance`, one
 *   interface;
 * - no refractive index (anodised / polished metal, gloss paint): `schlickReflectance` with the
 *   material's solar-weighted band reflectance as its normal-incidence value.
 *
 * References:
 * [1] M. Born and E. Wolf, Principles of Optics, 7th ed. Cambridge, U.K.: Cambridge Univ. Press,
 *     1999, sec. 1.5.3 (Fresnel formulae), doi:10.1017/CBO9781139644181.
 * [2] E. Hecht, Optics, 5th ed. Harlow, U.K.: Pearson, 2017, sec. 4.6.2 (reflectance and
 *     transmittance, Eqs. 4.42–4.43 in the 4th ed.; numbering from memory).
 * [3] J. A. Duffie and W. A. Beckman, Solar Engineering of Thermal Processes, 4th ed. Hoboken, NJ,
 *     USA: Wiley, 2013, sec. 5.1 (transmittance of N non-absorbing covers, τ = (1 − r)/(1 + (2N − 1)r)
 *     per polarisation), doi:10.1002/9781118671603.
 * [4] C. Schlick, "An inexpensive BRDF model for physically-based rendering," Computer Graphics
 *     Forum, vol. 13, no. 3, pp. 233–246, 1994, doi:10.1111/1467-8659.1330233.
 * [5] IAU 2015 Resolution B3 (nominal solar radius 6.957×10⁸ m) and IAU 2012 Resolution B2
 *     (1 au = 1.495978707×10¹¹ m); REFERENCE-VALUES §11.
 */
import { DEG } from './constants.ts';
import { InputError, requireInRange } from './errors.ts';

/** Nominal solar radius [m] (IAU 2015 Resolution B3). */
export const SOLAR_RADIUS_M = 6.957e8;
/** Astronomical unit [m] (IAU 2012 Resolution B2). */
export const ASTRONOMICAL_UNIT_M = 1.495978707e11;
/**
 * Angular diameter of the sun at 1 au [rad]: 2·atan(R☉ / 1 au) = 9.30 mrad (0.533°). It varies by
 * about ±1.7 % over the year with the Earth–Sun distance; the mean is used.
 */
export const SUN_ANGULAR_DIAMETER_RAD = 2 * Math.atan(SOLAR_RADIUS_M / ASTRONOMICAL_UNIT_M);

/** s- and p-polarised reflectance of one interface (caller-owned target, reused in loops). */
export interface FresnelSP {
  /** Reflectance of the s (TE) component [-]. */
  rs: number;
  /** Reflectance of the p (TM) component [-]. */
  rp: number;
}

/** A fresh target for `fresnelReflectanceSP` (allocate once, outside loops). */
export function makeFresnelSP(): FresnelSP {
  return { rs: 0, rp: 0 };
}

function checkIndex(refractiveIndex: number): void {
  requireInRange(refractiveIndex, 1, 10, 'refractiveIndex (Fresnel)', '', { source: 'a real refractive index ≥ 1 of a non-absorbing dielectric' });
}

/**
 * Fresnel reflectances of the s and p components at a smooth interface from air (n₁ = 1) into a
 * non-absorbing dielectric of refractive index n.
 *
 * With Snell's law sin θt = sin θi / n:
 *   R_s = ((cos θi − n cos θt) / (cos θi + n cos θt))²,
 *   R_p = ((n cos θi − cos θt) / (n cos θi + cos θt))².
 * At normal incidence both are ((n − 1)/(n + 1))²; at grazing incidence both tend to 1.
 *
 * @param incidenceDeg Angle of incidence from the surface normal [°], 0…90.
 * @param refractiveIndex Real refractive index of the dielectric [-], ≥ 1 (1.52 soda-lime glass).
 * @param target Receives rs and rp [-].
 * @returns `target`.
 * @throws InputError for an angle outside [0, 90]° or an index below 1.
 *
 * References: [1] Born & Wolf 1999, sec. 1.5.3; [2] Hecht 2017, sec. 4.6.2.
 *
 * @example
 * fresnelReflectanceSP(60, 1.52, makeFresnelSP()); // → { rs: 0.18344, rp: 0.00153 } (REFERENCE-VALUES §10.1)
 */
export function fresnelReflectanceSP(incidenceDeg: number, refractiveIndex: number, target: FresnelSP): FresnelSP {
  requireInRange(incidenceDeg, 0, 90, 'incidenceDeg (Fresnel)', '°');
  checkIndex(refractiveIndex);
  fresnelSPKernel(Math.cos(incidenceDeg * DEG), refractiveIndex, target);
  return target;
}

/** Unchecked kernel of `fresnelReflectanceSP` on cos θi (hot loops). */
function fresnelSPKernel(cosI: number, n: number, target: FresnelSP): void {
  const c = Math.min(1, Math.max(0, cosI));
  const sinI2 = 1 - c * c;
  const cosT = Math.sqrt(Math.max(0, 1 - sinI2 / (n * n)));
  const s = (c - n * cosT) / (c + n * cosT);
  const p = (n * c - cosT) / (n * c + cosT);
  target.rs = s * s;
  target.rp = p * p;
}

const _sp = makeFresnelSP();

/**
 * Unpolarised Fresnel reflectance of one smooth air–dielectric interface: the mean of the s and p
 * reflectances (sunlight is unpolarised).
 *
 * R = (R_s + R_p) / 2, with R_s and R_p as in `fresnelReflectanceSP`.
 *
 * @param incidenceDeg Angle of incidence from the surface normal [°], 0…90.
 * @param refractiveIndex Real refractive index [-], ≥ 1.
 * @returns Reflectance [-], 0…1.
 * @throws InputError for an angle outside [0, 90]° or an index below 1.
 *
 * References: [1] Born & Wolf 1999, sec. 1.5.3; [2] Hecht 2017, sec. 4.6.2.
 *
 * @example
 * fresnelReflectance(0, 1.52); // → 0.04258 (REFERENCE-VALUES §10.1)
 */
export function fresnelReflectance(incidenceDeg: number, refractiveIndex: number): number {
  fresnelReflectanceSP(incidenceDeg, refractiveIndex, _sp);
  return 0.5 * (_sp.rs + _sp.rp);
}

/**
 * Reflectance of a stack of N parallel, non-absorbing panes (2N identical interfaces) for
 * unpolarised light, summing the incoherent multiple reflections between all surfaces separately
 * for each polarisation and then averaging.
 *
 * Per polarisation with single-interface reflectance r (Duffie & Beckman sec. 5.1, the
 * transmittance τ = (1 − r)/(1 + (2N − 1)r) of N covers):
 *   R_N = 1 − τ = 2N·r / (1 + (2N − 1)·r);   one pane (N = 1): R_pane = 2r / (1 + r).
 * R = (R_N(r_s) + R_N(r_p)) / 2. Absorption in the glass is neglected, so this slightly overstates
 * a real unit's reflectance (clear double glazing: 0.151 here against ≈ 0.14 measured-type values).
 *
 * @param incidenceDeg Angle of incidence [°], 0…90.
 * @param refractiveIndex Refractive index of the glass [-], ≥ 1.
 * @param panes Number of panes N (integer ≥ 1): 1 single glazing, 2 double, 3 triple.
 * @returns Reflectance [-], 0…1.
 * @throws InputError for an angle outside [0, 90]°, an index below 1 or a pane count below 1.
 *
 * References: [1] Born & Wolf 1999, sec. 1.5.3; [3] Duffie & Beckman 2013, sec. 5.1.
 *
 * @example
 * paneStackReflectance(0, 1.52, 1); // → 0.0817 (REFERENCE-VALUES §10.1, two-surface pane)
 */
export function paneStackReflectance(incidenceDeg: number, refractiveIndex: number, panes: number): number {
  requireInRange(incidenceDeg, 0, 90, 'incidenceDeg (pane reflectance)', '°');
  checkIndex(refractiveIndex);
  if (!Number.isInteger(panes) || panes < 1) {
    throw new InputError({ problem: 'not a whole number of panes', place: 'panes', value: panes, expected: 'an integer ≥ 1' });
  }
  return paneStackReflectanceCos(Math.cos(incidenceDeg * DEG), refractiveIndex, panes);
}

/**
 * `paneStackReflectance` on cos θi, unchecked (hot loops; the caller validated n and N).
 * @param cosIncidence cos θi [-], 0…1.
 * @param refractiveIndex [-] ≥ 1.
 * @param panes N ≥ 1.
 */
export function paneStackReflectanceCos(cosIncidence: number, refractiveIndex: number, panes: number): number {
  fresnelSPKernel(cosIncidence, refractiveIndex, _sp);
  const m = 2 * panes;
  const stack = (r: number) => (m * r) / (1 + (m - 1) * r);
  return 0.5 * (stack(_sp.rs) + stack(_sp.rp));
}

/**
 * `fresnelReflectance` on cos θi, unchecked (hot loops).
 * @param cosIncidence cos θi [-], 0…1.
 * @param refractiveIndex [-] ≥ 1.
 */
export function fresnelReflectanceCos(cosIncidence: number, refractiveIndex: number): number {
  fresnelSPKernel(cosIncidence, refractiveIndex, _sp);
  return 0.5 * (_sp.rs + _sp.rp);
}

/**
 * Schlick's approximation of the angular rise of specular reflectance, used here for metals and
 * coated finishes that have no real refractive index: the reflectance at normal incidence R₀ rises
 * toward 1 at grazing incidence.
 *
 * R(θ) = R₀ + (1 − R₀)·(1 − cos θ)⁵.
 *
 * For a dielectric with R₀ = ((n − 1)/(n + 1))² it stays within 0.035 of the exact Fresnel mean
 * over 0–85° (n = 1.52; largest gaps near 60° and 85°); for metals it is the usual stand-in for the complex-index Fresnel
 * equations when only the normal reflectance is known (the material presets give band
 * reflectances, not complex indices).
 *
 * @param incidenceDeg Angle of incidence [°], 0…90.
 * @param normalReflectance R₀, reflectance at normal incidence [-], 0…1.
 * @returns Reflectance [-], R₀…1.
 * @throws InputError for an angle outside [0, 90]° or R₀ outside [0, 1].
 *
 * References: [4] Schlick 1994, eq. (24).
 *
 * @example
 * schlickReflectance(60, 0.7); // → 0.7 + 0.3·0.5⁵ = 0.709375
 */
export function schlickReflectance(incidenceDeg: number, normalReflectance: number): number {
  requireInRange(incidenceDeg, 0, 90, 'incidenceDeg (Schlick)', '°');
  requireInRange(normalReflectance, 0, 1, 'normalReflectance (Schlick)');
  return schlickReflectanceCos(Math.cos(incidenceDeg * DEG), normalReflectance);
}

/**
 * `schlickReflectance` on cos θi, unchecked (hot loops).
 * @param cosIncidence cos θi [-], 0…1.
 * @param normalReflectance R₀ [-].
 */
export function schlickReflectanceCos(cosIncidence: number, normalReflectance: number): number {
  const k = 1 - Math.min(1, Math.max(0, cosIncidence));
  const k2 = k * k;
  return normalReflectance + (1 - normalReflectance) * k2 * k2 * k;
}

/** How a specular surface's reflectance varies with incidence (see the module notes). */
export type SpecularModel =
  | { readonly kind: 'fresnel-interface'; readonly refractiveIndex: number }
  | { readonly kind: 'pane-stack'; readonly refractiveIndex: number; readonly panes: number }
  | { readonly kind: 'schlick'; readonly normalReflectance: number };

/**
 * Specular reflectance of a surface by its model, on cos θi (the dispatcher over the three models
 * above). Unchecked: build the model with checked values.
 *
 * @param model The surface's specular model.
 * @param cosIncidence cos θi [-], 0…1 (clamped).
 * @returns Reflectance [-].
 *
 * @example
 * specularReflectanceCos({ kind: 'pane-stack', refractiveIndex: 1.52, panes: 1 }, 1); // → 0.0817
 */
export function specularReflectanceCos(model: SpecularModel, cosIncidence: number): number {
  switch (model.kind) {
    case 'fresnel-interface':
      return fresnelReflectanceCos(cosIncidence, model.refractiveIndex);
    case 'pane-stack':
      return paneStackReflectanceCos(cosIncidence, model.refractiveIndex, model.panes);
    case 'schlick':
      return schlickReflectanceCos(cosIncidence, model.normalReflectance);
  }
}

/**
 * Mirror reflection of a direction about a plane: the direction the sun's beam leaves a mirror in,
 * given the unit vector toward the sun s and the mirror's unit normal n (law of reflection).
 *
 * r = 2(n·s)·n − s (r points away from the mirror; r·n = s·n).
 *
 * @param sx Unit vector toward the sun, x (east) [-]; sy, sz alike.
 * @param nx Unit normal of the mirror, x [-]; ny, nz alike.
 * @param target Receives r (length ≥ 3).
 * @returns `target`.
 *
 * References: [2] Hecht 2017, sec. 4.3 (law of reflection).
 *
 * @example
 * reflectDirection(0, -0.6, 0.8, 0, -1, 0, new Float64Array(3)); // → [0, -0.6, -0.8]
 */
export function reflectDirection<T extends { [i: number]: number }>(sx: number, sy: number, sz: number, nx: number, ny: number, nz: number, target: T): T {
  const d = 2 * (nx * sx + ny * sy + nz * sz);
  target[0] = d * nx - sx;
  target[1] = d * ny - sy;
  target[2] = d * nz - sz;
  return target;
}
