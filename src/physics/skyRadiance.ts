/**
 * Sky diffuse radiance over the sky patches, so a ray tracer can weight the sky patches a
 * receiver sees. For a receiver,
 *
 *   diffuse irradiance = Σ_k L_k·P_k + E_cs·max(0, cos θ)·(sun visible),
 *
 * with L_k the patch radiance filled here [W m⁻² sr⁻¹], P_k the receiver's cosine-weighted visible
 * solid angle of patch k [sr] (the tracer's job; an unobstructed horizontal plane has
 * P_k = `horizontalProjectedSr[k]`), E_cs the circumsolar normal irradiance returned here [W/m²]
 * and θ the sun's angle of incidence, the circumsolar part reusing the sun-visibility ray.
 *
 * The Perez 1990 sky [1], [2] is split into three parts:
 * - circumsolar: a point source along the sun with normal irradiance E_cs = F1·DHI/b,
 *   b = max(cos 85°, cos z), so any plane receives Perez's F1·DHI·a/b exactly;
 * - horizon: an excess radiance L_h on every patch of a horizon band made of the bottom m bands
 *   of the subdivision (each 12°/n high at level n, so from 0 to H = 12°·m/n). For brightening
 *   (F2 ≥ 0) m = 1, so the band shrinks toward Perez's infinitesimal horizon band as the level
 *   rises. For darkening (F2 < 0) a thin band would need negative radiance, so m is the smallest
 *   count that keeps the band's radiance ≥ 0 (the band then tends to a fixed height, about 6° for
 *   F2 = −0.066, F1 = 0.057). L_h = F2·DHI / (V₀ − P₀/2), with V₀ = H + (sin 2H)/2 the band's
 *   projected solid angle on a vertical plane (any azimuth; the band is a full ring) and P₀ its
 *   projected solid angle on a horizontal plane. The −P₀/2 accounts for the isotropic radiance
 *   given up to the band on the horizontal (below), so a vertical plane facing any azimuth
 *   receives exactly Perez's (1 − F1)·DHI/2 + F2·DHI from the two diffuse parts;
 * - isotropic: the uniform radiance L_iso on all patches that closes the horizontal budget
 *   exactly: L_iso·ΣP + L_h·P₀ + E_cs·max(0, cos z) = DHI.
 * So an unobstructed horizontal plane receives exactly DHI (Perez's own formula gives
 * DHI·[(1 − F1) + F1·cos z/b], short of DHI for z > 85°; the shortfall goes to the isotropic part
 * here), and a vertical plane receives exactly the Perez tilted-plane value for z ≤ 85°. Other
 * tilts differ from the Perez formula by O(band height), since the patch band is not infinitesimal
 * (measured at 40° tilt, clear high sun: −0.52 % at level 1, −0.25 % at level 2, −0.06 % at
 * level 8; with horizon darkening at 34° tilt: +0.55 % at levels 1–2, +0.34 % at level 8).
 *
 * Physical limits (our choice, beyond [1]): the radiance of every patch and E_cs stay ≥ 0 while the
 * horizontal budget still closes. When horizon darkening is deeper than even the widest band
 * (0–84°) can carry (only as Perez's vertical-plane value DHI·[(1 − F1)/2 + F2] nears 0), the
 * band is set to 0 and the isotropic part re-closes the budget; when F1 > 1
 * (possible in bins 6–7 at very small Δ and Z) would make the isotropic part negative, it is set to 0 and
 * E_cs is reduced to close the budget. The Perez tilted-plane formula itself has no such limit.
 *
 * References:
 * [1] R. Perez, P. Ineichen, R. Seals, J. Michalsky and R. Stewart, "Modeling daylight
 *     availability and irradiance components from direct and global irradiance," Solar Energy,
 *     vol. 44, no. 5, pp. 271–289, 1990, doi:10.1016/0038-092X(90)90055-H.
 * [2] R. Perez, R. Seals, P. Ineichen, R. Stewart and D. Menicucci, "A new simplified version of
 *     the Perez diffuse irradiance model for tilted surfaces," Solar Energy, vol. 39, no. 3,
 *     pp. 221–231, 1987, doi:10.1016/S0038-092X(87)80031-2.
 * [3] P. R. Tregenza, "Subdivision of the sky hemisphere for luminance measurements," Lighting
 *     Res. Technol., vol. 19, no. 1, pp. 13–14, 1987, doi:10.1177/096032718701900103.
 */
