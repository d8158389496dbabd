/**
 * The optional infinite ground plane z = groundZ, treated analytically instead of as triangles
 * (project key `ground: { material, z }`, DESIGN §4). It is opaque from both sides.
 *
 * Rules used by every query (documented once here):
 * - A ray o + t·d meets the plane at t = (groundZ − o_z) / d_z when that t is positive; the plane
 *   blocks anything beyond. For a point above the plane this only happens for d_z < 0, so the plane
 *   never blocks sun or sky rays (d_z > 0) from above-ground points; it does block every upward ray
 *   from a point below it.
 * - A ray that leaves the model downward (d_z < 0) without hitting a triangle counts as seeing the
 *   ground whether or not a plane is given: below the horizon there is always earth, and this keeps
 *   every receiver's view fractions summing to 1.
 */

/** Marker for "no ground plane" in the numeric hot path. */
export const NO_GROUND = Number.NaN;

/** The part of the project's ground the tracer needs. */
export interface GroundPlaneInput {
  /** Height of the plane [m]. */
  z: number;
}

/** The plane height [m], or `NO_GROUND` (NaN) when there is none. */
export function groundZOf(ground: GroundPlaneInput | null | undefined): number {
  return ground == null ? NO_GROUND : ground.z;
}

/**
 * Ray parameter where o + t·d crosses z = groundZ, or Infinity if it never does for t > 0 (or there
 * is no plane, groundZ = NaN).
 * @param groundZ Plane height [m] or NaN
 * @param oz Ray origin z [m]
 * @param dz Ray direction z (any length; t is in units of |d|) [-]
 */
export function groundCrossingT(groundZ: number, oz: number, dz: number): number {
  if (groundZ !== groundZ || dz === 0) return Infinity;
  const t = (groundZ - oz) / dz;
  return t > 0 ? t : Infinity;
}
