/** Which range a legend uses: automatic from the data, or the user's fixed one (SI units). Pure. */
import type { ValueRange } from '../colour/legend.ts';
import type { SensorLayerId } from '../colour/layers.ts';

/** How a legend's range is chosen: over the whole period, over the step shown, or the user's own. */
export type RangeMode = 'auto' | 'step' | 'fixed';

/** `step` is the range of the values shown now (used only for layers that change with the step). */
export function effectiveRange(mode: RangeMode, fixed: ValueRange | undefined, auto: ValueRange | null, step?: ValueRange | null): ValueRange {
  if (mode === 'fixed' && fixed && fixed.max > fixed.min) return fixed;
  if (mode === 'step' && step) return step;
  return auto ?? { min: 0, max: 1 };
}

/** Key of a sensor layer's fixed range (hours depend on the category only through the data). */
export function sensorRangeKey(layer: SensorLayerId, category: string): string {
  return layer === 'categoryHours' ? `categoryHours:${category}` : layer;
}
