/**
 * A quick screening table from the physics core alone (no geometry): for each step of the
 * project's period, the sun, the clear-sky/weather irradiance, the sol-air temperature of one wall
 * (orientation and material given), and the UTCI of a person on an open terrace in the sun and in
 * the shade (the beam blocked, everything else the same). It is what `sunfacet day` prints.
 *
 * The person: six-directional MRT (VDI 3787-2) with the sky diffuse (Perez 1990) on each face, the
 * ground reflecting GHI, the sky's longwave above and the ground's steady-state surface temperature
 * below; laterals see half sky, half ground (an open, flat site).
 */
import type { Project } from './project.ts';
import type { WeatherSeries } from '../physics/weather/types.ts';
import { buildSteps } from './stages/steps.ts';
import { resolveMaterial, solarAbsorptance, type Material } from '../physics/materials.ts';
import { perez1990Components, type PerezComponents } from '../physics/skyDiffuse.ts';
import { cosIncidence, beamOnSurfaceWm2, groundReflectedOnTiltWm2 } from '../physics/irradiance.ts';
import { solAirTempC } from '../physics/solAir.ts';
import { steadySurfaceTempC } from '../physics/surfaceEnergyBalance.ts';
import { windAtHeightFrom10mMs } from '../physics/wind.ts';
import { mrtSixDirectionalC, projectedAreaFactor } from '../physics/mrt.ts';
import { utciClampedC, utciStressCategory, type UtciCategoryId } from '../physics/utci.ts';
import { STEFAN_BOLTZMANN_W_M2K4, KELVIN_AT_0C } from '../physics/constants.ts';

export interface DayTableRow {
  time: string;
  sunAltitudeDeg: number;
  sunAzimuthDeg: number;
  dniWm2: number;
  dhiWm2: number;
  airTempC: number;
  wallIrradianceWm2: number;
  wallSolAirC: number;
  sunlitMrtC: number;
  sunlitUtciC: number;
  sunlitCategory: UtciCategoryId;
  shadedMrtC: number;
  shadedUtciC: number;
  shadedCategory: UtciCategoryId;
}

export interface DayTableOptions {
  /** Azimuth the wall faces [°, clockwise from north]; default: the equator (180° north of it). */
  wallAzimuthDeg?: number;
  /** Wall material preset id; default 'steel-dark-painted'. */
  wallMaterial?: string;
  posture?: 'standing' | 'seated';
}

