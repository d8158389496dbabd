/**
 * Sun transmittance of receivers through semi-transparent devices: 0 where an opaque surface
 * blocks the ray to the sun's centre, else the product of the fabric sheets' transmittances
 * crossed (`sheetTransmittance`) and the tree crowns' Beer–Lambert attenuation
 * (`crownTransmittance`, exp(−k·chord) per crown, k for the day of the sun direction).
 *
 * Used instead of the 0/1 sun visibility when a project has fabric devices or trees (DESIGN §4:
 * "a semi-transparent crown counts as sunlit with its transmittance applied to the beam").
 * Same geometry conventions as sunVisibility.ts: origins offset along the normal, a receiver facing
 * away from the sun or below the ground plane is not lit.
 */
import type { BvhData } from '../bvh/build.ts';
import { isOccludedMasked } from '../bvh/query.ts';
import { crownTransmittance, sheetTransmittance } from '../crowns.ts';
import type { CrownSet } from '../../geometry/generators/tree.ts';
import { groundCrossingT, groundZOf, type GroundPlaneInput } from './groundPlane.ts';
import { DEFAULT_NORMAL_OFFSET_M, DEFAULT_T_MIN_M } from './sunVisibility.ts';

export interface SunTransmittanceInput {
  points: Float32Array | Float64Array;
  normals?: Float32Array | Float64Array | undefined;
  /** Unit vectors toward the sun, 3 per sun direction. */
  sunDirections: Float32Array | Float64Array;
  ground?: GroundPlaneInput | null | undefined;
  /** Per BVH triangle (original index): transmittance of its sheet, 0 = opaque. */
  triangleTransmittance: Float32Array;
  /** 1 for semi-transparent triangles (skipped by the opaque test). */
  skipSemiTransparent: Uint8Array;
  /** 1 for opaque triangles (skipped while walking the sheets). */
  skipOpaque: Uint8Array;
  crowns: CrownSet;
  /** Crown extinction [1/m], crowns.count values per sun direction (the day the direction belongs to). */
  crownExtinctionPerM: Float64Array;
}

/** Transmittance [0, 1] per (receiver i in [start, end), sun s): element (i − start)·S + s. */
export function sunTransmittance(bvh: BvhData, input: SunTransmittanceInput, start = 0, end = -1): Float32Array {
  const count = input.points.length / 3;
  if (end < 0) end = count;
  const S = input.sunDirections.length / 3;
  const C = input.crowns.count;
  const out = new Float32Array((end - start) * S);
  const gz = groundZOf(input.ground);
  const k = input.crownExtinctionPerM;
  const kSun = new Float64Array(C);
  for (let i = start; i < end; i++) {
    let ox = input.points[3 * i]!, oy = input.points[3 * i + 1]!, oz = input.points[3 * i + 2]!;
    const n = input.normals;
    const nx = n ? n[3 * i]! : 0, ny = n ? n[3 * i + 1]! : 0, nz = n ? n[3 * i + 2]! : 0;
    if (n) {
      ox += nx * DEFAULT_NORMAL_OFFSET_M;
      oy += ny * DEFAULT_NORMAL_OFFSET_M;
      oz += nz * DEFAULT_NORMAL_OFFSET_M;
    }
    for (let s = 0; s < S; s++) {
      const dx = input.sunDirections[3 * s]!, dy = input.sunDirections[3 * s + 1]!, dz = input.sunDirections[3 * s + 2]!;
      let tau = 0;
      if (dz > 0 && (!n || nx * dx + ny * dy + nz * dz > 0) && groundCrossingT(gz, oz, dz) === Infinity) {
        if (bvh.triangleCount === 0 || !isOccludedMasked(bvh, ox, oy, oz, dx, dy, dz, DEFAULT_T_MIN_M, Infinity, input.skipSemiTransparent)) {
          tau = sheetTransmittance(bvh, ox, oy, oz, dx, dy, dz, DEFAULT_T_MIN_M, Infinity, input.triangleTransmittance, input.skipOpaque);
          if (tau > 0 && C > 0) {
            for (let c = 0; c < C; c++) kSun[c] = k[s * C + c]!;
            tau *= crownTransmittance(input.crowns, ox, oy, oz, dx, dy, dz, Infinity, kSun);
          }
        }
      }
      out[(i - start) * S + s] = tau;
    }
  }
  return out;
}
