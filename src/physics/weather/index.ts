export * from './types.ts';
export { parseEpw, EPW_FIELD_COUNT, EPW_FIELD_NAMES, EPW_COLUMNS } from './epw.ts';
export type { EpwOptions } from './epw.ts';
export { parseWeatherCsv, isoWithOffsetToMs, WEATHER_CSV_COLUMNS } from './csv.ts';
export type { WeatherCsvOptions, WeatherCsvColumn } from './csv.ts';