import { InputError, requireInRange } from './errors.ts';
import type { SkySubdivision } from './skySubdivision.ts';
import {
  perez1990SkyParameters,
  perezCircumsolarDenominator,
  validatePerezSkyInputs,
  type PerezSkyInputs,
  type PerezSkyParameters,
} from './skyDiffuse.ts';

const D2R = Math.PI / 180;

/** What the radiance fill returns besides the patch radiances. */
export interface SkyRadianceResult {
  /** Normal irradiance of the circumsolar point source along the sun direction [W/m²]. */
  circumsolarNormalWm2: number;
}

/** Names of the sky radiance models the dispatcher accepts. */
export type SkyRadianceModel = 'perez1990' | 'isotropic';

/** Per-subdivision sums, computed once per subdivision. */
interface SkySums {
  /** Σ_k horizontalProjectedSr[k] [sr] (π up to rounding). */
  totalHorizontalSr: number;
  /** [m − 1]: Σ of horizontalProjectedSr over the bottom m bands [sr]. */
  bottomHorizontalSr: Float64Array;
  /** [m − 1]: projected solid angle of the bottom m bands on a vertical plane [sr]. */
  bottomVerticalSr: Float64Array;
  /** [m − 1]: index past the last patch of the bottom m bands. */
  bottomEnd: Uint32Array;
}

const _sums = new WeakMap<SkySubdivision, SkySums>();

function skySums(sky: SkySubdivision): SkySums {
  const hit = _sums.get(sky);
  if (hit) return hit;
  let total = 0;
  for (let k = 0; k < sky.count; k++) total += sky.horizontalProjectedSr[k]!;
  // Every band but the polar cap may carry the horizon term.
  const nRing = sky.bandStart.length - 1;
  const sums: SkySums = {
    totalHorizontalSr: total,
    bottomHorizontalSr: new Float64Array(nRing),
    bottomVerticalSr: new Float64Array(nRing),
    bottomEnd: new Uint32Array(nRing),
  };
  let horizontal = 0;
  for (let b = 0; b < nRing; b++) {
    const start = sky.bandStart[b]!;
    const end = start + sky.bandCount[b]!;
    for (let k = start; k < end; k++) horizontal += sky.horizontalProjectedSr[k]!;
    const aTop = sky.altMaxRad[start]!;
    sums.bottomHorizontalSr[b] = horizontal;
    // ∫∫ cos a·max(0, cos φ)·cos a da dφ over full rings from 0 to aTop = 2∫cos² a da
    sums.bottomVerticalSr[b] = aTop + 0.5 * Math.sin(2 * aTop);
    sums.bottomEnd[b] = end;
  }
  _sums.set(sky, sums);
  return sums;
}

function checkTarget(sky: SkySubdivision, target: Float64Array): void {
  if (target.length !== sky.count) {
    throw new InputError({
      problem: 'radiance target has the wrong length',
      place: 'target',
      value: target.length,
      expected: `a Float64Array of ${sky.count} entries (one per sky patch)`,
    });
  }
}

const _params: PerezSkyParameters = { epsilon: 0, delta: 0, f1: 0, f2: 0 };

