/**
 * Display units: SI (°C, W/m², m) or IP (°F, Btu/(h·ft²), ft). The engine and the files are SI;
 * conversion happens only when a number is shown or typed.
 */
export type UnitSystem = 'SI' | 'IP';

/** Kinds of quantity the viewer shows. */
export type Quantity = 'temperature' | 'temperatureDifference' | 'irradiance' | 'length' | 'speed' | 'hours' | 'fraction';

/** 1 W/m² in Btu/(h·ft²): 1 Btu/(h·ft²) = 3.154591 W/m² (common practice: the IT Btu). */
const WM2_PER_BTU_HFT2 = 3.154591;
const M_PER_FT = 0.3048;
const MS_PER_MPH = 0.44704;

export function unitLabel(q: Quantity, system: UnitSystem): string {
  switch (q) {
    case 'temperature':
    case 'temperatureDifference':
      return system === 'SI' ? '°C' : '°F';
    case 'irradiance':
      return system === 'SI' ? 'W/m²' : 'Btu/(h·ft²)';
    case 'length':
      return system === 'SI' ? 'm' : 'ft';
    case 'speed':
      return system === 'SI' ? 'm/s' : 'mph';
    case 'hours':
      return 'h';
    case 'fraction':
      return '';
  }
}

/** A value in SI units (°C, W/m², m, m/s) shown in `system`. */
export function fromSI(q: Quantity, valueSI: number, system: UnitSystem): number {
  if (system === 'SI') return valueSI;
  switch (q) {
    case 'temperature':
      return valueSI * 1.8 + 32;
    case 'temperatureDifference':
      return valueSI * 1.8;
    case 'irradiance':
      return valueSI / WM2_PER_BTU_HFT2;
    case 'length':
      return valueSI / M_PER_FT;
    case 'speed':
      return valueSI / MS_PER_MPH;
    default:
      return valueSI;
  }
}

/** A value typed in `system` back to SI. */
export function toSI(q: Quantity, shown: number, system: UnitSystem): number {
  if (system === 'SI') return shown;
  switch (q) {
    case 'temperature':
      return (shown - 32) / 1.8;
    case 'temperatureDifference':
      return shown / 1.8;
    case 'irradiance':
      return shown * WM2_PER_BTU_HFT2;
    case 'length':
      return shown * M_PER_FT;
    case 'speed':
      return shown * MS_PER_MPH;
    default:
      return shown;
  }
}

/** "31.2 °C" style text with a sensible number of decimals for the quantity. */
export function formatQuantity(q: Quantity, valueSI: number, system: UnitSystem, digits?: number): string {
  if (!Number.isFinite(valueSI)) return '–';
  const v = fromSI(q, valueSI, system);
  const d = digits ?? (q === 'irradiance' ? 0 : q === 'fraction' ? 2 : 1);
  const unit = unitLabel(q, system);
  return unit === '' ? v.toFixed(d) : `${v.toFixed(d)} ${unit}`;
}
