/**
 * Direction samplers for the ray queries. STYLE §8: every sampler takes its uniform numbers
 * `u1, u2` from the caller (never draws them) and comes as a triad `sampleX` / `xPdf` / `invertX`;
 * results go into a caller-supplied `target` so hot loops allocate nothing.
 *
 * Frames: a local frame has its z axis along the receiver normal. World directions are x east,
 * y north, z up; azimuth is clockwise from north, so a direction at altitude `alt` and azimuth `az`
 * is (cos alt · sin az, cos alt · cos az, sin alt) (DESIGN §3).
 *
 * References:
 * [1] M. Pharr, W. Jakob and G. Humphreys, Physically Based Rendering, 4th ed., MIT Press, 2023,
 *     §A.5 "Sampling multidimensional functions" (cosine-weighted hemisphere, Malley's method).
 * [2] T. Duff, J. Burgess, P. Christensen, C. Hery, A. Kensler, M. Liani and R. Villemin,
 *     "Building an orthonormal basis, revisited," J. Comput. Graph. Tech., vol. 6, no. 1, 2017.
 */

/** Anything indexable to write a 3-vector (or 2-vector) into. */
export type NumberTarget = { [index: number]: number; readonly length: number };

const TWO_PI = 2 * Math.PI;

// ---------------------------------------------------------------------------------------------
// Cosine-weighted hemisphere (local frame, z = normal)

/**
 * Cosine-weighted direction on the hemisphere around +z.
 *
 * Equation: r = √u1, φ = 2π·u2, d = (r cos φ, r sin φ, √(1 − u1)); pdf(d) = cos θ / π.
 * @param u1 Uniform number in [0, 1) [-]
 * @param u2 Uniform number in [0, 1) [-]
 * @param target Receives the unit direction (x, y, z) in the local frame [-]
 * @returns `target`
 * @example sampleCosineHemisphere(0, 0.25, v) // v ≈ (0, 0, 1); (0.75, 0, ·) gives cos θ = 0.5
 */
export function sampleCosineHemisphere(u1: number, u2: number, target: NumberTarget): NumberTarget {
  const r = Math.sqrt(u1);
  const phi = TWO_PI * u2;
  target[0] = r * Math.cos(phi);
  target[1] = r * Math.sin(phi);
  target[2] = Math.sqrt(Math.max(0, 1 - u1));
  return target;
}

/**
 * Probability density of `sampleCosineHemisphere` per unit solid angle.
 * @param cosTheta Cosine of the angle from the normal [-]
 * @returns cos θ / π for cos θ > 0, else 0 [1/sr]
 */
export function cosineHemispherePdf(cosTheta: number): number {
  return cosTheta > 0 ? cosTheta / Math.PI : 0;
}

/**
 * Inverse of `sampleCosineHemisphere`: the (u1, u2) that map to a local direction.
 * @param dir Unit direction in the local frame (z ≥ 0) [-]
 * @param target Receives (u1, u2) in [0, 1) [-]
 * @returns `target`
 */
export function invertCosineHemisphere(dir: ArrayLike<number>, target: NumberTarget = new Float64Array(2)): NumberTarget {
  const x = dir[0]!;
  const y = dir[1]!;
  target[0] = Math.min(1, x * x + y * y);
  let u2 = Math.atan2(y, x) / TWO_PI;
  if (u2 < 0) u2 += 1;
  target[1] = u2 >= 1 ? 0 : u2;
  return target;
}

// ---------------------------------------------------------------------------------------------
// Orthonormal frame around a normal

/**
 * Orthonormal frame (tangent, bitangent, normal) around a unit normal, branch-light and without
 * allocation (Duff et al. 2017, listing 3). Layout of `target`: t = [0..2], b = [3..5], n = [6..8].
 * @param nx Normal x, unit length [-]
 * @param ny Normal y [-]
 * @param nz Normal z [-]
 * @param target Nine numbers [-]
 * @returns `target`
 */
export function buildFrame(nx: number, ny: number, nz: number, target: NumberTarget): NumberTarget {
  const sign = nz >= 0 ? 1 : -1;
  const a = -1 / (sign + nz);
  const b = nx * ny * a;
  target[0] = 1 + sign * nx * nx * a;
  target[1] = sign * b;
  target[2] = -sign * nx;
  target[3] = b;
  target[4] = sign + ny * ny * a;
  target[5] = -ny;
  target[6] = nx;
  target[7] = ny;
  target[8] = nz;
  return target;
}

/**
 * World direction of a local direction (lx, ly, lz) in a frame from `buildFrame`.
 * @returns `target`
 */
export function frameToWorld(frame: ArrayLike<number>, lx: number, ly: number, lz: number, target: NumberTarget): NumberTarget {
  target[0] = lx * frame[0]! + ly * frame[3]! + lz * frame[6]!;
  target[1] = lx * frame[1]! + ly * frame[4]! + lz * frame[7]!;
  target[2] = lx * frame[2]! + ly * frame[5]! + lz * frame[8]!;
  return target;
}

// ---------------------------------------------------------------------------------------------
// Sky cells: an altitude × azimuth rectangle of the sky (one sky patch)