/**
 * Perez 1990 sky as radiance per sky patch plus a circumsolar point source.
 *
 * Equations (see the module header for the derivation):
 *   E_cs = F1·DHI/b, b = max(cos 85°, cos z)   (0 with the sun at or below the horizon);
 *   L_h  = F2·DHI/(V₀ − P₀/2)                  (horizon band only: bottom m bands, m ≥ 1);
 *   L_iso = (DHI − E_cs·max(0, cos z) − L_h·P₀)/ΣP;
 *   L_k = L_iso + L_h on the bottom band, L_iso elsewhere; then the ≥ 0 limits of the header.
 * ε, Δ, F1, F2 as in `perez1990SkyParameters` (pvlib formulation of [1]).
 *
 * @param sky Sky subdivision (any level).
 * @param inputs Sky state: DHI [W/m²], DNI [W/m²], E0 [W/m²], solar zenith [°], solar azimuth [°]
 *   (unused here; the tracer has the sun direction), relative air mass [-].
 * @param target Radiance per patch, filled [W m⁻² sr⁻¹]; length `sky.count`.
 * @param result Optional object to fill instead of allocating one.
 * @returns The circumsolar normal irradiance [W/m²].
 * @example perez1990SkyRadiance(skySubdivision(1), sky, L) // Σ L·horizontalProjectedSr + E_cs·cos z = DHI
 */
export function perez1990SkyRadiance(
  sky: SkySubdivision,
  inputs: PerezSkyInputs,
  target: Float64Array,
  result?: SkyRadianceResult,
): SkyRadianceResult {
  validatePerezSkyInputs(inputs);
  checkTarget(sky, target);
  const out = result ?? { circumsolarNormalWm2: 0 };
  const sums = skySums(sky);
  const dhi = inputs.dhiWm2;
  const p = perez1990SkyParameters(inputs, _params);
  const cosZ = Math.max(0, Math.cos(inputs.solarZenithDeg * D2R));
  const sunUp = inputs.solarZenithDeg < 90;
  let eCs = sunUp ? (p.f1 * dhi) / perezCircumsolarDenominator(inputs.solarZenithDeg) : 0;
  const pTot = sums.totalHorizontalSr;
  const base = dhi - eCs * cosZ;
  // Thinnest run of bottom bands that carries the horizon term without negative radiance.
  const nRing = sums.bottomEnd.length;
  let m = 0;
  let p0 = 0;
  let lh = 0;
  let lIso = 0;
  for (;;) {
    p0 = sums.bottomHorizontalSr[m]!;
    lh = (p.f2 * dhi) / (sums.bottomVerticalSr[m]! - 0.5 * p0);
    lIso = (base - lh * p0) / pTot;
    if (p.f2 >= 0 || lIso + lh >= 0 || m === nRing - 1) break;
    m++;
  }
  const lh0 = lh;
  if (lIso + lh < 0) {
    // Darkening beyond what the widest band can carry (the Perez vertical value itself is then
    // negative): the band goes black, the rest of the sky closes the budget.
    lIso = base / (pTot - p0);
    lh = -lIso;
  }
  if (lIso < 0) {
    // F1 > 1: the circumsolar source alone exceeds DHI; no background left, E_cs closes the budget.
    lIso = 0;
    lh = Math.max(0, lh0);
    if (lh * p0 > dhi) lh = dhi / p0;
    eCs = cosZ > 0 ? (dhi - lh * p0) / cosZ : 0;
  }
  target.fill(lIso);
  const lBottom = lIso + lh;
  const end = sums.bottomEnd[m]!;
  for (let k = 0; k < end; k++) target[k] = lBottom;
  out.circumsolarNormalWm2 = eCs;
  return out;
}

/**
 * Isotropic sky as radiance per patch: L_k = DHI/π everywhere, no circumsolar source.
 *
 * Equation: L = DHI/π, so a horizontal plane receives Σ L·P_k = DHI and a vertical one DHI/2.
 *
 * References: B. Y. H. Liu and R. C. Jordan, Solar Energy 7(2):53–74, 1963,
 * doi:10.1016/0038-092X(63)90006-9 (citation from memory).
 *
 * @param sky Sky subdivision (any level).
 * @param dhiWm2 Diffuse horizontal irradiance [W/m²].
 * @param target Radiance per patch, filled [W m⁻² sr⁻¹]; length `sky.count`.
 * @param result Optional object to fill instead of allocating one.
 * @returns The circumsolar normal irradiance, always 0 [W/m²].
 * @example isotropicSkyRadiance(skySubdivision(1), 100, L) // L[k] = 100/π
 */
