/**
 * The in-memory form of an hourly (or sub-hourly) weather record series, whatever file it came
 * from: one entry per record in columnar typed arrays, missing values as NaN.
 *
 * What instant a record stands for: every record covers one interval of `intervalMinutes`.
 * `timeMs` is the instant the file stamps the record with, and `timeStampMeaning` says where in the
 * interval that stamp sits; `midpointTimeMs` is always the interval's centre, the time to place
 * the sun at when using the interval's irradiance (DESIGN §3: a step stands for its midpoint).
 *
 * For EPW files the stamp is the interval END in local standard time: hour h is the hour from
 * (h − 1):00 to h:00 ("Hour 1 is 00:01 to 01:00"), the radiation fields are totals over "the
 * number of minutes preceding the time indicated" (Wh/m² per hour = mean W/m²), while dry bulb,
 * dew point, humidity, pressure and wind are given "at the time indicated" (the interval end) [1].
 *
 * References:
 * [1] U.S. DOE, "EnergyPlus Weather File (EPW) Data Dictionary," in EnergyPlus Auxiliary
 *     Programs, ch. "Weather Converter Program". Online (v24.1.0):
 *     github.com/NREL/EnergyPlus/blob/v24.1.0/doc/auxiliary-programs/src/weather-converter-program/
 *     energyplus-weather-file-epw-data-dictionary.tex
 */

/** The per-record weather quantities every reader fills (NaN where missing or absent). */
export const WEATHER_FIELDS = [
  'dryBulbC',
  'dewPointC',
  'relativeHumidityPct',
  'pressurePa',
  'horizontalInfraredWm2',
  'ghiWm2',
  'dniWm2',
  'dhiWm2',
  'windSpeedMs',
  'windDirectionDeg',
] as const;

export type WeatherField = (typeof WEATHER_FIELDS)[number];

/**
 * Valid ranges of each quantity, from the EPW data dictionary [1] (`\minimum`, `\maximum`; a `>`
 * or `<` there means the bound itself is excluded). Values outside become NaN and are counted in
 * `WeatherSeries.invalid`. Radiation has a documented minimum only.
 */
export const WEATHER_FIELD_RANGES = {
  dryBulbC: { min: -70, max: 70, exclusive: true },
  dewPointC: { min: -70, max: 70, exclusive: true },
  relativeHumidityPct: { min: 0, max: 110, exclusive: false },
  pressurePa: { min: 31000, max: 120000, exclusive: true },
  horizontalInfraredWm2: { min: 0, max: Infinity, exclusive: false },
  ghiWm2: { min: 0, max: Infinity, exclusive: false },
  dniWm2: { min: 0, max: Infinity, exclusive: false },
  dhiWm2: { min: 0, max: Infinity, exclusive: false },
  windSpeedMs: { min: 0, max: 40, exclusive: false },
  windDirectionDeg: { min: 0, max: 360, exclusive: false },
} as const satisfies Record<WeatherField, { min: number; max: number; exclusive: boolean }>;

/** Where the site is. Angles in degrees (latitude + north, longitude + east). */
export interface WeatherLocation {
  /** Place name as the file gives it (may be "unknown"). */
  name: string;
  /** [deg], −90..90, + north. */
  latitudeDeg: number;
  /** [deg], −180..180, + east. */
  longitudeDeg: number;
  /** Offset of the file's local standard time from UTC [h], e.g. +1 for UTC+01:00. */
  timeZoneHours: number;
  /** Site elevation above sea level [m]. */
  elevationM: number;
}

/**
 * Where in its interval a record's time stamp `timeMs` sits:
 * - `interval-end`: the stamp closes the interval (EPW; midpoint = stamp − interval/2);
 * - `interval-start`: the stamp opens it (midpoint = stamp + interval/2);
 * - `interval-midpoint`: the stamp is the centre.
 */
export type TimeStampMeaning = 'interval-end' | 'interval-start' | 'interval-midpoint';

