/**
 * Surface–sun geometry and the beam and ground-reflected irradiance on a surface.
 *
 * Directions are unit vectors x east, y north, z up; surface azimuth is the compass direction the
 * outward normal faces, clockwise from north; tilt is the angle from horizontal (0 = facing up,
 * 90 = a vertical wall, 180 = facing down). The isotropic and Perez sky-diffuse terms live in
 * skyDiffuse.ts.
 */
import { DEG } from './constants.ts';
import { InputError, requireInRange } from './errors.ts';

/**
 * Cosine of the angle of incidence of the sun's rays on a surface: the dot product of the unit
 * vector toward the sun and the surface's outward unit normal.
 *
 * cos θ = s · n. Negative when the sun is behind the surface. Hot-path kernel: inputs are not
 * checked and must be unit vectors.
 *
 * @param sunDirX Unit vector toward the sun, east component [-].
 * @param sunDirY North component [-].
 * @param sunDirZ Up component [-].
 * @param nx Outward unit normal, east component [-].
 * @param ny North component [-].
 * @param nz Up component [-].
 * @returns cos θ [-], −1..1.
 *
 * References:
 * [1] J. A. Duffie and W. A. Beckman, Solar Engineering of Thermal Processes, 4th ed. Hoboken,
 *     NJ, USA: Wiley, 2013, sec. 1.6, doi:10.1002/9781118671603.
 *
 * @example
 * cosIncidence(0, 0, 1, 0, 0, 1); // → 1 (sun at the zenith on a roof)
 */
export function cosIncidence(sunDirX: number, sunDirY: number, sunDirZ: number, nx: number, ny: number, nz: number): number {
  return sunDirX * nx + sunDirY * ny + sunDirZ * nz;
}

/**
 * Angle of incidence of the sun's rays on a tilted surface.
 *
 * cos θ = cos z cos S + sin z sin S cos(γs − γ), clipped to [−1, 1]; θ = acos(cos θ).
 * θ > 90° means the sun is behind the surface.
 *
 * @param surfaceTiltDeg Surface tilt S from horizontal [°], 0..180.
 * @param surfaceAzimuthDeg Azimuth γ the surface faces [°], clockwise from north, −360..360.
 * @param solarZenithDeg Solar zenith z [°], 0..180.
 * @param solarAzimuthDeg Solar azimuth γs [°], clockwise from north, −360..360.
 * @returns θ [°], 0..180.
 * @throws InputError for inputs out of range.
 *
 * References:
 * [1] J. A. Duffie and W. A. Beckman, Solar Engineering of Thermal Processes, 4th ed. Hoboken,
 *     NJ, USA: Wiley, 2013, eq. 1.6.3, doi:10.1002/9781118671603.
 * [2] I. Reda and A. Andreas, "Solar position algorithm for solar radiation applications,"
 *     Solar Energy, vol. 76, no. 5, pp. 577–589, 2004, eq. 47, doi:10.1016/j.solener.2003.12.003.
 *
 * @example
 * angleOfIncidenceDeg(30, 170, 50.111622, 194.340241); // → 25.1870002 (SPA example)
 */
export function angleOfIncidenceDeg(
  surfaceTiltDeg: number,
  surfaceAzimuthDeg: number,
  solarZenithDeg: number,
  solarAzimuthDeg: number,
): number {
  requireInRange(surfaceTiltDeg, 0, 180, 'surfaceTiltDeg', '°');
  requireInRange(surfaceAzimuthDeg, -360, 360, 'surfaceAzimuthDeg', '°');
  requireInRange(solarZenithDeg, 0, 180, 'solarZenithDeg', '°');
  requireInRange(solarAzimuthDeg, -360, 360, 'solarAzimuthDeg', '°');
  return Math.acos(cosIncidenceFromAngles(surfaceTiltDeg, surfaceAzimuthDeg, solarZenithDeg, solarAzimuthDeg)) / DEG;
}

/**
 * Cosine of the angle of incidence of the sun on a plane given by tilt and azimuth, clipped to
 * [-1, 1]: cos θ = cos z cos S + sin z sin S cos(γs − γ). Hot-path kernel: inputs are not checked.
 *
 * References: Duffie & Beckman 2013, sec. 1.6 [1].
 *
 * @example cosIncidenceFromAngles(90, 180, 40, 180) // → cos 50° = 0.6428
 */
export function cosIncidenceFromAngles(surfaceTiltDeg: number, surfaceAzimuthDeg: number, solarZenithDeg: number, solarAzimuthDeg: number): number {
  const s = surfaceTiltDeg * DEG;
  const z = solarZenithDeg * DEG;
  const c = Math.cos(z) * Math.cos(s) + Math.sin(z) * Math.sin(s) * Math.cos((solarAzimuthDeg - surfaceAzimuthDeg) * DEG);
  return Math.min(1, Math.max(-1, c));
}

