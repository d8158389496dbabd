/**
 * Stage 1 of the pipeline: the time steps of the period, the sun at each, and the weather of each
 * step (clear-sky model + design-day profile, or an hourly weather file). Columnar typed arrays.
 */
import type { Project } from '../project.ts';
import type { WeatherSeries } from '../../physics/weather/types.ts';
import { sunPositionInto, type SunPosition, dayOfYear, calendarMonth, extraterrestrialNormalWm2 } from '../../physics/solarPosition.ts';
import { clearSkyIrradiance, defaultLinkeTurbidity, type ClearSkyIrradiance } from '../../physics/clearSky.ts';
import { relativeAirMassKastenYoung1989, pressureFromElevationPa } from '../../physics/atmosphere.ts';
import { designDayAirTempC } from '../../physics/designDay.ts';
import { skyLongwaveWm2, type SkyLongwaveInputs } from '../../physics/longwave.ts';
import { dewPointFromVapourPressureC, vapourPressureFromRelativeHumidityHpa, relativeHumidityFromDewPointPct } from '../../physics/humidity.ts';
import { formatIsoTime, zoneOffsetMinutes } from '../../physics/time.ts';
import { InputError } from '../../physics/errors.ts';

export interface Steps {
  count: number;
  /** Hours each step stands for. */
  stepHours: number;
  /** The instant sun and weather are evaluated at [epoch ms]. */
  timeMs: Float64Array;
  /** ISO 8601 labels with the site's offset. */
  labels: string[];
  timeConvention: string;
  sunAltitudeDeg: Float64Array;
  sunAzimuthDeg: Float64Array;
  sunZenithDeg: Float64Array;
  /** Unit vector toward the sun, 3 per step. */
  sunDir: Float64Array;
  dniExtraWm2: Float64Array;
  relativeAirMass: Float64Array;
  airTempC: Float64Array;
  relativeHumidityPct: Float64Array;
  dewPointC: Float64Array;
  wind10mMs: Float64Array;
  dniWm2: Float64Array;
  dhiWm2: Float64Array;
  ghiWm2: Float64Array;
  skyLongwaveWm2: Float64Array;
  weatherSource: string;
  warnings: string[];
}

function allocate(n: number): Omit<Steps, 'stepHours' | 'labels' | 'timeConvention' | 'weatherSource' | 'warnings'> {
  const f = () => new Float64Array(n);
  return {
    count: n, timeMs: f(), sunAltitudeDeg: f(), sunAzimuthDeg: f(), sunZenithDeg: f(), sunDir: new Float64Array(3 * n),
    dniExtraWm2: f(), relativeAirMass: f(), airTempC: f(), relativeHumidityPct: f(), dewPointC: f(), wind10mMs: f(),
    dniWm2: f(), dhiWm2: f(), ghiWm2: f(), skyLongwaveWm2: f(),
  };
}

/** Local solar hour [h] from UTC time and longitude (mean solar time; within ±16 min of apparent). */
function solarHour(timeMs: number, longitudeDeg: number): number {
  const h = ((timeMs / 3600000) % 24) + longitudeDeg / 15;
  return ((h % 24) + 24) % 24;
}

