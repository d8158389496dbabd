/** sRGB → linear for vertex colours (three.js treats colour attributes as linear). */
export function srgbToLinearInPlace(a: Float32Array): Float32Array {
  for (let i = 0; i < a.length; i++) {
    const c = a[i]!;
    a[i] = c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  }
  return a;
}
