/**
 * Longwave (thermal infrared) radiation: emission of a grey surface and the clear-sky downwelling
 * longwave from a sky emissivity formula, or from a weather file's measured horizontal infrared.
 *
 * References:
 * [1] E. Tiesinga, P. J. Mohr, D. B. Newell, B. N. Taylor, "CODATA recommended values of the
 *     fundamental physical constants: 2018," Rev. Mod. Phys., vol. 93, 025010, 2021,
 *     doi:10.1103/RevModPhys.93.025010 (σ).
 * [2] P. Berdahl, M. Martin, "Emissivity of clear skies," Solar Energy, vol. 32, no. 5,
 *     pp. 663–664, 1984, doi:10.1016/0038-092X(84)90144-0.
 * [3] W. C. Swinbank, "Long-wave radiation from clear skies," Q. J. R. Meteorol. Soc., vol. 89,
 *     no. 381, pp. 339–348, 1963, doi:10.1002/qj.49708938105.
 * [4] O. A. Alduchov, R. E. Eskridge, "Improved Magnus form approximation of saturation vapor
 *     pressure," J. Appl. Meteorol., vol. 35, no. 4, pp. 601–609, 1996,
 *     doi:10.1175/1520-0450(1996)035<0601:IMFAOS>2.0.CO;2.
 *
 * The sky-emissivity coefficients are the standard literature forms quoted in REFERENCE-VALUES
 * §6.2, which marks them "from memory — check against the primary papers".
 */
import { KELVIN_AT_0C, STEFAN_BOLTZMANN_W_M2K4 } from './constants.ts';
import { InputError, requireInRange } from './errors.ts';

/** Berdahl & Martin 1984 clear-sky emissivity coefficients (from memory, REFERENCE-VALUES §6.2). */
export const BERDAHL_MARTIN_1984 = {
  c0: 0.711,
  c1: 0.56,
  c2: 0.73,
  /** amplitude of the diurnal correction c·cos(2π·t/24) */
  diurnal: 0.013,
  /** pressure correction per hPa above 1000 hPa */
  pressurePerHpa: 0.00012,
  referencePressureHpa: 1000,
} as const;

/** Swinbank 1963: L↓ = c·T⁶ [W/m², T in K] (from memory, REFERENCE-VALUES §6.2). */
export const SWINBANK_1963 = { coeffWm2K6: 5.31e-13 } as const;

/** Magnus coefficients of Alduchov & Eskridge 1996 over water (e_s in hPa, T in °C). */
export const MAGNUS_ALDUCHOV_ESKRIDGE_1996 = { aHpa: 6.1094, b: 17.625, cC: 243.04 } as const;

/**
 * Longwave radiation emitted by a grey surface (Stefan–Boltzmann law).
 *
 * M = ε·σ·T⁴, T = tempC + 273.15, σ = 5.670374419×10⁻⁸ W m⁻² K⁻⁴ (CODATA 2018).
 *
 * @param emissivity Hemispherical thermal emissivity [-], in [0, 1]
 * @param tempC Surface temperature [°C]
 * @returns Emitted longwave flux density [W/m²]
 *
 * References: [1].
 *
 * @example
 * emittedLongwaveWm2(1, 26.85) // ≈ 459.3 (black body at 300 K)
 */
export function emittedLongwaveWm2(emissivity: number, tempC: number): number {
  // compare first: requireInRange allocates its options object, and this runs per patch and step
  if (!(emissivity >= 0 && emissivity <= 1)) requireInRange(emissivity, 0, 1, 'emissivity');
  if (!(tempC >= -KELVIN_AT_0C && tempC <= 2000)) requireInRange(tempC, -KELVIN_AT_0C, 2000, 'tempC', '°C');
  const tK = tempC + KELVIN_AT_0C;
  return emissivity * STEFAN_BOLTZMANN_W_M2K4 * tK * tK * tK * tK;
}

/**
 * Clear-sky emissivity after Berdahl & Martin (1984), from the dew point, with the optional diurnal
 * and pressure corrections.
 *
 * ε = 0.711 + 0.56·(T_dp/100) + 0.73·(T_dp/100)² [+ 0.013·cos(2π·t/24)] [+ 0.00012·(P − 1000)],
 * T_dp in °C, t in hours from local midnight, P in hPa.
 *
 * @param dewPointC Dew-point temperature [°C], in [−40, 35]
 * @param hourOfDay Local solar hour from midnight [h], in [0, 24]; omit for no diurnal correction
 * @param pressureHpa Station pressure [hPa], in [500, 1100]; omit for no pressure correction
 * @returns Clear-sky effective emissivity [-]
 *
 * References: [2].
 *
 * @example
 * skyEmissivityBerdahlMartin1984(10) // ≈ 0.7743
 */
export function skyEmissivityBerdahlMartin1984(dewPointC: number, hourOfDay?: number, pressureHpa?: number): number {
  requireInRange(dewPointC, -40, 35, 'dewPointC', '°C', { source: 'range of the Berdahl & Martin station data, approximate' });
  const c = BERDAHL_MARTIN_1984;
  const t = dewPointC / 100;
  let eps = c.c0 + c.c1 * t + c.c2 * t * t;
  if (hourOfDay !== undefined) {
    requireInRange(hourOfDay, 0, 24, 'hourOfDay', 'h');
    eps += c.diurnal * Math.cos((2 * Math.PI * hourOfDay) / 24);
  }
  if (pressureHpa !== undefined) {
    requireInRange(pressureHpa, 500, 1100, 'pressureHpa', 'hPa');
    eps += c.pressurePerHpa * (pressureHpa - c.referencePressureHpa);
  }
  return eps;
}