export function buildSteps(project: Project, weatherFile?: WeatherSeries): Steps {
  const { site } = project;
  const warnings: string[] = [];
  const sun: SunPosition = { altitudeDeg: 0, azimuthDeg: 0, zenithDeg: 0, altitudeGeometricDeg: 0, dirX: 0, dirY: 0, dirZ: 0 };
  let times: number[];
  let stepHours: number;
  let timeConvention: string;
  let recordIndex: number[] = [];
  if (project.weather.source === 'file') {
    if (!weatherFile) throw new Error('buildSteps: the weather file must be read before building steps');
    const w = weatherFile;
    stepHours = w.intervalMinutes / 60;
    const p = project.period;
    for (let i = 0; i < w.count; i++) {
      const t = w.midpointTimeMs[i]!;
      if (p.kind === 'year' || (t >= p.startMs - 1 && t <= p.endMs + (w.intervalMinutes * 60000) / 2)) recordIndex.push(i);
    }
    if (recordIndex.length === 0) {
      throw new InputError({ file: w.fileName, place: 'period', problem: 'no weather records fall in the project period', expected: `a period within ${formatIsoTime(w.timeMs[0]!, 0)} … ${formatIsoTime(w.timeMs[w.count - 1]!, 0)}` });
    }
    if (p.kind === 'range' && p.stepMinutes !== w.intervalMinutes) {
      warnings.push(`period.stepMinutes ${p.stepMinutes} differs from the weather file's ${w.intervalMinutes}-minute records; the file's records are used`);
    }
    times = recordIndex.map((i) => w.midpointTimeMs[i]!);
    timeConvention = `each time is the midpoint of a weather-file record (${w.fileName}: ${w.timeStampMeaning} stamps, ${w.intervalMinutes} min); sun and weather are evaluated there`;
  } else {
    const p = project.period;
    stepHours = p.stepMinutes / 60;
    times = [];
    for (let t = p.startMs; t <= p.endMs + 1; t += p.stepMinutes * 60000) times.push(t);
    timeConvention = `each time stands for the ${p.stepMinutes}-minute interval centred on it; sun and weather are evaluated at the time itself`;
  }
  const n = times.length;
  const s = allocate(n);
  const cs: ClearSkyIrradiance = { dniWm2: 0, dhiWm2: 0, ghiWm2: 0 };
  const lwIn: SkyLongwaveInputs = { airTempC: 0 };
  const pressureHpa = pressureFromElevationPa(site.elevationM) / 100;
  const labels: string[] = [];
  for (let i = 0; i < n; i++) {
    const t = times[i]!;
    s.timeMs[i] = t;
    const offset = zoneOffsetMinutes(site.timeZone, t);
    labels.push(formatIsoTime(t, offset));
    sunPositionInto(t, site.latitudeDeg, site.longitudeDeg, sun, { elevationM: site.elevationM });
    s.sunAltitudeDeg[i] = sun.altitudeDeg;
    s.sunAzimuthDeg[i] = sun.azimuthDeg;
    s.sunZenithDeg[i] = sun.zenithDeg;
    s.sunDir[3 * i] = sun.dirX;
    s.sunDir[3 * i + 1] = sun.dirY;
    s.sunDir[3 * i + 2] = sun.dirZ;
    const doy = dayOfYear(t, offset);
    s.dniExtraWm2[i] = extraterrestrialNormalWm2(doy);
    s.relativeAirMass[i] = sun.zenithDeg < 90 ? relativeAirMassKastenYoung1989(sun.zenithDeg) : NaN;
  }
  let weatherSource: string;
  if (project.weather.source === 'clear-sky') {
    const w = project.weather;
    weatherSource = 'clear-sky (Ineichen–Perez 2002' + (w.linkeTurbidity === undefined ? ', monthly default Linke turbidity' : `, Linke turbidity ${w.linkeTurbidity}`) + '); air temperature ' +
      (typeof w.airTempC === 'number' ? 'constant' : Array.isArray(w.airTempC) ? 'as given per step' : 'from the ASHRAE fraction-of-daily-range profile (min/max, local mean solar time)');
    if (Array.isArray(w.airTempC) && w.airTempC.length !== n) {
      throw new InputError({ place: 'weather.airTempC', problem: 'wrong number of hourly values', value: w.airTempC.length, expected: `one value per step of the period (${n})` });
    }
    for (let i = 0; i < n; i++) {
      const t = s.timeMs[i]!;
      const offset = zoneOffsetMinutes(site.timeZone, t);
      const tl = w.linkeTurbidity ?? defaultLinkeTurbidity(calendarMonth(t, offset), site.latitudeDeg);
      clearSkyIrradiance('ineichen-perez', { apparentZenithDeg: s.sunZenithDeg[i]!, dayOfYear: dayOfYear(t, offset), elevationM: site.elevationM, linkeTurbidity: tl }, cs);
      s.dniWm2[i] = cs.dniWm2;
      s.dhiWm2[i] = cs.dhiWm2;
      s.ghiWm2[i] = cs.ghiWm2;
      const ta = typeof w.airTempC === 'number' ? w.airTempC : Array.isArray(w.airTempC) ? w.airTempC[i]! : designDayAirTempC(solarHour(t, site.longitudeDeg), w.airTempC.min, w.airTempC.max);
      s.airTempC[i] = ta;
      s.relativeHumidityPct[i] = w.relativeHumidityPct;
      s.dewPointC[i] = dewPointFromVapourPressureC(vapourPressureFromRelativeHumidityHpa(ta, w.relativeHumidityPct));
      s.wind10mMs[i] = w.windMs;
      lwIn.airTempC = ta;
      lwIn.dewPointC = s.dewPointC[i]!;
      lwIn.hourOfDay = solarHour(t, site.longitudeDeg);
      lwIn.pressureHpa = pressureHpa;
      lwIn.measuredHorizontalIrWm2 = undefined;
      s.skyLongwaveWm2[i] = skyLongwaveWm2(lwIn);
    }
  } else {
    const w = weatherFile!;
    weatherSource = `weather file ${w.fileName}` + (w.location ? ` (${w.location.name}, ${w.location.latitudeDeg}°, ${w.location.longitudeDeg}°)` : '');
    const pick = (col: Float64Array, name: string, maxGap: number) => fillGaps(col, recordIndex, name, maxGap, w.fileName, labels, warnings);
    const ta = pick(w.dryBulbC, 'dry bulb temperature', 6);
    const dni = pick(w.dniWm2, 'DNI', 3);
    const dhi = pick(w.dhiWm2, 'DHI', 3);
    const ghi = pick(w.ghiWm2, 'GHI', 3);
    const wind = pick(w.windSpeedMs, 'wind speed', 6);
    const dp = w.present.dewPointC ? fillGaps(w.dewPointC, recordIndex, 'dew point', 6, w.fileName, labels, warnings, true) : null;
    const rh = w.present.relativeHumidityPct ? fillGaps(w.relativeHumidityPct, recordIndex, 'relative humidity', 6, w.fileName, labels, warnings, true) : null;
    const ir = recordIndex.map((i) => w.horizontalInfraredWm2[i]!);
    const pres = recordIndex.map((i) => w.pressurePa[i]!);
    for (let i = 0; i < n; i++) {
      s.airTempC[i] = ta[i]!;
      s.dniWm2[i] = s.sunAltitudeDeg[i]! > 0 ? dni[i]! : 0;
      s.dhiWm2[i] = s.sunAltitudeDeg[i]! > 0 ? dhi[i]! : 0;
      s.ghiWm2[i] = s.sunAltitudeDeg[i]! > 0 ? ghi[i]! : 0;
      s.wind10mMs[i] = wind[i]!;
      let dew = dp?.[i] ?? NaN;
      let hum = rh?.[i] ?? NaN;
      if (!Number.isFinite(hum) && Number.isFinite(dew)) hum = relativeHumidityFromDewPointPct(ta[i]!, Math.min(dew, ta[i]!));
      if (!Number.isFinite(dew) && Number.isFinite(hum)) dew = dewPointFromVapourPressureC(vapourPressureFromRelativeHumidityHpa(ta[i]!, hum));
      if (!Number.isFinite(hum)) {
        throw new InputError({ file: w.fileName, place: labels[i]!, problem: 'neither relative humidity nor dew point is available', expected: 'a relative humidity or dew point value for every hour' });
      }
      s.relativeHumidityPct[i] = Math.min(100, Math.max(1, hum));
      s.dewPointC[i] = dew;
      lwIn.airTempC = ta[i]!;
      lwIn.dewPointC = dew;
      lwIn.hourOfDay = solarHour(s.timeMs[i]!, site.longitudeDeg);
      lwIn.pressureHpa = Number.isFinite(pres[i]!) ? pres[i]! / 100 : pressureHpa;
      lwIn.measuredHorizontalIrWm2 = Number.isFinite(ir[i]!) ? ir[i]! : undefined;
      s.skyLongwaveWm2[i] = skyLongwaveWm2(lwIn);
    }
    const missingIr = ir.filter((x) => !Number.isFinite(x)).length;
    if (missingIr > 0) warnings.push(`${w.fileName}: horizontal infrared missing for ${missingIr} of ${n} steps; the Berdahl & Martin (1984) clear-sky emissivity was used there`);
    if (w.location && Math.hypot(w.location.latitudeDeg - site.latitudeDeg, w.location.longitudeDeg - site.longitudeDeg) > 1) {
      warnings.push(`${w.fileName}: the weather station (${w.location.latitudeDeg}°, ${w.location.longitudeDeg}°) is more than 1° from the site (${site.latitudeDeg}°, ${site.longitudeDeg}°)`);
    }
  }
  return { ...s, stepHours, labels, timeConvention, weatherSource, warnings };
}

