/**
 * Model-to-engine transforms: up axis, units and north rotation (DESIGN §3), plus the small 4×4
 * matrix helpers the glTF node hierarchy needs.
 *
 * Matrices are 4×4, column-major (the glTF layout: element (row r, col c) at index c*4 + r), held
 * in Float64Array(16). Names are target-from-source (`engineFromModel`), so `a·b` applied to a point
 * means "b first, then a" and compositions read right to left.
 *
 * Engine frame: metres, x east, y north, z up.
 *
 * Up-axis conversion:
 * - `upAxis: 'y'` (glTF's own convention): (x, y, z)_model → (x, −z, y)_engine. glTF +Y (up)
 *   becomes engine +z, glTF +Z ("front", towards the viewer; south-ish) becomes engine −y (south),
 *   and glTF −Z becomes engine +y (north). It is a proper rotation (+90° about x), so triangle
 *   winding and outward normals are kept.
 * - `upAxis: 'z'`: the model is already z-up; axes are kept.
 *
 * Units: `unitsPerMeter` model units make one metre (1000 for a model in millimetres); positions
 * are divided by it.
 *
 * North: `northDeg` is the azimuth (clockwise from true north, seen from above) that the model's +y
 * axis points to. The model is turned clockwise by `northDeg` about the engine z axis after the
 * up-axis conversion: with northDeg = 90, model +y goes to engine +x (east) and model +x goes to
 * engine −y (south). Rotation: x' = x·cosθ + y·sinθ, y' = −x·sinθ + y·cosθ, θ = northDeg.
 */
import { InputError } from '../physics/errors.ts';

/** Options every importer takes. */
export interface ImportOptions {
  /** Which model axis is up. Default 'y' for glTF (its standard), 'z' for OBJ. */
  upAxis?: 'y' | 'z';
  /** Model units per metre (1000 for millimetres). Default 1. */
  unitsPerMeter?: number;
  /** Azimuth of the model's +y axis, clockwise from true north [deg]. Default 0. */
  northDeg?: number;
}

/** A 4×4 column-major matrix. */
export type Mat4 = Float64Array;

export function mat4Identity(target: Mat4 = new Float64Array(16)): Mat4 {
  target.fill(0);
  target[0] = 1;
  target[5] = 1;
  target[10] = 1;
  target[15] = 1;
  return target;
}

/** target = a · b (apply b first). `target` may alias neither a nor b. */
export function mat4Multiply(a: Mat4, b: Mat4, target: Mat4 = new Float64Array(16)): Mat4 {
  for (let c = 0; c < 4; c++) {
    for (let r = 0; r < 4; r++) {
      let s = 0;
      for (let k = 0; k < 4; k++) s += a[k * 4 + r]! * b[c * 4 + k]!;
      target[c * 4 + r] = s;
    }
  }
  return target;
}

/**
 * The matrix T·R·S from a translation, a unit quaternion (x, y, z, w) and a scale (glTF node TRS).
 */
export function mat4FromTrs(
  t: ArrayLike<number>,
  q: ArrayLike<number>,
  s: ArrayLike<number>,
  target: Mat4 = new Float64Array(16),
): Mat4 {
  const x = q[0]!, y = q[1]!, z = q[2]!, w = q[3]!;
  const sx = s[0]!, sy = s[1]!, sz = s[2]!;
  const x2 = x + x, y2 = y + y, z2 = z + z;
  const xx = x * x2, xy = x * y2, xz = x * z2;
  const yy = y * y2, yz = y * z2, zz = z * z2;
  const wx = w * x2, wy = w * y2, wz = w * z2;
  target[0] = (1 - (yy + zz)) * sx;
  target[1] = (xy + wz) * sx;
  target[2] = (xz - wy) * sx;
  target[3] = 0;
  target[4] = (xy - wz) * sy;
  target[5] = (1 - (xx + zz)) * sy;
  target[6] = (yz + wx) * sy;
  target[7] = 0;
  target[8] = (xz + wy) * sz;
  target[9] = (yz - wx) * sz;
  target[10] = (1 - (xx + yy)) * sz;
  target[11] = 0;
  target[12] = t[0]!;
  target[13] = t[1]!;
  target[14] = t[2]!;
  target[15] = 1;
  return target;
}

