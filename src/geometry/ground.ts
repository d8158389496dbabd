/**
 * The optional infinite ground plane (project key `ground: { material, z }`): a horizontal plane at
 * height z with its normal up (+z), handled analytically by the tracer (no triangles), so it has no
 * edge a ray could slip past and costs nothing in the BVH.
 */
import { InputError } from '../physics/errors.ts';

/** An infinite horizontal ground plane; normal +z (the air is above). */
export interface GroundPlane {
  /** Material name or preset id (looked up like a model material). */
  material: string;
  /** Height of the plane [m], engine frame. */
  zM: number;
}

/** Unit normal of the ground plane (x, y, z). */
export const GROUND_NORMAL: readonly [number, number, number] = [0, 0, 1];

/**
 * The ground plane from the project's `ground` value (`{ material, z }`, z defaults to 0), or
 * undefined when the key is absent. Throws InputError naming the key.
 * @param value the parsed JSON value of `ground`
 * @param place key path for messages (default "ground")
 */
export function groundPlaneFromProject(value: unknown, place = 'ground', file?: string): GroundPlane | undefined {
  if (value === undefined || value === null) return undefined;
  if (typeof value !== 'object' || Array.isArray(value)) {
    throw new InputError({ problem: 'not an object', file, place, value, expected: '{ "material": "<name>", "z": <metres> }' });
  }
  const g = value as Record<string, unknown>;
  if (typeof g['material'] !== 'string' || g['material'] === '') {
    throw new InputError({ problem: 'missing or not a string', file, place: `${place}.material`, value: g['material'], expected: 'a material name or preset id' });
  }
  const z = g['z'] ?? 0;
  if (typeof z !== 'number' || !Number.isFinite(z)) {
    throw new InputError({ problem: 'not a finite number', file, place: `${place}.z`, value: z, expected: 'the ground height in metres' });
  }
  return { material: g['material'], zM: z };
}

/**
 * Distance along a ray to the ground plane [m, in units of the direction's length], or Infinity when
 * the ray runs parallel to it or away from it (or the hit is not beyond `tMinM`).
 * t = (z_ground − z_origin) / d_z.
 * @param ground the plane
 * @param originZM ray origin height [m]
 * @param dirZ z component of the ray direction
 * @param tMinM smallest accepted distance (self-intersection offset) [m], default 0
 */
export function rayGroundDistanceM(ground: GroundPlane, originZM: number, dirZ: number, tMinM = 0): number {
  if (dirZ === 0) return Infinity;
  const t = (ground.zM - originZM) / dirZ;
  return t > tMinM ? t : Infinity;
}

/**
 * Whether a ray from above the ground hits it on its upper (air) side: the ray goes down from a
 * point above the plane. A ray from below the plane (a basement) never hits it from the air side.
 */
export function rayHitsGroundFromAbove(ground: GroundPlane, originZM: number, dirZ: number): boolean {
  return originZM > ground.zM && dirZ < 0;
}

/** Height of a point above the ground plane [m] (negative below it). */
export function heightAboveGroundM(ground: GroundPlane, zM: number): number {
  return zM - ground.zM;
}