/** Picks the period's records of a column and fills short gaps (NaN) linearly; long gaps are an error. */
function fillGaps(col: Float64Array, idx: number[], name: string, maxGap: number, file: string, labels: string[], warnings: string[], optional = false): Float64Array {
  const out = new Float64Array(idx.length);
  for (let i = 0; i < idx.length; i++) out[i] = col[idx[i]!]!;
  let filled = 0;
  for (let i = 0; i < out.length; i++) {
    if (Number.isFinite(out[i]!)) continue;
    let j = i;
    while (j < out.length && !Number.isFinite(out[j]!)) j++;
    const gap = j - i;
    const before = i > 0 ? out[i - 1]! : NaN;
    const after = j < out.length ? out[j]! : NaN;
    if (gap > maxGap || (!Number.isFinite(before) && !Number.isFinite(after))) {
      if (optional) return out;
      throw new InputError({ file, place: `${name} from ${labels[i]} (${gap} steps)`, problem: 'missing values in a gap too long to fill', expected: `gaps of at most ${maxGap} steps (filled by linear interpolation)` });
    }
    for (let k = i; k < j; k++) {
      const w = (k - i + 1) / (gap + 1);
      out[k] = Number.isFinite(before) && Number.isFinite(after) ? before + w * (after - before) : Number.isFinite(before) ? before : after;
    }
    filled += gap;
    i = j - 1;
  }
  if (filled > 0) warnings.push(`${file}: ${filled} missing ${name} values filled by linear interpolation`);
  return out;
}
