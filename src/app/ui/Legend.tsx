/** A labelled colour legend: title with unit, gradient bar, nice ticks, auto or fixed range. */
import { niceStep, niceTicks, tickDecimals, type ValueRange } from '../colour/legend.ts';
import { scaleGradientCss, type ScaleId } from '../colour/scales.ts';
import { fromSI, unitLabel, type Quantity, type UnitSystem } from '../colour/units.ts';
import type { RangeMode } from './ranges.ts';

export interface LegendProps {
  title: string;
  quantity: Quantity;
  range: ValueRange;
  scale: ScaleId;
  units: UnitSystem;
  rangeMode: RangeMode;
  testId?: string;
}

export function Legend({ title, quantity, range, scale, units, rangeMode, testId }: LegendProps) {
  const lo = fromSI(quantity, range.min, units);
  const hi = fromSI(quantity, range.max, units);
  const ticks = niceTicks(lo, hi, 5);
  const d = tickDecimals(niceStep(hi - lo, 5));
  const unit = unitLabel(quantity, units);
  return (
    <figure className="legend" data-testid={testId} aria-label={`${title} legend, ${lo.toFixed(d)} to ${hi.toFixed(d)} ${unit}`}>
      <figcaption>
        {title} {unit && <span className="unit">[{unit}]</span>} <span className="muted small">({rangeMode === 'auto' ? 'range over the period' : rangeMode === 'step' ? 'range at this time step' : 'fixed range'})</span>
      </figcaption>
      <div className="legend-bar" style={{ background: scaleGradientCss(scale) }} />
      <div className="legend-ticks" aria-hidden="true">
        {ticks.map((t) => (
          <span key={t} style={{ left: `${((t - lo) / (hi - lo)) * 100}%` }}>{t.toFixed(d)}</span>
        ))}
      </div>
    </figure>
  );
}