/**
 * Beam (direct) irradiance on a surface.
 *
 * E_b = DNI · max(0, cos θ): zero when the sun is behind the surface. Sun visibility (shade) is
 * applied by the caller. Hot-path kernel: inputs are not checked.
 *
 * @param dniWm2 Direct normal irradiance [W/m²].
 * @param cosIncidence cos θ [-] from {@link cosIncidence}.
 * @returns Beam irradiance on the surface as oriented [W/m²].
 *
 * References:
 * [1] J. A. Duffie and W. A. Beckman, Solar Engineering of Thermal Processes, 4th ed. Hoboken,
 *     NJ, USA: Wiley, 2013, sec. 2.15, doi:10.1002/9781118671603.
 *
 * @example
 * beamOnSurfaceWm2(800, Math.cos(50 * Math.PI / 180)); // → 514.23
 */
export function beamOnSurfaceWm2(dniWm2: number, cosIncidence: number): number {
  return cosIncidence > 0 ? dniWm2 * cosIncidence : 0;
}

/**
 * Ground-reflected irradiance on a tilted surface from an infinite, uniformly lit, diffusely
 * reflecting (Lambertian) ground — the isotropic ground term, without obstructions.
 *
 * E_g = GHI · ρ · (1 − cos S) / 2.
 *
 * @param surfaceTiltDeg Surface tilt S from horizontal [°], 0..180.
 * @param ghiWm2 Global horizontal irradiance on the ground [W/m²], ≥ 0.
 * @param albedo Ground solar reflectance ρ [-], 0..1.
 * @returns Ground-reflected irradiance on the surface [W/m²].
 * @throws InputError for inputs out of range.
 *
 * References:
 * [1] B. Y. H. Liu and R. C. Jordan, "The long-term average performance of flat-plate
 *     solar-energy collectors," Solar Energy, vol. 7, no. 2, pp. 53–74, 1963,
 *     doi:10.1016/0038-092X(63)90006-9.
 * [2] pvlib python, irradiance.get_ground_diffuse, doi:10.21105/joss.00884.
 *
 * @example
 * groundReflectedOnTiltWm2(40, 900, 0.25); // → 26.32000014911496
 */
export function groundReflectedOnTiltWm2(surfaceTiltDeg: number, ghiWm2: number, albedo: number): number {
  requireInRange(surfaceTiltDeg, 0, 180, 'surfaceTiltDeg', '°');
  requireInRange(ghiWm2, 0, 2000, 'ghiWm2', 'W/m²');
  requireInRange(albedo, 0, 1, 'albedo');
  return (ghiWm2 * albedo * (1 - Math.cos(surfaceTiltDeg * DEG))) / 2;
}

/** Tilt and azimuth of a surface. */
export interface SurfaceOrientation {
  /** Tilt from horizontal [°]: 0 faces up, 90 vertical, 180 faces down. */
  tiltDeg: number;
  /** Azimuth the outward normal faces [°], clockwise from north, [0, 360); 180 by convention when horizontal. */
  azimuthDeg: number;
}

/** Normals closer to vertical than this (|horizontal part| below it) count as horizontal. */
const HORIZONTAL_EPS = 1e-12;

/**
 * Tilt and facing azimuth of a surface from its outward normal (need not be unit length).
 *
 * tilt = acos(nz / |n|), azimuth = atan2(nx, ny) mod 360°; a horizontal surface (up or down)
 * gets azimuth 180° by convention (it does not matter: sin S = 0).
 *
 * @param nx Outward normal, east component [-].
 * @param ny North component [-].
 * @param nz Up component [-].
 * @param target Optional object to write into.
 * @returns Tilt and azimuth [°].
 * @throws InputError for a zero-length or non-finite normal.
 *
 * References: coordinate convention of DESIGN.md §3 (x east, y north, z up; azimuth clockwise
 * from north); the relation is plain spherical geometry.
 *
 * @example
 * surfaceTiltAzimuthFromNormal(0, -1, 0); // → { tiltDeg: 90, azimuthDeg: 180 } (a south wall)
 */
export function surfaceTiltAzimuthFromNormal(
  nx: number,
  ny: number,
  nz: number,
  target: SurfaceOrientation = { tiltDeg: 0, azimuthDeg: 0 },
): SurfaceOrientation {
  const len = Math.hypot(nx, ny, nz);
  if (!Number.isFinite(len) || len === 0) {
    throw new InputError({
      problem: len === 0 ? 'zero-length normal' : 'not a finite vector',
      place: 'normal (nx, ny, nz)',
      value: [nx, ny, nz],
      expected: 'a finite, non-zero outward normal',
    });
  }
  const cz = Math.max(-1, Math.min(1, nz / len));
  target.tiltDeg = Math.acos(cz) / DEG;
  const horiz = Math.hypot(nx, ny) / len;
  if (horiz < HORIZONTAL_EPS) {
    target.azimuthDeg = 180;
  } else {
    const az = Math.atan2(nx, ny) / DEG;
    target.azimuthDeg = az < 0 ? az + 360 : az;
  }
  return target;
}
