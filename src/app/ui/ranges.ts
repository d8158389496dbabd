/** Which range a legend uses: automatic from the data, or the user's fixed one (SI units). Pure. */
import type { ValueRange } from '../colour/legend.ts';
import type { SensorLayerId } from '../colour/layers.ts';

export function effectiveRange(mode: 'auto' | 'fixed', fixed: ValueRange | undefined, auto: ValueRange | null): ValueRange {
  if (mode === 'fixed' && fixed && fixed.max > fixed.min) return fixed;
  return auto ?? { min: 0, max: 1 };
}

/** Key of a sensor layer's fixed range (hours depend on the category only through the data). */
export function sensorRangeKey(layer: SensorLayerId, category: string): string {
  return layer === 'categoryHours' ? `categoryHours:${category}` : layer;
}