/**
 * Clear-sky emissivity after Swinbank (1963), from the screen-level air temperature alone.
 *
 * L↓ = 5.31×10⁻¹³·T_a⁶, so ε = 5.31×10⁻¹³·T_a²/σ (≈ 9.365×10⁻⁶·T_a²), T_a in K.
 *
 * @param tempAirK Air temperature [K], in [230, 330]
 * @returns Clear-sky effective emissivity [-]
 *
 * References: [3].
 *
 * @example
 * skyEmissivitySwinbank1963(293.15) // ≈ 0.8048
 */
export function skyEmissivitySwinbank1963(tempAirK: number): number {
  requireInRange(tempAirK, 230, 330, 'tempAirK', 'K');
  return (SWINBANK_1963.coeffWm2K6 * tempAirK * tempAirK) / STEFAN_BOLTZMANN_W_M2K4;
}

/**
 * Dew point from air temperature and relative humidity by the Magnus form with the Alduchov &
 * Eskridge (1996) coefficients over water.
 *
 * e = RH/100·a·exp(b·T/(T + c)); T_dp = c·γ/(b − γ), γ = ln(e/a); a = 6.1094 hPa, b = 17.625,
 * c = 243.04 °C.
 *
 * @param tempC Air temperature [°C], in [−40, 60]
 * @param relativeHumidityPct Relative humidity [%], in (0, 100]
 * @returns Dew-point temperature [°C]
 *
 * References: [4].
 *
 * @example
 * dewPointMagnusC(20, 52.539) // ≈ 10.0
 */
export function dewPointMagnusC(tempC: number, relativeHumidityPct: number): number {
  requireInRange(tempC, -40, 60, 'tempC', '°C');
  requireInRange(relativeHumidityPct, 0, 100, 'relativeHumidityPct', '%');
  if (relativeHumidityPct === 0) {
    throw new InputError({ problem: 'dew point undefined at 0 % humidity', place: 'relativeHumidityPct', value: 0, expected: 'a value in (0, 100] %' });
  }
  const m = MAGNUS_ALDUCHOV_ESKRIDGE_1996;
  const g = Math.log(relativeHumidityPct / 100) + (m.b * tempC) / (tempC + m.cC);
  return (m.cC * g) / (m.b - g);
}

/** Names of the clear-sky emissivity formulas `skyLongwaveWm2` accepts. */
export const SKY_EMISSIVITY_MODELS = ['berdahl-martin-1984', 'swinbank-1963'] as const;
export type SkyEmissivityModel = (typeof SKY_EMISSIVITY_MODELS)[number];

/** Inputs of `skyLongwaveWm2`. Reuse one object in loops. */
export interface SkyLongwaveInputs {
  /** Screen-level air temperature [°C]. */
  airTempC: number;
  /** Dew-point temperature [°C]; required by Berdahl–Martin unless a measurement is given. */
  dewPointC?: number;
  /** Local solar hour from midnight [h] (Berdahl–Martin diurnal correction), optional. */
  hourOfDay?: number;
  /** Station pressure [hPa] (Berdahl–Martin pressure correction), optional. */
  pressureHpa?: number;
  /**
   * Measured horizontal infrared (downwelling longwave) from a weather file [W/m²]. Used when it is
   * a finite number; `undefined`, `null` or NaN mean "missing" and the formula is used.
   */
  measuredHorizontalIrWm2?: number | null;
}

/**
 * Downwelling longwave on a horizontal surface from the sky: the weather file's measured horizontal
 * infrared when present, else a clear-sky emissivity formula times σT_a⁴.
 *
 * L↓ = L_measured, or ε_sky(model)·σ·T_a⁴.
 *
 * @param inputs Air temperature [°C], dew point [°C], hour [h], pressure [hPa], measured IR [W/m²]
 * @param model Clear-sky formula: 'berdahl-martin-1984' (default) or 'swinbank-1963'
 * @returns Downwelling longwave irradiance on a horizontal surface [W/m²]
 *
 * References: [2], [3].
 *
 * @example
 * skyLongwaveWm2({ airTempC: 20, dewPointC: 10 }) // ≈ 324.3
 */
export function skyLongwaveWm2(inputs: SkyLongwaveInputs, model: SkyEmissivityModel = 'berdahl-martin-1984'): number {
  const measured = inputs.measuredHorizontalIrWm2;
  if (measured !== undefined && measured !== null && !Number.isNaN(measured)) {
    requireInRange(measured, 0, 1000, 'measuredHorizontalIrWm2', 'W/m²');
    return measured;
  }
  requireInRange(inputs.airTempC, -50, 60, 'airTempC', '°C');
  const tK = inputs.airTempC + KELVIN_AT_0C;
  let eps: number;
  switch (model) {
    case 'berdahl-martin-1984':
      if (inputs.dewPointC === undefined) {
        throw new InputError({
          problem: 'dew point missing',
          place: 'dewPointC',
          expected: 'a dew point [°C] for the Berdahl–Martin 1984 sky emissivity (or a measured horizontal infrared)',
        });
      }
      eps = skyEmissivityBerdahlMartin1984(inputs.dewPointC, inputs.hourOfDay, inputs.pressureHpa);
      break;
    case 'swinbank-1963':
      eps = skyEmissivitySwinbank1963(tK);
      break;
    default:
      throw new InputError({
        problem: 'unknown sky emissivity model',
        place: 'model',
        value: model as unknown,
        expected: `one of ${SKY_EMISSIVITY_MODELS.join(', ')}`,
      });
  }
  return eps * STEFAN_BOLTZMANN_W_M2K4 * tK * tK * tK * tK;
}