/**
 * Direction uniform in solid angle inside a sky cell [altMin, altMax] × [azMin, azMax].
 *
 * Equation: sin alt = sin altMin + u1 (sin altMax − sin altMin), az = azMin + u2 (azMax − azMin);
 * pdf = 1/Ω with Ω = (sin altMax − sin altMin)(azMax − azMin). The caller weights each sample by
 * the receiver's cosine max(0, n·ω), so stratified (u1, u2) give a stratified estimate of the
 * cosine-weighted visible solid angle of the cell.
 * @param altMinRad Lower altitude [rad]
 * @param altMaxRad Upper altitude [rad]
 * @param azMinRad Azimuth start, clockwise from north [rad]
 * @param azMaxRad Azimuth end [rad]
 * @param u1 Uniform number in [0, 1) (altitude) [-]
 * @param u2 Uniform number in [0, 1) (azimuth) [-]
 * @param target Receives the world unit direction (x east, y north, z up) [-]
 * @returns `target`
 * @example sampleSkyCell(0, Math.PI / 2, 0, 2 * Math.PI, 0.5, 0.25, v) // v = (cos 30°, 0, 0.5): east at 30°
 */
export function sampleSkyCell(
  altMinRad: number,
  altMaxRad: number,
  azMinRad: number,
  azMaxRad: number,
  u1: number,
  u2: number,
  target: NumberTarget,
): NumberTarget {
  const s0 = Math.sin(altMinRad);
  const sinAlt = s0 + u1 * (Math.sin(altMaxRad) - s0);
  const cosAlt = Math.sqrt(Math.max(0, 1 - sinAlt * sinAlt));
  const az = azMinRad + u2 * (azMaxRad - azMinRad);
  target[0] = cosAlt * Math.sin(az);
  target[1] = cosAlt * Math.cos(az);
  target[2] = sinAlt;
  return target;
}

/**
 * Probability density of `sampleSkyCell` per unit solid angle: 1/Ω of the cell.
 * @returns 1 / ((sin altMax − sin altMin)(azMax − azMin)) [1/sr]
 */
export function skyCellPdf(altMinRad: number, altMaxRad: number, azMinRad: number, azMaxRad: number): number {
  return 1 / ((Math.sin(altMaxRad) - Math.sin(altMinRad)) * (azMaxRad - azMinRad));
}

/**
 * Inverse of `sampleSkyCell` for a direction inside the cell.
 * @param dir World unit direction [-]
 * @param target Receives (u1, u2) [-]
 * @returns `target`
 */
export function invertSkyCell(
  altMinRad: number,
  altMaxRad: number,
  azMinRad: number,
  azMaxRad: number,
  dir: ArrayLike<number>,
  target: NumberTarget = new Float64Array(2),
): NumberTarget {
  const s0 = Math.sin(altMinRad);
  target[0] = (dir[2]! - s0) / (Math.sin(altMaxRad) - s0);
  let az = Math.atan2(dir[0]!, dir[1]!); // clockwise from north
  // bring az into [azMin, azMin + 2π)
  az -= TWO_PI * Math.floor((az - azMinRad) / TWO_PI);
  target[1] = (az - azMinRad) / (azMaxRad - azMinRad);
  return target;
}

/**
 * Cosine-weighted (projected) solid angle of a sky cell seen by a plane with unit normal n:
 * ∫_cell max(0, n·ω) dω [sr]. With ω = (cos a sin φ, cos a cos φ, sin a) and dω = cos a da dφ,
 * n·ω = A(φ) cos a + n_z sin a with A(φ) = n_x sin φ + n_y cos φ. The altitude integral is done
 * in closed form over the part of [altMin, altMax] where n·ω > 0,
 *   ∫ (A cos² a + n_z sin a cos a) da = A (a/2 + sin 2a / 4) + n_z sin² a / 2,
 * and the azimuth integral by the midpoint rule with `azSteps` steps (exact when n is vertical).
 * A horizontal receiver gets ½ (sin² altMax − sin² altMin)(azMax − azMin).
 * @param nx Receiver normal x [-]
 * @param ny Receiver normal y [-]
 * @param nz Receiver normal z [-]
 * @param azSteps Azimuth quadrature steps (default 16) [-]
 * @returns The projected solid angle [sr]
 */
export function projectedSolidAngleOfCell(
  nx: number,
  ny: number,
  nz: number,
  altMinRad: number,
  altMaxRad: number,
  azMinRad: number,
  azMaxRad: number,
  azSteps = 16,
): number {
  const dAz = (azMaxRad - azMinRad) / azSteps;
  let sum = 0;
  for (let j = 0; j < azSteps; j++) {
    const phi = azMinRad + (j + 0.5) * dAz;
    const A = nx * Math.sin(phi) + ny * Math.cos(phi);
    // n·ω = R cos(a − φ0), positive for a in (φ0 − π/2, φ0 + π/2); only this interval can meet
    // [0, π/2] because φ0 = atan2(nz, A) lies in (−π, π].
    if (A === 0 && nz === 0) continue;
    const phi0 = Math.atan2(nz, A);
    const lo = Math.max(altMinRad, phi0 - Math.PI / 2);
    const hi = Math.min(altMaxRad, phi0 + Math.PI / 2);
    if (hi <= lo) continue;
    const sLo = Math.sin(lo);
    const sHi = Math.sin(hi);
    sum +=
      A * (0.5 * (hi - lo) + 0.25 * (Math.sin(2 * hi) - Math.sin(2 * lo))) + 0.5 * nz * (sHi * sHi - sLo * sLo);
  }
  return sum * dAz;
}
