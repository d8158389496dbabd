/**
 * Subdivision of the sky hemisphere into patches, for weighting visible sky by radiance.
 *
 * Level 1 is the Tregenza subdivision: seven 12° altitude bands with 30, 30, 24, 24, 18, 12 and 6
 * patches and a polar cap above 84°, 145 patches in all. Level n splits every band into n bands of
 * 12°/n and multiplies each band's patch count by n (144·n² + 1 patches; n = 2 gives 577, the
 * count of the Reinhart subdivision), keeping one cap.
 *
 * References:
 * [1] P. R. Tregenza, "Subdivision of the sky hemisphere for luminance measurements,"
 *     Lighting Res. Technol., vol. 19, no. 1, pp. 13–14, 1987, doi:10.1177/096032718701900103.
 *
 * Directions are x east, y north, z up; azimuth clockwise from north; patch j of a band is centred
 * on azimuth j·Δaz (patch 0 of every band is centred on north).
 */
export interface SkySubdivision {
  readonly level: number;
  readonly count: number;
  /** Per patch: altitude bounds [rad]. */
  readonly altMinRad: Float64Array;
  readonly altMaxRad: Float64Array;
  /** Per patch: azimuth bounds [rad], clockwise from north; azMin may be negative (patch 0). */
  readonly azMinRad: Float64Array;
  readonly azMaxRad: Float64Array;
  /** Per patch: unit vector to the patch centre. */
  readonly dirX: Float64Array;
  readonly dirY: Float64Array;
  readonly dirZ: Float64Array;
  /** Per patch: solid angle [sr]; sums to 2π. */
  readonly solidAngleSr: Float64Array;
  /** Per patch: ∫ sin(alt) dω [sr], the projected solid angle on a horizontal plane; sums to π. */
  readonly horizontalProjectedSr: Float64Array;
  /** First patch index of each band (bands bottom to top, the cap last) and the band count. */
  readonly bandStart: Uint32Array;
  readonly bandCount: Uint32Array;
}

const TREGENZA_COUNTS = [30, 30, 24, 24, 18, 12, 6] as const;
const TREGENZA_BAND_DEG = 12;
const CAP_START_DEG = 84;

const cache = new Map<number, SkySubdivision>();

/** The sky subdivision of the given level (1 = Tregenza 145 patches). Cached; treat as read-only. */
export function skySubdivision(level = 1): SkySubdivision {
  if (!Number.isInteger(level) || level < 1 || level > 8) {
    throw new RangeError(`sky subdivision level must be an integer in [1, 8], got ${level}`);
  }
  const hit = cache.get(level);
  if (hit) return hit;
  const bands: { altMin: number; altMax: number; n: number }[] = [];
  const d2r = Math.PI / 180;
  for (let b = 0; b < TREGENZA_COUNTS.length; b++) {
    for (let s = 0; s < level; s++) {
      const altMin = (b * TREGENZA_BAND_DEG + (s * TREGENZA_BAND_DEG) / level) * d2r;
      const altMax = (b * TREGENZA_BAND_DEG + ((s + 1) * TREGENZA_BAND_DEG) / level) * d2r;
      bands.push({ altMin, altMax, n: TREGENZA_COUNTS[b]! * level });
    }
  }
  bands.push({ altMin: CAP_START_DEG * d2r, altMax: Math.PI / 2, n: 1 });
  const count = bands.reduce((a, b) => a + b.n, 0);
  const out = {
    level,
    count,
    altMinRad: new Float64Array(count),
    altMaxRad: new Float64Array(count),
    azMinRad: new Float64Array(count),
    azMaxRad: new Float64Array(count),
    dirX: new Float64Array(count),
    dirY: new Float64Array(count),
    dirZ: new Float64Array(count),
    solidAngleSr: new Float64Array(count),
    horizontalProjectedSr: new Float64Array(count),
    bandStart: new Uint32Array(bands.length),
    bandCount: new Uint32Array(bands.length),
  };
  let k = 0;
  bands.forEach((band, bi) => {
    out.bandStart[bi] = k;
    out.bandCount[bi] = band.n;
    const dAz = (2 * Math.PI) / band.n;
    const isCap = band.n === 1;
    // Centre altitude of a band patch: the altitude halving its solid angle would be exact, but
    // the mid-altitude is the usual choice; for the cap the centre is the zenith.
    const altC = isCap ? Math.PI / 2 : 0.5 * (band.altMin + band.altMax);
    for (let j = 0; j < band.n; j++, k++) {
      const azC = j * dAz;
      out.altMinRad[k] = band.altMin;
      out.altMaxRad[k] = band.altMax;
      out.azMinRad[k] = isCap ? 0 : azC - dAz / 2;
      out.azMaxRad[k] = isCap ? 2 * Math.PI : azC + dAz / 2;
      out.dirX[k] = Math.cos(altC) * Math.sin(azC);
      out.dirY[k] = Math.cos(altC) * Math.cos(azC);
      out.dirZ[k] = Math.sin(altC);
      // dω = cos(alt) dalt daz → Δ(sin alt)·Δaz
      out.solidAngleSr[k] = (Math.sin(band.altMax) - Math.sin(band.altMin)) * dAz;
      // ∫ sin(alt) cos(alt) dalt daz = ½ Δ(sin² alt)·Δaz
      out.horizontalProjectedSr[k] = 0.5 * (Math.sin(band.altMax) ** 2 - Math.sin(band.altMin) ** 2) * dAz;
    }
  });
  const frozen = out as SkySubdivision;
  cache.set(level, frozen);
  return frozen;
}

/** Index of the patch that contains the direction (altitude, azimuth clockwise from north), or -1 below the horizon. */
export function skyPatchIndex(sky: SkySubdivision, altRad: number, azRad: number): number {
  if (altRad < 0) return -1;
  const bandH = (TREGENZA_BAND_DEG / sky.level) * (Math.PI / 180);
  const nBands = sky.bandStart.length;
  const b = Math.min(nBands - 1, Math.floor(altRad / bandH));
  const n = sky.bandCount[b]!;
  if (n === 1) return sky.bandStart[b]!;
  const dAz = (2 * Math.PI) / n;
  let az = azRad % (2 * Math.PI);
  if (az < 0) az += 2 * Math.PI;
  const j = Math.floor((az + dAz / 2) / dAz) % n;
  return sky.bandStart[b]! + j;
}
