/** A small SVG line chart of one or two series over the period, with the current step marked. */
import { niceStep, niceTicks, tickDecimals } from '../colour/legend.ts';

export interface Series {
  label: string;
  values: readonly number[];
  colour: string;
}

export interface DayChartProps {
  title: string;
  unit: string;
  times: readonly string[];
  series: Series[];
  current: number;
}

const W = 300, H = 150, L = 38, R = 8, T = 10, B = 24;

export function DayChart({ title, unit, times, series, current }: DayChartProps) {
  const all = series.flatMap((s) => s.values.filter((v) => Number.isFinite(v)));
  if (all.length === 0 || times.length === 0) return null;
  let lo = Math.min(...all), hi = Math.max(...all);
  if (hi - lo < 1e-6) {
    lo -= 1;
    hi += 1;
  }
  const ticks = niceTicks(lo, hi, 4);
  const d = tickDecimals(niceStep(hi - lo, 4));
  const n = times.length;
  const x = (i: number) => L + ((W - L - R) * i) / Math.max(1, n - 1);
  const y = (v: number) => T + (H - T - B) * (1 - (v - lo) / (hi - lo));
  // Every sixth hour, once (stamps may sit at the half hour, e.g. a weather file's midpoints).
  const seenHours = new Set<string>();
  const hourTicks = times
    .map((t, i) => ({ i, h: /T(\d\d):(\d\d)/.exec(t) }))
    .filter((o) => {
      if (!o.h || Number(o.h[1]) % 6 !== 0 || seenHours.has(o.h[1]!)) return false;
      seenHours.add(o.h[1]!);
      return true;
    });
  return (
    <figure className="chart">
      <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={`${title} over the period`}>
        <title>{title}</title>
        {ticks.map((t) => (
          <g key={t}>
            <line x1={L} x2={W - R} y1={y(t)} y2={y(t)} className="grid" />
            <text x={L - 4} y={y(t) + 3} textAnchor="end" className="tick">{t.toFixed(d)}</text>
          </g>
        ))}
        {hourTicks.map(({ i, h }) => (
          <text key={i} x={x(i)} y={H - 8} textAnchor="middle" className="tick">{`${h![1]}:00`}</text>
        ))}
        <line x1={x(current)} x2={x(current)} y1={T} y2={H - B} className="now" />
        {series.map((s) => (
          <polyline
            key={s.label}
            fill="none"
            stroke={s.colour}
            strokeWidth={1.8}
            points={s.values.map((v, i) => (Number.isFinite(v) ? `${x(i).toFixed(1)},${y(v).toFixed(1)}` : '')).filter(Boolean).join(' ')}
          />
        ))}
        <text x={L} y={T - 2} className="tick">{unit}</text>
      </svg>
      <figcaption className="small">
        {series.map((s) => (
          <span key={s.label} className="key"><span className="swatch" style={{ background: s.colour }} aria-hidden="true" /> {s.label}</span>
        ))}
      </figcaption>
    </figure>
  );
}