/** Determinant of the upper-left 3×3 block (negative: the transform mirrors, winding flips). */
export function mat4Determinant3(m: Mat4): number {
  const a = m[0]!, b = m[4]!, c = m[8]!;
  const d = m[1]!, e = m[5]!, f = m[9]!;
  const g = m[2]!, h = m[6]!, i = m[10]!;
  return a * (e * i - f * h) - b * (d * i - f * g) + c * (d * h - e * g);
}

/** Applies m to the point (x, y, z) (w = 1) and writes xyz to target[offset..offset+2]. */
export function transformPoint(
  m: Mat4,
  x: number,
  y: number,
  z: number,
  target: { [i: number]: number },
  offset = 0,
): void {
  target[offset] = m[0]! * x + m[4]! * y + m[8]! * z + m[12]!;
  target[offset + 1] = m[1]! * x + m[5]! * y + m[9]! * z + m[13]!;
  target[offset + 2] = m[2]! * x + m[6]! * y + m[10]! * z + m[14]!;
}

/** Resolved, validated import options. */
export interface ResolvedImportOptions {
  upAxis: 'y' | 'z';
  unitsPerMeter: number;
  northDeg: number;
}

/**
 * Fills in defaults and checks the import options; throws InputError naming the option.
 * @param defaultUpAxis 'y' for glTF, 'z' for OBJ
 */
export function resolveImportOptions(
  opts: ImportOptions | undefined,
  defaultUpAxis: 'y' | 'z',
  file?: string,
): ResolvedImportOptions {
  const upAxis = opts?.upAxis ?? defaultUpAxis;
  if (upAxis !== 'y' && upAxis !== 'z') {
    throw new InputError({ problem: 'unknown up axis', file, place: 'upAxis', value: upAxis, expected: '"y" or "z"' });
  }
  const unitsPerMeter = opts?.unitsPerMeter ?? 1;
  if (!Number.isFinite(unitsPerMeter) || unitsPerMeter <= 0) {
    throw new InputError({
      problem: 'not a positive number',
      file,
      place: 'unitsPerMeter',
      value: unitsPerMeter,
      expected: 'model units per metre, a finite number > 0 (1000 for millimetres)',
    });
  }
  const northDeg = opts?.northDeg ?? 0;
  if (!Number.isFinite(northDeg)) {
    throw new InputError({ problem: 'not a finite number', file, place: 'northDeg', value: northDeg, expected: 'degrees clockwise' });
  }
  return { upAxis, unitsPerMeter, northDeg };
}

/**
 * The matrix taking model coordinates to engine coordinates: R_north · S(1/unitsPerMeter) · U_up.
 * See the module comment for the axis mapping and the sign of the north rotation.
 */
export function engineFromModel(opts: ResolvedImportOptions, target: Mat4 = new Float64Array(16)): Mat4 {
  const k = 1 / opts.unitsPerMeter;
  const th = (opts.northDeg * Math.PI) / 180;
  // Exact values at multiples of 90° so that a rotated box keeps integer corners.
  const quarter = opts.northDeg / 90;
  let c = Math.cos(th);
  let s = Math.sin(th);
  if (Number.isInteger(quarter)) {
    const q = ((quarter % 4) + 4) % 4;
    c = q === 0 ? 1 : q === 2 ? -1 : 0;
    s = q === 1 ? 1 : q === 3 ? -1 : 0;
  }
  // Rotation clockwise by θ about z: columns are the images of the unit axes.
  // R = [[c, s, 0], [-s, c, 0], [0, 0, 1]] (row-major).
  const r = new Float64Array(16);
  mat4Identity(r);
  r[0] = c * k; // col 0 = image of x: (c, -s, 0)
  r[1] = -s * k;
  r[4] = s * k; // col 1 = image of y: (s, c, 0)
  r[5] = c * k;
  r[10] = k;
  const u = new Float64Array(16);
  mat4Identity(u);
  if (opts.upAxis === 'y') {
    // (x, y, z) → (x, −z, y): image of x = (1,0,0), of y = (0,0,1), of z = (0,−1,0).
    u[5] = 0;
    u[6] = 1;
    u[9] = -1;
    u[10] = 0;
  }
  return mat4Multiply(r, u, target);
}
