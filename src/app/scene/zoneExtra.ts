/** Values and ranges of the extra zone layers (difference map, glare hours), shared by the tiles and the legends. */
import type { ResultsView } from '../compute/resultColumns.ts';
import { heavy } from '../state/heavy.ts';
import type { DiffMode, ZoneExtra } from '../state/store.ts';
import { differenceValues, glareHoursValues, hasStepDifferences } from '../compute/designView.ts';
import { symmetricHalfRange } from '../colour/diverging.ts';
import { stepHoursOf } from '../colour/layers.ts';
import type { ScaleId } from '../colour/scales.ts';
import type { ValueRange } from '../colour/legend.ts';

export type ExtraColours =
  | { kind: 'difference'; values: Float32Array; halfRangeK: number; mode: DiffMode }
  | { kind: 'hours'; values: Float32Array; range: ValueRange; scale: ScaleId };

/**
 * The values of an extra layer for the shown results. The difference map's range is symmetric
 * over every step of the pair (so colours compare across time), or over the daylight means.
 */
export function zoneExtraColours(r: ResultsView, extra: ZoneExtra, timeIndex: number, diffMode: DiffMode, scale: ScaleId): ExtraColours | null {
  if (extra === 'mrtChange') {
    const pair = heavy.pair;
    if (!pair) return null;
    const mode: DiffMode = diffMode === 'step' && hasStepDifferences(pair) ? 'step' : 'daylightMean';
    const values = differenceValues(pair, r, mode === 'step' ? { kind: 'step', step: timeIndex } : { kind: 'daylightMean' });
    return { kind: 'difference', values, halfRangeK: pairHalfRange(pair, mode), mode };
  }
  if (extra === 'glareHours') {
    const values = glareHoursValues(r);
    let max = 0;
    for (const v of values) if (v > max) max = v;
    return { kind: 'hours', values, range: { min: 0, max: Math.max(stepHoursOf(r), max) }, scale };
  }
  return null;
}

const halfCache = new WeakMap<object, Record<string, number>>();

function pairHalfRange(pair: NonNullable<typeof heavy.pair>, mode: DiffMode): number {
  let c = halfCache.get(pair);
  if (!c) halfCache.set(pair, (c = {}));
  if (c[mode] === undefined) {
    const all: number[] = [];
    for (const o of pair.options) {
      for (const z of o.zones) {
        if (mode === 'daylightMean') for (const v of z.sensorMeanMrtChangeK) { if (v !== null) all.push(v); }
        else for (const row of z.sensorMrtChangeK ?? []) if (row) for (const v of row) all.push(v);
      }
    }
    c[mode] = symmetricHalfRange(all);
  }
  return c[mode];
}