export function isotropicSkyRadiance(
  sky: SkySubdivision,
  dhiWm2: number,
  target: Float64Array,
  result?: SkyRadianceResult,
): SkyRadianceResult {
  requireInRange(dhiWm2, 0, 2000, 'dhiWm2', 'W/m²');
  checkTarget(sky, target);
  const out = result ?? { circumsolarNormalWm2: 0 };
  target.fill(dhiWm2 / Math.PI);
  out.circumsolarNormalWm2 = 0;
  return out;
}

/**
 * Sky radiance per patch by the named model ('perez1990' or 'isotropic', the latter using only
 * `inputs.dhiWm2`).
 *
 * @param model 'perez1990' or 'isotropic'.
 * @param sky Sky subdivision (any level).
 * @param inputs Sky state (see `perez1990SkyRadiance`).
 * @param target Radiance per patch, filled [W m⁻² sr⁻¹]; length `sky.count`.
 * @param result Optional object to fill instead of allocating one.
 * @returns The circumsolar normal irradiance [W/m²].
 * @example fillSkyRadiance('isotropic', skySubdivision(2), sky, L).circumsolarNormalWm2 // 0
 */
export function fillSkyRadiance(
  model: SkyRadianceModel,
  sky: SkySubdivision,
  inputs: PerezSkyInputs,
  target: Float64Array,
  result?: SkyRadianceResult,
): SkyRadianceResult {
  switch (model) {
    case 'perez1990':
      return perez1990SkyRadiance(sky, inputs, target, result);
    case 'isotropic':
      return isotropicSkyRadiance(sky, inputs.dhiWm2, target, result);
    default: {
      const never: never = model;
      throw new InputError({
        problem: 'unknown sky radiance model',
        place: 'model',
        value: never,
        expected: "'perez1990' or 'isotropic'",
      });
    }
  }
}

/**
 * Diffuse sky irradiance on a receiver from patch radiances and its patch weights.
 *
 * Equation: E = Σ_k L_k·P_k + E_cs·max(0, cos θ)·v, with v = 1 when the sun is visible, else 0.
 *
 * @param radianceWm2Sr Patch radiances L_k [W m⁻² sr⁻¹].
 * @param projectedSr The receiver's cosine-weighted visible solid angle per patch P_k [sr].
 * @param circumsolarNormalWm2 Circumsolar normal irradiance E_cs [W/m²].
 * @param sunCosIncidence cos θ of the sun on the receiver [-] (clipped at 0 here).
 * @param sunVisible Whether the ray to the sun is unobstructed.
 * @returns Diffuse sky irradiance on the receiver [W/m²].
 * @example skyIrradianceFromPatchesWm2(L, sky.horizontalProjectedSr, eCs, cosZ, true) // DHI
 */
export function skyIrradianceFromPatchesWm2(
  radianceWm2Sr: Float64Array,
  projectedSr: Float64Array,
  circumsolarNormalWm2: number,
  sunCosIncidence: number,
  sunVisible: boolean,
): number {
  if (radianceWm2Sr.length !== projectedSr.length) {
    throw new InputError({
      problem: 'patch arrays differ in length',
      place: 'projectedSr',
      value: projectedSr.length,
      expected: `${radianceWm2Sr.length} entries, as radianceWm2Sr`,
    });
  }
  let e = 0;
  for (let k = 0; k < radianceWm2Sr.length; k++) e += radianceWm2Sr[k]! * projectedSr[k]!;
  if (sunVisible && sunCosIncidence > 0) e += circumsolarNormalWm2 * sunCosIncidence;
  return e;
}