export function dayTable(project: Project, opts: DayTableOptions = {}, weatherFile?: WeatherSeries): { rows: DayTableRow[]; wall: { azimuthDeg: number; material: string }; warnings: string[] } {
  const steps = buildSteps(project, weatherFile);
  const wallAz = opts.wallAzimuthDeg ?? (project.site.latitudeDeg >= 0 ? 180 : 0);
  const wallMat = resolveMaterial(opts.wallMaterial ?? 'steel-dark-painted', '--material');
  const groundMat: Material = resolveMaterial(project.ground?.material ?? 'stone-paving', 'ground.material');
  const albedo = 1 - solarAbsorptance(groundMat);
  const posture = opts.posture ?? 'standing';
  const comps: PerezComponents = { isotropicWm2: 0, circumsolarWm2: 0, horizonWm2: 0, totalWm2: 0, epsilon: 0, delta: 0, f1: 0, f2: 0 };
  const nx = Math.sin((wallAz * Math.PI) / 180), ny = Math.cos((wallAz * Math.PI) / 180);
  const sw = new Float64Array(6), lw = new Float64Array(6);
  // [tilt, azimuth] of the six faces: up, down, east, south, west, north
  const faces: [number, number][] = [[0, 0], [180, 0], [90, 90], [90, 180], [90, 270], [90, 0]];
  const clamp = { utciC: 0, clamped: false, clampedInputs: [] as string[] };
  const rows: DayTableRow[] = [];
  for (let i = 0; i < steps.count; i++) {
    const alt = steps.sunAltitudeDeg[i]!, az = steps.sunAzimuthDeg[i]!, zen = steps.sunZenithDeg[i]!;
    const dni = steps.dniWm2[i]!, dhi = steps.dhiWm2[i]!, ghi = steps.ghiWm2[i]!, ta = steps.airTempC[i]!;
    const up = alt > 0;
    const sky = (tiltDeg: number, azDeg: number) => {
      if (!up || dhi <= 0) return 0;
      perez1990Components({ surfaceTiltDeg: tiltDeg, surfaceAzimuthDeg: azDeg, dhiWm2: dhi, dniWm2: dni, dniExtraWm2: steps.dniExtraWm2[i]!, solarZenithDeg: zen, solarAzimuthDeg: az, relativeAirMass: steps.relativeAirMass[i]! }, comps);
      return comps.totalWm2;
    };
    const cosWall = cosIncidence(steps.sunDir[3 * i]!, steps.sunDir[3 * i + 1]!, steps.sunDir[3 * i + 2]!, nx, ny, 0);
    const wallE = (up ? beamOnSurfaceWm2(dni, cosWall) : 0) + sky(90, wallAz) + groundReflectedOnTiltWm2(90, ghi, albedo);
    const wallSolAir = solAirTempC(ta, solarAbsorptance(wallMat), wallE, wallMat.emissivity, 0);
    // Open ground: steady-state surface temperature under the full sky (common practice for a screening figure).
    const lSky = steps.skyLongwaveWm2[i]!;
    const tGround = steadySurfaceTempC(groundMat, {
      absorbedShortwaveWm2: solarAbsorptance(groundMat) * ghi, longwaveInWm2: lSky, airTempC: ta, windMs: windAtHeightFrom10mMs(Math.max(steps.wind10mMs[i]!, 0.1), 1),
    });
    const lGround = groundMat.emissivity * STEFAN_BOLTZMANN_W_M2K4 * (tGround + KELVIN_AT_0C) ** 4 + (1 - groundMat.emissivity) * lSky;
    for (let d = 0; d < 6; d++) {
      const [tilt, fAz] = faces[d]!;
      sw[d] = d === 1 ? albedo * ghi : sky(tilt, fAz) + groundReflectedOnTiltWm2(tilt, ghi, albedo);
      lw[d] = d === 0 ? lSky : d === 1 ? lGround : 0.5 * lSky + 0.5 * lGround;
    }
    const fp = up ? projectedAreaFactor(posture, Math.min(90, alt)) : 0;
    const mrtSun = mrtSixDirectionalC({ shortwaveWm2: sw, longwaveWm2: lw, posture, directBeam: { normalIrradianceWm2: up ? dni : 0, projectedAreaFactor: fp } });
    const mrtShade = mrtSixDirectionalC({ shortwaveWm2: sw, longwaveWm2: lw, posture });
    const utci = (mrt: number) => utciClampedC({ airTempC: ta, mrtC: mrt, wind10mMs: steps.wind10mMs[i]!, relativeHumidityPct: steps.relativeHumidityPct[i]! }, clamp).utciC;
    const uSun = utci(mrtSun), uShade = utci(mrtShade);
    rows.push({
      time: steps.labels[i]!, sunAltitudeDeg: alt, sunAzimuthDeg: az, dniWm2: dni, dhiWm2: dhi, airTempC: ta,
      wallIrradianceWm2: wallE, wallSolAirC: wallSolAir, sunlitMrtC: mrtSun, sunlitUtciC: uSun, sunlitCategory: utciStressCategory(uSun),
      shadedMrtC: mrtShade, shadedUtciC: uShade, shadedCategory: utciStressCategory(uShade),
    });
  }
  return { rows, wall: { azimuthDeg: wallAz, material: wallMat.id }, warnings: steps.warnings };
}
