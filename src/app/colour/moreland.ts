/**
 * Moreland's diverging colour maps: two saturated end colours joined through a neutral middle by
 * interpolating in the Msh colour space (a polar form of CIELAB), so perceived lightness rises
 * evenly to the middle and falls evenly after it, and the middle bends smoothly instead of kinking.
 *
 * Msh: M = √(L² + a² + b²), s = acos(L / M), h = atan2(b, a). With two saturated ends more than
 * 60° of hue apart, a white point M = max(M₁, M₂, 88) is inserted in the middle; the unsaturated
 * end takes a hue "spun" from the saturated one (adjustHue).
 *
 * References
 * [1] K. Moreland, "Diverging Color Maps for Scientific Visualization," in Advances in Visual
 *     Computing (ISVC 2009), LNCS 5876, pp. 92–103, 2009, doi:10.1007/978-3-642-10520-3_9.
 * The cool-warm end colours (sRGB 59 76 192 and 180 4 38) are those of [1], §4.
 */

/** sRGB (0…255) end colours of Moreland's cool-warm map [1]. */
export const COOL_WARM_ENDS = { cool: [59, 76, 192], warm: [180, 4, 38] } as const;

// D65 reference white (CIE 1931 2°), the one used in [1].
const XN = 0.95047, YN = 1.0, ZN = 1.08883;

function srgbToLinear(c: number): number {
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}
function linearToSrgb(c: number): number {
  return c <= 0.0031308 ? 12.92 * c : 1.055 * c ** (1 / 2.4) - 0.055;
}
function labF(t: number): number {
  return t > 0.008856 ? Math.cbrt(t) : 7.787 * t + 16 / 116;
}
function labFInv(t: number): number {
  return t > 0.20689 ? t * t * t : (t - 16 / 116) / 7.787;
}

/** sRGB in [0, 1] → Msh [M, s rad, h rad]. */
export function rgbToMsh(rgb: readonly [number, number, number]): [number, number, number] {
  const [r, g, b] = rgb.map(srgbToLinear) as [number, number, number];
  const x = 0.4124 * r + 0.3576 * g + 0.1805 * b;
  const y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  const z = 0.0193 * r + 0.1192 * g + 0.9505 * b;
  const fx = labF(x / XN), fy = labF(y / YN), fz = labF(z / ZN);
  const L = 116 * fy - 16, A = 500 * (fx - fy), B = 200 * (fy - fz);
  const M = Math.hypot(L, A, B);
  return [M, M > 0 ? Math.acos(L / M) : 0, Math.atan2(B, A)];
}

/** Msh → sRGB in [0, 1] (clamped). */
export function mshToRgb(msh: readonly [number, number, number]): [number, number, number] {
  const [M, s, h] = msh;
  const L = M * Math.cos(s), A = M * Math.sin(s) * Math.cos(h), B = M * Math.sin(s) * Math.sin(h);
  const fy = (L + 16) / 116, fx = fy + A / 500, fz = fy - B / 200;
  const x = XN * labFInv(fx), y = YN * labFInv(fy), z = ZN * labFInv(fz);
  const r = 3.2406 * x - 1.5372 * y - 0.4986 * z;
  const g = -0.9689 * x + 1.8758 * y + 0.0415 * z;
  const b = 0.0557 * x - 0.204 * y + 1.057 * z;
  const clamp = (v: number) => Math.min(1, Math.max(0, linearToSrgb(v)));
  return [clamp(r), clamp(g), clamp(b)];
}

/** Hue for an unsaturated colour of magnitude `mUnsat` next to the saturated `msh` [1, §3]. */
function adjustHue(msh: readonly [number, number, number], mUnsat: number): number {
  const [M, s, h] = msh;
  if (M >= mUnsat) return h;
  const spin = (s * Math.sqrt(mUnsat * mUnsat - M * M)) / (M * Math.sin(s));
  return h > -Math.PI / 3 ? h + spin : h - spin;
}

/**
 * The colour at fraction t ∈ [0, 1] of the diverging map from `rgb1` to `rgb2` [1].
 * @param rgb1 low-end sRGB in [0, 1]
 * @param rgb2 high-end sRGB in [0, 1]
 * @example morelandDiverging([59/255, 76/255, 192/255], [180/255, 4/255, 38/255], 0.5) // ≈ [221, 221, 221]/255
 */
export function morelandDiverging(rgb1: readonly [number, number, number], rgb2: readonly [number, number, number], t: number): [number, number, number] {
  let m1 = rgbToMsh(rgb1), m2 = rgbToMsh(rgb2);
  let u = t;
  if (m1[1] > 0.05 && m2[1] > 0.05) {
    let dh = Math.abs(m1[2] - m2[2]);
    if (dh > Math.PI) dh = 2 * Math.PI - dh;
    if (dh > Math.PI / 3) {
      const mMid = Math.max(m1[0], m2[0], 88);
      if (t < 0.5) {
        m2 = [mMid, 0, 0];
        u = 2 * t;
      } else {
        m1 = [mMid, 0, 0];
        u = 2 * t - 1;
      }
    }
  }
  if (m1[1] < 0.05 && m2[1] > 0.05) m1 = [m1[0], m1[1], adjustHue(m2, m1[0])];
  else if (m2[1] < 0.05 && m1[1] > 0.05) m2 = [m2[0], m2[1], adjustHue(m1, m2[0])];
  return mshToRgb([m1[0] + (m2[0] - m1[0]) * u, m1[1] + (m2[1] - m1[1]) * u, m1[2] + (m2[2] - m1[2]) * u]);
}

/** Entries of the cool-warm table (coolWarmTable.ts). */
export const COOL_WARM_ENTRIES = 256;

/** The cool-warm table, r, g, b in [0, 1] flattened, as generated into coolWarmTable.ts. */
export function coolWarmTable(entries = COOL_WARM_ENTRIES): number[] {
  const c1 = COOL_WARM_ENDS.cool.map((v) => v / 255) as [number, number, number];
  const c2 = COOL_WARM_ENDS.warm.map((v) => v / 255) as [number, number, number];
  const out: number[] = [];
  for (let i = 0; i < entries; i++) out.push(...morelandDiverging(c1, c2, i / (entries - 1)));
  return out;
}