/** EPW-specific facts about the file, beyond the common series. */
export interface EpwDetails {
  /** The "Year" field of each record, as written (mixed in a typical-year file). */
  sourceYear: Int16Array;
  /** Month 1..12, day 1..31, hour 1..24 (hour ENDING, local standard time), minute as written. */
  month: Uint8Array;
  day: Uint8Array;
  hour: Uint8Array;
  minute: Uint8Array;
  /**
   * True when the records come from several source years spliced into one year (a typical
   * meteorological year). Their time stamps are then placed in `timestampYear`, keeping the
   * month/day/hour.
   */
  typicalYear: boolean;
  /** The calendar year `timeMs` is placed in, or null when the source years are used (actual data). */
  timestampYear: number | null;
  /** "Number of Records per hour" from DATA PERIODS. */
  recordsPerHour: number;
  /** DATA PERIODS entries as written. */
  dataPeriods: { name: string; startDayOfWeek: string; startDay: string; endDay: string }[];
  /** LOCATION fields not in `WeatherLocation`. */
  region: string;
  country: string;
  dataSource: string;
  wmoStation: string;
  /** Text of COMMENTS 1 and COMMENTS 2 (after the keyword and its comma). */
  comments: [string, string];
  /**
   * The number of hours in an "Irradiance Time Offset (h):x" note found in the COMMENTS lines, or
   * null. The EPW format does not define this note; it is reported, never applied.
   */
  irradianceTimeOffsetH: number | null;
}

/** A weather series in columnar form: entry i of every array belongs to record i. */
export interface WeatherSeries {
  /** The file name given to the reader, and its format. */
  fileName: string;
  format: 'epw' | 'csv';
  /** From the file (EPW) or the caller (CSV; null when not given). */
  location: WeatherLocation | null;
  /** Number of records. */
  count: number;
  /** Length of the interval each record stands for [min]. */
  intervalMinutes: number;
  /** Where in the interval `timeMs` sits. */
  timeStampMeaning: TimeStampMeaning;
  /** The record's time stamp, UTC epoch [ms]. */
  timeMs: Float64Array;
  /** The centre of the record's interval, UTC epoch [ms]. */
  midpointTimeMs: Float64Array;
  /** Air (dry bulb) temperature [°C]. */
  dryBulbC: Float64Array;
  /** Dew point temperature [°C]. */
  dewPointC: Float64Array;
  /** Relative humidity [%]. */
  relativeHumidityPct: Float64Array;
  /** Station (not sea-level) air pressure [Pa]. */
  pressurePa: Float64Array;
  /** Longwave irradiance from the sky on a horizontal surface, interval mean [W/m²]. */
  horizontalInfraredWm2: Float64Array;
  /** Global horizontal irradiance, interval mean [W/m²]. */
  ghiWm2: Float64Array;
  /** Direct normal irradiance, interval mean [W/m²]. */
  dniWm2: Float64Array;
  /** Diffuse horizontal irradiance, interval mean [W/m²]. */
  dhiWm2: Float64Array;
  /**
   * Wind speed [m/s] at the weather station's measurement height, taken as the standard 10 m
   * (the EPW dictionary gives no height; 10 m is the meteorological convention — common practice).
   */
  windSpeedMs: Float64Array;
  /** Direction the wind blows FROM, clockwise from north [deg] (0 N, 90 E; 0 when calm). */
  windDirectionDeg: Float64Array;
  /** Whether the file carries the quantity at all (CSV columns may be absent; EPW has all). */
  present: Record<WeatherField, boolean>;
  /** Per quantity: how many entries are NaN because the file marked them missing, left them empty, or lacked the column. */
  missing: Record<WeatherField, number>;
  /** Per quantity: how many entries were outside `WEATHER_FIELD_RANGES` and set to NaN. */
  invalid: Record<WeatherField, number>;
  /** Things a user should know that did not stop the reading (partial year, gaps, odd values). */
  warnings: string[];
  /** Present for EPW input. */
  epw?: EpwDetails;
}
